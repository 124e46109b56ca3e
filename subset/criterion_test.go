package subset

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/stat"
)

func randomSamples(rng *rand.Rand, n int) []float64 {
	s := make([]float64, n)
	for i := range s {
		s[i] = 100 + 40*rng.NormFloat64()
	}
	return s
}

// TestZNCCMatchesPearson checks ZNCC against gonum's Pearson correlation
// (reference library; ZNCC is the Pearson coefficient of the two samples),
// and ZNSSD against its defining sum Σ[(f-f̄)/‖f-f̄‖ - (g-ḡ)/‖g-ḡ‖]²,
// which verifies ZNCC = 1 - ZNSSD/2 (Pan, Xie & Wang 2010).
func TestZNCCMatchesPearson(t *testing.T) {
	rng := rand.New(rand.NewPCG(11, 11))
	for range 20 {
		f := randomSamples(rng, 441)
		g := randomSamples(rng, 441)
		for i := range g { // partly correlated
			g[i] = 0.6*f[i] + 0.4*g[i]
		}
		if got, want := ZNCC(f, g), stat.Correlation(f, g, nil); math.Abs(got-want) > 1e-12 {
			t.Errorf("ZNCC = %.15g, gonum Pearson = %.15g", got, want)
		}
		fm, gm := stat.Mean(f, nil), stat.Mean(g, nil)
		var nf, ng float64
		for i := range f {
			nf += (f[i] - fm) * (f[i] - fm)
			ng += (g[i] - gm) * (g[i] - gm)
		}
		nf, ng = math.Sqrt(nf), math.Sqrt(ng)
		var want float64
		for i := range f {
			d := (f[i]-fm)/nf - (g[i]-gm)/ng
			want += d * d
		}
		if got := ZNSSD(f, g); math.Abs(got-want) > 1e-12 {
			t.Errorf("ZNSSD = %.15g, definition gives %.15g", got, want)
		}
		if got := ZNCCFromZNSSD(want); math.Abs(got-ZNCC(f, g)) > 1e-12 {
			t.Errorf("1 - ZNSSD/2 = %.15g, ZNCC = %.15g", got, ZNCC(f, g))
		}
	}
}

// TestZNCCIntensityInvariance checks that ZNCC and ZNSSD ignore an affine
// change of intensity a·g + b with a > 0 (Pan, Xie & Wang 2010): a subset
// compared with a brightened, contrast-changed copy of itself scores
// exactly ZNCC = 1, ZNSSD = 0, and a negated copy ZNCC = -1, ZNSSD = 4.
func TestZNCCIntensityInvariance(t *testing.T) {
	rng := rand.New(rand.NewPCG(12, 12))
	f := randomSamples(rng, 961)
	g := randomSamples(rng, 961)
	base := ZNCC(f, g)
	for _, ab := range [][2]float64{{1, 0}, {0.37, 25}, {3.1, -80}, {1e3, 1e4}} {
		h := make([]float64, len(f))
		k := make([]float64, len(g))
		for i := range f {
			h[i] = ab[0]*f[i] + ab[1]
			k[i] = ab[0]*g[i] + ab[1]
		}
		if c := ZNCC(f, h); math.Abs(c-1) > 1e-12 {
			t.Errorf("ZNCC(f, %g f + %g) = %.15g, want 1", ab[0], ab[1], c)
		}
		if c := ZNSSD(f, h); math.Abs(c) > 1e-12 {
			t.Errorf("ZNSSD(f, %g f + %g) = %g, want 0", ab[0], ab[1], c)
		}
		if c := ZNCC(f, k); math.Abs(c-base) > 1e-12 {
			t.Errorf("ZNCC(f, %g g + %g) = %.15g, want %.15g as for g", ab[0], ab[1], c, base)
		}
		for i := range h {
			h[i] = -h[i]
		}
		if c := ZNCC(f, h); math.Abs(c+1) > 1e-12 {
			t.Errorf("ZNCC(f, -(%g f + %g)) = %.15g, want -1", ab[0], ab[1], c)
		}
		if c := ZNSSD(f, h); math.Abs(c-4) > 1e-12 {
			t.Errorf("ZNSSD(f, -(%g f + %g)) = %.15g, want 4", ab[0], ab[1], c)
		}
	}
	flat := make([]float64, len(f))
	if c := ZNCC(f, flat); !math.IsNaN(c) {
		t.Errorf("ZNCC against a flat sample = %g, want NaN", c)
	}
	if n := testing.AllocsPerRun(100, func() { ZNSSD(f, g) }); n != 0 {
		t.Errorf("ZNSSD allocates %g times per call, want 0", n)
	}
}

func BenchmarkZNCC(b *testing.B) {
	rng := rand.New(rand.NewPCG(13, 13))
	f, g := randomSamples(rng, 961), randomSamples(rng, 961)
	for b.Loop() {
		ZNCC(f, g)
	}
}

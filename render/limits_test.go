package render

import (
	"math"
	"slices"
	"testing"

	"gonum.org/v1/gonum/stat"

	"spallscope/dic"
	"spallscope/dic/synth"
)

// Percentile follows Hyndman & Fan's definition 7: NumPy's documented
// example np.percentile([[10, 7, 4], [3, 2, 1]], 50) = 3.5, and R's
// quantile(1:10, 0.1) = 1.9 (type 7, R's default).
func TestLimitsPercentileDefinition7(t *testing.T) {
	for _, c := range []struct {
		xs       []float64
		pct, exp float64
	}{
		{[]float64{10, 7, 4, 3, 2, 1}, 50, 3.5},
		{[]float64{1, 2, 3, 4, 5, 6, 7, 8, 9, 10}, 10, 1.9},
		{[]float64{1, 2, 3, 4}, 100, 4},
		{[]float64{1, 2, 3, 4}, 0, 1},
	} {
		xs := slices.Clone(c.xs)
		slices.Sort(xs)
		if got := Percentile(xs, c.pct); math.Abs(got-c.exp) > 1e-12 {
			t.Errorf("percentile %g of %v = %g, expected %g", c.pct, c.xs, got, c.exp)
		}
	}
}

// kirschFrames returns the synthetic lab's exact strain around a circular
// opening (Kirsch solution) at load fractions 0.2, 0.4, …, 1 on a grid,
// NaN inside the opening: name selects exx, e1 or e_eq.
func kirschFrames(name string) []*GridValues {
	k := synth.Kirsch{Cx: 100, Cy: 100, Radius: 25, Stress: 30, K: 0.3, E: 20000, Nu: 0.2}
	g := dic.Grid{X0: 2, Y0: 2, Step: 4, Cols: 50, Rows: 50}
	var out []*GridValues
	for f := 1; f <= 5; f++ {
		field := k.Scaled(float64(f) / 5)
		out = append(out, sampleGrid(g, func(x, y float64) float64 {
			m := field.At(x, y)
			exx, eyy, exy := m.UX, m.VY, (m.UY+m.VX)/2
			c, r := (exx+eyy)/2, math.Hypot((exx-eyy)/2, exy)
			switch name {
			case "exx":
				return exx
			case "e1":
				return c + r
			}
			e1, e2 := c+r, c-r
			return 2 / math.Sqrt(3) * math.Sqrt(e1*e1+e2*e2-e1*e2)
		}, func(x, y float64) bool { return math.Hypot(x-100, y-100) < 25 }))
	}
	return out
}

// Sequence limits of a signed field are symmetric about zero at the larger
// of |P1| and |P99| of all frames' values pooled, checked against gonum's
// empirical quantile of the same pool (a different estimator: agreement to
// 1 % of the limit); magnitudes start at zero and end at P99.
func TestLimitsSequenceSymmetricForSignedFields(t *testing.T) {
	for _, name := range []string{"exx", "e1", "e_eq"} {
		q, err := QuantityNamed(name)
		if err != nil {
			t.Fatal(err)
		}
		var pool Pool
		var all []float64
		for _, f := range kirschFrames(name) {
			pool.Add(f.Values)
			all = append(all, f.Finite()...)
		}
		lim, err := AutoLimits(q, &pool, LimitsSequence, 1, 99)
		if err != nil {
			t.Fatal(err)
		}
		slices.Sort(all)
		p1, p99 := stat.Quantile(0.01, stat.Empirical, all, nil), stat.Quantile(0.99, stat.Empirical, all, nil)
		if q.Signed {
			want := math.Max(math.Abs(p1), math.Abs(p99))
			if lim.Lo != -lim.Hi || !lim.Centred {
				t.Errorf("%s: sequence limits %g to %g, expected symmetric and centred", name, lim.Lo, lim.Hi)
			}
			if math.Abs(lim.Hi-want) > 0.01*want {
				t.Errorf("%s: limit %g, gonum's pooled quantiles give %g", name, lim.Hi, want)
			}
		} else {
			if lim.Lo != 0 || math.Abs(lim.Hi-p99) > 0.01*p99 || lim.Centred {
				t.Errorf("%s: limits %g to %g, expected 0 to P99 = %g, not centred", name, lim.Lo, lim.Hi, p99)
			}
		}
		if lim.Values != len(all) {
			t.Errorf("%s: limits from %d values, the frames hold %d", name, lim.Values, len(all))
		}
	}
}

// A signed field with asymmetric fixed limits keeps zero at the neutral
// middle of the map, each side scaled on its own.
func TestLimitsFixedKeepZeroNeutral(t *testing.T) {
	q, _ := QuantityNamed("eyy")
	spec, err := ParseLimits("-1000ue, 3000ue", q, 0)
	if err != nil {
		t.Fatal(err)
	}
	lim := spec.Fixed(q)
	for _, c := range []struct{ v, t float64 }{{-1e-3, 0}, {0, 0.5}, {1.5e-3, 0.75}, {3e-3, 1}, {9e-3, 1}, {-5e-4, 0.25}} {
		if got := lim.Position(c.v); math.Abs(got-c.t) > 1e-12 {
			t.Errorf("position of %g in %g to %g: %g, expected %g", c.v, lim.Lo, lim.Hi, got, c.t)
		}
	}
}

// Limits parse with units, and a plain strain that can only be meant as
// microstrain is refused with the fix.
func TestLimitsParse(t *testing.T) {
	e1, _ := QuantityNamed("e1")
	v, _ := QuantityNamed("v")
	for _, c := range []struct {
		s      string
		q      Quantity
		scale  dic.Scale
		lo, hi float64
		mode   LimitMode
		bad    bool
	}{
		{s: "", q: e1, mode: LimitsSequence},
		{s: "auto", q: e1, mode: LimitsFrame},
		{s: "-0.002,0.004", q: e1, lo: -0.002, hi: 0.004, mode: LimitsFixed},
		{s: "-0.2%,0.5%", q: e1, lo: -0.002, hi: 0.005, mode: LimitsFixed},
		{s: "-2px,2px", q: v, lo: -2, hi: 2, mode: LimitsFixed},
		{s: "-0.1mm,0.1mm", q: v, scale: 0.05, lo: -2, hi: 2, mode: LimitsFixed},
		{s: "-2000,2000", q: e1, bad: true},
		{s: "-0.1mm,0.1mm", q: v, bad: true},
		{s: "1ue,-1ue", q: e1, bad: true},
		{s: "2px,3px", q: e1, bad: true},
	} {
		got, err := ParseLimits(c.s, c.q, c.scale)
		if (err != nil) != c.bad {
			t.Errorf("ParseLimits(%q, %s): error %v, expected failure %t", c.s, c.q.Name, err, c.bad)
			continue
		}
		if !c.bad && (got.Mode != c.mode || math.Abs(got.Lo-c.lo) > 1e-12 || math.Abs(got.Hi-c.hi) > 1e-12) {
			t.Errorf("ParseLimits(%q, %s) = %+v, expected %s %g to %g", c.s, c.q.Name, got, c.mode, c.lo, c.hi)
		}
	}
}

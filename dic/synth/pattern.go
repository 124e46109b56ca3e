package synth

import (
	"fmt"
	"math"
	"math/rand/v2"
)

// Pattern describes a painted speckle pattern: dark ink spots on bright
// paint. Spot centres are a Poisson point process; each spot lays down an
// ink density κ·exp(−r²/R²), densities add, and the paint's reflectance is
// reduced by 1 − exp(−total density) (ink layers absorb like a
// Beer–Lambert medium), which keeps the pattern smooth and its gray levels
// bounded. By Campbell's theorem for Poisson shot noise the expected inked
// fraction is 1 − exp(−λ·π·E[R²]·Ein(κ)), with Ein(κ) = ∫₀^κ (1−e⁻ˢ)/s ds;
// Coverage fixes λ through that relation.
type Pattern struct {
	// Radius is the spot radius R in px (1/e radius of the ink density).
	// The visible speckle diameter is about 2R–3R.
	Radius float64 `json:"radius_px"`
	// RadiusSpread spreads radii uniformly over R·(1 ± RadiusSpread).
	RadiusSpread float64 `json:"radius_spread,omitempty"`
	// Coverage is the expected fraction of the face that is inked, in (0, 1).
	Coverage float64 `json:"coverage"`
	// Ink is the peak density κ of one spot (default 3: a lone spot's centre
	// is 95 % inked).
	Ink float64 `json:"ink,omitempty"`
	// Paint and Dark are the gray levels of bare paint and of full ink as
	// fractions of the full scale (defaults 0.85 and 0.08).
	Paint float64 `json:"paint,omitempty"`
	Dark  float64 `json:"dark,omitempty"`
	// Seed fixes the spot positions.
	Seed uint64 `json:"seed"`
	// Periodic makes the pattern repeat with the image size (for tests by
	// the Fourier shift theorem); otherwise spots extend Margin px beyond
	// the image so material moving in from outside is textured too.
	Periodic bool    `json:"periodic,omitempty"`
	Margin   float64 `json:"margin_px,omitempty"`
}

// withDefaults fills unset optional values.
func (p Pattern) withDefaults() Pattern {
	if p.Ink == 0 {
		p.Ink = 3
	}
	if p.Paint == 0 && p.Dark == 0 {
		p.Paint, p.Dark = 0.85, 0.08
	}
	if p.Margin == 0 {
		p.Margin = 64
	}
	return p
}

// Validate reports a pattern that cannot be rendered.
func (p Pattern) Validate() error {
	switch {
	case !(p.Radius >= 0.5 && p.Radius <= 100):
		return fmt.Errorf("speckle radius %g px, expected 0.5 to 100", p.Radius)
	case !(p.Coverage > 0 && p.Coverage < 1):
		return fmt.Errorf("speckle coverage %g, expected a fraction between 0 and 1", p.Coverage)
	case p.RadiusSpread < 0 || p.RadiusSpread >= 1:
		return fmt.Errorf("radius spread %g, expected 0 to <1", p.RadiusSpread)
	case p.Ink < 0 || p.Paint < 0 || p.Paint > 1 || p.Dark < 0 || p.Dark > 1:
		return fmt.Errorf("ink %g, paint %g, dark %g: expected ink ≥ 0 and levels in [0, 1]", p.Ink, p.Paint, p.Dark)
	}
	return nil
}

// Ein is the entire exponential integral Ein(x) = ∫₀^x (1−e⁻ˢ)/s ds
// = Σ_{k≥1} (−1)^{k+1} x^k / (k·k!) (Abramowitz & Stegun 5.1.11 in the
// form of DLMF 6.2.3).
func Ein(x float64) float64 {
	sum, term := 0.0, 1.0
	for k := 1; k < 200; k++ {
		term *= x / float64(k) // x^k / k!
		d := term / float64(k)
		if k%2 == 0 {
			d = -d
		}
		sum += d
		if math.Abs(d) < 1e-17*math.Abs(sum) {
			break
		}
	}
	return sum
}

// ExpectedCoverage is the mean inked fraction for spot density λ (spots per
// px²) by Campbell's theorem (see Pattern).
func (p Pattern) ExpectedCoverage(lambda float64) float64 {
	p = p.withDefaults()
	return 1 - math.Exp(-lambda*math.Pi*p.meanR2()*Ein(p.Ink))
}

// SpotDensity is the spot density λ that gives the pattern's Coverage.
func (p Pattern) SpotDensity() float64 {
	p = p.withDefaults()
	return -math.Log(1-p.Coverage) / (math.Pi * p.meanR2() * Ein(p.Ink))
}

// meanR2 is E[R²] for radii uniform on R(1±s): R²(1 + s²/3).
func (p Pattern) meanR2() float64 {
	return p.Radius * p.Radius * (1 + p.RadiusSpread*p.RadiusSpread/3)
}

// spot is one ink spot.
type spot struct{ x, y, invR2 float64 }

// Speckles is a rendered-ready pattern over a face of a given size: the
// spots bucketed in square cells for fast evaluation.
type Speckles struct {
	p             Pattern
	width, height float64
	x0, y0        float64 // origin of the cell grid
	cellW, cellH  float64 // cell size ≥ cut-off distance
	cols, rows    int
	start         []int32 // spots of cell c are spots[start[c]:start[c+1]]
	spots         []spot
	cut2          float64 // squared cut-off distance in units of R²
}

// NewSpeckles draws the spots of pattern p over a width×height face.
func NewSpeckles(p Pattern, width, height int) (*Speckles, error) {
	p = p.withDefaults()
	if err := p.Validate(); err != nil {
		return nil, err
	}
	if width <= 0 || height <= 0 {
		return nil, fmt.Errorf("pattern size %dx%d, expected positive", width, height)
	}
	s := &Speckles{p: p, width: float64(width), height: float64(height)}
	rmax := p.Radius * (1 + p.RadiusSpread)
	// Beyond 4.5 R a spot's density is κ·e^−20 ≈ 6e-9: far below one gray level.
	s.cut2 = 4.5 * 4.5
	cut := 4.5 * rmax
	margin := p.Margin
	if p.Periodic {
		margin = 0
	}
	s.x0, s.y0 = -margin, -margin
	w, h := s.width+2*margin, s.height+2*margin
	s.cols = max(1, int(math.Ceil(w/cut)))
	s.rows = max(1, int(math.Ceil(h/cut)))
	if p.Periodic {
		// Cells must tile the period exactly so wrapped neighbours are whole.
		s.cols, s.rows = int(w/cut), int(h/cut)
		if s.cols < 3 || s.rows < 3 {
			return nil, fmt.Errorf("periodic pattern %dx%d is too small for speckle radius %g px (needs %g px per side)", width, height, p.Radius, 3*cut)
		}
	}
	s.cellW, s.cellH = w/float64(s.cols), h/float64(s.rows)
	rng := rand.New(rand.NewPCG(p.Seed, 0x5ec1e5))
	n := poisson(rng, p.SpotDensity()*w*h)
	raw := make([]spot, n)
	counts := make([]int32, s.cols*s.rows+1)
	for i := range raw {
		r := p.Radius * (1 + p.RadiusSpread*(2*rng.Float64()-1))
		raw[i] = spot{x: s.x0 + w*rng.Float64(), y: s.y0 + h*rng.Float64(), invR2: 1 / (r * r)}
		counts[s.cellOf(raw[i].x, raw[i].y)+1]++
	}
	for c := 1; c < len(counts); c++ {
		counts[c] += counts[c-1]
	}
	s.start = counts
	s.spots = make([]spot, n)
	fill := append([]int32(nil), counts[:len(counts)-1]...)
	for _, sp := range raw {
		c := s.cellOf(sp.x, sp.y)
		s.spots[fill[c]] = sp
		fill[c]++
	}
	return s, nil
}

// Count is the number of spots drawn.
func (s *Speckles) Count() int { return len(s.spots) }

// Area is the area over which spots were drawn, in px².
func (s *Speckles) Area() float64 {
	return float64(s.cols) * s.cellW * float64(s.rows) * s.cellH
}

func (s *Speckles) cellOf(x, y float64) int {
	cx := int((x - s.x0) / s.cellW)
	cy := int((y - s.y0) / s.cellH)
	cx = min(max(cx, 0), s.cols-1)
	cy = min(max(cy, 0), s.rows-1)
	return cy*s.cols + cx
}

// Coverage returns the inked fraction at material point (x, y), in [0, 1).
func (s *Speckles) Coverage(x, y float64) float64 {
	if s.p.Periodic {
		x -= s.width * math.Floor(x/s.width)
		y -= s.height * math.Floor(y/s.height)
	}
	fx := (x - s.x0) / s.cellW
	fy := (y - s.y0) / s.cellH
	cx, cy := int(math.Floor(fx)), int(math.Floor(fy))
	density := 0.0
	for j := cy - 1; j <= cy+1; j++ {
		oy, jj := 0.0, j
		if s.p.Periodic {
			jj, oy = wrap(j, s.rows, s.height)
		} else if j < 0 || j >= s.rows {
			continue
		}
		for i := cx - 1; i <= cx+1; i++ {
			ox, ii := 0.0, i
			if s.p.Periodic {
				ii, ox = wrap(i, s.cols, s.width)
			} else if i < 0 || i >= s.cols {
				continue
			}
			c := jj*s.cols + ii
			for _, sp := range s.spots[s.start[c]:s.start[c+1]] {
				dx, dy := x-(sp.x+ox), y-(sp.y+oy)
				q := (dx*dx + dy*dy) * sp.invR2
				if q < s.cut2 {
					density += math.Exp(-q)
				}
			}
		}
	}
	return 1 - math.Exp(-s.p.Ink*density)
}

// Level returns the gray level (fraction of full scale) at material point
// (x, y): Paint where bare, towards Dark where inked.
func (s *Speckles) Level(x, y float64) float64 {
	return s.p.Paint + (s.p.Dark-s.p.Paint)*s.Coverage(x, y)
}

// wrap maps cell index i of a periodic axis with n cells of total length
// period to an index in range and the offset to add to that cell's spots.
func wrap(i, n int, period float64) (int, float64) {
	switch {
	case i < 0:
		return i + n, -period
	case i >= n:
		return i - n, period
	}
	return i, 0
}

// poisson draws a Poisson variate with the given mean (normal approximation
// with continuity correction above 1000, exact inversion below).
func poisson(rng *rand.Rand, mean float64) int {
	if mean > 1000 {
		return max(0, int(math.Round(mean+math.Sqrt(mean)*rng.NormFloat64())))
	}
	l, k, p := math.Exp(-mean), 0, 1.0
	for {
		p *= rng.Float64()
		if p <= l {
			return k
		}
		k++
	}
}

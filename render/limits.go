package render

import (
	"fmt"
	"math"
	"slices"
	"strconv"
	"strings"

	"spallscope/dic"
)

// LimitMode says how the values at the ends of the colour map are chosen.
type LimitMode string

// Limit modes.
const (
	// LimitsSequence takes robust percentiles of the values of every frame
	// together, so one colour means one value throughout the sequence and
	// frames can be compared (the default).
	LimitsSequence LimitMode = "sequence"
	// LimitsFrame takes the percentiles of each frame alone: every frame
	// uses the whole map, but colours differ in meaning between frames.
	LimitsFrame LimitMode = "auto"
	// LimitsFixed uses limits given by the user.
	LimitsFixed LimitMode = "fixed"
)

// Default percentiles of automatic limits: the extreme percent of values at
// each end (often a few points at a crack or the edge of an opening) is
// shown at the end colours instead of stretching the map.
const (
	DefaultLowPercentile  = 1
	DefaultHighPercentile = 99
)

// Limits are the values at the ends of the colour map (values beyond are
// drawn at the end colours).
type Limits struct {
	Lo, Hi float64
	// Centred limits belong to a signed quantity: zero is the map's middle
	// (the neutral colour), each side scaled on its own if Lo ≠ −Hi.
	Centred bool
	Mode    LimitMode
	// LowPct and HighPct are the percentiles automatic limits came from.
	LowPct, HighPct float64
	// Values is the number of values the limits were taken from (0 for
	// fixed limits).
	Values int
}

// Position returns where v falls on the colour map, in [0, 1].
func (l Limits) Position(v float64) float64 {
	var t float64
	switch {
	case l.Centred && l.Lo < 0 && l.Hi > 0:
		if v < 0 {
			t = 0.5 - 0.5*v/l.Lo
		} else {
			t = 0.5 + 0.5*v/l.Hi
		}
	case l.Hi > l.Lo:
		t = (v - l.Lo) / (l.Hi - l.Lo)
	default:
		t = 0.5
	}
	return math.Min(1, math.Max(0, t))
}

// Pool gathers the values of many frames for sequence-wide limits. It keeps
// at most MaxPool values, thinning evenly (every other value, then every
// fourth, ...) when more come, so a long run of large frames costs bounded
// memory and the percentiles stay those of the whole sequence to within
// the sampling.
type Pool struct {
	vals   []float64
	stride int
	seen   int
}

// MaxPool is the most values a Pool keeps.
const MaxPool = 1 << 22

// Add adds the finite values of vs.
func (p *Pool) Add(vs []float64) {
	if p.stride == 0 {
		p.stride = 1
	}
	for _, v := range vs {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			continue
		}
		if p.seen%p.stride == 0 {
			p.vals = append(p.vals, v)
		}
		p.seen++
		if len(p.vals) > MaxPool {
			kept := p.vals[:0]
			for i := 0; i < len(p.vals); i += 2 {
				kept = append(kept, p.vals[i])
			}
			p.vals, p.stride = kept, 2*p.stride
		}
	}
}

// Len is the number of values kept.
func (p *Pool) Len() int { return len(p.vals) }

// Percentile returns the pct-th percentile (0–100) of xs by linear
// interpolation between order statistics (Hyndman & Fan 1996, definition 7,
// the default of R and NumPy); xs must be sorted and non-empty.
func Percentile(xs []float64, pct float64) float64 {
	h := (float64(len(xs)) - 1) * pct / 100
	i := int(math.Floor(h))
	if i >= len(xs)-1 {
		return xs[len(xs)-1]
	}
	if i < 0 {
		return xs[0]
	}
	return xs[i] + (h-float64(i))*(xs[i+1]-xs[i])
}

// AutoLimits returns robust limits for q from the values in p: for a signed
// quantity ±max(|P_low|, |P_high|), symmetric about zero so the neutral
// colour means zero; for a magnitude from zero (FromZero) or P_low to
// P_high. Limits never span less than the quantity's resolution of display
// (1 µε, 0.001 px, 0.001 ZNCC). It fails when p holds no value.
func AutoLimits(q Quantity, p *Pool, mode LimitMode, lowPct, highPct float64) (Limits, error) {
	if p.Len() == 0 {
		return Limits{}, fmt.Errorf("limits of %s: no measured value", q.Name)
	}
	if !(lowPct >= 0 && lowPct < highPct && highPct <= 100) {
		return Limits{}, fmt.Errorf("limits of %s: percentiles %g and %g, expected 0 ≤ low < high ≤ 100", q.Name, lowPct, highPct)
	}
	xs := slices.Clone(p.vals)
	slices.Sort(xs)
	lo, hi := Percentile(xs, lowPct), Percentile(xs, highPct)
	l := Limits{Mode: mode, LowPct: lowPct, HighPct: highPct, Values: len(xs)}
	span := q.minSpan()
	switch {
	case q.Signed:
		m := math.Max(math.Max(math.Abs(lo), math.Abs(hi)), span/2)
		l.Lo, l.Hi, l.Centred = -m, m, true
	case q.FromZero:
		l.Lo, l.Hi = 0, math.Max(hi, span)
	default:
		if hi-lo < span {
			mid := (hi + lo) / 2
			lo, hi = mid-span/2, mid+span/2
		}
		l.Lo, l.Hi = lo, hi
	}
	return l, nil
}

// LimitSpec is what the user asked for: a mode, and the values for fixed
// limits.
type LimitSpec struct {
	Mode   LimitMode
	Lo, Hi float64
}

// ParseLimits reads "sequence", "auto" or "MIN,MAX" for quantity q. Fixed
// limits are in the quantity's own unit — strain as a plain number
// (0.002), displacement in px — or carry a unit: "ue" or "µε", "%" for
// strain, "px" or (with a known scale) "mm" for displacement.
func ParseLimits(s string, q Quantity, scale dic.Scale) (LimitSpec, error) {
	switch strings.TrimSpace(s) {
	case "", string(LimitsSequence):
		return LimitSpec{Mode: LimitsSequence}, nil
	case string(LimitsFrame), "frame":
		return LimitSpec{Mode: LimitsFrame}, nil
	}
	a, b, ok := strings.Cut(s, ",")
	if !ok {
		return LimitSpec{}, fmt.Errorf("limits %q: expected sequence, auto or MIN,MAX", s)
	}
	lo, err := parseLimitValue(a, q, scale)
	if err != nil {
		return LimitSpec{}, fmt.Errorf("limits %q: %w", s, err)
	}
	hi, err := parseLimitValue(b, q, scale)
	if err != nil {
		return LimitSpec{}, fmt.Errorf("limits %q: %w", s, err)
	}
	if !(hi > lo) {
		return LimitSpec{}, fmt.Errorf("limits %q: MIN must be below MAX", s)
	}
	return LimitSpec{Mode: LimitsFixed, Lo: lo, Hi: hi}, nil
}

// parseLimitValue reads one fixed limit with its optional unit.
func parseLimitValue(s string, q Quantity, scale dic.Scale) (float64, error) {
	s = strings.TrimSpace(s)
	factor, unit := 1.0, ""
	for _, u := range []struct {
		suffix string
		factor float64
		kind   QuantityKind
	}{{"ue", 1e-6, StrainKind}, {"µε", 1e-6, StrainKind}, {"%", 1e-2, StrainKind}, {"px", 1, DisplacementKind}, {"mm", 0, DisplacementKind}} {
		if strings.HasSuffix(s, u.suffix) {
			if q.Kind != u.kind {
				return 0, fmt.Errorf("unit %s does not fit field %s", u.suffix, q.Name)
			}
			unit, factor = u.suffix, u.factor
			if unit == "mm" {
				if !scale.Known() {
					return 0, fmt.Errorf("limits in mm need the image scale, which this run does not know; give px")
				}
				factor = 1 / float64(scale)
			}
			s = strings.TrimSpace(strings.TrimSuffix(s, u.suffix))
			break
		}
	}
	v, err := strconv.ParseFloat(s, 64)
	if err != nil || math.IsNaN(v) || math.IsInf(v, 0) {
		return 0, fmt.Errorf("%q is not a number", s)
	}
	if q.Kind == StrainKind && unit == "" && math.Abs(v) >= 1 {
		return 0, fmt.Errorf("strain %g as a plain number is %g %%; for microstrain write %gue", v, 100*v, v)
	}
	return v * factor, nil
}

// Fixed returns the limits of spec (LimitsFixed) for q: centred when q is
// signed and the range holds zero.
func (s LimitSpec) Fixed(q Quantity) Limits {
	return Limits{Lo: s.Lo, Hi: s.Hi, Mode: LimitsFixed, Centred: q.Signed && s.Lo < 0 && s.Hi > 0}
}

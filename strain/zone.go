package strain

import (
	"math"
	"slices"

	"spallscope/dic"
	"spallscope/subset"
)

// Zone is one localized zone in one frame: connected grid points whose
// indicator exceeds the frame's threshold.
type Zone struct {
	// ID is stable across frames: a zone keeps the ID of the zone of the
	// previous frame it overlaps most.
	ID        int
	Frame     int
	Indicator Indicator
	Cells     []int // grid point indices
	AreaPx2   float64
	AreaMM2   float64 // 0 without a scale
	// Peak is the largest indicator value in the zone (strain; for
	// decorrelation the lowest ZNCC's shortfall 1 − ZNCC, 1 for lost).
	Peak float64
	// Cx, Cy is the centroid in reference px.
	Cx, Cy float64
	// OrientationDeg is the direction of the zone's long axis from +x
	// towards +y (second moments of its cells), in (−90, 90].
	OrientationDeg float64
	Opening        int // nearest opening, −1 if none
	Sector         Sector
	// Touches lists the openings (indices) whose walls the zone reaches,
	// and FreeEdge whether it reaches the edge of the measured face: a zone
	// touching two openings, or an opening and the free edge, is a
	// through-going fracture.
	Touches  []int
	FreeEdge bool
}

// Through reports whether the zone links two openings, or an opening and a
// free boundary.
func (z *Zone) Through() bool { return len(z.Touches) >= 2 || (len(z.Touches) == 1 && z.FreeEdge) }

// Thresholds say when a point belongs to a zone: its indicator must exceed
// the frame's median by K robust standard deviations (1.4826 × MAD over
// the frame's points, so a small zone does not raise its own bar) and by
// at least Absolute (strain; 0 = no floor). Decorrelated points are those
// that were measured in the reference and are lost or diverged now, or
// whose ZNCC is below MinZNCC.
type Thresholds struct {
	K        float64 `json:"k_mad"`
	Absolute float64 `json:"absolute"`
	MinZNCC  float64 `json:"min_zncc"`
	// MinCells is the smallest zone, in grid points (default 4).
	MinCells int `json:"min_cells"`
}

// Effective returns the thresholds with defaults filled in (K 6, MinZNCC
// 0.9, MinCells 4), as they are applied.
func (t Thresholds) Effective() Thresholds { return t.withDefaults() }

func (t Thresholds) withDefaults() Thresholds {
	if t.K == 0 {
		t.K = 6
	}
	if t.MinZNCC == 0 {
		t.MinZNCC = 0.9
	}
	if t.MinCells == 0 {
		t.MinCells = 4
	}
	return t
}

// marks returns the points of a frame that pass the indicator's threshold,
// each point's indicator value, the threshold (the bar; +Inf for a frame
// with too few points, 0 for decorrelation, whose bar is its rule) and the
// frame's robust spread of the indicator (0 where there is none). floor is the indicator's noise floor
// (see NoiseFloors): the bar is never below it, so that a frame whose
// scatter is round-off does not mark round-off. scale, if not nil, is each
// point's own noise relative to the face's (at least 1, see pointScale):
// a point is marked when its excess over the median passes the bar's
// excess times its scale.
func (t Thresholds) marks(ind Indicator, bl Baseline, sf *Field, disp, ref *dic.Field, stress, floor float64, scale []float64) (marked []bool, value []float64, bar, sigma float64) {
	t = t.withDefaults()
	n := len(sf.Points)
	marked, value = make([]bool, n), make([]float64, n)
	if ind == Decorrelation {
		for i := 0; i < n && disp != nil; i++ {
			if v, ok := t.value(ind, bl, sf, disp, ref, i, stress); ok && v > 0 {
				marked[i], value[i] = true, v
			}
		}
		return marked, value, 0, 0
	}
	var vals []float64
	have := make([]bool, n)
	for i := 0; i < n; i++ {
		v, ok := t.value(ind, bl, sf, disp, ref, i, stress)
		if !ok {
			continue
		}
		value[i], have[i] = v, true
		vals = append(vals, v)
	}
	if len(vals) < 8 {
		return marked, value, math.Inf(1), 0
	}
	med, sigma := robustSpread(vals)
	excess := math.Max(math.Max(t.Absolute, floor), t.K*sigma)
	bar = med + excess
	for i := 0; i < n; i++ {
		e := excess
		if scale != nil {
			e *= scale[i]
		}
		marked[i] = have[i] && value[i] > med+e
	}
	return marked, value, bar, sigma
}

// value is the indicator's value at point i of a frame: for the strain
// indicators, of the inelastic strain (the residual from the elastic
// baseline), false where there is none; for decorrelation, 1 for a point
// measured in the reference and lost or diverged now, 1 − ZNCC below the
// decorrelation limit, else 0 (false where the point was never measured).
func (t Thresholds) value(ind Indicator, bl Baseline, sf *Field, disp, ref *dic.Field, i int, stress float64) (float64, bool) {
	if ind == Decorrelation {
		if disp == nil || (ref != nil && !ref.Points[i].Valid()) {
			return 0, false // never measured: not decorrelation
		}
		p := &disp.Points[i]
		switch {
		case p.Status == subset.Lost || p.Status == subset.Diverged:
			return 1, true
		case p.Valid() && p.ZNCC < t.MinZNCC:
			return 1 - p.ZNCC, true
		}
		return 0, true
	}
	r, ok := bl.Residual(sf, i, stress)
	if !ok {
		return 0, false
	}
	return ind.value(r), true
}

// robustSpread returns the median of xs and their robust standard
// deviation, 1.4826 × the median absolute deviation (the factor makes it
// the standard deviation for Gaussian data; Rousseeuw and Croux 1993,
// JASA 88).
func robustSpread(xs []float64) (med, sigma float64) {
	med = medianOf(xs)
	dev := make([]float64, len(xs))
	for k, x := range xs {
		dev[k] = math.Abs(x - med)
	}
	return med, 1.4826 * medianOf(dev)
}

func medianOf(xs []float64) float64 {
	s := slices.Clone(xs)
	slices.Sort(s)
	n := len(s)
	if n%2 == 1 {
		return s[n/2]
	}
	return (s[n/2-1] + s[n/2]) / 2
}

// describe builds the zones of the marked points of one frame.
func (t Thresholds) describe(ind Indicator, g dic.Grid, marked []bool, value []float64, frame int, geo *geometry, scale dic.Scale) []Zone {
	t = t.withDefaults()
	var zones []Zone
	for _, cells := range components(g, marked) {
		if len(cells) < t.MinCells {
			continue
		}
		z := Zone{Frame: frame, Indicator: ind, Cells: cells, Opening: -1, Sector: Other}
		step := float64(g.Step)
		z.AreaPx2 = float64(len(cells)) * step * step
		if scale.Known() {
			z.AreaMM2 = z.AreaPx2 * float64(scale) * float64(scale)
		}
		var sx, sy float64
		for _, c := range cells {
			x, y := g.Pos(c)
			sx, sy = sx+float64(x), sy+float64(y)
			z.Peak = math.Max(z.Peak, value[c])
		}
		n := float64(len(cells))
		z.Cx, z.Cy = sx/n, sy/n
		var sxx, syy, sxy float64
		for _, c := range cells {
			x, y := g.Pos(c)
			dx, dy := float64(x)-z.Cx, float64(y)-z.Cy
			sxx, syy, sxy = sxx+dx*dx, syy+dy*dy, sxy+dx*dy
		}
		_, _, z.OrientationDeg = Principal(sxx, syy, sxy)
		if geo != nil {
			geo.place(&z)
		}
		zones = append(zones, z)
	}
	return zones
}

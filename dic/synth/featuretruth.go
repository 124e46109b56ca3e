package synth

import (
	"fmt"
	"math"
	"runtime"
	"sync"

	"spallscope/dic"
	"spallscope/dic/sector"
	"spallscope/subset"
)

// Feature kinds in FeatureTruth.
const (
	FeatureBand  = "band"
	FeatureCrack = "crack"
	FeatureNotch = "notch"
	FeatureSpall = "spall"
)

// Detection is the measurement a feature's truth is stated for: the
// virtual strain gauge the strain stage differentiates over (strain window
// × step, px) and the detection limit, the smallest localized strain the
// run can tell from noise (e.g. its noise floor × K).
type Detection struct {
	VSG   int     `json:"vsg_px"`
	Limit float64 `json:"limit"`
}

// DefaultDetection is the detection a truth file states when the scenario
// names none: a 9-point strain window at an 8 px step (72 px) and a limit
// of 1000 µε in γmax — round numbers of our own, not of any run; a run's
// own limit is applied to the VSG curve with FeatureTruth.FirstAbove.
var DefaultDetection = Detection{VSG: 72, Limit: 1e-3}

// FeatureTruth is what is exactly known about one damage feature of a
// scenario (a band, crack or notch field, or a spalled patch): when it
// starts, the first frame at which any method could see it, and where.
//
// The feature's own strain is that of its displacement field alone,
// without the elastic field and the other features. VSGGamma[f] is the
// largest, over all positions of a square VSG window of side VSG px
// (corners on the pixel lattice, wholly inside the image), of γmax = E1 −
// E2 of the window's mean displacement gradient; MaxGamma[f] is the
// largest pointwise γmax of the feature's own gradient on the pixel
// lattice. Both count only rock (points outside the openings). The window
// mean is computed from the displacement sampled at every pixel: the mean
// of each gradient component over the window is the mean of the 1 px
// differences along the lattice links inside it whose two ends are rock
// (over a window of rock only, by Green's theorem, the mean gradient
// itself; a crack's jump w across it counts as w/VSG), and a window needs
// at least half its links in rock, as the strain window needs half its
// points. MaxGamma, from the analytic gradient of each side, leaves a
// crack's jump out.
//
// DetectableFrame is the first frame whose VSGGamma exceeds Limit (−1:
// never). Two placements of the windows (Placement): at every pixel
// (Scenario.FeatureTruth), the most favourable grid, so the detectable
// frame is the earliest any method with that VSG and limit could report;
// or centred on the points of one measurement grid
// (Scenario.FeatureTruthOnGrid), which is the earliest a run that
// measures strain only at those points could report — a young feature
// between two grid points reaches the limit later there. Score a run
// against its own grid's truth; the every-pixel truth bounds any grid. A spalled patch has no displacement of its own: it shows as
// fresh, uncorrelated texture from its frame, which is its hidden start
// and its detectable frame; its gamma curves are empty.
type FeatureTruth struct {
	// Feature names it: kind and index, e.g. "notch 1" (Scenario.Fields[1])
	// or "spall 0" (Scenario.Spalls[0]).
	Feature string `json:"feature"`
	Kind    string `json:"kind"`
	Field   int    `json:"field"` // index into Scenario.Fields, −1 for a spall
	Spall   int    `json:"spall"` // index into Scenario.Spalls, −1 for a field
	// X, Y is where the feature starts (its mouth or apex, 2 px into the
	// rock towards its tip; an embedded feature's middle; a patch's
	// centre), the point its sector is taken at.
	X float64 `json:"x_px"`
	Y float64 `json:"y_px"`
	// Opening (index into Scenario.Openings, −1 for none), Sector and
	// Wall are the place of (X, Y) by package sector's rule (load axis
	// vertical): in a pillar, Wall is the pillar's wall of that opening.
	Opening int           `json:"opening"`
	Sector  sector.Sector `json:"sector"`
	Wall    sector.Sector `json:"wall"`
	// HiddenStart is the first frame at which the feature has any motion
	// (a growth drive's start_frame + 1) or a patch has spalled.
	HiddenStart     int     `json:"hidden_start_frame"`
	DetectableFrame int     `json:"detectable_frame"`
	VSG             int     `json:"vsg_px"`
	Limit           float64 `json:"limit"`
	// Grid is the placement of the windows: nil at every pixel.
	Grid *Placement `json:"window_grid,omitempty"`
	// PeakX, PeakY is the centre of the window of largest γmax at the
	// detectable frame (the feature's position there; 0 when never).
	PeakX    float64   `json:"peak_x_px"`
	PeakY    float64   `json:"peak_y_px"`
	MaxGamma []float64 `json:"max_gamma,omitempty"`
	VSGGamma []float64 `json:"vsg_gamma,omitempty"`
}

// FirstAbove returns the first frame whose VSGGamma exceeds limit, −1 if
// none (a spall: its hidden start): the detectable frame for another
// detection limit at the same VSG.
func (ft FeatureTruth) FirstAbove(limit float64) int {
	if ft.Kind == FeatureSpall {
		return ft.HiddenStart
	}
	for f, g := range ft.VSGGamma {
		if g > limit {
			return f
		}
	}
	return -1
}

// Placement is a measurement grid the truth's windows are centred on:
// points at X0 + i·Step, Y0 + j·Step px (dic.Grid's lattice). A window of
// side VSG centred on a point (x, y) spans [x − ⌊VSG/2⌋, x − ⌊VSG/2⌋ + VSG]
// (half a pixel right of and below the point for an odd VSG, since its
// corners lie on the pixel lattice).
type Placement struct {
	X0   int `json:"x0_px"`
	Y0   int `json:"y0_px"`
	Step int `json:"step_px"`
}

// FeatureTruth returns the truth of every damage feature of the scenario
// (band, crack and notch fields in order, then spalled patches) for a VSG
// of vsg px and a detection limit in γmax, with windows at every pixel
// (see the type). It samples each feature's field at every pixel of every
// frame whose magnitude changed, features in parallel.
func (sc *Scenario) FeatureTruth(vsg int, limit float64) ([]FeatureTruth, error) {
	return sc.featureTruth(vsg, limit, nil)
}

// FeatureTruthOnGrid is FeatureTruth with the windows centred on the
// points of grid only: the truth a run measuring on that grid is scored
// against (see the type).
func (sc *Scenario) FeatureTruthOnGrid(vsg int, limit float64, grid Placement) ([]FeatureTruth, error) {
	if grid.Step < 1 {
		return nil, fmt.Errorf("feature truth: grid step %d px, expected at least 1 px", grid.Step)
	}
	return sc.featureTruth(vsg, limit, &grid)
}

func (sc *Scenario) featureTruth(vsg int, limit float64, grid *Placement) ([]FeatureTruth, error) {
	if vsg < 2 || vsg >= sc.Width || vsg >= sc.Height {
		return nil, fmt.Errorf("feature truth: VSG %d px, expected 2 px up to less than the %dx%d image", vsg, sc.Width, sc.Height)
	}
	if !(limit > 0) || math.IsInf(limit, 0) {
		return nil, fmt.Errorf("feature truth: detection limit %g, expected a positive strain", limit)
	}
	layout := sector.Layout{}
	for _, o := range sc.Openings {
		layout.Openings = append(layout.Openings, sector.Opening{Shape: o})
	}
	var out []FeatureTruth
	for i, f := range sc.Fields {
		kind, x, y, ok := damageKind(f)
		if !ok {
			continue
		}
		ft := FeatureTruth{Feature: fmt.Sprintf("%s %d", kind, i), Kind: kind, Field: i, Spall: -1, X: x, Y: y,
			HiddenStart: -1, DetectableFrame: -1, VSG: vsg, Limit: limit, Grid: grid}
		for fr := 0; fr < sc.Frames; fr++ {
			if sc.Factor(i, fr) > 0 {
				ft.HiddenStart = fr
				break
			}
		}
		out = append(out, ft)
	}
	for i, s := range sc.Spalls {
		out = append(out, FeatureTruth{Feature: fmt.Sprintf("%s %d", FeatureSpall, i), Kind: FeatureSpall, Field: -1, Spall: i,
			X: s.Region.Cx, Y: s.Region.Cy, HiddenStart: s.Frame, DetectableFrame: s.Frame, VSG: vsg, Limit: limit, Grid: grid})
	}
	var rock []bool // the pixel lattice's rock (outside the openings), for the fields
	if len(out) > len(sc.Spalls) {
		rock = make([]bool, sc.Width*sc.Height)
		for y := 0; y < sc.Height; y++ {
			for x := 0; x < sc.Width; x++ {
				rock[y*sc.Width+x] = sc.Material(float64(x), float64(y), 0)
			}
		}
	}
	var wg sync.WaitGroup
	slots := make(chan struct{}, runtime.GOMAXPROCS(0)) // memory: eight tables of the image per feature
	for k := range out {
		ft := &out[k]
		p := layout.Locate(ft.X, ft.Y)
		ft.Opening, ft.Sector, ft.Wall = p.Opening, p.Sector, p.Wall
		if ft.Kind == FeatureSpall {
			continue
		}
		wg.Go(func() {
			slots <- struct{}{}
			sc.featureCurves(ft, rock)
			<-slots
		})
	}
	wg.Wait()
	return out, nil
}

// damageKind returns the feature kind of a damage field and the point it
// starts at; ok is false for the other fields (elastic, rigid, ...).
func damageKind(f FieldSpec) (kind string, x, y float64, ok bool) {
	into := func(x0, y0, x1, y1 float64, embedded bool) (float64, float64) {
		if embedded {
			return (x0 + x1) / 2, (y0 + y1) / 2
		}
		l := math.Hypot(x1-x0, y1-y0)
		if l == 0 {
			return x0, y0
		}
		return x0 + 2*(x1-x0)/l, y0 + 2*(y1-y0)/l
	}
	switch {
	case f.Band != nil:
		b := f.Band
		x, y = into(b.X0, b.Y0, b.X1, b.Y1, b.Embedded)
		return FeatureBand, x, y, true
	case f.Crack != nil:
		c := f.Crack
		x, y = into(c.X0, c.Y0, c.X1, c.Y1, c.Embedded)
		return FeatureCrack, x, y, true
	case f.Notch != nil:
		n := f.Notch
		// Along the bisector of the arms: the sum of their unit vectors.
		l1, l2 := math.Hypot(n.X1-n.X0, n.Y1-n.Y0), math.Hypot(n.X2-n.X0, n.Y2-n.Y0)
		bx, by := 0.0, 0.0
		if l1 > 0 && l2 > 0 {
			bx, by = (n.X1-n.X0)/l1+(n.X2-n.X0)/l2, (n.Y1-n.Y0)/l1+(n.Y2-n.Y0)/l2
		}
		x, y = into(n.X0, n.Y0, n.X0+bx, n.Y0+by, false)
		return FeatureNotch, x, y, true
	}
	return "", 0, 0, false
}

// featureCurves fills ft's MaxGamma, VSGGamma, DetectableFrame and peak.
func (sc *Scenario) featureCurves(ft *FeatureTruth, rock []bool) {
	spec := sc.Fields[ft.Field]
	ft.MaxGamma = make([]float64, sc.Frames)
	ft.VSGGamma = make([]float64, sc.Frames)
	w := newWindowMeans(sc.Width, sc.Height, rock)
	prev := 0.0
	peakX, peakY := make([]float64, sc.Frames), make([]float64, sc.Frames)
	for f := 0; f < sc.Frames; f++ {
		g := sc.Factor(ft.Field, f)
		switch {
		case g == 0:
			// no motion: the curves stay 0
		case f > 0 && g == prev:
			ft.MaxGamma[f], ft.VSGGamma[f], peakX[f], peakY[f] = ft.MaxGamma[f-1], ft.VSGGamma[f-1], peakX[f-1], peakY[f-1]
		default:
			ft.MaxGamma[f] = w.sample(spec.scalable().Scaled(g))
			ft.VSGGamma[f], peakX[f], peakY[f] = w.maxMean(ft.VSG, ft.Grid)
		}
		prev = g
	}
	ft.DetectableFrame = ft.FirstAbove(ft.Limit)
	if f := ft.DetectableFrame; f >= 0 {
		ft.PeakX, ft.PeakY = peakX[f], peakY[f]
	}
}

// gammaMax returns E1 − E2 of the small-strain tensor of a displacement
// gradient: √((εxx − εyy)² + 4εxy²) with εxy = (uy + vx)/2 (principal
// strains of a symmetric 2×2 tensor, common practice, no source).
func gammaMax(ux, uy, vx, vy float64) float64 { return math.Hypot(ux-vy, uy+vx) }

// windowMeans holds one feature's displacement on the pixel lattice and
// summed-area tables of its 1 px link differences, for the mean gradient
// over any window.
type windowMeans struct {
	w, h int
	rock []bool
	u, v []float64
	// Summed-area tables ((w+1)×(h+1), sat[(y+1)(w+1)+x+1] = Σ over links
	// starting at x' ≤ x, y' ≤ y) of the horizontal links' du, dv and
	// count, and the vertical links'.
	hu, hv, hn, vu, vv, vn []float64
}

func newWindowMeans(w, h int, rock []bool) *windowMeans {
	n := (w + 1) * (h + 1)
	return &windowMeans{w: w, h: h, rock: rock, u: make([]float64, w*h), v: make([]float64, w*h),
		hu: make([]float64, n), hv: make([]float64, n), hn: make([]float64, n),
		vu: make([]float64, n), vv: make([]float64, n), vn: make([]float64, n)}
}

// sample evaluates field at every pixel, builds the link tables and
// returns the largest pointwise γmax on rock.
func (m *windowMeans) sample(field Field) float64 {
	most := 0.0
	for y := 0; y < m.h; y++ {
		for x := 0; x < m.w; x++ {
			mo := field.At(float64(x), float64(y))
			k := y*m.w + x
			m.u[k], m.v[k] = mo.U, mo.V
			if m.rock[k] {
				most = math.Max(most, gammaMax(mo.UX, mo.UY, mo.VX, mo.VY))
			}
		}
	}
	s := m.w + 1
	for y := 0; y < m.h; y++ {
		var rhu, rhv, rhn, rvu, rvv, rvn float64 // running sums along the row
		for x := 0; x < m.w; x++ {
			k := y*m.w + x
			if x+1 < m.w && m.rock[k] && m.rock[k+1] {
				rhu, rhv, rhn = rhu+m.u[k+1]-m.u[k], rhv+m.v[k+1]-m.v[k], rhn+1
			}
			if y+1 < m.h && m.rock[k] && m.rock[k+m.w] {
				rvu, rvv, rvn = rvu+m.u[k+m.w]-m.u[k], rvv+m.v[k+m.w]-m.v[k], rvn+1
			}
			i, up := (y+1)*s+x+1, y*s+x+1
			m.hu[i], m.hv[i], m.hn[i] = m.hu[up]+rhu, m.hv[up]+rhv, m.hn[up]+rhn
			m.vu[i], m.vv[i], m.vn[i] = m.vu[up]+rvu, m.vv[up]+rvv, m.vn[up]+rvn
		}
	}
	return most
}

// box sums table t over link origins x0 ≤ x ≤ x1, y0 ≤ y ≤ y1.
func (m *windowMeans) box(t []float64, x0, y0, x1, y1 int) float64 {
	s := m.w + 1
	return t[(y1+1)*s+x1+1] - t[y0*s+x1+1] - t[(y1+1)*s+x0] + t[y0*s+x0]
}

// maxMean returns the largest γmax of the mean gradient over the windows
// [x0, x0+vsg] × [y0, y0+vsg] inside the image with at least half of
// their links on rock, and that window's centre: every such window, or
// with a grid those centred on its points (see Placement).
func (m *windowMeans) maxMean(vsg int, grid *Placement) (best, cx, cy float64) {
	full := float64(vsg * (vsg + 1)) // links of each direction in a window
	ox, oy, step := 0, 0, 1
	if grid != nil {
		// The first window origins at or after 0 of the grid's points.
		step = grid.Step
		ox, oy = ((grid.X0-vsg/2)%step+step)%step, ((grid.Y0-vsg/2)%step+step)%step
	}
	for y0 := oy; y0+vsg < m.h; y0 += step {
		for x0 := ox; x0+vsg < m.w; x0 += step {
			x1, y1 := x0+vsg, y0+vsg
			// Horizontal links start at x0..x1−1 on rows y0..y1; vertical
			// ones at columns x0..x1 on rows y0..y1−1.
			nh := m.box(m.hn, x0, y0, x1-1, y1)
			nv := m.box(m.vn, x0, y0, x1, y1-1)
			if 2*nh < full || 2*nv < full {
				continue
			}
			ux, vx := m.box(m.hu, x0, y0, x1-1, y1)/nh, m.box(m.hv, x0, y0, x1-1, y1)/nh
			uy, vy := m.box(m.vu, x0, y0, x1, y1-1)/nv, m.box(m.vv, x0, y0, x1, y1-1)/nv
			if g := gammaMax(ux, uy, vx, vy); g > best {
				best, cx, cy = g, float64(x0)+float64(vsg)/2, float64(y0)+float64(vsg)/2
			}
		}
	}
	return best, cx, cy
}

// FeatureFieldOnGrid returns damage field i's own displacement at frame —
// Scenario.Fields[i] alone at its drive's factor, without the elastic
// field, the other features and noise — at the points of grid g, as a
// tracked field would hold it: the exact displacement a run on that grid
// would measure of that feature alone. A point is masked where measured
// (one flag per grid point; nil: every point) is false or it lies off the
// rock (in an opening). A frame before the feature moves gives zero
// displacement at the measured points. This is the input of the strain
// layer's truth through the run's own strain window (strain.KernelTruth).
//
// subsetSize ≤ 1 samples the displacement at the grid points, as a field
// of exact point values (the seed tests' runs) is; a larger odd size gives
// each point the mean displacement over the rock pixels of the square
// subset of that side centred on it, clipped to the image: what a subset
// with a first-order shape function reports of a field that varies inside
// it, to first order — the least-squares affine fit of the field over the
// subset, whose value at the centre is the subset mean on a symmetric
// subset, with the pattern's gradients taken as uniform (Schreier and
// Sutton 2002, Exp. Mech. 42, 303–310, on undermatched shape functions;
// from memory).
func (sc *Scenario) FeatureFieldOnGrid(i, frame int, g dic.Grid, measured []bool, subsetSize int) (*dic.Field, error) {
	if i < 0 || i >= len(sc.Fields) {
		return nil, fmt.Errorf("feature field: field %d, expected 0 to %d", i, len(sc.Fields)-1)
	}
	if _, _, _, ok := damageKind(sc.Fields[i]); !ok {
		return nil, fmt.Errorf("feature field: field %d is not a damage feature (band, crack or notch)", i)
	}
	if frame < 0 || frame >= sc.Frames {
		return nil, fmt.Errorf("feature field: frame %d, expected 0 to %d", frame, sc.Frames-1)
	}
	if measured != nil && len(measured) != g.Len() {
		return nil, fmt.Errorf("feature field: %d measured flags for a %dx%d grid, expected %d", len(measured), g.Cols, g.Rows, g.Len())
	}
	if subsetSize > 1 && subsetSize%2 == 0 {
		return nil, fmt.Errorf("feature field: subset %d px, expected an odd size", subsetSize)
	}
	var field Field
	if s := sc.Factor(i, frame); s > 0 {
		field = sc.Fields[i].scalable().Scaled(s)
		if subsetSize > 1 {
			field = sc.subsetMeans(field, subsetSize)
		}
	}
	out := &dic.Field{Index: frame, Name: sc.FrameName(frame), Grid: g, Points: make([]dic.Point, g.Len())}
	for k := range out.Points {
		x, y := g.Pos(k)
		p := &out.Points[k]
		p.X, p.Y = x, y
		if (measured != nil && !measured[k]) || !sc.Material(float64(x), float64(y), 0) {
			p.Status = subset.Masked
			continue
		}
		p.Status, p.ZNCC = subset.Converged, 1
		if field != nil {
			m := field.At(float64(x), float64(y))
			p.P[subset.PU], p.P[subset.PV] = m.U, m.V
		}
	}
	return out, nil
}

// FeatureBoxGammaOnGrid returns, per point of grid g, the box-mean truth
// of damage field i at frame: γmax of the feature's own mean displacement
// gradient over the square VSG window centred on the point (the windows of
// FeatureTruthOnGrid, see Placement), NaN where that window leaves the
// image or holds less than half its links in rock. It is FeatureTruthOnGrid's
// value cell by cell, for comparison with a strain window's response.
func (sc *Scenario) FeatureBoxGammaOnGrid(i, frame, vsg int, g dic.Grid) ([]float64, error) {
	if vsg < 2 || vsg >= sc.Width || vsg >= sc.Height {
		return nil, fmt.Errorf("feature box truth: VSG %d px, expected 2 px up to less than the %dx%d image", vsg, sc.Width, sc.Height)
	}
	if i < 0 || i >= len(sc.Fields) {
		return nil, fmt.Errorf("feature box truth: field %d, expected 0 to %d", i, len(sc.Fields)-1)
	}
	if frame < 0 || frame >= sc.Frames {
		return nil, fmt.Errorf("feature box truth: frame %d, expected 0 to %d", frame, sc.Frames-1)
	}
	out := make([]float64, g.Len())
	for k := range out {
		out[k] = math.NaN()
	}
	s := sc.Factor(i, frame)
	rock := make([]bool, sc.Width*sc.Height)
	for y := 0; y < sc.Height; y++ {
		for x := 0; x < sc.Width; x++ {
			rock[y*sc.Width+x] = sc.Material(float64(x), float64(y), 0)
		}
	}
	m := newWindowMeans(sc.Width, sc.Height, rock)
	var field Field = Sum{} // no motion before the feature moves
	if s > 0 {
		field = sc.Fields[i].scalable().Scaled(s)
	}
	m.sample(field)
	full := float64(vsg * (vsg + 1))
	for k := range out {
		px, py := g.Pos(k)
		x0, y0 := px-vsg/2, py-vsg/2
		x1, y1 := x0+vsg, y0+vsg
		if x0 < 0 || y0 < 0 || x1 >= m.w || y1 >= m.h {
			continue
		}
		nh, nv := m.box(m.hn, x0, y0, x1-1, y1), m.box(m.vn, x0, y0, x1, y1-1)
		if 2*nh < full || 2*nv < full {
			continue
		}
		ux, vx := m.box(m.hu, x0, y0, x1-1, y1)/nh, m.box(m.hv, x0, y0, x1-1, y1)/nh
		uy, vy := m.box(m.vu, x0, y0, x1, y1-1)/nv, m.box(m.vv, x0, y0, x1, y1-1)/nv
		out[k] = gammaMax(ux, uy, vx, vy)
	}
	return out, nil
}

// subsetMean is a field's mean displacement over the rock pixels of the
// square subset centred on a pixel (summed-area tables of the field
// sampled at every pixel); At takes the nearest pixel.
type subsetMean struct {
	w, h, half int
	su, sv, sn []float64 // (w+1)×(h+1) summed-area tables
}

func (sc *Scenario) subsetMeans(field Field, size int) subsetMean {
	w, h := sc.Width, sc.Height
	m := subsetMean{w: w, h: h, half: size / 2, su: make([]float64, (w+1)*(h+1)), sv: make([]float64, (w+1)*(h+1)), sn: make([]float64, (w+1)*(h+1))}
	s := w + 1
	for y := 0; y < h; y++ {
		var ru, rv, rn float64
		for x := 0; x < w; x++ {
			if sc.Material(float64(x), float64(y), 0) {
				mo := field.At(float64(x), float64(y))
				ru, rv, rn = ru+mo.U, rv+mo.V, rn+1
			}
			i, up := (y+1)*s+x+1, y*s+x+1
			m.su[i], m.sv[i], m.sn[i] = m.su[up]+ru, m.sv[up]+rv, m.sn[up]+rn
		}
	}
	return m
}

// At returns the mean displacement of the subset centred on the pixel
// nearest (x, y); its gradients are left zero (only U and V are read).
func (m subsetMean) At(x, y float64) Motion {
	cx, cy := int(math.Round(x)), int(math.Round(y))
	x0, y0 := max(cx-m.half, 0), max(cy-m.half, 0)
	x1, y1 := min(cx+m.half, m.w-1), min(cy+m.half, m.h-1)
	if x0 > x1 || y0 > y1 {
		return Motion{}
	}
	s := m.w + 1
	box := func(t []float64) float64 {
		return t[(y1+1)*s+x1+1] - t[y0*s+x1+1] - t[(y1+1)*s+x0] + t[y0*s+x0]
	}
	n := box(m.sn)
	if n == 0 {
		return Motion{}
	}
	return Motion{U: box(m.su) / n, V: box(m.sv) / n}
}

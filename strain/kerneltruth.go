package strain

import (
	"fmt"
	"math"

	"spallscope/dic"
	"spallscope/subset"
)

// KernelTruth is a damage feature's own strain as a run measures it with
// its strain window, without noise: the feature's exact displacement
// alone (no elastic field, no other feature), sampled at the run's grid
// points where the run measured, differentiated by the run's own strain
// window (Window.Strain: the same least-squares fit, the same one-sided
// windows at walls and edges), and an indicator of that strain at every
// point of every frame.
//
// It is the truth an onset is scored against, because it is the earliest
// frame a run with this strain window, grid and VSG could report. The
// window is linear in the displacement, and its point set is the run's,
// so the strain a run measures at a point is the window's response to the
// elastic field, plus its response to the feature, plus its response to
// the noise. The elastic baseline takes out the first and the noise has
// zero mean, so the feature's mean signal at that point is the response
// to the feature alone: a frame at which that is below the detection
// limit at every point is a frame at which no estimator on this run can
// tell the feature from noise, and the first frame at which it exceeds
// the limit somewhere is the first at which one could.
//
// The box mean of the exact gradient over the VSG (synth's
// FeatureTruthOnGrid) is another kernel. By summation by parts the
// window's least-squares slope of a displacement profile u along x is
// Σ_i k_i·(u_{i+1} − u_i) with k_i = Σ_{j>i} x_j / Σ_j x_j² (x_j the
// window's point offsets in steps, −h…h, h = (Size − 1)/2): a weighted
// mean of the displacement's differences between neighbouring points,
// the weights a stepped parabola over the (Size − 1) steps that sums to 1
// (Savitzky and Golay 1964, Anal. Chem. 36, 1627: the first-derivative
// filter of a plane fit; the weights from memory, derived here). A jump
// s between the two middle points thus reads s·3/(2·Size·step) — for 7
// points at 8 px, s/37.3 px, where the 69 px box reads s/69 px — and a
// jump between the outermost pair reads s·6/(Size·(Size+1)·step), s/74.7
// px: the kernel sees a narrow feature near a grid point earlier, and one
// near the window's rim later, than the box. What the kernel leaves out
// is the correlation subset's own averaging, which the sampling of the
// feature's displacement (synth's FeatureFieldOnGrid) may add.
type KernelTruth struct {
	Indicator Indicator
	// Values[f][i] is the indicator of the feature's own strain at grid
	// point i in frame f (NaN where the window gives no strain).
	Values [][]float64
	// Max[f] is the largest of Values[f], at point Peak[f] (−1: none).
	Max  []float64
	Peak []int
	// Gain[i] is the window's noise gain at point i: the standard
	// deviation of its displacement gradient for independent displacement
	// noise of equal variance at every point, relative to a full window's
	// (1 on a full window, more on the one-sided ones at walls and edges;
	// NaN where there is no strain). The least-squares slope is a weighted
	// sum Σ_j w_j·u_j, so its variance is σ²·Σ_j w_j²; Gain is
	// √((Σ w_x² + Σ w_y²) / (2·Σ w_full²)) over the slopes along x and y.
	Gain []float64
}

// KernelTruth passes a feature's own displacement fields through the
// window: fields[f] is frame f's (nil: no motion, zero strain wherever
// the first non-nil field's points are valid), on the run's grid with the
// run's measured points valid. ind is the indicator the onset is scored
// on (not decorrelation, which has no strain).
func (w Window) KernelTruth(fields []*dic.Field, ind Indicator) (KernelTruth, error) {
	if ind == Decorrelation {
		return KernelTruth{}, fmt.Errorf("kernel truth: indicator %s has no strain, expected e1, e_eq or gamma_max", ind)
	}
	var ref *dic.Field
	for _, f := range fields {
		if f != nil {
			ref = f
			break
		}
	}
	if ref == nil {
		return KernelTruth{}, fmt.Errorf("kernel truth: %d frames without a displacement field, expected at least one", len(fields))
	}
	kt := KernelTruth{Indicator: ind, Values: make([][]float64, len(fields)), Max: make([]float64, len(fields)), Peak: make([]int, len(fields))}
	for f, df := range fields {
		if df == nil {
			// No motion: zero strain where the window gives strain.
			df = atRest(ref)
			df.Index = f
		}
		if df.Grid != ref.Grid {
			return KernelTruth{}, fmt.Errorf("kernel truth: frame %d on a %dx%d grid at step %d, expected frame %d's %dx%d at step %d", f, df.Grid.Cols, df.Grid.Rows, df.Grid.Step, ref.Index, ref.Grid.Cols, ref.Grid.Rows, ref.Grid.Step)
		}
		sf, err := w.Strain(df)
		if err != nil {
			return KernelTruth{}, fmt.Errorf("kernel truth: frame %d: %w", f, err)
		}
		vals := make([]float64, len(sf.Points))
		best, at := 0.0, -1
		for i := range sf.Points {
			p := &sf.Points[i]
			if !p.Valid {
				vals[i] = math.NaN()
				continue
			}
			vals[i] = ind.value(Tensor{p.Exx, p.Eyy, p.Exy})
			if at < 0 || vals[i] > best {
				best, at = vals[i], i
			}
		}
		kt.Values[f], kt.Max[f], kt.Peak[f] = vals, best, at
	}
	gain, err := w.noiseGain(ref)
	if err != nil {
		return KernelTruth{}, err
	}
	kt.Gain = gain
	return kt, nil
}

// noiseGain is the window's noise gain at every point of ref's grid (see
// KernelTruth.Gain). The weights w_j come from the window itself: a field
// of unit impulses in u at points Size apart in both directions puts at
// most one impulse into any window, so each window's gradient is its
// weight of that impulse; Size² such fields cover every point once, and
// the squared gradients summed over them are Σ w_j² (for the slopes along
// x and y; v has the same design). The window is taken with engineering
// strain for this, whose gradient is linear in the displacement.
func (w Window) noiseGain(ref *dic.Field) ([]float64, error) {
	w.Measure = Engineering
	g := ref.Grid
	n := g.Len()
	sx, sy := make([]float64, n), make([]float64, n)
	probe := atRest(ref)
	for oy := range w.Size {
		for ox := range w.Size {
			for i := range probe.Points {
				c, r := i%g.Cols, i/g.Cols
				probe.Points[i].P = subset.Params{}
				if c%w.Size == ox && r%w.Size == oy {
					probe.Points[i].P[subset.PU] = 1
				}
			}
			sf, err := w.Strain(probe)
			if err != nil {
				return nil, fmt.Errorf("kernel truth: noise gain: %w", err)
			}
			for i := range sf.Points {
				p := &sf.Points[i]
				sx[i] += p.Exx * p.Exx
				sy[i] += 4 * p.Exy * p.Exy // ∂u/∂y = 2·exy with v = 0
			}
		}
	}
	// A full window: Σ w² = 1 / (Size · Σdx² · step²) for either slope.
	half := w.Size / 2
	var sxx float64
	for d := -half; d <= half; d++ {
		sxx += float64(d * d)
	}
	step := float64(g.Step)
	full := 1 / (float64(w.Size) * sxx * step * step)
	gain := make([]float64, n)
	for i := range gain {
		gain[i] = math.NaN()
		if ref.Points[i].Valid() {
			if v := (sx[i] + sy[i]) / (2 * full); v > 0 {
				gain[i] = math.Sqrt(v)
			}
		}
	}
	return gain, nil
}

// FirstAboveScale is FirstAbove with each point's limit raised as the
// run raised its bar there: limit·max(1, scale[i]), scale the run's
// measured noise scale (Finder.NoiseScale: each point's noise over the
// calibration frames relative to the face's), one value a grid point. A
// run sees the feature at a point only above that point's bar, so this
// is the earliest frame the run could report it. NaN scale: the point had
// no bar (it is skipped). An error when scale is not one value a point.
func (kt KernelTruth) FirstAboveScale(limit float64, scale []float64) (int, error) {
	for f, vals := range kt.Values {
		if len(scale) != len(vals) {
			return -1, fmt.Errorf("kernel truth: %d noise scales for frame %d's %d grid points, expected one a point", len(scale), f, len(vals))
		}
		for i, v := range vals {
			if !math.IsNaN(v) && !math.IsNaN(scale[i]) && v > limit*math.Max(1, scale[i]) {
				return f, nil
			}
		}
	}
	return -1, nil
}

// FirstAboveNoise is FirstAbove with each point's limit scaled by its
// window's theoretical noise gain (at least 1): limit·max(1, Gain[i]).
// The gain assumes independent displacement noise at every point; a
// tracker's noise is correlated between overlapping neighbouring subsets,
// so the run's measured scale at the one-sided windows is smaller than
// the gain (FirstAboveScale, the run's own bar, is the truth when the run
// recorded it). This is its stand-in for a run that did not.
func (kt KernelTruth) FirstAboveNoise(limit float64) int {
	f, _ := kt.FirstAboveScale(limit, kt.Gain)
	return f
}

// FirstAbove is the kernel truth's detectable frame at a detection limit:
// the first frame whose Max exceeds limit, −1 if none.
func (kt KernelTruth) FirstAbove(limit float64) int {
	for f, m := range kt.Max {
		if m > limit {
			return f
		}
	}
	return -1
}

// atRest is ref's grid and measured points with no displacement: the
// field of a frame in which the feature has not moved, and the probe the
// noise gain sets one point of at a time.
func atRest(ref *dic.Field) *dic.Field {
	f := &dic.Field{Index: ref.Index, Grid: ref.Grid, Points: make([]dic.Point, len(ref.Points))}
	for i, p := range ref.Points {
		f.Points[i] = dic.Point{X: p.X, Y: p.Y, Status: p.Status, ZNCC: p.ZNCC}
	}
	return f
}

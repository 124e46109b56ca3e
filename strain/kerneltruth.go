package strain

import (
	"fmt"
	"math"

	"spallscope/dic"
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
			zero := &dic.Field{Index: f, Grid: ref.Grid, Points: make([]dic.Point, len(ref.Points))}
			for i, p := range ref.Points {
				zero.Points[i] = dic.Point{X: p.X, Y: p.Y, Status: p.Status, ZNCC: p.ZNCC}
			}
			df = zero
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
	return kt, nil
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

package job

import (
	"fmt"
	"math"
	"slices"
	"strings"

	"gonum.org/v1/gonum/stat"

	"spallscope/cmd/spallscope/internal/stage"
	"spallscope/dic/runfolder"
	"spallscope/dic/similarity"
	"spallscope/strain"
	"spallscope/strain/strainfile"
)

// FarFieldReach is how far from an opening, in the opening's half
// diagonals, a point counts as far field for the magnification estimate:
// at three radii of a circular hole the Kirsch solution's stress
// perturbation is down to about a ninth of the far-field stress
// (it falls off as (a/r)²; Kirsch 1898 in the form of Jaeger, Cook and
// Zimmerman 2007, §8.4, from memory).
const FarFieldReach = 3.0

// farFieldKeep reports the points far from every opening (see
// FarFieldReach), the openings in the fields' pixels (the zone stage's,
// undistorted with a lens).
func farFieldKeep(openings []strain.Opening) func(x, y int) bool {
	type disc struct{ cx, cy, r float64 }
	var ds []disc
	for _, o := range openings {
		x0, y0, x1, y1 := o.Shape.Bounds()
		ds = append(ds, disc{(x0 + x1) / 2, (y0 + y1) / 2, FarFieldReach * math.Hypot(x1-x0, y1-y0) / 2})
	}
	return func(x, y int) bool {
		for _, d := range ds {
			if math.Hypot(float64(x)-d.cx, float64(y)-d.cy) < d.r {
				return false
			}
		}
		return true
	}
}

// recordMotion completes run.json's "motion" section before the zones
// are found: the plate's note, or the far field's fit and warning, against
// the noise floor of the "resolution" section (none: no warning). It runs
// with the zones stage, whose calibration frames the far field's elastic
// line uses.
func (r *testRun) recordMotion() error {
	var res *strainfile.ResolutionRecord
	var rr strainfile.ResolutionRecord
	if runfolder.Section(r.out, "resolution", &rr) == nil {
		res = &rr
	}
	if r.tp.plate != nil {
		return plateWarning(r.out, res)
	}
	return r.recordFarFieldMotion(res)
}

// recordFarFieldMotion fits each frame's similarity to the far field of
// run folder dir's fields (no compensation plate) and writes run.json's
// "motion" section, with a warning when the magnification changes by more
// than the strain noise floor res (nil: not known, no warning).
func (r *testRun) recordFarFieldMotion(res *strainfile.ResolutionRecord) error {
	names, err := runfolder.Frames(r.out)
	if err != nil {
		return err
	}
	rec := runfolder.MotionRecord{Source: runfolder.MotionFromFarField, StandoffMM: r.t.StandoffMM}
	w, h := r.tp.in.Width, r.tp.in.Height
	rec.Centre, rec.CentreIs = [2]float64{float64(w-1) / 2, float64(h-1) / 2}, "image centre (no lens file: the principal point of an ideal camera)"
	if r.tp.lens != nil {
		rec.Centre, rec.CentreIs = [2]float64{r.tp.lens.Model.Cx, r.tp.lens.Model.Cy}, "principal point of the lens file"
	}
	keep := farFieldKeep(r.zoneCfg.Finder.Sectors.Openings)
	for _, name := range names {
		f, err := runfolder.ReadField(runfolder.FieldPath(r.out, name))
		if err != nil {
			return err
		}
		f.Name = name
		m, err := similarity.Fit(f, keep)
		if err != nil {
			rec.Unfitted = append(rec.Unfitted, name)
			m = similarity.Motion{Frame: name, Points: m.Points}
		}
		rec.Add(m)
	}
	rec.Baseline = r.elasticMagnification(names, &rec)
	if res != nil {
		rec.Warning = magnificationWarning(&rec, res)
	}
	return runfolder.SetSection(r.out, runfolder.MotionSection, rec)
}

// elasticMagnification fits the far field's magnification as a + b·σ over
// the zone stage's calibration frames (stress up to its calibrate_below
// fraction of the peak, or its first calibrate_frames without a load):
// the same frames each point's elastic response is fitted on, which the
// onset detection takes out of every point. A magnification linear in
// stress goes with it; what departs from the line is what can move an
// onset. nil when the frames' stresses are unknown or too few frames
// calibrate.
func (r *testRun) elasticMagnification(names []string, rec *runfolder.MotionRecord) *runfolder.MotionBaseline {
	if len(r.tp.times) != len(names) {
		return nil
	}
	st := r.zoneCfg.Effective()
	states := stage.FrameStates(names, r.tp.times, r.sigma)
	peak := 0.0
	for _, f := range states {
		peak = math.Max(peak, f.Stress)
	}
	var xs, ys []float64
	for k, f := range states {
		if slices.Contains(rec.Unfitted, names[k]) {
			continue
		}
		if (peak > 0 && f.Stress <= st.CalibrateBelow*peak) || (peak == 0 && k < st.CalibrateFrames) {
			xs, ys = append(xs, f.Stress), append(ys, rec.Frames[k].Magnification)
		}
	}
	if len(xs) < 2 {
		return nil
	}
	b := runfolder.MotionBaseline{Frames: len(xs)}
	if stat.Variance(xs, nil) > 0 {
		b.Intercept, b.PerMPa = stat.LinearRegression(xs, ys, nil, false)
	} else {
		// one stress (unloaded calibration frames): no slope to fit
		b.Intercept = stat.Mean(ys, nil)
	}
	for _, f := range states {
		b.Stress = append(b.Stress, f.Stress)
	}
	return &b
}

// plateWarning tells when the compensation plate measures magnification
// more coarsely than half the strain noise floor: its scatter is added to
// every point's strain.
func plateWarning(dir string, res *strainfile.ResolutionRecord) error {
	var rec runfolder.MotionRecord
	if runfolder.Section(dir, runfolder.MotionSection, &rec) != nil || rec.Source != runfolder.MotionFromPlate || res == nil {
		return nil
	}
	floor := noiseFloorIso(res)
	// Overlapping subsets share pixels: their errors are not independent
	// (see similarity.Motion.MagnificationSD).
	overlap := 1.0
	if res.Step > 0 && res.Subset > res.Step {
		overlap = float64(res.Subset) / float64(res.Step)
	}
	var sds []float64
	for _, m := range rec.Frames {
		sds = append(sds, overlap*m.MagnificationSD)
	}
	rec.Warning = ""
	if len(sds) > 0 {
		slices.Sort(sds)
		if sd := sds[len(sds)/2]; floor > 0 && sd > floor/2 {
			rec.Warning = fmt.Sprintf("the compensation plate measures the magnification to ±%.0f µε per frame (median standard error, widened by subset/step for overlapping subsets), more than half the strain noise floor of %.0f µε: its scatter adds to every point's strain; a larger plate, or a finer step over it, measures it better", 1e6*sd, 1e6*floor)
		}
	}
	return runfolder.SetSection(dir, runfolder.MotionSection, rec)
}

// noiseFloorIso is the noise floor of an isotropic strain: the mean of
// the exx and eyy floors.
func noiseFloorIso(res *strainfile.ResolutionRecord) float64 {
	return (res.Exx + res.Eyy) / 2
}

// magnificationWarning says which frames' far-field magnification
// changes by more than the strain noise floor where the specimen's own
// strain cannot explain it: at zero load, from the first frame's; under
// load, from its elastic line (the record's Baseline) — or, without
// stresses, from the first frame's in every frame. "" when none does.
func magnificationWarning(rec *runfolder.MotionRecord, res *strainfile.ResolutionRecord) string {
	floor := noiseFloorIso(res)
	if !(floor > 0) || len(rec.Frames) == 0 {
		return ""
	}
	m0 := rec.Frames[0].Magnification
	b := rec.Baseline
	if b != nil && len(b.Stress) != len(rec.Frames) {
		b = nil
	}
	var still, loaded []string
	worstStill, worstLoaded, atStill, atLoaded := 0.0, 0.0, "", ""
	for k, m := range rec.Frames {
		if slices.Contains(rec.Unfitted, m.Frame) {
			continue
		}
		if b == nil || b.Stress[k] == 0 {
			if d := math.Abs(m.Magnification - m0); d > floor {
				still = append(still, m.Frame)
				if d > worstStill {
					worstStill, atStill = d, m.Frame
				}
			}
			continue
		}
		if d := math.Abs(m.Magnification - (b.Intercept + b.PerMPa*b.Stress[k])); d > floor {
			loaded = append(loaded, m.Frame)
			if d > worstLoaded {
				worstLoaded, atLoaded = d, m.Frame
			}
		}
	}
	if len(still) == 0 && len(loaded) == 0 {
		return ""
	}
	w := func(m float64) string {
		if rec.StandoffMM > 0 {
			return fmt.Sprintf(" (at the stand-off of %g mm, %.3g mm along the camera's axis)", rec.StandoffMM, rec.StandoffMM*m)
		}
		return ""
	}
	var parts []string
	if len(still) > 0 {
		where := "at zero load"
		if b == nil {
			where = "(frame stresses unknown)"
		}
		parts = append(parts, fmt.Sprintf("the far field's apparent magnification changes from the first frame's by up to %.0f µε (frame %s)%s %s, where the specimen is not strained, in %d frame(s): %s — out-of-plane motion (an apparent strain of w/Z), or a change of focus or of the camera's mount",
			1e6*worstStill, atStill, w(worstStill), where, len(still), frameList(still)))
	}
	if len(loaded) > 0 {
		parts = append(parts, fmt.Sprintf("under load it departs from its elastic line (fitted against stress over the %d calibration frames; the onset detection takes such a line out of every point) by up to %.0f µε (frame %s)%s, in %d frame(s): %s — out-of-plane motion, or the specimen's own mean strain turning inelastic, which the far field cannot tell apart",
			b.Frames, 1e6*worstLoaded, atLoaded, w(worstLoaded), len(loaded), frameList(loaded)))
	}
	return fmt.Sprintf("%s; all above the strain noise floor of %.0f µε. Name a compensation_plate (a rigid, unloaded plate beside the specimen) to measure the magnification and take it out",
		strings.Join(parts, "; "), 1e6*floor)
}

// frameList names up to eight frames and counts the rest.
func frameList(names []string) string {
	if len(names) > 8 {
		names = append(slices.Clone(names[:8]), fmt.Sprintf("and %d more", len(names)-8))
	}
	return strings.Join(names, ", ")
}

// motionNote is the motion record's warning, for the run's notes ("" when
// none).
func motionNote(dir string) string {
	var rec runfolder.MotionRecord
	if runfolder.Section(dir, runfolder.MotionSection, &rec) != nil {
		return ""
	}
	return rec.Warning
}

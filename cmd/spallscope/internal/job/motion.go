package job

import (
	"fmt"
	"math"
	"slices"
	"strings"

	"spallscope/dic/region"
	"spallscope/dic/runfolder"
	"spallscope/dic/similarity"
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
// FarFieldReach); shapes that do not parse are checked elsewhere.
func farFieldKeep(openings []string) func(x, y int) bool {
	type disc struct{ cx, cy, r float64 }
	var ds []disc
	for _, s := range openings {
		shape, err := region.ParseShape(s)
		if err != nil {
			continue
		}
		x0, y0, x1, y1 := shape.Bounds()
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
	w, h := r.tp.in.Ref.Width, r.tp.in.Ref.Height
	rec.Centre, rec.CentreIs = [2]float64{float64(w-1) / 2, float64(h-1) / 2}, "image centre (no lens file: the principal point of an ideal camera)"
	if r.tp.lens != nil {
		rec.Centre, rec.CentreIs = [2]float64{r.tp.lens.Model.Cx, r.tp.lens.Model.Cy}, "principal point of the lens file"
	}
	var shapes []string
	for _, o := range r.t.Openings {
		shapes = append(shapes, o.Shape)
	}
	keep := farFieldKeep(shapes)
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
	if res != nil {
		rec.Warning = magnificationWarning(&rec, res)
	}
	return runfolder.SetSection(r.out, runfolder.MotionSection, rec)
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

// magnificationWarning says which frames' far-field magnification differs
// from the first frame's by more than the strain noise floor, or "".
func magnificationWarning(rec *runfolder.MotionRecord, res *strainfile.ResolutionRecord) string {
	floor := noiseFloorIso(res)
	if !(floor > 0) || len(rec.Frames) == 0 {
		return ""
	}
	m0 := rec.Frames[0].Magnification
	var over []string
	worst, at := 0.0, ""
	for i, m := range rec.Frames {
		if slices.Contains(rec.Unfitted, m.Frame) {
			continue
		}
		d := math.Abs(m.Magnification - m0)
		if d > floor {
			over = append(over, m.Frame)
		}
		if d > worst {
			worst, at = d, rec.Frames[i].Frame
		}
	}
	if len(over) == 0 {
		return ""
	}
	list := over
	if len(list) > 8 {
		list = append(slices.Clone(list[:8]), fmt.Sprintf("and %d more", len(over)-8))
	}
	w := ""
	if rec.StandoffMM > 0 {
		w = fmt.Sprintf(" (at the stand-off of %g mm, %.3g mm of motion along the camera's axis)", rec.StandoffMM, rec.StandoffMM*worst)
	}
	return fmt.Sprintf("apparent magnification of the far field changes by up to %.0f µε (frame %s)%s, above the strain noise floor of %.0f µε, in %d frame(s): %s. "+
		"It is the face moving along the camera's axis (out-of-plane motion, w ≈ m·Z), or the specimen's own mean in-plane strain, which the far field cannot tell apart under load; "+
		"name a compensation_plate (a rigid, unloaded plate beside the specimen) to measure it and take it out",
		1e6*worst, at, w, 1e6*floor, len(over), strings.Join(list, ", "))
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

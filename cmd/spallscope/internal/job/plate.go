package job

import (
	"fmt"
	"math"

	"spallscope/cmd/spallscope/internal/config"
	"spallscope/cmd/spallscope/internal/stage"
	"spallscope/dic/lens"
	"spallscope/dic/region"
	"spallscope/dic/runfolder"
	"spallscope/dic/similarity"
)

// plate is a test's compensation plate: a rigid, unloaded plate in view
// beside the specimen, tracked with it (its pixels are added to the
// measured mask) and told apart by its shape.
type plate struct {
	given      string       // the shape as given
	shape      region.Shape // in photo pixels
	standoffMM float64
}

// openPlate reads test t's compensation plate, if it names one, checks it
// against the photos — inside them, with grid points enough for a fit,
// and at least half a subset clear of the specimen's measured pixels, so
// that no subset straddles plate and specimen — and adds it to in's mask.
func openPlate(t *config.Test, in *photos, subsetSize, step int) (*plate, error) {
	if t.CompensationPlate == "" {
		return nil, nil
	}
	shape, err := region.ParseShape(t.CompensationPlate)
	if err != nil {
		return nil, fmt.Errorf("compensation_plate: %w", err)
	}
	w, h := in.Ref.Width, in.Ref.Height
	pm, err := region.Layout{ROI: []region.Shape{shape}}.Rasterise(w, h)
	if err != nil {
		return nil, fmt.Errorf("compensation_plate %q: %w", t.CompensationPlate, err)
	}
	x0, y0, x1, y1 := shape.Bounds()
	if x0 < 0 || y0 < 0 || x1 > float64(w-1) || y1 > float64(h-1) {
		return nil, fmt.Errorf("compensation_plate %q: reaches outside the %dx%d photos", t.CompensationPlate, w, h)
	}
	if n := pm.Count() / (step * step); n < similarity.MinPoints {
		return nil, fmt.Errorf("compensation_plate %q: about %d grid points at a step of %d px, at least %d needed to fit its magnification (a larger plate measures it better)", t.CompensationPlate, n, step, similarity.MinPoints)
	}
	gap := float64(subsetSize/2 + 1)
	for y := max(0, int(math.Floor(y0-gap))); y <= min(h-1, int(math.Ceil(y1+gap))); y++ {
		for x := max(0, int(math.Floor(x0-gap))); x <= min(w-1, int(math.Ceil(x1+gap))); x++ {
			if in.Mask.At(x, y) && !pm.At(x, y) {
				return nil, fmt.Errorf("compensation_plate %q: the specimen's measured pixel (%d, %d) lies within half a subset (%g px) of the plate's bounding box, so subsets would straddle both: give an roi that leaves the plate and a gap around it out, or exclude the gap", t.CompensationPlate, x, y, gap)
			}
		}
	}
	for i, v := range pm.Pix {
		if v != 0 {
			in.Mask.Pix[i] = 255
		}
	}
	return &plate{given: t.CompensationPlate, shape: shape, standoffMM: t.StandoffMM}, nil
}

// compensation is the track stage's compensation for the plate, with
// corr the lens correction (nil: none): plate points are told apart in
// the fields' pixels (undistorted ones through the lens), and
// magnifications are taken about the lens's principal point or, without
// a lens, the image centre (the principal point of an ideal camera). A
// run resumed at frame from keeps the motions of the frames before it
// from dir's record.
func (p *plate) compensation(dir string, width, height int, corr *lens.Correction, from int) *stage.Compensation {
	c := &stage.Compensation{
		InPlate: func(x, y int) bool { return p.shape.Contains(float64(x), float64(y)) },
		Cx:      float64(width-1) / 2, Cy: float64(height-1) / 2,
		Record: runfolder.MotionRecord{Source: runfolder.MotionFromPlate, Plate: p.given, Compensated: true,
			CentreIs: "image centre (no lens file: the principal point of an ideal camera)", StandoffMM: p.standoffMM},
	}
	if corr != nil {
		m := corr.Model
		c.InPlate = func(x, y int) bool { return p.shape.Contains(m.Distort(float64(x), float64(y))) }
		c.Cx, c.Cy, c.Record.CentreIs = m.Cx, m.Cy, "principal point of the lens file"
	}
	c.Record.Centre = [2]float64{c.Cx, c.Cy}
	if from > 0 {
		var old runfolder.MotionRecord
		if runfolder.Section(dir, runfolder.MotionSection, &old) == nil && len(old.Frames) >= from {
			c.Record.Frames, c.Record.TowardCameraMM = old.Frames, old.TowardCameraMM
			c.Record.Truncate(from)
		}
	}
	return c
}

// recordedMotions is the number of frames whose plate motions dir's
// record holds (0 when it has none).
func recordedMotions(dir string) int {
	var old runfolder.MotionRecord
	if runfolder.Section(dir, runfolder.MotionSection, &old) != nil || old.Source != runfolder.MotionFromPlate {
		return 0
	}
	return len(old.Frames)
}

package stage

import (
	"spallscope/dic"
	"spallscope/dic/runfolder"
	"spallscope/dic/similarity"
)

// Compensation is the compensation plate of a track stage: each frame's
// plate points (InPlate, in the fields' pixels: undistorted ones with a
// lens) give the frame's apparent magnification, which is taken out of
// the specimen's points about (Cx, Cy) (similarity.Compensate). Record
// collects the frames' motions; a resumed run's holds the frames before
// it.
type Compensation struct {
	InPlate func(x, y int) bool
	Cx, Cy  float64
	Record  runfolder.MotionRecord
}

// apply compensates one frame's field and records the plate's motion in
// run folder dir.
func (c *Compensation) apply(dir string, f *dic.Field) (*dic.Field, error) {
	out, m, err := similarity.Compensate(f, c.InPlate, c.Cx, c.Cy)
	if err != nil {
		return nil, err
	}
	c.Record.Add(m)
	return out, runfolder.SetSection(dir, runfolder.MotionSection, c.Record)
}

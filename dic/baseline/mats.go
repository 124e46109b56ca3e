package baseline

import (
	"fmt"

	"gocv.io/x/gocv"

	"spallscope/dic/frames"
)

// caseMats converts the frames of c into 8-bit single-channel OpenCV
// images, the input the OpenCV baselines expect. The caller closes both.
func caseMats(c *Case) (ref, def gocv.Mat, err error) {
	ref, err = frames.ToMat(c.Ref, 8)
	if err != nil {
		return gocv.Mat{}, gocv.Mat{}, fmt.Errorf("case %s: reference frame: %w", c.Name, err)
	}
	def, err = frames.ToMat(c.Def, 8)
	if err != nil {
		ref.Close()
		return gocv.Mat{}, gocv.Mat{}, fmt.Errorf("case %s: deformed frame: %w", c.Name, err)
	}
	return ref, def, nil
}

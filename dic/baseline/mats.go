package baseline

import (
	"fmt"

	"gocv.io/x/gocv"

	"spallscope/dic/frames"
)

// caseMats returns the frames of c as 8-bit single-channel OpenCV images,
// the input the OpenCV baselines expect, and the function that releases
// them: the images holdMats converted when it holds them (release then
// does nothing), else new ones that release closes.
func caseMats(c *Case) (ref, def gocv.Mat, release func(), err error) {
	if c.mats != nil {
		return c.mats[0], c.mats[1], func() {}, nil
	}
	ref, def, err = convertMats(c)
	if err != nil {
		return gocv.Mat{}, gocv.Mat{}, nil, err
	}
	return ref, def, func() { ref.Close(); def.Close() }, nil
}

// holdMats converts the frames of c once, for every caseMats until the
// returned function releases them. Compare holds them while it times the
// methods: a run with OpenCV decodes its photos straight into such images,
// so the conversion from the synthetic lab's frames is the harness's work,
// not the baselines'.
func (c *Case) holdMats() (release func(), err error) {
	ref, def, err := convertMats(c)
	if err != nil {
		return nil, err
	}
	c.mats = &[2]gocv.Mat{ref, def}
	return func() {
		c.mats = nil
		ref.Close()
		def.Close()
	}, nil
}

// convertMats converts the frames of c; the caller closes both.
func convertMats(c *Case) (ref, def gocv.Mat, err error) {
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

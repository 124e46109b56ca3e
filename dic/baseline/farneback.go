package baseline

import (
	"fmt"

	"gocv.io/x/gocv"
)

// Farneback settings: a 3-level pyramid halving each level, 10 iterations
// per level, polynomial expansion over 7 px neighbourhoods with σ = 1.5 (the
// values OpenCV documents for poly_n = 7) and a Gaussian averaging window.
const (
	fbPyrScale  = 0.5
	fbLevels    = 3
	fbIter      = 10
	fbPolyN     = 7
	fbPolySigma = 1.5
)

// Farneback computes OpenCV's dense Farneback optical flow (Farnebäck 2003,
// "Two-frame motion estimation based on polynomial expansion", SCIA,
// LNCS 2749:363–370) once for the frame pair, with a window px averaging
// window, and samples it at the points. OpenCV's flow at a pixel of the
// first image is where that pixel went in the second, which is the
// displacement sought. The time is that of the whole dense field spread
// over the points.
func Farneback(c *Case, window int) (u, v []float64, err error) {
	if err := checkWindow(c, window); err != nil {
		return nil, nil, fmt.Errorf("%s: %w", NameFarneback, err)
	}
	ref, def, release, err := caseMats(c)
	if err != nil {
		return nil, nil, fmt.Errorf("%s: %w", NameFarneback, err)
	}
	defer release()
	flow := gocv.NewMat()
	defer flow.Close()
	gocv.CalcOpticalFlowFarneback(ref, def, &flow, fbPyrScale, fbLevels, window, fbIter, fbPolyN, fbPolySigma, gocv.OptflowFarnebackGaussian)
	data, err := flow.DataPtrFloat32()
	if err != nil || len(data) != 2*c.Ref.Width*c.Ref.Height {
		return nil, nil, fmt.Errorf("%s: flow field: got %d values for a %dx%d image (%v)", NameFarneback, len(data), c.Ref.Width, c.Ref.Height, err)
	}
	u, v = make([]float64, len(c.Points)), make([]float64, len(c.Points))
	for i, p := range c.Points {
		k := 2 * (p[1]*c.Ref.Width + p[0])
		u[i], v[i] = float64(data[k]), float64(data[k+1])
	}
	return u, v, nil
}

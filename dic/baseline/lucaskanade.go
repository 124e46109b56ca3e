package baseline

import (
	"encoding/binary"
	"fmt"
	"image"
	"math"

	"gocv.io/x/gocv"
)

// Lucas–Kanade settings: a 3-level pyramid and a tight stopping rule (100
// iterations or an update below 1e-4 px); OpenCV's default minimum
// eigenvalue threshold.
const (
	lkMaxLevel       = 3
	lkMaxIterations  = 100
	lkEpsilon        = 1e-4
	lkMinEigenThresh = 1e-4
)

// LucasKanade measures all points in one call of OpenCV's pyramidal
// Lucas–Kanade tracker (Lucas & Kanade 1981, "An iterative image
// registration technique with an application to stereo vision", IJCAI;
// pyramidal form of Bouguet 2000, "Pyramidal implementation of the Lucas
// Kanade feature tracker", Intel), with a window×window integration
// window. Its translation-only model is the one a general-purpose tracker
// fits; the displacement is the tracked position minus the start. Points
// whose status OpenCV reports as lost are NaN. (gocv 0.31 has no way to
// free a TermCriteria: each call leaks those few bytes.)
func LucasKanade(c *Case, window int) (u, v []float64, err error) {
	if err := checkWindow(c, window); err != nil {
		return nil, nil, fmt.Errorf("%s: %w", NameLucasKanade, err)
	}
	ref, def, release, err := caseMats(c)
	if err != nil {
		return nil, nil, fmt.Errorf("%s: %w", NameLucasKanade, err)
	}
	defer release()
	return lucasKanadeMats(ref, def, c.Points, window)
}

// lucasKanadeMats is LucasKanade on frames already converted to 8-bit
// OpenCV images, so that a sequence converts its reference once and times
// the tracker alone (a run with OpenCV would decode its photos straight
// into such images).
func lucasKanadeMats(ref, def gocv.Mat, points [][2]int, window int) (u, v []float64, err error) {
	n := len(points)
	buf := make([]byte, 8*n)
	for i, p := range points {
		binary.LittleEndian.PutUint32(buf[8*i:], math.Float32bits(float32(p[0])))
		binary.LittleEndian.PutUint32(buf[8*i+4:], math.Float32bits(float32(p[1])))
	}
	prev, err := gocv.NewMatFromBytes(n, 1, gocv.MatTypeCV32FC2, buf)
	if err != nil {
		return nil, nil, fmt.Errorf("%s: points: %w", NameLucasKanade, err)
	}
	defer prev.Close()
	next, status, lkErr := gocv.NewMat(), gocv.NewMat(), gocv.NewMat()
	defer next.Close()
	defer status.Close()
	defer lkErr.Close()
	crit := gocv.NewTermCriteria(gocv.Count|gocv.EPS, lkMaxIterations, lkEpsilon)
	gocv.CalcOpticalFlowPyrLKWithParams(ref, def, prev, next, &status, &lkErr,
		image.Pt(window, window), lkMaxLevel, crit, 0, lkMinEigenThresh)

	pts, err := next.DataPtrFloat32()
	if err != nil || len(pts) != 2*n {
		return nil, nil, fmt.Errorf("%s: tracked points: got %d values for %d points (%v)", NameLucasKanade, len(pts), n, err)
	}
	st, err := status.DataPtrUint8()
	if err != nil || len(st) != n {
		return nil, nil, fmt.Errorf("%s: status: got %d values for %d points (%v)", NameLucasKanade, len(st), n, err)
	}
	u, v = nanSlices(n)
	for i, p := range points {
		if st[i] == 1 {
			u[i] = float64(pts[2*i]) - float64(p[0])
			v[i] = float64(pts[2*i+1]) - float64(p[1])
		}
	}
	return u, v, nil
}

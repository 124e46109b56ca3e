package baseline

import (
	"encoding/binary"
	"fmt"
	"image"
	"math"

	"gocv.io/x/gocv"
)

// PhaseCorrelation measures each point with OpenCV's phase correlation
// (Kuglin & Hines 1975, "The phase correlation image alignment method",
// Proc. IEEE Conf. Cybernetics and Society; subpixel peak by OpenCV's
// weighted centroid) between the window×window patches of both frames
// centred on the point, each tapered by a Hanning window. The patches sit
// at the same place in both frames, so the shift found is the
// displacement. OpenCV refines the peak by a weighted centroid, which on
// windows this small is strongly biased (a 0.1 px shift reads about 0 px
// here; a related failure of that step is opencv/opencv#9158): the
// weakness is the library's estimator, not the harness's sign or layout. It makes one cgo call per point, acceptable
// for a baseline; the points are shared among the CPUs.
func PhaseCorrelation(c *Case, window int) (u, v []float64, err error) {
	if err := checkWindow(c, window); err != nil {
		return nil, nil, fmt.Errorf("%s: %w", NamePhaseCorrelation, err)
	}
	ref8, def8, release, err := caseMats(c)
	if err != nil {
		return nil, nil, fmt.Errorf("%s: %w", NamePhaseCorrelation, err)
	}
	defer release()
	ref, def := gocv.NewMat(), gocv.NewMat()
	defer ref.Close()
	defer def.Close()
	ref8.ConvertTo(&ref, gocv.MatTypeCV32F)
	def8.ConvertTo(&def, gocv.MatTypeCV32F)
	han, err := hanning(window)
	if err != nil {
		return nil, nil, fmt.Errorf("%s: %w", NamePhaseCorrelation, err)
	}
	defer han.Close()

	r := window / 2
	u, v = nanSlices(len(c.Points))
	err = forChunks(len(c.Points), func(lo, hi int) error {
		for i := lo; i < hi; i++ {
			x, y := c.Points[i][0], c.Points[i][1]
			rect := image.Rect(x-r, y-r, x+r+1, y+r+1)
			a, b := ref.Region(rect), def.Region(rect)
			shift, _ := gocv.PhaseCorrelate(a, b, han)
			a.Close()
			b.Close()
			u[i], v[i] = float64(shift.X), float64(shift.Y)
		}
		return nil
	})
	return u, v, err
}

// hanning returns the n×n 32-bit float Hanning window
// w(i, j) = h(i)·h(j), h(k) = ½(1 − cos(2πk/(n−1))), the taper that
// OpenCV's createHanningWindow builds (gocv does not wrap it).
func hanning(n int) (gocv.Mat, error) {
	h := make([]float64, n)
	for k := range h {
		h[k] = 0.5 * (1 - math.Cos(2*math.Pi*float64(k)/float64(n-1)))
	}
	buf := make([]byte, 4*n*n)
	for j := range n {
		for i := range n {
			binary.LittleEndian.PutUint32(buf[4*(j*n+i):], math.Float32bits(float32(h[i]*h[j])))
		}
	}
	m, err := gocv.NewMatFromBytes(n, n, gocv.MatTypeCV32F, buf)
	if err != nil {
		return gocv.Mat{}, fmt.Errorf("hanning window %d px: %w", n, err)
	}
	return m, nil
}

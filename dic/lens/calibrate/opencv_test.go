package calibrate

import (
	"image"
	"math"
	"testing"
	"unsafe"

	"gocv.io/x/gocv"

	"spallscope/dic/lens"
)

// cameraMats returns OpenCV's camera matrix and distortion coefficients of
// model m.
func cameraMats(t *testing.T, m lens.Model) (K, D gocv.Mat) {
	t.Helper()
	K = gocv.NewMatWithSize(3, 3, gocv.MatTypeCV64F)
	for i, v := range []float64{m.Fx, 0, m.Cx, 0, m.Fy, m.Cy, 0, 0, 1} {
		K.SetDoubleAt(i/3, i%3, v)
	}
	D = gocv.NewMatWithSize(1, 5, gocv.MatTypeCV64F)
	for i, v := range m.Coefficients() {
		D.SetDoubleAt(0, i, v)
	}
	return K, D
}

// OpenCV's undistortPoints (the reference library, with the camera matrix
// as the new one, so that it returns ideal pixels) agrees with
// lens.Model.Undistort to 1e-3 px over the whole frame of the synthetic
// targets' lens. OpenCV solves by a fixed number (5) of fixed-point
// iterations, so the agreement measures both its convergence and our
// Newton solution (measured: see the log).
func TestUndistortAgreesWithOpenCV(t *testing.T) {
	m := trueLens
	K, D := cameraMats(t, m)
	defer K.Close()
	defer D.Close()
	var pts []float64
	for y := 0.0; y <= 479; y += 12 {
		for x := 0.0; x <= 639; x += 12 {
			pts = append(pts, x, y)
		}
	}
	pts = append(pts, 0, 0, 639, 0, 0, 479, 639, 479)
	n := len(pts) / 2
	src, err := gocv.NewMatFromBytes(n, 1, gocv.MatTypeCV64FC2, unsafe.Slice((*byte)(unsafe.Pointer(&pts[0])), 8*len(pts)))
	if err != nil {
		t.Fatal(err)
	}
	defer src.Close()
	dst := gocv.NewMat()
	defer dst.Close()
	R := gocv.NewMat()
	defer R.Close()
	gocv.UndistortPoints(src, &dst, K, D, R, K)
	got, err := dst.DataPtrFloat64()
	if err != nil || len(got) != 2*n {
		t.Fatalf("undistortPoints returned %d numbers (%v), want %d", len(got), err, 2*n)
	}
	worst, at := 0.0, [2]float64{}
	for i := 0; i < n; i++ {
		X, Y, ok := m.Undistort(pts[2*i], pts[2*i+1])
		if !ok {
			t.Fatalf("no inverse at (%g, %g)", pts[2*i], pts[2*i+1])
		}
		if d := math.Hypot(X-got[2*i], Y-got[2*i+1]); d > worst {
			worst, at = d, [2]float64{pts[2*i], pts[2*i+1]}
		}
	}
	t.Logf("undistortPoints and Undistort differ by up to %.2g px (at photo pixel %v) over %d points", worst, at, n)
	if worst > 1e-3 {
		t.Errorf("undistortPoints and Undistort differ by %.3g px at %v, want < 1e-3", worst, at)
	}
}

// OpenCV's initUndistortRectifyMap gives, for every ideal pixel, the photo
// position it is seen at: lens.Model.Distort agrees with it to 1e-3 px
// (the maps are float32: about 3e-5 px at 640 px) for the targets' lens
// and for the strong pincushion lens of the strain check.
func TestDistortAgreesWithOpenCV(t *testing.T) {
	strong := lens.Model{Width: 512, Height: 512, Fx: 700, Fy: 700, Cx: 255.5, Cy: 255.5, K1: 0.45}
	for _, m := range []lens.Model{trueLens, strong} {
		K, D := cameraMats(t, m)
		R := gocv.NewMat()
		mx, my := gocv.NewMat(), gocv.NewMat()
		gocv.InitUndistortRectifyMap(K, D, R, K, image.Pt(m.Width, m.Height), int(gocv.MatTypeCV32F), mx, my)
		xs, err1 := mx.DataPtrFloat32()
		ys, err2 := my.DataPtrFloat32()
		if err1 != nil || err2 != nil || len(xs) != m.Width*m.Height || len(ys) != len(xs) {
			t.Fatalf("maps: %v %v, %d values", err1, err2, len(xs))
		}
		worst := 0.0
		for i := range xs {
			x, y := m.Distort(float64(i%m.Width), float64(i/m.Width))
			worst = math.Max(worst, math.Hypot(x-float64(xs[i]), y-float64(ys[i])))
		}
		t.Logf("%dx%d lens k1 %g: Distort and initUndistortRectifyMap differ by up to %.2g px", m.Width, m.Height, m.K1, worst)
		if worst > 1e-3 {
			t.Errorf("lens %+v: Distort and OpenCV's map differ by %.3g px, want < 1e-3", m, worst)
		}
		K.Close()
		D.Close()
		R.Close()
		mx.Close()
		my.Close()
	}
}

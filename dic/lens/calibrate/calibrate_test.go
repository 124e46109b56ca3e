package calibrate

import (
	"fmt"
	"math"
	"strings"
	"sync"
	"testing"

	"spallscope/dic/lens"
	"spallscope/dic/synth"
)

// trueLens is the lens the synthetic targets are shot through: values of
// our own, of the strength of a short machine-vision lens (from memory).
var trueLens = lens.Model{Width: 640, Height: 480, Fx: 800, Fy: 804, Cx: 323.4, Cy: 236.8,
	K1: -0.24, K2: 0.15, K3: -0.05, P1: 0.0011, P2: -0.0007}

var targetBoard = lens.Board{Cols: 9, Rows: 6, SquareMM: 10}

// targets are twelve synthetic photos of the board through trueLens
// (synth.RenderTarget at synth.TargetPoses), with their detected corners;
// rendered once per test binary.
var targets struct {
	once  sync.Once
	poses []lens.Pose
	views []View
	err   error
}

func targetViews(t *testing.T) ([]lens.Pose, []View) {
	t.Helper()
	targets.once.Do(func() {
		targets.poses = synth.TargetPoses(trueLens, targetBoard, 12)
		for k, p := range targets.poses {
			img, err := synth.RenderTarget(trueLens, targetBoard, p, synth.Camera{Oversample: 2}, k)
			if err != nil {
				targets.err = err
				return
			}
			c, found, err := FindCorners(img, targetBoard)
			if err != nil || !found {
				targets.err = fmt.Errorf("pose %d: board found %v, %v", k, found, err)
				return
			}
			targets.views = append(targets.views, View{Image: fmt.Sprintf("target_%02d", k), Corners: c})
		}
	})
	if targets.err != nil {
		t.Fatal(targets.err)
	}
	return targets.poses, targets.views
}

// The corners found in the synthetic photos are where the board's corners
// project through the lens (the exact projection, lens.Pose.Project of
// the rendering pose) to within 0.06 px each (measured 0.044 px at worst,
// 0.02 px RMS: what cornerSubPix leaves on corners blurred over a pixel
// and seen in perspective). The finder may number a board from either
// end; the nearer of the two orders is compared.
func TestCornersAreTheProjectedBoard(t *testing.T) {
	poses, views := targetViews(t)
	board := targetBoard.Corners()
	worst := 0.0
	for k, v := range views {
		fwd, back := 0.0, 0.0
		for i, b := range board {
			x, y, _ := poses[k].Project(&trueLens, b[0], b[1])
			j := len(board) - 1 - i
			fwd = math.Max(fwd, math.Hypot(x-v.Corners[i][0], y-v.Corners[i][1]))
			back = math.Max(back, math.Hypot(x-v.Corners[j][0], y-v.Corners[j][1]))
		}
		worst = math.Max(worst, math.Min(fwd, back))
	}
	t.Logf("worst corner %.4f px from its exact projection", worst)
	if worst > 0.06 {
		t.Errorf("a corner lies %.3f px from its exact projection, want < 0.06", worst)
	}
}

// Calibration on the twelve synthetic photos recovers the lens they were
// shot through (Zhang 2000 with OpenCV's calibrateCamera; the answer is
// the rendering lens). Tolerances, each about three times what was
// measured: fx, fy to 0.1 % (measured 0.01 %), cx, cy to 1 px (0.35 px),
// k1 to 0.005 (0.0016), p1, p2 to 3e-4 (1e-4). k2 and k3 trade off along
// the radius, so they are checked through the radial distortion they
// describe together, f·r·(k1r² + k2r⁴ + k3r⁶): within 0.15 px of the true
// one out to the farthest corner found (measured 0.02 px). The
// reprojection error is under 0.05 px (0.025 px), and recomputed in Go
// from OpenCV's poses (lens.Pose.Project) it equals OpenCV's own to
// 1e-3 px.
func TestCalibrationRecoversTheLens(t *testing.T) {
	_, views := targetViews(t)
	f, err := Calibrate(targetBoard, 640, 480, views)
	if err != nil {
		t.Fatal(err)
	}
	m := f.Model()
	t.Logf("recovered %+v, RMS %.4f px", m, f.RMS)
	check := func(name string, got, want, tol float64) {
		t.Helper()
		if math.Abs(got-want) > tol {
			t.Errorf("%s = %.6g, want %.6g ± %g", name, got, want, tol)
		}
	}
	check("fx", m.Fx, trueLens.Fx, 1e-3*trueLens.Fx)
	check("fy", m.Fy, trueLens.Fy, 1e-3*trueLens.Fy)
	check("cx", m.Cx, trueLens.Cx, 1)
	check("cy", m.Cy, trueLens.Cy, 1)
	check("k1", m.K1, trueLens.K1, 0.005)
	check("p1", m.P1, trueLens.P1, 3e-4)
	check("p2", m.P2, trueLens.P2, 3e-4)
	rmax := 0.0
	for _, v := range views {
		for _, c := range v.Corners {
			X, Y, _ := trueLens.Undistort(c[0], c[1])
			rmax = math.Max(rmax, math.Hypot((X-trueLens.Cx)/trueLens.Fx, (Y-trueLens.Cy)/trueLens.Fy))
		}
	}
	radial := func(m lens.Model, r float64) float64 {
		r2 := r * r
		return m.Fx * r * r2 * (m.K1 + r2*(m.K2+r2*m.K3))
	}
	worst := 0.0
	for r := 0.0; r <= rmax; r += rmax / 100 {
		worst = math.Max(worst, math.Abs(radial(m, r)-radial(trueLens, r)))
	}
	t.Logf("radial distortion within %.3f px of the true one out to r = %.3f (farthest corner)", worst, rmax)
	if worst > 0.15 {
		t.Errorf("radial distortion off by %.3f px within the corners' reach, want < 0.15", worst)
	}
	if f.RMS > 0.05 {
		t.Errorf("reprojection error %.4f px, want < 0.05", f.RMS)
	}
	sum := 0.0
	for _, p := range f.Poses {
		sum += p.RMS * p.RMS
	}
	if goRMS := math.Sqrt(sum / float64(len(f.Poses))); math.Abs(goRMS-f.RMS) > 1e-3 {
		t.Errorf("reprojection error recomputed in Go %.5f px, OpenCV's %.5f px", goRMS, f.RMS)
	}
	if c := f.Coverage; c == nil || c.Covered != 1 || len(c.EmptyCorners) != 0 {
		t.Errorf("coverage %+v, want every cell covered", c)
	}
	if w := Warnings(f); len(w) != 0 {
		t.Errorf("warnings for a good calibration: %q", w)
	}
}

// Three square-on and tilted poses at the centre leave the frame's
// corner cells empty, and the warning says so; a reprojection error over
// 0.3 px is warned of (the rule of Warnings).
func TestWarnings(t *testing.T) {
	_, views := targetViews(t)
	f, err := Calibrate(targetBoard, 640, 480, views[:3])
	if err != nil {
		t.Fatal(err)
	}
	if c := f.Coverage; len(c.EmptyCorners) != 4 {
		t.Errorf("centre poses only: empty corner cells %v, want all four", c.EmptyCorners)
	}
	w := strings.Join(Warnings(f), "\n")
	if !strings.Contains(w, "top-left, top-right, bottom-left, bottom-right") {
		t.Errorf("warnings %q do not name the empty corner cells", w)
	}
	f.RMS = 0.31
	if w := strings.Join(Warnings(f), "\n"); !strings.Contains(w, "0.310 px is above 0.3 px") {
		t.Errorf("warnings for a 0.31 px calibration: %q", w)
	}
	if _, err := Calibrate(targetBoard, 640, 480, views[:2]); err == nil {
		t.Error("two views were accepted")
	}
}

func BenchmarkFindCorners(b *testing.B) {
	p := synth.TargetPoses(trueLens, targetBoard, 1)[0]
	img, err := synth.RenderTarget(trueLens, targetBoard, p, synth.Camera{Oversample: 2}, 0)
	if err != nil {
		b.Fatal(err)
	}
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		if _, ok, err := FindCorners(img, targetBoard); !ok || err != nil {
			b.Fatal(ok, err)
		}
	}
}

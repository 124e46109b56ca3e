package calibrate

import (
	"errors"
	"fmt"
	"image"
	"math"
	"strings"
	"time"

	"gocv.io/x/gocv"

	"spallscope/dic/lens"
)

// View is one calibration photo: its name and its board's detected
// corners, row by row as FindCorners returns them.
type View struct {
	Image   string
	Corners [][2]float64
}

// MinViews is the fewest poses Calibrate accepts: Zhang's method needs
// three views of a plane for the camera matrix alone (Zhang 2000, §3.1),
// and the distortion terms need more; ten or more is the usual advice
// (common practice, no source).
const MinViews = 3

// Calibrate estimates the lens of a width×height camera from the views of
// board b with OpenCV's calibrateCamera: fx, fy, cx, cy, the radial terms
// k1, k2, k3 and the tangential p1, p2 (no skew). It returns the lens
// file, with each view's pose and reprojection error (projected in Go by
// lens.Pose.Project with the estimated model) and the frame coverage;
// Skipped and Calibrated are left for the caller.
func Calibrate(b lens.Board, width, height int, views []View) (*lens.File, error) {
	if err := b.Validate(); err != nil {
		return nil, err
	}
	if len(views) < MinViews {
		return nil, fmt.Errorf("calibration needs the board found in at least %d photos, it was found in %d", MinViews, len(views))
	}
	board := b.Corners()
	obj := make([][]gocv.Point3f, len(views))
	img := make([][]gocv.Point2f, len(views))
	for k, v := range views {
		if len(v.Corners) != len(board) {
			return nil, fmt.Errorf("%s: %d corners, expected %d for a %dx%d board", v.Image, len(v.Corners), len(board), b.Cols, b.Rows)
		}
		for i, p := range board {
			obj[k] = append(obj[k], gocv.Point3f{X: float32(p[0]), Y: float32(p[1])})
			img[k] = append(img[k], gocv.Point2f{X: float32(v.Corners[i][0]), Y: float32(v.Corners[i][1])})
		}
	}
	objV, imgV := gocv.NewPoints3fVectorFromPoints(obj), gocv.NewPoints2fVectorFromPoints(img)
	defer objV.Close()
	defer imgV.Close()
	K, D, rv, tv := gocv.NewMat(), gocv.NewMat(), gocv.NewMat(), gocv.NewMat()
	defer K.Close()
	defer D.Close()
	defer rv.Close()
	defer tv.Close()
	rms := gocv.CalibrateCamera(objV, imgV, image.Pt(width, height), &K, &D, &rv, &tv, 0)
	k, err := doubles(K, 9, "camera matrix")
	if err != nil {
		return nil, err
	}
	d, err := doubles(D, 5, "distortion coefficients")
	if err != nil {
		return nil, err
	}
	r, err := doubles(rv, 3*len(views), "rotations")
	if err != nil {
		return nil, err
	}
	t, err := doubles(tv, 3*len(views), "translations")
	if err != nil {
		return nil, err
	}
	m := lens.Model{Width: width, Height: height, Fx: k[0], Fy: k[4], Cx: k[2], Cy: k[5], K1: d[0], K2: d[1], P1: d[2], P2: d[3], K3: d[4]}
	if math.IsNaN(rms) || math.IsInf(rms, 0) {
		return nil, errors.New("calibration did not converge (non-finite reprojection error): check that the board size matches the printed board")
	}
	f := lens.FileOf(m)
	f.RMS, f.Board = rms, b
	var all [][][2]float64
	for i, v := range views {
		pose := lens.Pose{Rotation: [3]float64{r[3*i], r[3*i+1], r[3*i+2]}, Translation: [3]float64{t[3*i], t[3*i+1], t[3*i+2]}}
		f.Poses = append(f.Poses, lens.PoseRecord{Image: v.Image, Pose: pose, RMS: reprojection(&m, pose, board, v.Corners)})
		all = append(all, v.Corners)
	}
	c := Coverage(width, height, all)
	f.Coverage = &c
	return &f, nil
}

// reprojection is the RMS distance in px between the detected corners and
// the board's corners projected through model m in pose p.
func reprojection(m *lens.Model, p lens.Pose, board, corners [][2]float64) float64 {
	sum := 0.0
	for i, b := range board {
		x, y, ok := p.Project(m, b[0], b[1])
		if !ok {
			return math.Inf(1)
		}
		sum += (x-corners[i][0])*(x-corners[i][0]) + (y-corners[i][1])*(y-corners[i][1])
	}
	return math.Sqrt(sum / float64(len(board)))
}

// doubles reads n float64 values out of an OpenCV result.
func doubles(m gocv.Mat, n int, what string) ([]float64, error) {
	if m.Empty() || m.Total()*m.Channels() != n {
		return nil, fmt.Errorf("calibration returned no %s", what)
	}
	if !m.IsContinuous() {
		c := m.Clone()
		defer c.Close()
		m = c
	}
	v, err := m.DataPtrFloat64()
	if err != nil {
		return nil, fmt.Errorf("calibration %s: %w", what, err)
	}
	return append([]float64(nil), v...), nil
}

// RMSWarning is the reprojection error above which a calibration is
// suspect, in px (common practice, no source).
const RMSWarning = 0.3

// Warnings lists what should make the user look again at a calibration:
// a reprojection error above RMSWarning, photos whose own error is over
// twice the whole calibration's, and corner cells of the frame that no
// detected corner reaches.
func Warnings(f *lens.File) []string {
	var w []string
	if f.RMS > RMSWarning {
		w = append(w, fmt.Sprintf("reprojection error %.3f px is above %.1f px: blurred, overexposed or moving photos, a board that is not flat, or a wrong --board size", f.RMS, RMSWarning))
	}
	for _, p := range f.Poses {
		if p.RMS > 2*f.RMS && p.RMS > 0.1 {
			w = append(w, fmt.Sprintf("%s: reprojection error %.3f px, over twice the calibration's %.3f px (blur or a bent board in this photo?); consider leaving it out", p.Image, p.RMS, f.RMS))
		}
	}
	if c := f.Coverage; c != nil && len(c.EmptyCorners) > 0 {
		w = append(w, fmt.Sprintf("no board corner reaches the %s cell(s) of the frame (frame divided into %d × %d cells; %.0f %% of cells covered): the distortion there is extrapolated; add photos with the board in those corners",
			strings.Join(c.EmptyCorners, ", "), c.Cells, c.Cells, 100*c.Covered))
	}
	return w
}

// Stamp sets the file's calibration time and tool.
func Stamp(f *lens.File, tool string, now time.Time) {
	f.Calibrated, f.Tool = now.UTC().Format(time.RFC3339), tool
}

package synth

import (
	"fmt"
	"math"
	"runtime"
	"sync"
	"sync/atomic"

	"spallscope/dic/lens"
	"spallscope/subset"
)

// Targets asks the synthetic lab for photos of a chessboard calibration
// target, taken with the scenario's camera and lens at Poses poses chosen
// to cover the frame (TargetPoses).
type Targets struct {
	Board lens.Board `json:"board"`
	Poses int        `json:"poses"`
}

// Validate reports targets that cannot be rendered.
func (t Targets) Validate() error {
	if err := t.Board.Validate(); err != nil {
		return err
	}
	if t.Poses < 1 || t.Poses > 100 {
		return fmt.Errorf("%d target poses, expected 1 to 100", t.Poses)
	}
	return nil
}

// Chessboard paper levels, as fractions of full scale.
const (
	paperLevel = 0.9
	inkLevel   = 0.1
)

// boardLevel is the reflectance of chessboard b at board point (X, Y) mm:
// (Cols+1) × (Rows+1) squares whose inner corners are at (c·s, r·s),
// c = 0 … Cols−1, r = 0 … Rows−1, on white paper. Edges are smooth over
// a width w = s/40 (a printed edge as a tanh profile of the distance),
// so that pixel integration by Gauss–Legendre points converges and each
// inner corner is an exact saddle point of the levels.
func boardLevel(b lens.Board, X, Y float64) float64 {
	s := b.SquareMM
	w := s / 40
	sx := math.Tanh(math.Sin(math.Pi*X/s) * s / (math.Pi * w))
	sy := math.Tanh(math.Sin(math.Pi*Y/s) * s / (math.Pi * w))
	checker := 0.5 * (1 + sx*sy) // 1 on white squares, 0 on black ones
	inX := math.Min(X+s, float64(b.Cols)*s-X)
	inY := math.Min(Y+s, float64(b.Rows)*s-Y)
	inside := 0.25 * (1 + math.Tanh(inX/w)) * (1 + math.Tanh(inY/w))
	on := inkLevel + (paperLevel-inkLevel)*checker
	return paperLevel*(1-inside) + on*inside
}

// RenderTarget photographs chessboard b in pose p through lens m with
// camera cam: each Gauss–Legendre sample of a pixel is undistorted by the
// lens, sent back through the board's homography onto the board plane and
// given the board's reflectance there (no bitmap is resampled); blur,
// noise and quantisation follow as for speckle frames (Record, with frame
// as the noise seed's offset).
func RenderTarget(m lens.Model, b lens.Board, p lens.Pose, cam Camera, frame int) (*subset.Image, error) {
	cam = cam.withDefaults()
	if err := cam.Validate(); err != nil {
		return nil, err
	}
	if err := m.Validate(); err != nil {
		return nil, fmt.Errorf("lens: %w", err)
	}
	if err := b.Validate(); err != nil {
		return nil, err
	}
	h, ok := invert3x3(p.Homography(&m))
	if !ok {
		return nil, fmt.Errorf("target pose %+v: the board is seen edge-on", p)
	}
	full := cam.FullScale()
	img := subset.NewImage(m.Width, m.Height, cam.Depth)
	nodes, weights := gaussLegendre(cam.Oversample)
	var next atomic.Int64
	var wg sync.WaitGroup
	for w := 0; w < runtime.GOMAXPROCS(0); w++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for {
				y := int(next.Add(1) - 1)
				if y >= m.Height {
					return
				}
				row := img.Row(y)
				for x := range row {
					sum := 0.0
					for j, oy := range nodes {
						for i, ox := range nodes {
							level := cam.Void
							if X, Y, ok := m.Undistort(float64(x)+ox, float64(y)+oy); ok {
								w := h[6]*X + h[7]*Y + h[8]
								if w > 0 {
									level = boardLevel(b, (h[0]*X+h[1]*Y+h[2])/w, (h[3]*X+h[4]*Y+h[5])/w)
								}
							}
							sum += weights[i] * weights[j] * level
						}
					}
					row[x] = float32(sum * full)
				}
			}
		}()
	}
	wg.Wait()
	Record(img, cam, frame)
	return img, nil
}

// invert3x3 inverts a row-major 3×3 matrix.
func invert3x3(a [9]float64) ([9]float64, bool) {
	c := [9]float64{
		a[4]*a[8] - a[5]*a[7], a[2]*a[7] - a[1]*a[8], a[1]*a[5] - a[2]*a[4],
		a[5]*a[6] - a[3]*a[8], a[0]*a[8] - a[2]*a[6], a[2]*a[3] - a[0]*a[5],
		a[3]*a[7] - a[4]*a[6], a[1]*a[6] - a[0]*a[7], a[0]*a[4] - a[1]*a[3],
	}
	det := a[0]*c[0] + a[1]*c[3] + a[2]*c[6]
	if !(math.Abs(det) > 0) {
		return c, false
	}
	for i := range c {
		c[i] /= det
	}
	return c, true
}

// targetPlaces are where TargetPoses puts the board's centre (fractions
// of the frame) and how it tilts it (rotation vector, rad): the centre
// square-on and tilted, then the four corners and the four edges, each
// tilted towards the frame's centre, so that corners reach every part of
// the frame and the tilts fix the focal length (Zhang 2000, §3.1: views
// must not be parallel).
var targetPlaces = []struct{ u, v, rx, ry, rz float64 }{
	{0.5, 0.5, 0, 0, 0},
	{0.5, 0.5, 0.45, 0, 0.05},
	{0.5, 0.5, 0, -0.45, -0.05},
	{0.25, 0.25, -0.3, 0.3, 0.08},
	{0.75, 0.25, -0.3, -0.3, -0.08},
	{0.25, 0.75, 0.3, 0.3, -0.06},
	{0.75, 0.75, 0.3, -0.3, 0.06},
	{0.5, 0.28, -0.35, 0, 0.1},
	{0.5, 0.72, 0.35, 0, -0.1},
	{0.28, 0.5, 0, 0.35, 0.04},
	{0.72, 0.5, 0, -0.35, -0.04},
	{0.5, 0.5, 0.3, 0.3, 0.2},
}

// TargetPoses returns n poses of board b in front of the camera of lens
// m: the board is placed where its width spans half the frame's width
// square-on, at the places of targetPlaces in turn (repeated with a
// slightly larger tilt after the twelfth).
func TargetPoses(m lens.Model, b lens.Board, n int) []lens.Pose {
	s := b.SquareMM
	boardW := float64(b.Cols+1) * s
	z := m.Fx * boardW / (0.55 * float64(m.Width))
	cx, cy := float64(b.Cols-1)*s/2, float64(b.Rows-1)*s/2
	var poses []lens.Pose
	for k := 0; k < n; k++ {
		pl := targetPlaces[k%len(targetPlaces)]
		gain := 1 + 0.1*float64(k/len(targetPlaces))
		p := lens.Pose{Rotation: [3]float64{pl.rx * gain, pl.ry * gain, pl.rz}}
		R := p.Matrix()
		X := (pl.u*float64(m.Width-1) - m.Cx) / m.Fx * z
		Y := (pl.v*float64(m.Height-1) - m.Cy) / m.Fy * z
		p.Translation = [3]float64{X - (R[0]*cx + R[1]*cy), Y - (R[3]*cx + R[4]*cy), z - (R[6]*cx + R[7]*cy)}
		poses = append(poses, p)
	}
	return poses
}

package synth

import (
	"fmt"
	"math"
	"math/rand/v2"
	"runtime"
	"sync"
	"sync/atomic"

	"spallscope/dic/lens"
	"spallscope/dic/region"
	"spallscope/subset"
)

// Camera describes how a frame is recorded.
type Camera struct {
	// Depth is the bit depth, 8 or 16.
	Depth int `json:"depth"`
	// Noise is the standard deviation of additive Gaussian sensor noise, in
	// gray levels of the depth (e.g. 2 for an 8-bit frame, 500 for 16-bit).
	Noise float64 `json:"noise,omitempty"`
	// Blur is the standard deviation in px of a Gaussian optical blur
	// applied in the image plane (0 = none).
	Blur float64 `json:"blur_px,omitempty"`
	// Oversample is the number n of Gauss–Legendre points per pixel side
	// (n×n per pixel) used to integrate light over each pixel; 1 samples
	// the pixel centre only. Default 2.
	Oversample int `json:"oversample,omitempty"`
	// Void is the gray level (fraction of full scale) seen through openings
	// and open cracks (default 0.04: a dark hole).
	Void float64 `json:"void,omitempty"`
	// Seed fixes the noise; each frame adds its index.
	Seed uint64 `json:"seed,omitempty"`
}

func (c Camera) withDefaults() Camera {
	if c.Depth == 0 {
		c.Depth = 8
	}
	if c.Oversample == 0 {
		c.Oversample = 2
	}
	if c.Void == 0 {
		c.Void = 0.04
	}
	return c
}

// Validate reports settings that cannot be rendered.
func (c Camera) Validate() error {
	c = c.withDefaults()
	switch {
	case c.Depth != 8 && c.Depth != 16:
		return fmt.Errorf("bit depth %d, expected 8 or 16", c.Depth)
	case c.Noise < 0 || c.Blur < 0:
		return fmt.Errorf("noise %g and blur %g must not be negative", c.Noise, c.Blur)
	case c.Oversample < 1 || c.Oversample > 4:
		return fmt.Errorf("oversample %d, expected 1 to 4", c.Oversample)
	}
	return nil
}

// FullScale is the largest gray level of the depth.
func (c Camera) FullScale() float64 {
	if c.withDefaults().Depth == 16 {
		return 65535
	}
	return 255
}

// Scene is what the camera sees in one frame.
type Scene struct {
	Speckles *Speckles
	// Field is the displacement from the reference; nil means undeformed.
	Field Field
	// Openings are untextured regions, in reference coordinates.
	Openings []Opening
	// Spalled regions (reference coordinates) show the Fresh pattern instead
	// of the original paint: material that has come off, exposing new rock
	// whose texture no longer correlates with the reference.
	Spalled []Opening
	Fresh   *Speckles
	// Lens, if not nil, is the camera's lens: the scene (pattern, field,
	// openings) lives in the lens's ideal pixels and each sample of the
	// photo is first mapped to ideal pixels by the lens's inverse. nil is
	// a perfect lens.
	Lens *lens.Model
	// Magnification, if not 0, is the apparent magnification of
	// out-of-plane motion about (MagCx, MagCy), in ideal pixels: each
	// sample is mapped back by it after the lens and before the field.
	Magnification, MagCx, MagCy float64
	// Plate, if not nil, is a rigid plate (reference pixels) that the field
	// does not move and that hides the face behind it.
	Plate *region.Rect
}

// gaussLegendre returns nodes on [−½, ½] and weights summing to 1
// (Abramowitz & Stegun, Table 25.4).
func gaussLegendre(n int) (nodes, weights []float64) {
	switch n {
	case 1:
		return []float64{0}, []float64{1}
	case 2:
		a := 0.5 / math.Sqrt(3)
		return []float64{-a, a}, []float64{0.5, 0.5}
	case 3:
		a := 0.5 * math.Sqrt(0.6)
		return []float64{-a, 0, a}, []float64{5.0 / 18, 8.0 / 18, 5.0 / 18}
	default:
		a := 0.5 * math.Sqrt(3.0/7-2.0/7*math.Sqrt(1.2))
		b := 0.5 * math.Sqrt(3.0/7+2.0/7*math.Sqrt(1.2))
		wa := (18 + math.Sqrt(30)) / 72
		wb := (18 - math.Sqrt(30)) / 72
		return []float64{-b, -a, a, b}, []float64{wb, wa, wa, wb}
	}
}

// Invert finds the reference point X that field f moves to image point
// (x, y), solving X + u(X) = (x, y) by Newton's method with the analytic
// gradient. It reports false where no material point lands (inside an open
// crack) or the iteration does not settle to 1e-6 px (a position error that
// moves a gray level by well under 1e-3 of a level).
func Invert(f Field, x, y float64) (float64, float64, bool) {
	return invertFrom(f, x, y, x, y)
}

// invertFrom is Invert started from the guess (X, Y); a neighbouring
// pixel's solution saves most iterations.
func invertFrom(f Field, x, y, X, Y float64) (float64, float64, bool) {
	if f == nil {
		return x, y, true
	}
	for it := 0; it < 40; it++ {
		m := f.At(X, Y)
		rx, ry := X+m.U-x, Y+m.V-y
		if rx*rx+ry*ry < 1e-12 {
			return X, Y, true
		}
		a, b, c, d := 1+m.UX, m.UY, m.VX, 1+m.VY
		det := a*d - b*c
		if !(math.Abs(det) > 1e-9) {
			return X, Y, false
		}
		X -= (d*rx - b*ry) / det
		Y -= (a*ry - c*rx) / det
	}
	return X, Y, false
}

// Render records scene sc as a width×height frame: Expose, then Record.
func Render(sc Scene, cam Camera, width, height, frame int) (*subset.Image, error) {
	img, err := Expose(sc, cam, width, height)
	if err != nil {
		return nil, err
	}
	Record(img, cam, frame)
	return img, nil
}

// Expose returns the light reaching each pixel of a width×height frame, in
// gray levels of the camera's depth, before blur, noise and quantisation.
// Each pixel integrates over its area with cam.Oversample² Gauss–Legendre
// points, each mapped to ideal pixels through the scene's lens, if any
// (lens.Model.Undistort), and back to the reference by Invert.
func Expose(sc Scene, cam Camera, width, height int) (*subset.Image, error) {
	cam = cam.withDefaults()
	if err := cam.Validate(); err != nil {
		return nil, err
	}
	if sc.Speckles == nil {
		return nil, fmt.Errorf("render: scene has no speckle pattern")
	}
	full := cam.FullScale()
	img := subset.NewImage(width, height, cam.Depth)
	nodes, weights := gaussLegendre(cam.Oversample)
	var next atomic.Int64
	var wg sync.WaitGroup
	for w := 0; w < runtime.GOMAXPROCS(0); w++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for {
				y := int(next.Add(1) - 1)
				if y >= height {
					return
				}
				row := img.Row(y)
				var dx, dy float64 // last material offset X − x: the next guess
				for x := range row {
					sum := 0.0
					for j, oy := range nodes {
						for i, ox := range nodes {
							px, py := float64(x)+ox, float64(y)+oy
							if sc.Lens != nil {
								var seen bool
								if px, py, seen = sc.Lens.Undistort(px, py); !seen {
									sum += weights[i] * weights[j] * cam.Void
									continue
								}
							}
							if sc.Magnification != 0 {
								px = sc.MagCx + (px-sc.MagCx)/(1+sc.Magnification)
								py = sc.MagCy + (py-sc.MagCy)/(1+sc.Magnification)
							}
							if sc.Plate != nil && sc.Plate.Contains(px, py) {
								sum += weights[i] * weights[j] * sc.Speckles.Level(px, py)
								continue
							}
							X, Y, ok := invertFrom(sc.Field, px, py, px+dx, py+dy)
							if (dx != 0 || dy != 0) && (!ok || sc.inOpening(X, Y)) {
								// A warm start can land across a jump or on a spurious
								// root inside an opening: start again from the pixel.
								X, Y, ok = Invert(sc.Field, px, py)
							}
							if ok && !sc.inOpening(X, Y) {
								dx, dy = X-px, Y-py
							}
							sum += weights[i] * weights[j] * sc.level(X, Y, ok, cam.Void)
						}
					}
					row[x] = float32(sum * full)
				}
			}
		}()
	}
	wg.Wait()
	return img, nil
}

// Record turns an exposure into a recorded frame in place: optional optical
// blur, Gaussian sensor noise seeded by cam.Seed + frame, and quantisation
// to the bit depth.
func Record(img *subset.Image, cam Camera, frame int) {
	cam = cam.withDefaults()
	full := cam.FullScale()
	if cam.Blur > 0 {
		gaussianBlur(img, cam.Blur)
	}
	if cam.Noise > 0 {
		rng := rand.New(rand.NewPCG(cam.Seed+uint64(frame), 0xa11ce))
		for i := range img.Pix {
			img.Pix[i] += float32(cam.Noise * rng.NormFloat64())
		}
	}
	for i, v := range img.Pix {
		img.Pix[i] = float32(math.Min(full, math.Max(0, math.Round(float64(v)))))
	}
}

// level is the gray level (fraction of full scale) seen at an image point
// whose material point is (X, Y); ok is false where there is no material.
func (sc Scene) level(X, Y float64, ok bool, void float64) float64 {
	if !ok || sc.inOpening(X, Y) || (sc.Plate != nil && sc.Plate.Contains(X, Y)) {
		return void
	}
	if sc.Fresh != nil {
		for _, o := range sc.Spalled {
			if o.Contains(X, Y) {
				return sc.Fresh.Level(X, Y)
			}
		}
	}
	return sc.Speckles.Level(X, Y)
}

func (sc Scene) inOpening(X, Y float64) bool {
	for _, o := range sc.Openings {
		if o.Contains(X, Y) {
			return true
		}
	}
	return false
}

// gaussianBlur convolves img in place with a separable Gaussian of standard
// deviation sigma px, mirroring at the borders.
func gaussianBlur(img *subset.Image, sigma float64) {
	r := int(math.Ceil(3 * sigma))
	k := make([]float64, 2*r+1)
	sum := 0.0
	for i := range k {
		d := float64(i - r)
		k[i] = math.Exp(-d * d / (2 * sigma * sigma))
		sum += k[i]
	}
	for i := range k {
		k[i] /= sum
	}
	w, h := img.Width, img.Height
	tmp := make([]float32, len(img.Pix))
	for y := 0; y < h; y++ {
		for x := 0; x < w; x++ {
			acc := 0.0
			for i, kv := range k {
				acc += kv * float64(img.Pix[y*w+mirror(x+i-r, w)])
			}
			tmp[y*w+x] = float32(acc)
		}
	}
	for y := 0; y < h; y++ {
		for x := 0; x < w; x++ {
			acc := 0.0
			for i, kv := range k {
				acc += kv * float64(tmp[mirror(y+i-r, h)*w+x])
			}
			img.Pix[y*w+x] = float32(acc)
		}
	}
}

// mirror reflects index i into [0, n) (whole-sample symmetric boundary).
func mirror(i, n int) int {
	if n == 1 {
		return 0
	}
	for i < 0 || i >= n {
		if i < 0 {
			i = -i
		}
		if i >= n {
			i = 2*(n-1) - i
		}
	}
	return i
}

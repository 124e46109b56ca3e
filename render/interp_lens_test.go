package render

import (
	"math"
	"testing"

	"spallscope/dic"
	"spallscope/dic/lens"
	"spallscope/dic/region"
)

// With a lens, a field in undistorted px is drawn on the photo as taken:
// photo pixel p shows the field's value at the lens's undistorted position
// of p (lens.Model.Undistort, checked against OpenCV's undistortPoints in
// package lens). A field whose value is its own x position, linear and so
// exact under bilinear interpolation, shows Undistort(p).x at every drawn
// pixel, to float32 rounding; moved by a uniform displacement (2, −1), it
// shows Undistort(p).x − 2, the reference position that moved there. A
// marked position goes to Distort(X + u). The reference mask, in photo
// pixels, keeps the material it excludes clear, where that material is.
func TestRasterThroughLens(t *testing.T) {
	m := lens.Model{Width: 120, Height: 90, Fx: 100, Fy: 100, Cx: 59.5, Cy: 44.5, K1: -0.25, P2: 0.002}
	g := dic.Grid{X0: -20, Y0: -20, Step: 10, Cols: 17, Rows: 14}
	xs, us, vs := &GridValues{Grid: g}, &GridValues{Grid: g}, &GridValues{Grid: g}
	for i := 0; i < g.Len(); i++ {
		x, _ := g.Pos(i)
		xs.Values = append(xs.Values, float64(x))
		us.Values, vs.Values = append(us.Values, 2), append(vs.Values, -1)
	}
	keep, err := region.Layout{Exclude: []region.Shape{region.Circle(30, 30, 6)}}.Rasterise(120, 90)
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		name string
		d    *Deformation
		du   float64
	}{{"still", &Deformation{Lens: &m}, 0}, {"moved", &Deformation{U: us, V: vs, Lens: &m}, 2}} {
		r, err := xs.RasterOn(c.d, 120, 90, keep)
		if err != nil {
			t.Fatal(err)
		}
		drawn, worst := 0, 0.0
		for y := 0; y < 90; y++ {
			for x := 0; x < 120; x++ {
				v := float64(r.Pix[y*120+x])
				if math.IsNaN(v) {
					continue
				}
				X, Y, _ := m.Undistort(float64(x), float64(y))
				// the material shown there was at Distort(X − u) in the
				// reference photo, where the mask is
				if kx, ky := m.Distort(X-c.du, Y+c.du/2); math.Hypot(kx-30, ky-30) < 5 {
					t.Fatalf("%s: photo pixel (%d, %d) drawn, whose material the mask excludes", c.name, x, y)
				}
				worst = math.Max(worst, math.Abs(v-(X-c.du)))
				drawn++
			}
		}
		if drawn < 100*80 || worst > 1e-3 {
			t.Errorf("%s: %d pixels drawn, worst %.2g px off Undistort(p).x − %g", c.name, drawn, worst, c.du)
		}
		x, y, ok := c.d.Current(10, 20)
		wx, wy := m.Distort(10+c.du, 20-c.du/2)
		if !ok || math.Abs(x-wx) > 1e-9 || math.Abs(y-wy) > 1e-9 {
			t.Errorf("%s: (10, 20) drawn at (%g, %g), want (%g, %g)", c.name, x, y, wx, wy)
		}
	}
}

// Through a lens, a grid inside the photo is drawn wherever a photo
// pixel's undistorted position lies within half a step of the grid (At's
// rule), and nowhere else: the photo box the raster scans covers it.
func TestRasterThroughLensCoversTheGrid(t *testing.T) {
	m := lens.Model{Width: 120, Height: 90, Fx: 100, Fy: 100, Cx: 59.5, Cy: 44.5, K1: -0.25}
	g := dic.Grid{X0: 70, Y0: 50, Step: 10, Cols: 5, Rows: 4}
	vals := &GridValues{Grid: g, Values: make([]float64, g.Len())}
	r, err := vals.RasterOn(&Deformation{Lens: &m}, 120, 90, nil)
	if err != nil {
		t.Fatal(err)
	}
	for y := 0; y < 90; y++ {
		for x := 0; x < 120; x++ {
			X, Y, _ := m.Undistort(float64(x), float64(y))
			inside := X >= 65.01 && X <= 114.99 && Y >= 45.01 && Y <= 84.99
			outside := X < 64.99 || X > 115.01 || Y < 44.99 || Y > 85.01
			drawn := !math.IsNaN(float64(r.Pix[y*120+x]))
			if (inside && !drawn) || (outside && drawn) {
				t.Fatalf("photo pixel (%d, %d) at (%.2f, %.2f) undistorted: drawn %v", x, y, X, Y, drawn)
			}
		}
	}
}

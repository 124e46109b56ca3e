package lens

import (
	"math"
	"testing"

	"spallscope/dic"
	"spallscope/dic/region"
	"spallscope/subset"
)

// idealMotion is an exact displacement field in ideal pixels: a uniform
// strain with a small rotation about (cx, cy) and a translation.
func idealMotion(X, Y float64) (u, v float64) {
	const exx, eyy, exy, rot = 1e-3, -4e-4, 2e-4, 3e-4
	dx, dy := X-300, Y-250
	return 1.7 + exx*dx + (exy-rot)*dy, -0.6 + (exy+rot)*dx + eyy*dy
}

// photoField is what a perfect tracker measures in the photos of the
// lens: at photo grid point p the displacement Distort(P + U(P)) − p with
// P = Undistort(p), and its gradient by central differences of that map
// (a reference independent of the chain rule Correction uses).
func photoField(t *testing.T, m *Model, g dic.Grid) *dic.Field {
	t.Helper()
	f := &dic.Field{Grid: g, Points: make([]dic.Point, g.Len())}
	at := func(x, y float64) (float64, float64) {
		X, Y, ok := m.Undistort(x, y)
		if !ok {
			t.Fatalf("no inverse at (%g, %g)", x, y)
		}
		u, v := idealMotion(X, Y)
		px, py := m.Distort(X+u, Y+v)
		return px - x, py - y
	}
	const h = 1e-3
	for i := range f.Points {
		x, y := g.Pos(i)
		p := &f.Points[i]
		p.X, p.Y, p.Status, p.ZNCC = x, y, subset.Converged, 0.99
		fx, fy := float64(x), float64(y)
		u, v := at(fx, fy)
		ue, ve := at(fx+h, fy)
		uw, vw := at(fx-h, fy)
		us, vs := at(fx, fy+h)
		un, vn := at(fx, fy-h)
		p.P[subset.PU], p.P[subset.PV] = u, v
		p.P[subset.PUx], p.P[subset.PUy] = (ue-uw)/(2*h), (us-un)/(2*h)
		p.P[subset.PVx], p.P[subset.PVy] = (ve-vw)/(2*h), (vs-vn)/(2*h)
	}
	return f
}

// Corrected fields give back the ideal field: on every grid point the
// corrected displacement is the exact one to 2e-4 px and its gradient to
// 5e-5. What is left is the error of carrying a subset's affine shape over
// up to half a diagonal step (7 px) when the photo field is not affine: a
// 1.7 px translation seen through the distortion has a gradient that
// changes by about u·6·k1/f²·h ≈ 2e-5 over that distance (measured 8e-5 px
// and 1.9e-5, both far below the noise of a tracked field).
func TestCorrectionRecoversIdealField(t *testing.T) {
	m := typical
	g := dic.Grid{X0: 10, Y0: 12, Step: 10, Cols: 63, Rows: 46}
	c, err := NewCorrection(m, m.Width, m.Height, nil)
	if err != nil {
		t.Fatal(err)
	}
	out := c.Field(photoField(t, &m, g))
	var worstU, worstG float64
	valid := 0
	for i := range out.Points {
		p := &out.Points[i]
		if !p.Valid() {
			continue
		}
		valid++
		X, Y := float64(p.X), float64(p.Y)
		u, v := idealMotion(X, Y)
		worstU = math.Max(worstU, math.Hypot(p.P[subset.PU]-u, p.P[subset.PV]-v))
		want := [4]float64{1e-3, 2e-4 - 3e-4, 2e-4 + 3e-4, -4e-4}
		got := [4]float64{p.P[subset.PUx], p.P[subset.PUy], p.P[subset.PVx], p.P[subset.PVy]}
		for k := range got {
			worstG = math.Max(worstG, math.Abs(got[k]-want[k]))
		}
	}
	t.Logf("%d of %d points corrected; worst displacement error %.2g px, gradient %.2g", valid, len(out.Points), worstU, worstG)
	if valid < len(out.Points)*9/10 {
		t.Errorf("only %d of %d points corrected", valid, len(out.Points))
	}
	if worstU > 2e-4 || worstG > 5e-5 {
		t.Errorf("worst displacement error %.3g px (want < 2e-4), gradient %.3g (want < 5e-5)", worstU, worstG)
	}
}

// Points whose photo position falls on masked pixels are masked, those
// beyond half a step from the tracked grid out of image, and a lost
// subset's point stays lost (the statuses of subset.Status). A lens for
// photos of another size is refused.
func TestCorrectionStatuses(t *testing.T) {
	m := typical
	m.K1, m.K2, m.K3 = 0.3, 0, 0 // pincushion: the grid's ideal corner is shown beyond the photo grid
	g := dic.Grid{X0: 10, Y0: 12, Step: 10, Cols: 63, Rows: 46}
	f := photoField(t, &m, g)
	mask := region.Full(m.Width, m.Height)
	for y := 150; y < 170; y++ {
		for x := 200; x < 230; x++ {
			mask.Pix[y*m.Width+x] = 0
		}
	}
	c, err := NewCorrection(m, m.Width, m.Height, mask)
	if err != nil {
		t.Fatal(err)
	}
	lostX, lostY := m.Distort(320, 232) // near the centre the distortion moves points by under half a step
	f.Points[g.Index(int(math.Round((lostX-10)/10)), int(math.Round((lostY-12)/10)))].Status = subset.Lost
	out := c.Field(f)
	status := func(X, Y int) subset.Status { return out.Points[g.Index((X-10)/10, (Y-12)/10)].Status }
	for _, tc := range []struct {
		x, y int
		want subset.Status
	}{{320, 232, subset.Lost}, {210, 152, subset.Masked}, {10, 12, subset.OutOfImage}, {630, 462, subset.OutOfImage}, {100, 102, subset.Converged}} {
		px, py := m.Distort(float64(tc.x), float64(tc.y))
		if got := status(tc.x, tc.y); got != tc.want {
			t.Errorf("ideal (%d, %d), photo (%.1f, %.1f): %v, want %v", tc.x, tc.y, px, py, got, tc.want)
		}
	}
	if _, err := NewCorrection(m, m.Width+2, m.Height, nil); err == nil {
		t.Error("a lens for another photo size was accepted")
	}
}

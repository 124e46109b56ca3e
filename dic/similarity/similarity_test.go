package similarity

import (
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"spallscope/dic"
	"spallscope/subset"
)

// gridField is a 20×15 grid at a 10 px step whose point at X moves to
// c + t + s·R(θ)·(X − c) about c = (cx, cy), plus Gaussian noise of sd px.
func gridField(s, thetaDeg, tx, ty, cx, cy, sd float64) *dic.Field {
	g := dic.Grid{X0: 30, Y0: 40, Step: 10, Cols: 20, Rows: 15}
	f := &dic.Field{Name: "f", Grid: g, Points: make([]dic.Point, g.Len())}
	sin, cos := math.Sincos(thetaDeg * math.Pi / 180)
	rng := rand.New(rand.NewPCG(7, 11))
	for i := range f.Points {
		x, y := g.Pos(i)
		X, Y := float64(x)-cx, float64(y)-cy
		p := &f.Points[i]
		p.X, p.Y, p.Status = x, y, subset.Converged
		p.P[subset.PU] = cx + tx + s*(cos*X-sin*Y) - float64(x) + sd*rng.NormFloat64()
		p.P[subset.PV] = cy + ty + s*(sin*X+cos*Y) - float64(y) + sd*rng.NormFloat64()
		p.P[subset.PUx], p.P[subset.PUy] = s*cos-1, -s*sin
		p.P[subset.PVx], p.P[subset.PVy] = s*sin, s*cos-1
	}
	return f
}

// Least squares recovers an exact similarity exactly (Umeyama 1991, IEEE
// Trans. PAMI 13, 376: the closed form is the minimiser, whose residual is
// zero for exact data): magnification, rotation and the centroid's
// translation to rounding.
func TestFitRecoversAnExactSimilarity(t *testing.T) {
	const s, theta, tx, ty, cx, cy = 1.0008, 0.3, 1.25, -0.75, 200, 150
	f := gridField(s, theta, tx, ty, cx, cy, 0)
	m, err := Fit(f, nil)
	if err != nil {
		t.Fatal(err)
	}
	if m.Points != 300 {
		t.Errorf("%d points fitted, want 300", m.Points)
	}
	if math.Abs(m.Magnification-(s-1)) > 1e-12 || math.Abs(m.RotationDeg-theta) > 1e-10 {
		t.Errorf("magnification %g rotation %g°, want %g and %g°", m.Magnification, m.RotationDeg, s-1, theta)
	}
	// The centroid (125, 110) is (−75, −40) from c; it goes to c + t + sR(X̄ − c).
	sin, cos := math.Sincos(theta * math.Pi / 180)
	X, Y := 125.0-cx, 110.0-cy
	wantU := cx + tx + s*(cos*X-sin*Y) - 125
	wantV := cy + ty + s*(sin*X+cos*Y) - 110
	if math.Abs(m.Cx-125) > 1e-9 || math.Abs(m.U-wantU) > 1e-9 || math.Abs(m.V-wantV) > 1e-9 {
		t.Errorf("centroid (%g, %g) moves by (%g, %g), want (125, 110) by (%g, %g)", m.Cx, m.Cy, m.U, m.V, wantU, wantV)
	}
	if m.RMS > 1e-9 {
		t.Errorf("residual %g px for exact data", m.RMS)
	}
}

// With noise of σ px per component the magnification's standard error is
// σ/sqrt(Σ|X − c|²) (the least-squares slope's standard error, common
// practice, no source): the fit's own estimate is within 15 % of it and
// the error of the fitted magnification within four of it.
func TestFitStandardErrorMatchesTheNoise(t *testing.T) {
	const sd = 0.02
	f := gridField(1.0005, 0, 0.3, 0.1, 200, 150, sd)
	m, err := Fit(f, nil)
	if err != nil {
		t.Fatal(err)
	}
	var sxx float64
	for i := range f.Points {
		X, Y := float64(f.Points[i].X)-m.Cx, float64(f.Points[i].Y)-m.Cy
		sxx += X*X + Y*Y
	}
	want := sd / math.Sqrt(sxx)
	if math.Abs(m.MagnificationSD/want-1) > 0.15 {
		t.Errorf("standard error %g, want %g ± 15 %%", m.MagnificationSD, want)
	}
	if math.Abs(m.Magnification-5e-4) > 4*want {
		t.Errorf("magnification %g, want 5e-4 ± %g", m.Magnification, 4*want)
	}
}

// A region outside the keep function and lost points do not count; too
// few points is an error naming the frame.
func TestFitNeedsEnoughPoints(t *testing.T) {
	f := gridField(1.001, 0, 0, 0, 0, 0, 0)
	_, err := Fit(f, func(x, y int) bool { return x < 50 && y < 50 })
	if err == nil {
		t.Fatal("a fit on 4 points passed")
	}
	for i := range f.Points {
		if i%2 == 0 {
			f.Points[i].Status = subset.Lost
		}
	}
	m, err := Fit(f, nil)
	if err != nil || m.Points != 150 || math.Abs(m.Magnification-1e-3) > 1e-12 {
		t.Errorf("fit on the valid half: %d points, magnification %g, %v", m.Points, m.Magnification, err)
	}
}

// Demagnifying a magnified uniform strain leaves the strain: a map
// x = c + s·(c' + (I+E)(X − c') − c) composed with c + (x − c)/s is
// c' + (I+E)(X − c') exactly, for any centres (composition of affine maps).
func TestDemagnifyLeavesTheStrain(t *testing.T) {
	const s, exx, eyy, cx, cy = 1.0012, 4e-4, -9e-4, 180, 120
	g := dic.Grid{X0: 0, Y0: 0, Step: 16, Cols: 10, Rows: 10}
	f := &dic.Field{Grid: g, Points: make([]dic.Point, g.Len())}
	for i := range f.Points {
		x, y := g.Pos(i)
		X, Y := float64(x), float64(y)
		// strain about (50, 60), then magnification about (cx, cy)
		sx, sy := 50+(1+exx)*(X-50), 60+(1+eyy)*(Y-60)
		p := &f.Points[i]
		p.X, p.Y, p.Status = x, y, subset.Converged
		p.P[subset.PU], p.P[subset.PV] = cx+s*(sx-cx)-X, cy+s*(sy-cy)-Y
		p.P[subset.PUx], p.P[subset.PVy] = s*(1+exx)-1, s*(1+eyy)-1
	}
	d := Demagnify(f, s-1, cx, cy)
	for i := range d.Points {
		p := &d.Points[i]
		X, Y := float64(p.X), float64(p.Y)
		wu, wv := exx*(X-50), eyy*(Y-60)
		if math.Abs(p.P[subset.PU]-wu) > 1e-10 || math.Abs(p.P[subset.PV]-wv) > 1e-10 ||
			math.Abs(p.P[subset.PUx]-exx) > 1e-12 || math.Abs(p.P[subset.PVy]-eyy) > 1e-12 {
			t.Fatalf("point (%d, %d): u %g v %g ux %g vy %g, want %g %g %g %g", p.X, p.Y, p.P[subset.PU], p.P[subset.PV], p.P[subset.PUx], p.P[subset.PVy], wu, wv, exx, eyy)
		}
	}
	if f.Points[5].P[subset.PUx] != s*(1+exx)-1 {
		t.Error("Demagnify changed its input")
	}
}

// A field whose plate (x ≥ 150) shows only a magnification about c and
// whose specimen shows a strain on top of it: compensation finds the
// plate's magnification exactly (Umeyama's closed form on exact data),
// leaves the specimen its own strain and masks the plate.
func TestCompensateWithAPlate(t *testing.T) {
	const s, exx, cx, cy = 1.0007, -1.5e-3, 120, 100
	g := dic.Grid{X0: 0, Y0: 0, Step: 10, Cols: 20, Rows: 15}
	f := &dic.Field{Name: "f7", Grid: g, Points: make([]dic.Point, g.Len())}
	inPlate := func(x, y int) bool { return x >= 150 }
	for i := range f.Points {
		x, y := g.Pos(i)
		X, Y := float64(x), float64(y)
		e := exx
		if inPlate(x, y) {
			e = 0
		}
		p := &f.Points[i]
		p.X, p.Y, p.Status = x, y, subset.Converged
		p.P[subset.PU] = cx + s*((1+e)*X-cx) - X
		p.P[subset.PV] = cy + s*(Y-cy) - Y
		p.P[subset.PUx], p.P[subset.PVy] = s*(1+e)-1, s-1
	}
	out, m, err := Compensate(f, inPlate, cx, cy)
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(m.Magnification-(s-1)) > 1e-12 || m.Points != 5*15 {
		t.Errorf("plate magnification %g on %d points, want %g on 75", m.Magnification, m.Points, s-1)
	}
	for i := range out.Points {
		p := &out.Points[i]
		if inPlate(p.X, p.Y) {
			if p.Valid() {
				t.Fatalf("plate point (%d, %d) left in the specimen's field", p.X, p.Y)
			}
			continue
		}
		if math.Abs(p.P[subset.PUx]-exx) > 1e-12 || math.Abs(p.P[subset.PVy]) > 1e-12 || math.Abs(p.P[subset.PU]-exx*float64(p.X)) > 1e-9 {
			t.Fatalf("specimen point (%d, %d): ux %g vy %g u %g, want %g, 0, %g", p.X, p.Y, p.P[subset.PUx], p.P[subset.PVy], p.P[subset.PU], exx, exx*float64(p.X))
		}
	}
	if _, _, err := Compensate(f, func(x, y int) bool { return x > 1000 }, cx, cy); err == nil || !strings.Contains(err.Error(), "frame f7") {
		t.Errorf("a plate with no points: %v", err)
	}
}

package render

import (
	"math"
	"strings"
	"testing"

	"spallscope/dic"
	"spallscope/subset"
)

// affineField returns a field on grid g whose displacement is u = (F − I)·X
// for the deformation gradient F = [[1+a, b], [c, 1+d]] (X the reference
// position): a homogeneous deformation.
func affineField(g dic.Grid, a, b, c, d float64) *dic.Field {
	f := &dic.Field{Grid: g, Points: make([]dic.Point, g.Len())}
	for i := range f.Points {
		x, y := g.Pos(i)
		p := dic.Point{X: x, Y: y, Status: subset.Converged}
		p.P[subset.PU] = a*float64(x) + b*float64(y)
		p.P[subset.PV] = c*float64(x) + d*float64(y)
		p.P[subset.PUx], p.P[subset.PUy], p.P[subset.PVx], p.P[subset.PVy] = a, b, c, d
		f.Points[i] = p
	}
	return f
}

var extGrid = dic.Grid{X0: 10, Y0: 20, Step: 5, Cols: 21, Rows: 31}

// On a uniform uniaxial strain the extensometer along the strain reads it
// exactly: Δu/L (continuum kinematics: the stretch of a line element N is
// |F·N|, and for F = diag(1, 1+d) along y it is 1 + d). Tolerance 1e-9.
func TestExtensometerUniformStrain(t *testing.T) {
	for _, d := range []float64{-2.5e-3, -1e-6, 4e-4, 0.02} {
		f := affineField(extGrid, 0.3*d, 0, 0, d)
		e := Extensometer{X1: 30, Y1: 40, X2: 30, Y2: 160}
		got, ok, err := e.Strain(f)
		if err != nil || !ok {
			t.Fatalf("d=%g: %v, ok %v", d, err, ok)
		}
		if math.Abs(got-d) > 1e-9 {
			t.Errorf("d=%g: extensometer reads %.12g", d, got)
		}
	}
}

// On a general homogeneous deformation an oblique extensometer reads the
// stretch of its direction minus one, |F·N| − 1 (continuum kinematics,
// e.g. Holzapfel, Nonlinear Solid Mechanics, 2000, ch. 2), within 1e-9; ends off
// the grid points snap to the nearest ones, which here keep the direction.
func TestExtensometerOblique(t *testing.T) {
	a, b, c, d := 1.5e-3, -4e-4, 7e-4, -2.2e-3
	f := affineField(extGrid, a, b, c, d)
	e := Extensometer{X1: 21.2, Y1: 29, X2: 79, Y2: 121.4} // snaps to (20,30)–(80,120)
	got, ok, err := e.Strain(f)
	if err != nil || !ok {
		t.Fatal(err, ok)
	}
	nx, ny := 60.0, 90.0
	l := math.Hypot(nx, ny)
	nx, ny = nx/l, ny/l
	want := math.Hypot((1+a)*nx+b*ny, c*nx+(1+d)*ny) - 1
	if math.Abs(got-want) > 1e-9 {
		t.Errorf("oblique extensometer %.12g, stretch − 1 = %.12g", got, want)
	}
}

// A rigid rotation with a translation changes no length: the extensometer
// reads 0 within 1e-9 (it follows the distance, not a projection).
func TestExtensometerRigidMotion(t *testing.T) {
	th := 0.05 // rad
	f := affineField(extGrid, math.Cos(th)-1, -math.Sin(th), math.Sin(th), math.Cos(th)-1)
	for i := range f.Points {
		f.Points[i].P[subset.PU] += 3.7
		f.Points[i].P[subset.PV] -= 1.2
	}
	got, ok, err := Extensometer{X1: 20, Y1: 30, X2: 100, Y2: 150}.Strain(f)
	if err != nil || !ok || math.Abs(got) > 1e-9 {
		t.Errorf("rigid motion: %.3g (ok %v, %v)", got, ok, err)
	}
}

// An end without a measurement reads nothing; ends off the grid or on one
// point are errors that say what is wrong.
func TestExtensometerInvalidAndErrors(t *testing.T) {
	f := affineField(extGrid, 0, 0, 0, 1e-3)
	i, _ := nearestGridPoint(extGrid, 30, 40)
	f.Points[i].Status = subset.Lost
	if v, ok, err := (Extensometer{X1: 30, Y1: 40, X2: 30, Y2: 160}).Strain(f); ok || err != nil || !math.IsNaN(v) {
		t.Errorf("lost end: %v, ok %v, %v", v, ok, err)
	}
	cases := []struct {
		e    Extensometer
		want string
	}{
		{Extensometer{X1: 30, Y1: 40, X2: 30, Y2: 400}, "outside the grid"},
		{Extensometer{X1: -10, Y1: 40, X2: 30, Y2: 100}, "end 1"},
		{Extensometer{X1: 30, Y1: 40, X2: 31, Y2: 41}, "both ends fall on grid point"},
	}
	for _, c := range cases {
		if _, _, err := c.e.Strain(f); err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%v: error %v, want %q", c.e, err, c.want)
		}
	}
}

// The default extensometer is vertical, a quarter in from the left, spans
// 80 % of the grid height (rows 1 and 10 of 0…11 here) and sits on
// measured points beside the fixture's opening.
func TestExtensometerDefault(t *testing.T) {
	ref := fixtureField(0)
	e := DefaultExtensometer(ref)
	g := ref.Grid
	if e.X1 != e.X2 || e.X1 != float64(g.X0+3*g.Step) {
		t.Errorf("default extensometer %v: want vertical at x = %d px", e, g.X0+3*g.Step)
	}
	if e.Y1 != float64(g.Y0+g.Step) || e.Y2 != float64(g.Y0+10*g.Step) {
		t.Errorf("default extensometer %v: want y from %d to %d px", e, g.Y0+g.Step, g.Y0+10*g.Step)
	}
	i, j, err := e.Ends(g)
	if err != nil || !ref.Points[i].Valid() || !ref.Points[j].Valid() {
		t.Errorf("default ends %d, %d not measured (%v)", i, j, err)
	}
	// An end on the opening moves to the nearest measured point.
	hole, _ := nearestGridPoint(g, fixtureCx, fixtureCy)
	if k := nearestValidPoint(ref, hole); !ref.Points[k].Valid() || k == hole {
		t.Errorf("nearest valid point to the opening's centre: %d", k)
	}
}

package model_test

import (
	"math"
	"os"
	"path/filepath"
	"testing"

	"gonum.org/v1/gonum/mat"

	"spallscope/strain/model"
)

// The mapping of Format's comment, worked by hand: a model in mm with its
// origin at (100, 200) px, 0.05 mm/px, y up. The point (1, 2) mm is 20 px
// right of and 40 px above the origin; a displacement (0.01, 0.02) mm is
// (0.2, −0.4) px.
func TestFormatMapping(t *testing.T) {
	f := model.Format{Units: model.MM, Scale: 0.05, OriginX: 100, OriginY: 200, YUp: true}
	if err := f.Validate(); err != nil {
		t.Fatal(err)
	}
	x, y := f.ToImage(1, 2)
	u, v := f.DisplacementToImage(0.01, 0.02)
	if math.Abs(x-120) > 1e-9 || math.Abs(y-160) > 1e-9 || math.Abs(u-0.2) > 1e-12 || math.Abs(v+0.4) > 1e-12 {
		t.Errorf("(1, 2) mm → (%g, %g) px, want (120, 160); (0.01, 0.02) mm → (%g, %g) px, want (0.2, −0.4)", x, y, u, v)
	}
	f.YUp, f.Units = false, model.PX
	x, y = f.ToImage(1, 2)
	u, v = f.DisplacementToImage(0.01, 0.02)
	if x != 101 || y != 202 || u != 0.01 || v != 0.02 {
		t.Errorf("px, y down: (1, 2) → (%g, %g), (0.01, 0.02) → (%g, %g); want the origin shift only", x, y, u, v)
	}
}

// Strains follow the tensor transformation rule ε′ = Q ε Qᵀ for the
// reflection Q = diag(1, −1) that turns y up into y down (continuum
// mechanics: a change of basis of a second-order tensor): exx and eyy stay,
// exy changes sign. Compression positive negates the tensor.
func TestStrainToImage(t *testing.T) {
	const exx, eyy, exy = 1e-3, -2e-3, 4e-4
	e := mat.NewDense(2, 2, []float64{exx, exy, exy, eyy})
	q := mat.NewDense(2, 2, []float64{1, 0, 0, -1})
	var want mat.Dense
	want.Product(q, e, q.T())
	for _, c := range []struct {
		f    model.Format
		sign float64
		want *mat.Dense
	}{
		{model.Format{Units: model.PX, YUp: true}, 1, &want},
		{model.Format{Units: model.PX, YUp: true, CompressionPositive: true}, -1, &want},
		{model.Format{Units: model.PX}, 1, e},
	} {
		gx, gy, gs := c.f.StrainToImage(exx, eyy, exy)
		if math.Abs(gx-c.sign*c.want.At(0, 0)) > 1e-15 || math.Abs(gy-c.sign*c.want.At(1, 1)) > 1e-15 || math.Abs(gs-c.sign*c.want.At(0, 1)) > 1e-15 {
			t.Errorf("%+v: (%g, %g, %g), want %g × (%g, %g, %g)", c.f, gx, gy, gs, c.sign, c.want.At(0, 0), c.want.At(1, 1), c.want.At(0, 1))
		}
	}
}

// Read applies the format to every point and value: a compression-positive
// strain and a y-up displacement come out in the image's frame.
func TestReadAppliesFormat(t *testing.T) {
	path := filepath.Join(t.TempDir(), "m.csv")
	if err := os.WriteFile(path, []byte("x,y,u,v,exx,eyy,exy\n2,-1,0.01,0.02,0.001,-0.003,0.0005\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	m, err := model.Read(path, model.Format{Units: model.MM, Scale: 0.1, OriginX: 50, OriginY: 60, YUp: true, CompressionPositive: true})
	if err != nil {
		t.Fatal(err)
	}
	p := m.Points[0]
	want := [...]float64{0.1, -0.2, -0.001, 0.003, 0.0005}
	if math.Abs(p.X-70) > 1e-9 || math.Abs(p.Y-70) > 1e-9 || p.ModelX != 2 || p.ModelY != -1 {
		t.Errorf("point (%g, %g) mm at (%g, %g) px, want (70, 70)", p.ModelX, p.ModelY, p.X, p.Y)
	}
	for k, q := range model.Quantities {
		if math.Abs(p.Value(q)-want[k]) > 1e-12 {
			t.Errorf("%s = %g, want %g", q, p.Value(q), want[k])
		}
	}
}

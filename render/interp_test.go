package render

import (
	"math"
	"testing"

	"spallscope/dic"
	"spallscope/dic/region"
	"spallscope/dic/synth"
)

// sampleGrid samples f at the points of g, NaN where invalid says so.
func sampleGrid(g dic.Grid, f func(x, y float64) float64, invalid func(x, y float64) bool) *GridValues {
	gv := &GridValues{Grid: g, Values: make([]float64, g.Len())}
	for i := range gv.Values {
		x, y := g.Pos(i)
		gv.Values[i] = f(float64(x), float64(y))
		if invalid != nil && invalid(float64(x), float64(y)) {
			gv.Values[i] = math.NaN()
		}
	}
	return gv
}

// The synthetic lab's uniform strain has a displacement linear in x and y,
// which bilinear interpolation reproduces exactly: every pixel inside the
// grid must carry the lab's exact u to rounding (1e-9 px).
func TestInterpBilinearMatchesExactLinearField(t *testing.T) {
	us := synth.UniformStrain{Cx: 50, Cy: 40, Exx: 3e-3, Eyy: -2e-3, Exy: 1e-3}
	g := dic.Grid{X0: 5, Y0: 4, Step: 7, Cols: 13, Rows: 10}
	gv := sampleGrid(g, func(x, y float64) float64 { return us.At(x, y).U }, nil)
	r, err := gv.Raster(100, 80, nil)
	if err != nil {
		t.Fatal(err)
	}
	worst, n := 0.0, 0
	for y := g.Y0; y <= g.Y0+(g.Rows-1)*g.Step; y++ {
		for x := g.X0; x <= g.X0+(g.Cols-1)*g.Step; x++ {
			v := float64(r.Pix[y*r.Width+x])
			worst = math.Max(worst, math.Abs(v-us.At(float64(x), float64(y)).U))
			n++
		}
	}
	// float32 storage of values about 0.2 px: 2e-8 px of rounding.
	if worst > 1e-7 {
		t.Errorf("bilinear raster of a linear field: largest error %.3g px over %d pixels, expected rounding only", worst, n)
	}
}

// Edges: next to an invalid point a valid one colours up to half a step
// around it and no further; a pixel the mask excludes stays clear even with
// valid points all around; outside the grid by more than half a step there
// is nothing.
func TestInterpEdgesOpeningsAndBeyond(t *testing.T) {
	g := dic.Grid{X0: 10, Y0: 10, Step: 8, Cols: 5, Rows: 5}
	// Point (2, 2) at (26, 26) is invalid.
	gv := sampleGrid(g, func(x, y float64) float64 { return x }, func(x, y float64) bool { return x == 26 && y == 26 })
	cases := []struct {
		x, y float64
		ok   bool
		v    float64
	}{
		{14, 14, true, 14},       // inside a cell with four valid corners: bilinear
		{18 + 3.9, 26, true, 18}, // within half a step of valid (18, 26), in a cell touching the invalid point
		{26, 26 - 3.8, false, 0}, // nearest point is the invalid one
		{10 - 4, 20, true, 10},   // half a step outside the grid
		{10 - 4.5, 20, false, 0}, // beyond half a step
	}
	for _, c := range cases {
		v, ok := gv.At(c.x, c.y)
		if ok != c.ok || (ok && math.Abs(v-c.v) > 1e-12) {
			t.Errorf("At(%g, %g) = %g, %t; expected %g, %t", c.x, c.y, v, ok, c.v, c.ok)
		}
	}
	keep, err := region.Layout{Exclude: []region.Shape{region.Circle(14, 14, 2)}}.Rasterise(60, 60)
	if err != nil {
		t.Fatal(err)
	}
	r, err := gv.Raster(60, 60, keep)
	if err != nil {
		t.Fatal(err)
	}
	if v := r.Pix[14*60+14]; !math.IsNaN(float64(v)) {
		t.Errorf("pixel in an excluded circle drawn with %g, expected clear", v)
	}
	if v := r.Pix[14*60+17]; v != 17 {
		t.Errorf("pixel next to the excluded circle %g, expected 17", v)
	}
}

// On the current frame a field moves with the material: with the lab's
// rigid translation (u, v) = (3.4, −2.2) px, the pixel at x shows the value
// measured at x − u, exactly for a linear value field, and an opening's
// clear disc moves by (u, v).
func TestInterpCurrentFrameFollowsTranslation(t *testing.T) {
	tr := synth.Translation{U: 3.4, V: -2.2}
	g := dic.Grid{X0: 4, Y0: 4, Step: 6, Cols: 16, Rows: 13}
	val := func(x, y float64) float64 { return 2*x - y }
	gv := sampleGrid(g, val, nil)
	d := &Deformation{
		U: sampleGrid(g, func(x, y float64) float64 { return tr.At(x, y).U }, nil),
		V: sampleGrid(g, func(x, y float64) float64 { return tr.At(x, y).V }, nil),
	}
	hole := region.Circle(50, 40, 8)
	keep, err := region.Layout{Exclude: []region.Shape{hole}}.Rasterise(100, 80)
	if err != nil {
		t.Fatal(err)
	}
	r, err := gv.RasterOn(d, 100, 80, keep)
	if err != nil {
		t.Fatal(err)
	}
	for _, p := range [][2]int{{20, 20}, {33, 61}, {70, 15}} {
		want := val(float64(p[0])-tr.U, float64(p[1])-tr.V)
		if got := float64(r.Pix[p[1]*100+p[0]]); math.Abs(got-want) > 1e-4 {
			t.Errorf("current-frame pixel (%d, %d) = %g, expected the value at x − u, %g", p[0], p[1], got, want)
		}
	}
	// The opening's centre has moved to (53.4, 37.8); the reference centre
	// (50, 40) is 4 px inside the moved disc, (44, 40) now outside it.
	if v := r.Pix[38*100+53]; !math.IsNaN(float64(v)) {
		t.Errorf("pixel at the moved opening's centre drawn with %g, expected clear", v)
	}
	if v := r.Pix[40*100+44]; math.IsNaN(float64(v)) {
		t.Errorf("pixel (44, 40), inside the reference opening but left of the moved one, is clear; expected a value")
	}
}

// The overlay's row sampler gives At's value at every pixel bit for bit
// (At is the definition; the row sampler only hoists its per-row work),
// on a grid with invalid points, edges, a mask and pixels beyond the grid.
func TestRowMatchesAt(t *testing.T) {
	g := dic.Grid{X0: 3, Y0: 5, Step: 7, Cols: 11, Rows: 9}
	gv := sampleGrid(g, func(x, y float64) float64 { return math.Sin(x/9) * math.Cos(y/13) },
		func(x, y float64) bool { return (x == 24 && y == 26) || x == 73 })
	keep, err := region.Layout{Exclude: []region.Shape{region.Circle(50, 40, 5)}}.Rasterise(90, 75)
	if err != nil {
		t.Fatal(err)
	}
	s, err := gv.sampler(nil, 90, 75, keep)
	if err != nil {
		t.Fatal(err)
	}
	row := make([]float32, 90)
	drawn := 0
	for y := 0; y < 75; y++ {
		s.row(y, row)
		for x := 0; x < 90; x++ {
			v, ok := gv.At(float64(x), float64(y))
			if !keep.At(x, y) {
				ok = false
			}
			got := row[x]
			switch {
			case ok && got != float32(v):
				t.Fatalf("pixel (%d, %d): row %v, At %v", x, y, got, float32(v))
			case !ok && !math.IsNaN(float64(got)):
				t.Fatalf("pixel (%d, %d): row %v, At has no value", x, y, got)
			}
			if ok {
				drawn++
			}
		}
	}
	if drawn < 3000 {
		t.Errorf("%d pixels drawn: the case does not reach the grid", drawn)
	}
}

package region

import (
	"math"
	"testing"
)

// Rasterised areas against the exact areas of the shapes (πab for an
// ellipse, the shoelace formula for a polygon; elementary geometry): pixel
// counting by centres errs by about the perimeter's share.
func TestRasteriseAreas(t *testing.T) {
	horseshoe := Polygon{{100, 200}, {100, 120}, {110, 95}, {130, 82}, {150, 80}, {170, 82}, {190, 95}, {200, 120}, {200, 200}}
	cases := []struct {
		name      string
		s         Shape
		area, per float64
	}{
		{"circle", Circle(128.3, 120.7, 40), math.Pi * 1600, 2 * math.Pi * 40},
		{"tilted ellipse", Ellipse{Cx: 128, Cy: 128, Rx: 60, Ry: 25, AngleDeg: 30}, math.Pi * 60 * 25, 2 * math.Pi * math.Sqrt((60*60+25*25)/2)},
		{"horseshoe", horseshoe, shoelace(horseshoe), 400},
		{"rect", Rect{10, 20, 59, 39}, 50 * 20, 140}, // inclusive pixel centres: 50×20 pixels exactly
	}
	for _, c := range cases {
		m, err := Layout{ROI: []Shape{c.s}}.Rasterise(256, 256)
		if err != nil {
			t.Fatal(err)
		}
		n := float64(m.Count())
		if math.Abs(n-c.area) > 0.15*c.per {
			t.Errorf("%s: %v pixels, area %.1f px² (perimeter %.0f)", c.name, n, c.area, c.per)
		}
	}
}

func shoelace(p Polygon) float64 {
	a := 0.0
	for i := range p {
		j := (i + 1) % len(p)
		a += p[i][0]*p[j][1] - p[j][0]*p[i][1]
	}
	return math.Abs(a) / 2
}

func TestLayoutExcludesOpenings(t *testing.T) {
	l := Layout{ROI: []Shape{Rect{0, 0, 99, 99}}, Exclude: []Shape{Circle(50, 50, 10)}}
	m, _ := l.Rasterise(120, 100)
	if m.At(50, 50) || !m.At(50, 39) || m.At(105, 50) || !m.At(99, 99) {
		t.Error("mask: opening must be excluded, ROI edge included, outside ROI excluded")
	}
	if _, err := (Layout{Exclude: []Shape{Rect{-1, -1, 200, 200}}}).Rasterise(64, 64); err == nil {
		t.Error("a layout that excludes everything must be an error")
	}
	if err := (Polygon{{0, 0}, {1, 1}}).Validate(); err == nil {
		t.Error("a two-vertex polygon must be rejected")
	}
}

func TestParseShape(t *testing.T) {
	for s, want := range map[string]Shape{
		"circle:256,200,40":      Circle(256, 200, 40),
		"rect:0,0,511,300":       Rect{0, 0, 511, 300},
		"ellipse:10,20,30,15,45": Ellipse{Cx: 10, Cy: 20, Rx: 30, Ry: 15, AngleDeg: 45},
		"polygon:0,0,10,0,10,10": Polygon{{0, 0}, {10, 0}, {10, 10}},
	} {
		got, err := ParseShape(s)
		if err != nil {
			t.Errorf("%s: %v", s, err)
			continue
		}
		if x0, y0, x1, y1 := got.Bounds(); [4]float64{x0, y0, x1, y1} != func() [4]float64 { a, b, c, d := want.Bounds(); return [4]float64{a, b, c, d} }() {
			t.Errorf("%s: parsed %v, want %v", s, got, want)
		}
	}
	for _, bad := range []string{"circle:1,2", "blob:1,2,3", "rect:5,5,1,1", "polygon:1,2,3", "circle:a,b,c", "256,200,40"} {
		if _, err := ParseShape(bad); err == nil {
			t.Errorf("%q must be rejected", bad)
		}
	}
}

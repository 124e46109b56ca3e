package region

import (
	"math"
	"strings"
	"testing"
)

// Careless shape texts: non-finite numbers, sizes that are not positive,
// polygons without an area. Each is refused with the shape text and what
// was expected. Before, a NaN in a circle or ellipse (or a rect) parsed
// and then excluded nothing, an infinite radius excluded everything, and a
// polygon of collinear vertices enclosed nothing.
func TestParseShapeRefused(t *testing.T) {
	for _, c := range []struct{ text, want string }{
		{"circle:100,100,NaN", `shape "circle:100,100,NaN": circle radius NaN, expected a finite positive number of px`},
		{"circle:NaN,100,10", `shape "circle:NaN,100,10": circle centre (NaN, 100), expected a finite point in px`},
		{"circle:1,2,Inf", `shape "circle:1,2,Inf": circle radius +Inf, expected a finite positive number of px`},
		{"circle:1,2,-5", `shape "circle:1,2,-5": circle radius -5, expected a finite positive number of px`},
		{"circle:1,2,0", `shape "circle:1,2,0": circle radius 0, expected a finite positive number of px`},
		{"ellipse:1,2,3,NaN", `shape "ellipse:1,2,3,NaN": ellipse semi-axes 3 and NaN, expected finite positive numbers of px`},
		{"ellipse:1,2,0,4", `shape "ellipse:1,2,0,4": ellipse semi-axes 0 and 4, expected finite positive numbers of px`},
		{"ellipse:1,2,3,4,-Inf", `shape "ellipse:1,2,3,4,-Inf": ellipse angle -Inf°, expected a finite number of degrees`},
		{"rect:NaN,0,10,10", `shape "rect:NaN,0,10,10": rect corners (NaN, 0) and (10, 10), expected finite numbers of px`},
		{"rect:0,0,Inf,10", `shape "rect:0,0,Inf,10": rect corners (0, 0) and (+Inf, 10), expected finite numbers of px`},
		{"rect:5,5,1,1", `shape "rect:5,5,1,1": rect corners (5, 5) and (1, 1), expected x0 ≤ x1 and y0 ≤ y1`},
		{"polygon:0,0,1,1", `shape "polygon:0,0,1,1": polygon with 2 vertices, expected at least 3`},
		{"polygon:0,0,1,1,NaN,2", `shape "polygon:0,0,1,1,NaN,2": polygon vertex 3 (NaN, 2) is not a finite point`},
		{"polygon:0,0,5,5,2,2,9,9", `shape "polygon:0,0,5,5,2,2,9,9": polygon of 4 vertices encloses no area (its vertices lie on one line), expected a closed outline`},
		{"polygon:", `shape "polygon:": number 1, "", is not a number of px`},
		{"circle:1,2,3x", `shape "circle:1,2,3x": number 3, "3x", is not a number of px`},
		{"circle:1,2,1e999", `shape "circle:1,2,1e999": number 3, "1e999", is not a number of px`},
		{"blob:1,2,3", `shape "blob:1,2,3": unknown kind "blob", expected rect, circle, ellipse or polygon`},
	} {
		_, err := ParseShape(c.text)
		if err == nil || err.Error() != c.want {
			t.Errorf("ParseShape(%q):\n got %v\nwant %s", c.text, err, c.want)
		}
	}
	// A huge shape text is quoted as an excerpt, not whole.
	huge := "polygon:" + strings.Repeat("1,", 100_000) + "x"
	_, err := ParseShape(huge)
	if err == nil || len(err.Error()) > 300 || !strings.Contains(err.Error(), "(200009 bytes)") || !strings.Contains(err.Error(), `number 100001, "x"`) {
		t.Errorf("huge shape: error %.300v (%d bytes), want an excerpt naming number 100001", err, len(err.Error()))
	}
}

// Rasterise refuses shapes built in code that would not validate, rather
// than drawing nothing (NaN) or everything; and a valid radius of 1e300,
// whose bounds do not fit an int, still covers the image.
func TestRasteriseShapes(t *testing.T) {
	_, err := Layout{Exclude: []Shape{Circle(50, 50, 10), Circle(50, 50, math.NaN())}}.Rasterise(100, 100)
	if want := "exclusion 2: circle radius NaN, expected a finite positive number of px"; err == nil || err.Error() != want {
		t.Errorf("NaN exclusion: error %v, want %q", err, want)
	}
	_, err = Layout{ROI: []Shape{Rect{0, 0, math.Inf(1), 10}}}.Rasterise(100, 100)
	if err == nil || !strings.HasPrefix(err.Error(), "region of interest, shape 1: rect corners") {
		t.Errorf("infinite ROI rect: error %v", err)
	}
	m, err := Layout{ROI: []Shape{Circle(50, 50, 1e300)}}.Rasterise(100, 80)
	if err != nil || m.Count() != 100*80 {
		t.Errorf("ROI circle of radius 1e300: %v, %d pixels measured, want all 8000", err, m.Count())
	}
	m, err = Layout{ROI: []Shape{Rect{-1e300, 10, 1e300, 19}}}.Rasterise(100, 80)
	if err != nil || m.Count() != 100*10 {
		t.Errorf("ROI rect across ±1e300: %v, %d pixels, want 1000", err, m.Count())
	}
}

// A float mask image's NaN pixels are not measured.
func TestFromImageNaN(t *testing.T) {
	nan := float32(math.NaN())
	m := FromImage(4, 1, []float32{1, nan, 0, -2})
	if !m.At(0, 0) || m.At(1, 0) || m.At(2, 0) || !m.At(3, 0) {
		t.Errorf("mask %v, want 1 0 0 1 (NaN not measured)", m.Pix)
	}
}

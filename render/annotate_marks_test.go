package render

import (
	"image"
	"reflect"
	"testing"

	"gocv.io/x/gocv"

	"spallscope/dic"
)

// The zone outlines traced on the cells' bounding box are OpenCV's
// contours of the whole photo's cell mask, point for point: a block in
// the middle, a ring of cells with a hole, cells on the photo's corner
// and right edge (clipped by it), cells off the grid, and each class on
// its own.
func TestZoneContoursEqualWholePhotoMask(t *testing.T) {
	const w, h = 203, 157
	g := dic.Grid{X0: 4, Y0: 4, Step: 8, Cols: 26, Rows: 20}
	at := func(c, r int) int { return g.Index(c, r) }
	var ring []int
	for r := 5; r <= 9; r++ {
		for c := 10; c <= 14; c++ {
			if r == 5 || r == 9 || c == 10 || c == 14 {
				ring = append(ring, at(c, r))
			}
		}
	}
	zones := []ZoneOutline{
		{Class: "localization", Cells: []int{at(3, 3), at(4, 3), at(3, 4), at(4, 4), at(5, 4)}},
		{Class: "localization", Cells: ring},
		{Class: "localization", Cells: []int{at(0, 0), at(1, 0), at(0, 1), -3, g.Len() + 7}},
		{Class: "decorrelation", Cells: []int{at(25, 10), at(25, 11), at(24, 11), at(25, 19)}},
	}
	whole := func(class string) [][]image.Point {
		mask := make([]byte, w*h)
		found := false
		for _, z := range zones {
			if (z.Class == "decorrelation") != (class == "decorrelation") {
				continue
			}
			for _, c := range z.Cells {
				if c < 0 || c >= g.Len() {
					continue
				}
				x, y := g.Pos(c)
				x0, y0 := max(0, x-g.Step/2), max(0, y-g.Step/2)
				for yy := y0; yy < min(h, y0+g.Step); yy++ {
					for xx := x0; xx < min(w, x0+g.Step); xx++ {
						mask[yy*w+xx], found = 255, true
					}
				}
			}
		}
		if !found {
			return nil
		}
		m, err := gocv.NewMatFromBytes(h, w, gocv.MatTypeCV8U, mask)
		if err != nil {
			t.Fatal(err)
		}
		defer m.Close()
		cs := gocv.FindContours(m, gocv.RetrievalList, gocv.ChainApproxSimple)
		defer cs.Close()
		return cs.ToPoints()
	}
	for _, class := range []string{"localization", "decorrelation"} {
		got, want := zoneContours(w, h, g, zones, class), whole(class)
		if len(want) < 2 {
			t.Fatalf("%s: %d contours on the whole mask; the case needs several", class, len(want))
		}
		if !reflect.DeepEqual(got, want) {
			t.Errorf("%s: contours\n%v\non the bounding box, expected the whole mask's\n%v", class, got, want)
		}
	}
	if got := zoneContours(w, h, g, []ZoneOutline{{Class: "localization", Cells: []int{-1}}}, "localization"); got != nil {
		t.Errorf("no cell on the grid: contours %v, expected none", got)
	}
}

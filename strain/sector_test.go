package strain

import (
	"testing"

	"spallscope/dic/region"
)

// Sector geometry (the names of the trade, common practice, no source):
// under a vertical load the crown is above an opening (smaller y, the
// image is y-down), the invert below, the sidewalls left and right; the
// rock between two openings side by side is pillar. The geometry is
// package sector's, worked by hand in its tests; this checks that Sectors
// applies it.
func TestClassifySectors(t *testing.T) {
	s := Sectors{Openings: []Opening{{Name: "A", Shape: region.Circle(200, 200, 50)}, {Name: "B", Shape: region.Circle(400, 200, 50)}}}
	cases := []struct {
		x, y float64
		op   int
		want Sector
	}{
		{200, 130, 0, Crown}, {200, 270, 0, Invert}, {130, 200, 0, LeftSidewall},
		{300, 200, 0, Pillar}, {300, 230, 0, Pillar}, {470, 200, 1, RightSidewall},
		{400, 120, 1, Crown}, {200, 20, -1, Other},
		// either side of the 45° line, above the pillar's tangent y = 150
		// (from A: 58 and 62 px across, 60 px up: 44.0° and 45.9°)
		{258, 140, 0, Crown}, {262, 140, 0, RightSidewall},
	}
	for _, c := range cases {
		op, sec := s.Classify(c.x, c.y)
		if sec != c.want || op != c.op {
			t.Errorf("(%g,%g): opening %d sector %s, want %d %s", c.x, c.y, op, sec, c.op, c.want)
		}
	}
	// A load axis turned to horizontal swaps crown and sidewall: at 180°
	// the crown direction −(cos 180°, sin 180°) is +x, so left of A is its
	// invert and above it its left sidewall.
	s.LoadAngleDeg = 180
	if _, sec := s.Classify(130, 200); sec != Invert {
		t.Errorf("horizontal load: left of the opening is %s, want invert", sec)
	}
	if _, sec := s.Classify(200, 130); sec != LeftSidewall {
		t.Errorf("horizontal load: above the opening is %s, want left-sidewall", sec)
	}
}

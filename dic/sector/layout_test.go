package sector

import (
	"testing"

	"spallscope/dic/region"
)

// Sector geometry (the names of the trade, common practice, no source):
// under a vertical load the crown is above an opening (smaller y, the
// image is y-down), the invert below, the sidewalls left and right.
func TestLocateSingleOpening(t *testing.T) {
	s := Layout{Openings: []Opening{{Name: "A", Shape: region.Circle(200, 200, 50)}}}
	cases := []struct {
		x, y float64
		want Place
	}{
		{200, 130, Place{0, Crown, Crown}}, {200, 270, Place{0, Invert, Invert}},
		{130, 200, Place{0, LeftSidewall, LeftSidewall}}, {270, 200, Place{0, RightSidewall, RightSidewall}},
		{245, 150, Place{0, Crown, Crown}}, {255, 150, Place{0, RightSidewall, RightSidewall}}, // either side of the 45° line
		{200, 20, Place{-1, Other, Other}}, // 130 px beyond the wall, reach 50 px
	}
	for _, c := range cases {
		if got := s.Locate(c.x, c.y); got != c.want {
			t.Errorf("(%g,%g): %+v, want %+v", c.x, c.y, got, c.want)
		}
	}
}

// Twin openings, worked by hand. Equal circles A (200,200) and B
// (400,200), radius 50: the outer common tangents are y = 150 and y = 250,
// so the pillar is 250 < x < 350 (outside the walls) with |y − 200| ≤ 50.
// Unequal circles C (100,100) r 40 and D (300,100) r 20, l = 200: the
// tangents' normal has m_t = (40 − 20)/200 = 0.1, m_n = √0.99 = 0.99499,
// so at t = 100 (x = 200) the pillar reaches |n| ≤ (40 − 0.1·100)/0.99499
// = 30.15 px, and A's tangent point is (100 + 40·0.1, 100 − 40·0.99499) =
// (104, 60.2).
func TestLocateTwinOpenings(t *testing.T) {
	equal := Layout{Openings: []Opening{{Name: "A", Shape: region.Circle(200, 200, 50)}, {Name: "B", Shape: region.Circle(400, 200, 50)}}}
	unequal := Layout{Openings: []Opening{{Name: "C", Shape: region.Circle(100, 100, 40)}, {Name: "D", Shape: region.Circle(300, 100, 20)}}}
	cases := []struct {
		name string
		s    Layout
		x, y float64
		want Place
	}{
		// Mid-pillar: both walls 50 px away, the tie goes to A; seen from
		// A's centre the point is straight right.
		{"mid-pillar", equal, 300, 200, Place{0, Pillar, RightSidewall}},
		// (260,245): n = 45 ≤ 50; A's wall is √(60²+45²) − 50 = 25 px away,
		// B's √(140²+45²) − 50 = 97 px; from A 53° below the horizontal.
		{"pillar near A, low", equal, 260, 245, Place{0, Pillar, RightSidewall}},
		// (340,200): B's wall 10 px, A's 90 px: B's left sidewall.
		{"pillar near B", equal, 340, 200, Place{1, Pillar, LeftSidewall}},
		// (300,255): 5 px beyond the tangent y = 250: no pillar; both walls
		// √(100²+55²) − 50 = 64 px away, beyond the 50 px reach.
		{"above the pillar", equal, 300, 255, Place{-1, Other, Other}},
		// (249,200) is inside A (1 px within its wall): A's own sector.
		{"inside A", equal, 249, 200, Place{0, RightSidewall, RightSidewall}},
		{"A outer sidewall", equal, 130, 200, Place{0, LeftSidewall, LeftSidewall}},
		{"B outer sidewall", equal, 470, 200, Place{1, RightSidewall, RightSidewall}},
		{"B crown", equal, 400, 120, Place{1, Crown, Crown}},
		// (200,70): n = 30 ≤ 30.15: pillar; C's wall √(100²+30²) − 40 =
		// 64.4 px, D's 84.4 px; from C 16.7° above the horizontal.
		{"narrowing pillar, inside", unequal, 200, 70, Place{0, Pillar, RightSidewall}},
		// (200,69): n = 31 > 30.15: outside the tangent, and beyond both
		// reaches (64.7 > 40, 84.7 > 20).
		{"narrowing pillar, outside", unequal, 200, 69, Place{-1, Other, Other}},
		// (110,61): t = 10, n = 39: 0.1·10 + 0.99499·39 = 39.8 ≤ 40, and
		// √(10²+39²) = 40.26 > 40: a sliver of pillar between the tangent
		// point (104,60.2) and the wall, 14° from C's crown direction.
		{"sliver at the tangent point", unequal, 110, 61, Place{0, Pillar, Crown}},
	}
	for _, c := range cases {
		if got := c.s.Locate(c.x, c.y); got != c.want {
			t.Errorf("%s (%g,%g): %+v, want %+v", c.name, c.x, c.y, got, c.want)
		}
		op, sec := c.s.Classify(c.x, c.y)
		if op != c.want.Opening || sec != c.want.Sector {
			t.Errorf("%s: Classify %d %s, Locate %+v", c.name, op, sec, c.want)
		}
	}
}

// Overlapping openings bound no pillar; a horizontal load axis turns the
// crown to the side (definition of the load angle): at 180° the load
// axis points along −x, so the crown direction −(cos 180°, sin 180°) is
// +x, right of the opening, and the invert left of it.
func TestLocateNoPillarAndTurnedLoad(t *testing.T) {
	s := Layout{Openings: []Opening{{Shape: region.Circle(200, 200, 50)}, {Shape: region.Circle(280, 200, 50)}}}
	if p := s.Locate(240, 260); p.Sector == Pillar {
		t.Errorf("overlapping openings: %+v, want no pillar", p)
	}
	turned := Layout{Openings: []Opening{{Shape: region.Circle(200, 200, 50)}}, LoadAngleDeg: 180}
	for _, c := range []struct {
		x, y float64
		want Sector
	}{{270, 200, Crown}, {130, 200, Invert}, {200, 130, LeftSidewall}, {200, 270, RightSidewall}} {
		if p := turned.Locate(c.x, c.y); p.Sector != c.want {
			t.Errorf("horizontal load: (%g,%g) is %s, want %s", c.x, c.y, p.Sector, c.want)
		}
	}
}

// A grid point's pillar reaches half a grid step beyond the outer common
// tangents (LocateCell), worked by hand on the equal circles of
// TestLocateTwinOpenings (tangents y = 150 and y = 250) at step 8 px: the
// tangent moves out by 4 px, to y = 254 and y = 146. (300,253) is 3 px
// beyond y = 250: a pillar cell (both walls 63.2 px away, the tie to A,
// 28° below the horizontal from A's centre: its right sidewall);
// (300,255), 5 px beyond, stays outside as for Locate; points away from
// the pillar keep Locate's place.
func TestLocateCellPillarHalfAStep(t *testing.T) {
	equal := Layout{Openings: []Opening{{Name: "A", Shape: region.Circle(200, 200, 50)}, {Name: "B", Shape: region.Circle(400, 200, 50)}}}
	cases := []struct {
		name string
		x, y float64
		want Place
	}{
		{"3 px beyond the lower tangent", 300, 253, Place{0, Pillar, RightSidewall}},
		{"3 px beyond the upper tangent", 300, 147, Place{0, Pillar, RightSidewall}},
		{"5 px beyond", 300, 255, Place{-1, Other, Other}},
		{"mid-pillar", 300, 200, Place{0, Pillar, RightSidewall}},
		{"B crown", 400, 120, Place{1, Crown, Crown}},
		{"A outer sidewall", 130, 200, Place{0, LeftSidewall, LeftSidewall}},
	}
	for _, c := range cases {
		if got := equal.LocateCell(c.x, c.y, 8); got != c.want {
			t.Errorf("%s (%g,%g): %+v, want %+v", c.name, c.x, c.y, got, c.want)
		}
	}
	if got := equal.LocateCell(300, 253, 0); got != equal.Locate(300, 253) {
		t.Errorf("step 0: %+v, want Locate's %+v", got, equal.Locate(300, 253))
	}
}

package baseline

import (
	"math"
	"testing"
)

// The grid keeps Margin px from every edge with GridStep spacing: on a
// 160 px frame the last allowed coordinate is 119, so the points are at
// 40, 48, …, 112 on each axis: 10 per axis (counted by hand).
func TestGrid(t *testing.T) {
	pts := Grid(160, 160)
	if len(pts) != 100 {
		t.Fatalf("%d points, want 100", len(pts))
	}
	if pts[0] != [2]int{40, 40} || pts[1] != [2]int{48, 40} || pts[99] != [2]int{112, 112} {
		t.Errorf("points 0, 1, 99 are %v %v %v, want [40 40] [48 40] [112 112]", pts[0], pts[1], pts[99])
	}
}

// The truth of the strain case is the analytic field written out by hand
// (exact by construction, tolerance 1e-12 px), and the search radius
// follows from its largest component: on a 161 px frame (centre 80, points
// 40…120) that is |v| = 0.6 + 0.002·40 + 0.003·40 = 0.8 px, so 1 + 1 = 2.
func TestStrainCaseTruth(t *testing.T) {
	c, err := StrainCase(161)
	if err != nil {
		t.Fatal(err)
	}
	for i, p := range c.Points {
		dx, dy := float64(p[0])-80, float64(p[1])-80
		wu := StrainU + StrainExx*dx + StrainExy*dy
		wv := StrainV + StrainExy*dx + StrainEyy*dy
		if m := c.Truth[i]; math.Abs(m.U-wu) > 1e-12 || math.Abs(m.V-wv) > 1e-12 {
			t.Errorf("point %v: truth (%g, %g), want (%g, %g)", p, m.U, m.V, wu, wv)
		}
	}
	if c.Search != 2 {
		t.Errorf("search radius %d px, want 2", c.Search)
	}
}

package render

import (
	"math"
	"strings"
	"testing"

	"spallscope/dic"
	"spallscope/strain"
	"spallscope/subset"
)

// The gauge's reading is the plain mean of its component over the valid
// points inside the rectangle, edges included: here a 4 × 3 grid every
// 10 px, a rectangle over columns 1–2 and rows 0–1 (points 1, 2, 5, 6),
// one of them invalid, so the mean of eyy is (2 + 3 + 7)/3 · 1e-4 by hand.
func TestGaugeMeanByHand(t *testing.T) {
	g := dic.Grid{X0: 0, Y0: 0, Step: 10, Cols: 4, Rows: 3}
	f := &strain.Field{Grid: g, Points: make([]strain.Point, g.Len())}
	for i := range f.Points {
		x, y := g.Pos(i)
		f.Points[i] = strain.Point{X: x, Y: y, Eyy: float64(i+1) * 1e-4, Exx: -float64(i) * 1e-5, Valid: true}
	}
	f.Points[5].Valid = false
	gauge := Gauge{X0: 10, Y0: 0, X1: 20, Y1: 10}
	mean, n, err := gauge.Mean(f)
	if err != nil {
		t.Fatal(err)
	}
	if want := (2 + 3 + 7) / 3.0 * 1e-4; n != 3 || math.Abs(mean-want) > 1e-15 {
		t.Errorf("eyy gauge: mean %.17g over %d points, want %.17g over 3", mean, n, want)
	}
	// Corners given the other way round, and another component.
	gauge = Gauge{X0: 20, Y0: 10, X1: 10, Y1: 0, Component: "exx"}
	mean, _, _ = gauge.Mean(f)
	if want := -(1 + 2 + 6) / 3.0 * 1e-5; math.Abs(mean-want) > 1e-15 {
		t.Errorf("exx gauge: mean %.17g, want %.17g", mean, want)
	}
	// No valid point: NaN and 0, not an error.
	for _, i := range []int{1, 2, 6} {
		f.Points[i].Valid = false
	}
	if mean, n, err := (Gauge{X0: 10, Y0: 0, X1: 20, Y1: 10}).Mean(f); err != nil || n != 0 || !math.IsNaN(mean) {
		t.Errorf("all invalid: %v over %d, %v", mean, n, err)
	}
}

func TestGaugeErrors(t *testing.T) {
	g := dic.Grid{X0: 0, Y0: 0, Step: 10, Cols: 4, Rows: 3}
	cases := []struct {
		gauge Gauge
		want  string
	}{
		{Gauge{X0: 1, Y0: 1, X1: 9, Y1: 9}, "holds no grid point"},
		{Gauge{X0: 0, Y0: 0, X1: 20, Y1: 20, Component: "angle_deg"}, "expected a strain component"},
		{Gauge{X0: 0, Y0: 0, X1: 20, Y1: 20, Component: "eyyy"}, `"eyyy"`},
	}
	for _, c := range cases {
		if _, err := c.gauge.Points(g); err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%+v: error %v, want %q", c.gauge, err, c.want)
		}
	}
}

// The default gauge lies on measured points only, at least two grid steps
// from the fixture's opening and off the grid's outer rows and columns,
// and on a uniform
// field reads the uniform strain (eyy = −σ/E of the fixture) within 1e-9.
func TestGaugeDefault(t *testing.T) {
	ref := fixtureField(0)
	gauge := DefaultGauge(ref)
	pts, err := gauge.Points(ref.Grid)
	if err != nil {
		t.Fatal(err)
	}
	if len(pts) < 9 || gauge.Component != "eyy" {
		t.Errorf("default gauge %v: %d points", gauge, len(pts))
	}
	g := ref.Grid
	for _, i := range pts {
		x, y := g.Pos(i)
		if !ref.Points[i].Valid() {
			t.Errorf("default gauge %v covers unmeasured point (%d, %d)", gauge, x, y)
		}
		if c, r := i%g.Cols, i/g.Cols; c == 0 || r == 0 || c == g.Cols-1 || r == g.Rows-1 {
			t.Errorf("default gauge point (%d, %d) on the grid's edge", x, y)
		}
		if d := math.Hypot(float64(x)-fixtureCx, float64(y)-fixtureCy); d < fixtureR+2*float64(g.Step) {
			t.Errorf("default gauge point (%d, %d) is %.1f px from the opening's centre", x, y, d)
		}
	}
	sf, err := strain.Window{Size: 3}.Strain(fixtureField(4))
	if err != nil {
		t.Fatal(err)
	}
	mean, _, err := gauge.Mean(sf)
	if _, eyy := fixtureStrain(4); err != nil || math.Abs(mean-eyy) > 1e-9 {
		t.Errorf("default gauge reads %.12g, uniform eyy %.12g (%v)", mean, eyy, err)
	}
}

// referenceDefaultGauge is DefaultGauge's direct search, as it was: every
// point's distance against every unmeasured point, every window's least
// room point by point.
func referenceDefaultGauge(ref *dic.Field) Gauge {
	g := ref.Grid
	w, h := max(3, g.Cols/5), max(3, g.Rows/5)
	w, h = min(w, g.Cols), min(h, g.Rows)
	var holes [][2]int
	for i := range ref.Points {
		if !ref.Points[i].Valid() {
			holes = append(holes, [2]int{i % g.Cols, i / g.Cols})
		}
	}
	room := make([]float64, g.Len())
	for i := range room {
		c, r := i%g.Cols, i/g.Cols
		d := float64(min(c+1, r+1, g.Cols-c, g.Rows-r))
		for _, hp := range holes {
			d = math.Min(d, math.Hypot(float64(c-hp[0]), float64(r-hp[1])))
		}
		room[i] = d
	}
	// Each window's least room, point by point.
	return bestGauge(g, w, h, func(c, r int) float64 {
		score := math.Inf(1)
		for dr := range h {
			for dc := range w {
				score = math.Min(score, room[g.Index(c+dc, r+dr)])
			}
		}
		return score
	})
}

// The default gauge by distance transform and running minima is the direct
// search's gauge (referenceDefaultGauge) on grids with one and two
// openings, scattered lost points, none at all, and grids of 3 points
// across; and the squared distances are the brute-force ones exactly.
func TestGaugeDefaultMatchesDirectSearch(t *testing.T) {
	s := uint32(9)
	for k, c := range []struct {
		cols, rows int
		lost       func(c, r int) bool
	}{
		{60, 40, func(c, r int) bool { return math.Hypot(float64(c-25), float64(r-20)) < 7 }},
		{61, 37, func(c, r int) bool {
			return math.Hypot(float64(c-18), float64(r-18)) < 6 || math.Hypot(float64(c-42), float64(r-18)) < 6
		}},
		{50, 45, func(c, r int) bool { s = s*1664525 + 1013904223; return s>>24 < 4 }},
		{40, 30, func(c, r int) bool { return false }},
		{3, 3, func(c, r int) bool { return c == 0 && r == 2 }},
		{17, 3, func(c, r int) bool { return c == 8 }},
	} {
		g := dic.Grid{X0: 10, Y0: 10, Step: 5, Cols: c.cols, Rows: c.rows}
		f := &dic.Field{Grid: g, Points: make([]dic.Point, g.Len())}
		site := make([]bool, g.Len())
		for i := range f.Points {
			f.Points[i].Status = subset.Converged
			if c.lost(i%g.Cols, i/g.Cols) {
				f.Points[i].Status, site[i] = subset.Lost, true
			}
		}
		if got, want := DefaultGauge(f), referenceDefaultGauge(f); got != want {
			t.Errorf("case %d (%dx%d): gauge %+v, direct search %+v", k, c.cols, c.rows, got, want)
		}
		d2 := squaredDistances(site, g.Cols, g.Rows)
		for i := range d2 {
			want := math.Inf(1)
			for j, s := range site {
				if s {
					dc, dr := float64(i%g.Cols-j%g.Cols), float64(i/g.Cols-j/g.Cols)
					want = math.Min(want, dc*dc+dr*dr)
				}
			}
			if d2[i] != want {
				t.Fatalf("case %d: point %d squared distance %v, brute force %v", k, i, d2[i], want)
			}
		}
	}
}

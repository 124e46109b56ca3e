package render

import (
	"math"
	"testing"

	"gocv.io/x/gocv"

	"spallscope/dic"
	"spallscope/dic/region"
	"spallscope/dic/synth"
	"spallscope/strain"
	"spallscope/subset"
)

// synthPhoto renders an 8-bit speckle photo from the synthetic lab, with
// the given openings seen as dark holes.
func synthPhoto(t *testing.T, w, h int, holes ...synth.Opening) *subset.Image {
	t.Helper()
	sp, err := synth.NewSpeckles(synth.Pattern{Radius: 2.5, Coverage: 0.5, Seed: 3}, w, h)
	if err != nil {
		t.Fatal(err)
	}
	img, err := synth.Render(synth.Scene{Speckles: sp, Openings: holes}, synth.Camera{Depth: 8}, w, h, 0)
	if err != nil {
		t.Fatal(err)
	}
	return img
}

// uniformStrainField is a strain field on g with the lab's uniform strain
// us at every point, invalid at points inside hole (as the tracker leaves
// them).
func uniformStrainField(g dic.Grid, us synth.UniformStrain, hole region.Shape) *strain.Field {
	f := &strain.Field{Name: "uniform", Grid: g, Points: make([]strain.Point, g.Len())}
	m := us.At(0, 0)
	exx, eyy, exy := m.UX, m.VY, (m.UY+m.VX)/2
	c, r := (exx+eyy)/2, math.Hypot((exx-eyy)/2, exy)
	for i := range f.Points {
		x, y := g.Pos(i)
		f.Points[i] = strain.Point{X: x, Y: y, Exx: exx, Eyy: eyy, Exy: exy, E1: c + r, E2: c - r, Valid: !hole.Contains(float64(x), float64(y))}
	}
	return f
}

// pixelBGR returns the BGR colour of pixel (x, y) of an 8-bit BGR image.
func pixelBGR(t *testing.T, m gocv.Mat, x, y int) [3]int {
	t.Helper()
	v := m.GetVecbAt(y, x)
	return [3]int{int(v[0]), int(v[1]), int(v[2])}
}

// A uniform strain field renders, at every pixel inside the measured
// region, the colour the map assigns to its value blended with the photo's
// gray at the opacity: colour·α + gray·(1 − α), to one 8-bit level (OpenCV's
// AddWeighted rounds its float result); a pixel inside the opening keeps
// the photo's own gray exactly.
func TestOverlayUniformStrainColour(t *testing.T) {
	const w, h = 160, 120
	hole := synth.Circle(80, 60, 18)
	photo := synthPhoto(t, w, h, hole)
	g := dic.Grid{X0: 4, Y0: 4, Step: 8, Cols: 20, Rows: 15}
	us := synth.UniformStrain{Cx: 80, Cy: 60, Exx: 8e-4, Eyy: -1.2e-3, Exy: 3e-4}
	q, _ := QuantityNamed("exx")
	vals, err := q.StrainValues(uniformStrainField(g, us, hole))
	if err != nil {
		t.Fatal(err)
	}
	keep, err := region.Layout{Exclude: []region.Shape{hole}}.Rasterise(w, h)
	if err != nil {
		t.Fatal(err)
	}
	spec, err := ParseLimits("-2000ue,2000ue", q, 0)
	if err != nil {
		t.Fatal(err)
	}
	const alpha = 0.6
	out, err := Overlay(photo, vals, OverlayOptions{Quantity: q, Limits: spec.Fixed(q), Alpha: alpha, Keep: keep, Scale: 0.1,
		Stamp: Stamp{Frame: "uniform", Time: 12, HasTime: true, Stress: 8, HasStress: true, Peak: 20}})
	if err != nil {
		t.Fatal(err)
	}
	defer out.Close()
	if out.Cols() <= w || out.Rows() < h || out.Channels() != 3 {
		t.Fatalf("overlay %dx%d with %d channels, expected the %dx%d photo and a panel, BGR", out.Cols(), out.Rows(), out.Channels(), w, h)
	}
	// exx = 800 µε on ±2000 µε: position 0.7 of the diverging map.
	r, gg, b := Diverging().At(0.7)
	col := [3]float64{float64(b), float64(gg), float64(r)}
	checked := 0
	for y := 2; y < h-2; y += 3 {
		for x := 2; x < w-2; x += 3 {
			if math.Hypot(float64(x)-80, float64(y)-60) < 18+6 {
				continue // the opening and the half step beside it
			}
			gray := float64(photo.At(x, y))
			got := pixelBGR(t, out, x, y)
			for c := 0; c < 3; c++ {
				want := alpha*col[c] + (1-alpha)*gray
				if math.Abs(float64(got[c])-want) > 1 {
					t.Fatalf("pixel (%d, %d) channel %d = %d, expected %.1f (map colour %v at α %.1f over gray %.0f)", x, y, c, got[c], want, col, alpha, gray)
				}
			}
			checked++
		}
	}
	for _, p := range [][2]int{{80, 60}, {70, 55}, {92, 66}} {
		gray := int(photo.At(p[0], p[1]))
		if got := pixelBGR(t, out, p[0], p[1]); got != [3]int{gray, gray, gray} {
			t.Errorf("pixel (%d, %d) inside the opening = %v, expected the photo's gray %d", p[0], p[1], got, gray)
		}
	}
	t.Logf("%d pixels inside the measured region checked", checked)
}

// On the current frame the clear opening moves with the material: with the
// lab's translation by 6 px to the right, a pixel just inside the
// reference opening's left edge is outside the moved opening and coloured,
// and the moved opening's centre stays gray.
func TestOverlayCurrentFrameMovesOpening(t *testing.T) {
	const w, h = 160, 120
	hole := synth.Circle(80, 60, 18)
	tr := synth.Translation{U: 6, V: 0}
	photo := synthPhoto(t, w, h) // a photo without the hole: only the field's clearing is looked at
	g := dic.Grid{X0: 4, Y0: 4, Step: 8, Cols: 20, Rows: 15}
	q, _ := QuantityNamed("exx")
	vals, _ := q.StrainValues(uniformStrainField(g, synth.UniformStrain{Exx: 1e-3}, hole))
	d := &Deformation{
		U: sampleGrid(g, func(x, y float64) float64 { return tr.At(x, y).U }, func(x, y float64) bool { return hole.Contains(x, y) }),
		V: sampleGrid(g, func(x, y float64) float64 { return tr.At(x, y).V }, func(x, y float64) bool { return hole.Contains(x, y) }),
	}
	keep, _ := region.Layout{Exclude: []region.Shape{hole}}.Rasterise(w, h)
	lim := Limits{Lo: -2e-3, Hi: 2e-3, Centred: true, Mode: LimitsFixed}
	gray := func(x, y int) [3]int { v := int(photo.At(x, y)); return [3]int{v, v, v} }
	for _, c := range []struct {
		deform *Deformation
		x, y   int
		clear  bool
	}{
		{nil, 64, 60, true},   // reference: inside the opening (16 px left of its centre)
		{d, 64, 60, false},    // current: 22 px left of the moved centre, outside it
		{d, 86, 60, true},     // current: the moved centre
		{nil, 99, 60, false},  // reference: 19 px right of the centre, outside
		{d, 99 + 4, 60, true}, // current: 17 px right of the moved centre, inside
		{d, 40, 30, false},    // current: far from the opening
		{nil, 40, 30, false},  // reference: far from the opening
	} {
		out, err := Overlay(photo, vals, OverlayOptions{Quantity: q, Limits: lim, Keep: keep, Deform: c.deform, Stamp: Stamp{Frame: "shifted"}})
		if err != nil {
			t.Fatal(err)
		}
		got := pixelBGR(t, out, c.x, c.y)
		out.Close()
		if (got == gray(c.x, c.y)) != c.clear {
			t.Errorf("current frame %t, pixel (%d, %d) = %v (photo gray %v): expected clear %t", c.deform != nil, c.x, c.y, got, gray(c.x, c.y), c.clear)
		}
	}
}

// Zone outlines trace the zone's grid cells (squares of one step about each
// point, OpenCV's FindContours): the outline passes along the left edge of
// a 3×3-point zone in the light ink of localization, and dark for a
// decorrelation zone. An onset badge is drawn at its place.
func TestOverlayZoneOutlinesAndOnsets(t *testing.T) {
	const w, h = 160, 120
	photo := synthPhoto(t, w, h)
	g := dic.Grid{X0: 4, Y0: 4, Step: 8, Cols: 20, Rows: 15}
	q, _ := QuantityNamed("e1")
	vals, _ := q.StrainValues(uniformStrainField(g, synth.UniformStrain{Exx: 1e-4}, region.Rect{X0: -9, Y0: -9, X1: -8, Y1: -8}))
	var cells []int
	for r := 5; r <= 7; r++ {
		for c := 4; c <= 6; c++ {
			cells = append(cells, g.Index(c, r))
		}
	}
	// Points (4..6, 5..7) are at x 36..52, y 44..60; their squares span
	// x 32..55 and y 40..63.
	lim := Limits{Lo: -2e-3, Hi: 2e-3, Centred: true, Mode: LimitsFixed}
	for _, c := range []struct {
		class string
		want  [3]int
	}{{"localization", [3]int{255, 255, 255}}, {"decorrelation", [3]int{16, 16, 16}}} {
		out, err := Overlay(photo, vals, OverlayOptions{Quantity: q, Limits: lim, Stamp: Stamp{Frame: "zones"},
			Zones: []ZoneOutline{{Cells: cells, Class: c.class}}})
		if err != nil {
			t.Fatal(err)
		}
		for _, y := range []int{44, 52, 60} {
			if got := pixelBGR(t, out, 32, y); got != c.want {
				t.Errorf("%s outline at (32, %d) = %v, expected %v", c.class, y, got, c.want)
			}
		}
		if got := pixelBGR(t, out, 44, 52); got == c.want {
			t.Errorf("%s zone's inside (44, 52) = %v, the outline colour; expected the field", c.class, got)
		}
		out.Close()
	}
	out, err := Overlay(photo, vals, OverlayOptions{Quantity: q, Limits: lim, Stamp: Stamp{Frame: "onset"},
		Onsets: []OnsetMark{{X: 100, Y: 70, Number: 1, Legend: "localization, left-sidewall A, 12.0 MPa"}}})
	if err != nil {
		t.Fatal(err)
	}
	defer out.Close()
	// The mark is a dark dot ringed in white at the onset's place.
	if got := pixelBGR(t, out, 100, 70); got != [3]int{16, 16, 16} {
		t.Errorf("onset mark at (100, 70) = %v, expected the dark dot", got)
	}
}

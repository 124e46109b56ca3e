package render

import (
	"image/color"
	"math"
	"os"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
	"gonum.org/v1/plot/vg/recorder"

	"spallscope/strain"
)

// recordedFill is a filled path as drawn, with the colour it was filled in.
type recordedFill struct {
	Colour color.Color
	Path   vg.Path
}

// recordedStroke is a stroked path as drawn, with its colour.
type recordedStroke struct {
	Colour color.Color
	Path   vg.Path
}

// recordPlot draws p onto gonum's recording canvas at the plots' size and
// returns the fills and strokes with their colours, and the plot's
// data-to-canvas transforms (gonum's own, the reference for where a value
// lands).
func recordPlot(p *plot.Plot, w, h vg.Length) (fills []recordedFill, strokes []recordedStroke, trX, trY func(float64) vg.Length) {
	rec := &recorder.Canvas{}
	c := draw.NewCanvas(rec, w, h)
	p.Draw(c)
	dc := p.DataCanvas(c)
	trX, trY = p.Transforms(&dc)
	var colour color.Color = color.Black
	for _, a := range rec.Actions {
		switch a := a.(type) {
		case *recorder.SetColor:
			colour = a.Color
		case *recorder.Fill:
			fills = append(fills, recordedFill{colour, a.Path})
		case *recorder.Stroke:
			strokes = append(strokes, recordedStroke{colour, a.Path})
		}
	}
	return fills, strokes, trX, trY
}

// pathBounds returns the bounding box of a path's points.
func pathBounds(p vg.Path) (lo, hi vg.Point) {
	lo = vg.Point{X: vg.Length(math.Inf(1)), Y: vg.Length(math.Inf(1))}
	hi = vg.Point{X: vg.Length(math.Inf(-1)), Y: vg.Length(math.Inf(-1))}
	for _, c := range p {
		if c.Type == vg.MoveComp || c.Type == vg.LineComp {
			lo.X, lo.Y = min(lo.X, c.Pos.X), min(lo.Y, c.Pos.Y)
			hi.X, hi.Y = max(hi.X, c.Pos.X), max(hi.Y, c.Pos.Y)
		}
	}
	return lo, hi
}

// sameColour compares colours by their premultiplied RGBA.
func sameColour(a, b color.Color) bool {
	r1, g1, b1, a1 := a.RGBA()
	r2, g2, b2, a2 := b.RGBA()
	return r1 == r2 && g1 == g2 && b1 == b2 && a1 == a2
}

// closeTo compares canvas lengths within 1e-6 pt.
func closeTo(a, b vg.Length) bool { return math.Abs(float64(a-b)) < 1e-6 }

// The stress–time plot of the fixture draws each onset's 95 % interval as
// a band, where gonum's own data-to-canvas transform puts the interval:
// the left sidewall's from 2 s to 6 s (frames 1 to 3) and from 6 − 0.6 to
// 18 + 0.6 MPa (the stresses over it, widened by 2.5 % of the 24 MPa
// peak); the right sidewall's one-frame interval at 6 s as a band
// spanMinWidth wide centred there; the crown record without an interval
// gets none. The trigger frame (6 s, 18 MPa) is marked by a crossed
// circle of radius 4.6 pt, distinct from the filled onset glyphs. The
// SVG file carries the two bands as translucent fills.
func TestStressTimeBands(t *testing.T) {
	dir := t.TempDir()
	writeFixtureRun(t, dir)
	r, err := readRunRecords(dir)
	if err != nil {
		t.Fatal(err)
	}
	p, _, ok, err := stressTimePlot(r)
	if err != nil || !ok {
		t.Fatalf("stress plot: %v, %v", ok, err)
	}
	fills, strokes, trX, trY := recordPlot(p, plotWidth, plotHeight)
	band := bandColour(classColour(strain.Localization))
	var got [][2]vg.Point
	for _, f := range fills {
		if sameColour(f.Colour, band) {
			lo, hi := pathBounds(f.Path)
			got = append(got, [2]vg.Point{lo, hi})
		}
	}
	if len(got) != 2 {
		t.Fatalf("%d localization bands, want 2 (the crown decorrelation has no interval)", len(got))
	}
	left, right := got[0], got[1]
	if !closeTo(left[0].X, trX(2)) || !closeTo(left[1].X, trX(6)) || !closeTo(left[0].Y, trY(6-0.6)) || !closeTo(left[1].Y, trY(18+0.6)) {
		t.Errorf("left band %v, want x %v to %v, y %v to %v", left, trX(2), trX(6), trY(5.4), trY(18.6))
	}
	if w := right[1].X - right[0].X; !closeTo(w, spanMinWidth) || !closeTo((right[0].X+right[1].X)/2, trX(6)) {
		t.Errorf("one-frame band %v: width %v, want %v centred on %v", right, w, spanMinWidth, trX(6))
	}
	trigger := 0
	for _, s := range strokes {
		for _, c := range s.Path {
			if c.Type == vg.ArcComp && closeTo(c.Pos.X, trX(6)) && closeTo(c.Pos.Y, trY(18)) && closeTo(c.Radius, 4.6) {
				trigger++
			}
		}
	}
	if trigger != 2 {
		t.Errorf("%d trigger circles at (6 s, 18 MPa), want 2 (both sidewalls were triggered at frame 3)", trigger)
	}

	if _, err := WritePlots(dir, PlotOptions{}); err != nil {
		t.Fatal(err)
	}
	svg, err := os.ReadFile(filepath.Join(dir, PlotsDir, "stress_time.svg"))
	if err != nil {
		t.Fatal(err)
	}
	// vgsvg writes a translucent fill as fill-opacity = alpha / 255.
	opacity := strconv.FormatFloat(float64(band.A)/255, 'g', 5, 64)
	if n := strings.Count(string(svg), "fill-opacity:"+opacity); n != 3 {
		t.Errorf("%d fills of opacity %s in the SVG, want 3 (two bands and the legend's sample)", n, opacity)
	}
}

// The onset histories of the fixture: one panel per onset with a history
// (the crown record has none), numbered as in onset.json; on the left
// sidewall's panel the 95 % band spans frames 1 to 3 (2 s to 6 s), the
// back-dated onset is a vertical line at frame 2 (4 s), the trigger a
// dotted line at frame 3 (6 s), and the threshold line passes through
// every frame's threshold in µε — all where gonum's transforms put them.
func TestOnsetHistoryPanels(t *testing.T) {
	dir := t.TempDir()
	writeFixtureRun(t, dir)
	r, err := readRunRecords(dir)
	if err != nil {
		t.Fatal(err)
	}
	panels := onsetHistoryPanels(r)
	if len(panels) != 2 || panels[0].Number != 1 || panels[1].Number != 2 {
		t.Fatalf("%d panels, want the two sidewall onsets numbered 1 and 2", len(panels))
	}
	left := panels[0]
	if left.OnsetX != 4 || left.LoX != 2 || left.HiX != 6 || !left.HasTrigger || left.TriggerX != 6 {
		t.Errorf("left panel: onset %v, interval %v–%v, trigger %v (%v); want 4, 2–6, 6", left.OnsetX, left.LoX, left.HiX, left.TriggerX, left.HasTrigger)
	}
	if right := panels[1]; right.OnsetX != 6 || right.LoX != 6 || right.HiX != 6 || right.TriggerX != 6 {
		t.Errorf("right panel: onset %v, interval %v–%v, trigger %v; want all at 6 s", right.OnsetX, right.LoX, right.HiX, right.TriggerX)
	}
	w, h := plotWidth/2, historyPanelHeight
	fills, strokes, trX, trY := recordPlot(left.Plot, w, h)
	c := classColour(strain.Localization)
	bands := 0
	for _, f := range fills {
		if sameColour(f.Colour, bandColour(c)) {
			lo, hi := pathBounds(f.Path)
			if !closeTo(lo.X, trX(2)) || !closeTo(hi.X, trX(6)) {
				t.Errorf("interval band from %v to %v, want %v to %v", lo.X, hi.X, trX(2), trX(6))
			}
			bands++
		}
	}
	if bands != 1 {
		t.Errorf("%d interval bands, want 1", bands)
	}
	var onsetLine, triggerLine, threshold bool
	thr := left.Onset.History.Threshold
	for _, s := range strokes {
		lo, hi := pathBounds(s.Path)
		vertical := closeTo(lo.X, hi.X) && hi.Y-lo.Y > 10
		switch {
		case vertical && closeTo(lo.X, trX(4)) && sameColour(s.Colour, c):
			onsetLine = true
		case vertical && closeTo(lo.X, trX(6)) && sameColour(s.Colour, plotInk):
			triggerLine = true
		case len(s.Path) == len(thr) && sameColour(s.Colour, plotInk):
			all := true
			for k, pc := range s.Path {
				x := fixtureTimes[k]
				all = all && closeTo(pc.Pos.X, trX(x)) && closeTo(pc.Pos.Y, trY(1e6*thr[k]))
			}
			threshold = threshold || all
		}
	}
	if !onsetLine || !triggerLine || !threshold {
		t.Errorf("left panel: onset line %v, trigger line %v, threshold line %v; want all drawn", onsetLine, triggerLine, threshold)
	}

	// The figure: two panels side by side under the legend strip, its
	// size as the page is told (the PNG decoded by Go's image/png is
	// checked in TestPlotsWritten).
	fig, ok, err := plotOnsetHistories(r)
	if err != nil || !ok {
		t.Fatalf("onset histories: %v, %v", ok, err)
	}
	if want := int(math.Round(float64((historyLegendStrip+historyPanelHeight)/vg.Inch) * plotDPI)); fig.Width != 945 || math.Abs(float64(fig.Height-want)) > 1 {
		t.Errorf("figure %d × %d px, want 945 × %d", fig.Width, fig.Height, want)
	}
	if !regexp.MustCompile(`trigger`).MatchString(fig.Caption) || !strings.Contains(fig.Caption, "95 % interval") {
		t.Errorf("caption does not explain the marks: %q", fig.Caption)
	}
}

// The onset histories' legend stays inside the figure: with the sixth
// entry a decorrelation panel adds, the names ran past the figure's right
// edge on one line ("per-point lim…", seen in chromium on the demo's twin
// face); laid out in lines, every entry ends within the width, entries on
// one line do not overlap, and the lines fit the strip.
func TestHistoryLegendFits(t *testing.T) {
	names := []string{"zone mean", "frame's threshold", "95 % interval", "back-dated onset", "trigger", "per-point limit"}
	sty := historyLegendText()
	for _, n := range []int{5, 6} {
		places, lines := historyLegendLayout(names[:n], plotWidth)
		end := map[int]vg.Length{}
		for k, pl := range places[:n] {
			right := pl.X + 14 + 3 + sty.Width(names[k])
			if right > plotWidth {
				t.Errorf("%d entries: %q ends at %.1f pt, past the figure's %.1f pt", n, names[k], right, plotWidth)
			}
			if pl.X < end[pl.Line] {
				t.Errorf("%d entries: %q starts at %.1f pt, over the entry before it (ends %.1f pt)", n, names[k], pl.X, end[pl.Line])
			}
			end[pl.Line] = right
		}
		if h := vg.Length(lines) * historyLegendPitch; h > historyLegendStrip {
			t.Errorf("%d entries: %d lines, %.1f pt, do not fit the %.1f pt strip", n, lines, h, historyLegendStrip)
		}
		t.Logf("%d entries: %d line(s)", n, lines)
	}
}

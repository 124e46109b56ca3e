package render

import (
	"math"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

// vLine is a vertical line across the whole height of a plot at X: a
// frame marked on a history (the back-dated onset, the trigger).
type vLine struct {
	X     float64
	Style draw.LineStyle
}

// Plot implements plot.Plotter.
func (l vLine) Plot(c draw.Canvas, p *plot.Plot) {
	trX, _ := p.Transforms(&c)
	x := trX(l.X)
	if x < c.Min.X || x > c.Max.X {
		return
	}
	c.StrokeLine2(l.Style, x, c.Min.Y, x, c.Max.Y)
}

// DataRange implements plot.DataRanger: the line's place, so that the
// horizontal axis includes it.
func (l vLine) DataRange() (xmin, xmax, ymin, ymax float64) {
	return l.X, l.X, math.Inf(1), math.Inf(-1)
}

// Thumbnail implements plot.Thumbnailer: a short vertical stroke.
func (l vLine) Thumbnail(c *draw.Canvas) {
	x := (c.Min.X + c.Max.X) / 2
	c.StrokeLine2(l.Style, x, c.Min.Y, x, c.Max.Y)
}

// dotted is the dash pattern of a dotted line.
var dotted = []vg.Length{1.2, 1.8}

// hLine is a horizontal line across a plot at Y: a limit that does not
// change from frame to frame.
type hLine struct {
	Y     float64
	Style draw.LineStyle
}

// Plot implements plot.Plotter.
func (l hLine) Plot(c draw.Canvas, p *plot.Plot) {
	_, trY := p.Transforms(&c)
	y := trY(l.Y)
	if y < c.Min.Y || y > c.Max.Y {
		return
	}
	c.StrokeLine2(l.Style, c.Min.X, y, c.Max.X, y)
}

// DataRange implements plot.DataRanger.
func (l hLine) DataRange() (xmin, xmax, ymin, ymax float64) {
	return math.Inf(1), math.Inf(-1), l.Y, l.Y
}

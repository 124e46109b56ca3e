package render

import (
	"image/color"
	"math"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/font"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

// The look of spallscope's plots: a sans-serif face, light grid lines
// behind the data, a muted palette of our own and one glyph shape per
// sector, so that a plot printed in grey still tells the sectors apart.

// plotFace is the typeface of every plot text (one of gonum/plot's bundled
// Liberation faces, so plots look the same on every machine).
var plotFace = font.Font{Typeface: "Liberation", Variant: "Sans"}

// plotInk is the colour of text and axes; plotRule that of grid lines;
// plotMuted that of legend samples that stand for every colour (an
// interval band, a trigger mark).
var (
	plotInk   = color.RGBA{0x26, 0x2b, 0x33, 0xff}
	plotRule  = color.RGBA{0xdc, 0xe0, 0xe6, 0xff}
	plotMuted = color.RGBA{0x5d, 0x66, 0x73, 0xff}
)

// plotPalette holds the series colours, in the order series take them.
var plotPalette = []color.RGBA{
	{0x2f, 0x5d, 0x8a, 0xff}, // slate blue
	{0xc0, 0x4b, 0x2c, 0xff}, // brick
	{0x3a, 0x8f, 0x6e, 0xff}, // spruce
	{0xc9, 0x92, 0x1e, 0xff}, // mustard
	{0x7a, 0x4f, 0x9a, 0xff}, // heather
	{0x5c, 0x6b, 0x2e, 0xff}, // moss
	{0xb0, 0x5f, 0x86, 0xff}, // mauve
	{0x4f, 0x9c, 0xb8, 0xff}, // lake
	{0x8a, 0x6a, 0x44, 0xff}, // umber
}

// plotColour returns the colour of series k.
func plotColour(k int) color.RGBA { return plotPalette[k%len(plotPalette)] }

// classColour is the colour of an onset class: the same class has the same
// colour in every plot.
func classColour(class string) color.RGBA {
	switch class {
	case "decorrelation":
		return plotPalette[0]
	case "through-going":
		return plotPalette[4]
	}
	return plotPalette[1] // localization
}

// Plot sizes: a figure fits a printed A4 page at full text width.
const (
	plotWidth  = 16 * vg.Centimeter
	plotHeight = 9.5 * vg.Centimeter
	plotDPI    = 150
)

// newPlot returns an empty plot in our style with its title and axis
// labels (units in the label, after a comma).
func newPlot(title, xLabel, yLabel string) *plot.Plot {
	p := plot.New()
	p.Title.Text = title
	p.Title.TextStyle.Font = font.From(plotFace, 11)
	p.Title.TextStyle.Color = plotInk
	p.Title.Padding = 6
	for _, ax := range []*plot.Axis{&p.X, &p.Y} {
		ax.Label.TextStyle.Font = font.From(plotFace, 9.5)
		ax.Label.TextStyle.Color = plotInk
		ax.Tick.Label.Font = font.From(plotFace, 8.5)
		ax.Tick.Label.Color = plotInk
		ax.Color = plotInk
		ax.Tick.Color = plotInk
		ax.Width = 0.75
		ax.Tick.Width = 0.75
		ax.Padding = 4
		ax.Tick.Marker = plotTicks{}
	}
	p.X.Label.Text = xLabel
	p.Y.Label.Text = yLabel
	p.Legend.TextStyle.Font = font.From(plotFace, 8.5)
	p.Legend.TextStyle.Color = plotInk
	p.Legend.Top = true
	p.Legend.Left = true
	p.Legend.XOffs = 6
	p.Legend.YOffs = -4
	p.Legend.ThumbnailWidth = 14
	p.Legend.Padding = 2.5
	g := plotter.NewGrid()
	g.Vertical.Color, g.Horizontal.Color = plotRule, plotRule
	g.Vertical.Width, g.Horizontal.Width = 0.5, 0.5
	p.Add(g)
	return p
}

// seriesLine styles a line of series colour c.
func seriesLine(l *plotter.Line, c color.Color, dashed bool) {
	l.Color = c
	l.Width = 1.4
	if dashed {
		l.Dashes = []vg.Length{4, 3}
	}
}

// seriesPoints styles the points of a series: small glyphs of colour c.
func seriesPoints(s *plotter.Scatter, c color.Color, shape draw.GlyphDrawer, radius vg.Length) {
	s.Color = c
	s.Shape = shape
	s.Radius = radius
}

// sectorGlyph is the glyph of a sector in every plot.
func sectorGlyph(sector string) draw.GlyphDrawer {
	switch sector {
	case "crown":
		return draw.PyramidGlyph{}
	case "invert":
		return downTriangleGlyph{}
	case "left-sidewall":
		return draw.CircleGlyph{}
	case "right-sidewall":
		return draw.BoxGlyph{}
	case "pillar":
		return diamondGlyph{}
	case "through":
		return draw.RingGlyph{}
	}
	return draw.CrossGlyph{}
}

// downTriangleGlyph is a filled triangle pointing down (the invert, below
// the opening).
type downTriangleGlyph struct{}

// DrawGlyph implements draw.GlyphDrawer.
func (downTriangleGlyph) DrawGlyph(c *draw.Canvas, sty draw.GlyphStyle, pt vg.Point) {
	c.SetLineStyle(draw.LineStyle{Color: sty.Color, Width: 0})
	c.SetColor(sty.Color)
	r := sty.Radius
	var p vg.Path
	p.Move(vg.Point{X: pt.X, Y: pt.Y - r})
	p.Line(vg.Point{X: pt.X + 0.95*r, Y: pt.Y + 0.7*r})
	p.Line(vg.Point{X: pt.X - 0.95*r, Y: pt.Y + 0.7*r})
	p.Close()
	c.Fill(p)
}

// diamondGlyph is a filled diamond (pillars, and the peak of the load).
type diamondGlyph struct{}

// DrawGlyph implements draw.GlyphDrawer.
func (diamondGlyph) DrawGlyph(c *draw.Canvas, sty draw.GlyphStyle, pt vg.Point) {
	c.SetColor(sty.Color)
	r := 1.2 * sty.Radius
	var p vg.Path
	p.Move(vg.Point{X: pt.X, Y: pt.Y + r})
	p.Line(vg.Point{X: pt.X + 0.75*r, Y: pt.Y})
	p.Line(vg.Point{X: pt.X, Y: pt.Y - r})
	p.Line(vg.Point{X: pt.X - 0.75*r, Y: pt.Y})
	p.Close()
	c.Fill(p)
}

// ringGlyphBold is an open circle with a heavy rim, drawn around a point
// of a line to mark an event on it.
type ringGlyphBold struct{}

// DrawGlyph implements draw.GlyphDrawer.
func (ringGlyphBold) DrawGlyph(c *draw.Canvas, sty draw.GlyphStyle, pt vg.Point) {
	c.SetLineStyle(draw.LineStyle{Color: sty.Color, Width: 1.6})
	var p vg.Path
	p.Move(vg.Point{X: pt.X + sty.Radius, Y: pt.Y})
	p.Arc(pt, sty.Radius, 0, 2*math.Pi)
	p.Close()
	c.Stroke(p)
}

// triggerGlyph marks the frame whose threshold confirmed a zone (an onset's
// trigger): an open circle with a cross, distinct from the filled glyph of
// the back-dated onset.
type triggerGlyph struct{}

// DrawGlyph implements draw.GlyphDrawer.
func (triggerGlyph) DrawGlyph(c *draw.Canvas, sty draw.GlyphStyle, pt vg.Point) {
	c.SetLineStyle(draw.LineStyle{Color: sty.Color, Width: 1.1})
	r := sty.Radius
	var p vg.Path
	p.Move(vg.Point{X: pt.X + r, Y: pt.Y})
	p.Arc(pt, r, 0, 2*math.Pi)
	p.Close()
	c.Stroke(p)
	var x vg.Path
	d := 0.7 * r
	x.Move(vg.Point{X: pt.X - d, Y: pt.Y - d})
	x.Line(vg.Point{X: pt.X + d, Y: pt.Y + d})
	x.Move(vg.Point{X: pt.X - d, Y: pt.Y + d})
	x.Line(vg.Point{X: pt.X + d, Y: pt.Y - d})
	c.Stroke(x)
}

// legendAwayFrom puts p's legend in the corner of the data's bounding box
// that holds the fewest of pts (each corner a box of 40 % of the width and
// 30 % of the height, about what a two-line legend takes; counted over the
// points of every series given), so that it covers as little of the
// curves as it can: a curve that falls from the top left, as a loaded
// face's apparent magnification does, would run under the default corner.
// Ties go to top left, top right, bottom left, bottom right, in that order.
func legendAwayFrom(p *plot.Plot, pts []plotter.XY) {
	if len(pts) == 0 {
		return
	}
	x0, x1, y0, y1 := pts[0].X, pts[0].X, pts[0].Y, pts[0].Y
	for _, q := range pts {
		x0, x1, y0, y1 = min(x0, q.X), max(x1, q.X), min(y0, q.Y), max(y1, q.Y)
	}
	w, h := 0.4*(x1-x0), 0.3*(y1-y0)
	corners := []struct{ top, left bool }{{true, true}, {true, false}, {false, true}, {false, false}}
	best, fewest := 0, len(pts)+1
	for i, c := range corners {
		n := 0
		for _, q := range pts {
			inX := (c.left && q.X <= x0+w) || (!c.left && q.X >= x1-w)
			inY := (c.top && q.Y >= y1-h) || (!c.top && q.Y <= y0+h)
			if inX && inY {
				n++
			}
		}
		if n < fewest {
			best, fewest = i, n
		}
	}
	p.Legend.Top, p.Legend.Left = corners[best].top, corners[best].left
	if !p.Legend.Top {
		p.Legend.YOffs = 4
	}
	if !p.Legend.Left {
		p.Legend.XOffs = -6
	}
}

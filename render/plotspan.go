package render

import (
	"image/color"
	"math"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

// spanMinWidth is the narrowest an interval band is drawn: an interval of
// one frame (lo = hi) still shows as a band, centred on its place.
const spanMinWidth = 2.5 // points

// spanBand is a shaded rectangle over an interval of the horizontal axis,
// X0 to X1, between Y0 and Y1 on the vertical one (NaN: the full height of
// the plot). It marks a confidence interval: an onset's frames, time and
// stress. A band narrower than spanMinWidth on the page is widened about
// its centre so that a one-frame interval stays visible.
type spanBand struct {
	X0, X1, Y0, Y1 float64
	Fill           color.Color
	// Edge outlines the band (nil: no outline).
	Edge color.Color
}

// fullHeight reports whether the band spans the plot's whole height.
func (b spanBand) fullHeight() bool { return math.IsNaN(b.Y0) || math.IsNaN(b.Y1) }

// Plot implements plot.Plotter.
func (b spanBand) Plot(c draw.Canvas, p *plot.Plot) {
	trX, trY := p.Transforms(&c)
	x0, x1 := trX(min(b.X0, b.X1)), trX(max(b.X0, b.X1))
	if w := x1 - x0; w < spanMinWidth {
		mid := (x0 + x1) / 2
		x0, x1 = mid-spanMinWidth/2, mid+spanMinWidth/2
	}
	y0, y1 := c.Min.Y, c.Max.Y
	if !b.fullHeight() {
		y0, y1 = trY(min(b.Y0, b.Y1)), trY(max(b.Y0, b.Y1))
		if h := y1 - y0; h < spanMinWidth {
			mid := (y0 + y1) / 2
			y0, y1 = mid-spanMinWidth/2, mid+spanMinWidth/2
		}
	}
	x0, x1 = max(x0, c.Min.X), min(x1, c.Max.X)
	y0, y1 = max(y0, c.Min.Y), min(y1, c.Max.Y)
	if x1 <= x0 || y1 <= y0 {
		return
	}
	var path vg.Path
	path.Move(vg.Point{X: x0, Y: y0})
	path.Line(vg.Point{X: x1, Y: y0})
	path.Line(vg.Point{X: x1, Y: y1})
	path.Line(vg.Point{X: x0, Y: y1})
	path.Close()
	c.SetColor(b.Fill)
	c.Fill(path)
	if b.Edge != nil {
		c.SetLineStyle(draw.LineStyle{Color: b.Edge, Width: 0.6})
		c.Stroke(path)
	}
}

// DataRange implements plot.DataRanger: the band's extent, so that the
// axes include it.
func (b spanBand) DataRange() (xmin, xmax, ymin, ymax float64) {
	xmin, xmax = min(b.X0, b.X1), max(b.X0, b.X1)
	if b.fullHeight() {
		return xmin, xmax, math.Inf(1), math.Inf(-1)
	}
	return xmin, xmax, min(b.Y0, b.Y1), max(b.Y0, b.Y1)
}

// Thumbnail implements plot.Thumbnailer: the legend's sample of the band.
func (b spanBand) Thumbnail(c *draw.Canvas) {
	path := c.Rectangle.Path()
	c.SetColor(b.Fill)
	c.Fill(path)
	if b.Edge != nil {
		c.SetLineStyle(draw.LineStyle{Color: b.Edge, Width: 0.6})
		c.Stroke(path)
	}
}

// intervalBox is the shaded box of an onset's interval over a stress
// history: across, the interval's times t0 to t1; up and down, the stress
// over them — the interval's stresses s0 and s1 and the curve in between —
// widened by pad on both sides. Without stresses (NaN) the band spans the
// plot's whole height.
func intervalBox(t0, t1, s0, s1 float64, curve plotter.XYs, pad float64, c color.RGBA) spanBand {
	b := spanBand{X0: t0, X1: t1, Y0: math.NaN(), Y1: math.NaN(), Fill: bandColour(c), Edge: edgeColour(c)}
	if !plotFinite(s0) || !plotFinite(s1) {
		return b
	}
	lo, hi := min(s0, s1), max(s0, s1)
	for _, pt := range curve {
		if pt.X >= min(t0, t1) && pt.X <= max(t0, t1) {
			lo, hi = min(lo, pt.Y), max(hi, pt.Y)
		}
	}
	b.Y0, b.Y1 = lo-pad, hi+pad
	return b
}

// bandColour is the fill of an interval band of an onset of colour c:
// the same hue, mostly transparent, so the curve under it shows.
func bandColour(c color.RGBA) color.NRGBA {
	return color.NRGBA{R: c.R, G: c.G, B: c.B, A: 0x48}
}

// edgeColour is the outline of a band of colour c.
func edgeColour(c color.RGBA) color.NRGBA {
	return color.NRGBA{R: c.R, G: c.G, B: c.B, A: 0xb0}
}

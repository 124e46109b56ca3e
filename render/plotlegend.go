package render

import (
	"gonum.org/v1/plot"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

// sideLegendGap is the space between a plot and a legend beside it.
const sideLegendGap = 0.25 * vg.Centimeter

// withSideLegend draws p with its legend beside the data, on the right,
// rather than over it: for plots with many entries whose data may reach
// any corner (a stress history rises to its peak and falls after it).
func withSideLegend(p *plot.Plot) figureDrawer {
	return func(c draw.Canvas) {
		side := p.Legend
		side.Top, side.Left = true, true
		side.XOffs, side.YOffs = 0, -p.Title.TextStyle.Height(p.Title.Text)-2*p.Title.Padding
		inner := *p
		inner.Legend = plot.NewLegend()
		w := side.Rectangle(c).Size().X + sideLegendGap
		left := c
		left.Max.X -= w
		inner.Draw(left)
		right := c
		right.Min.X = left.Max.X + sideLegendGap
		side.Draw(right)
	}
}

package render

import (
	"bufio"
	"fmt"
	"image/color"
	"os"
	"path/filepath"

	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
	"gonum.org/v1/plot/vg/vgimg"
	"gonum.org/v1/plot/vg/vgsvg"

	"spallscope/dic/runfolder"
)

// PlotsDir is the run folder's subfolder of plots.
const PlotsDir = "plots"

// Figure is one plot written to a run folder, as a PNG (for the page and
// slides) and an SVG (for print) of the same drawing.
type Figure struct {
	// Name is the file stem, e.g. "stress_time".
	Name string
	// Title and Caption say what the plot shows, for the report.
	Title, Caption string
	// PNG and SVG are the files' paths relative to the run folder,
	// slash-separated.
	PNG, SVG string
	// Width and Height are the PNG's size in pixels.
	Width, Height int
}

// figureDrawer draws a whole figure onto a canvas.
type figureDrawer func(c draw.Canvas)

// writeFigure draws d into dir/plots/<name>.png and .svg (both written
// atomically) at the plots' size and returns the figure.
func writeFigure(dir, name, title, caption string, d figureDrawer) (Figure, error) {
	return writeFigureSized(dir, name, title, caption, plotHeight, d)
}

// writeFigureSized is writeFigure for a figure of the plots' width and
// the given height (small multiples grow downwards).
func writeFigureSized(dir, name, title, caption string, height vg.Length, d figureDrawer) (Figure, error) {
	if err := mkdirPlots(dir); err != nil {
		return Figure{}, err
	}
	fig := Figure{Name: name, Title: title, Caption: caption,
		PNG: PlotsDir + "/" + name + ".png", SVG: PlotsDir + "/" + name + ".svg"}
	png := vgimg.NewWith(vgimg.UseWH(plotWidth, height), vgimg.UseDPI(plotDPI), vgimg.UseBackgroundColor(color.White))
	b := png.Image().Bounds()
	fig.Width, fig.Height = b.Dx(), b.Dy()
	d(draw.New(png))
	if err := runfolder.WriteAtomic(filepath.Join(dir, fig.PNG), func(w *bufio.Writer) error {
		_, err := vgimg.PngCanvas{Canvas: png}.WriteTo(w)
		return err
	}); err != nil {
		return Figure{}, err
	}
	svg := vgsvg.New(plotWidth, height)
	// The SVG has no background of its own: paint the page white first,
	// as the PNG is.
	c := draw.New(svg)
	c.SetColor(color.White)
	c.Fill(c.Rectangle.Path())
	d(c)
	if err := runfolder.WriteAtomic(filepath.Join(dir, fig.SVG), func(w *bufio.Writer) error {
		_, err := svg.WriteTo(w)
		return err
	}); err != nil {
		return Figure{}, err
	}
	return fig, nil
}

// mkdirPlots makes the plots folder of run folder dir.
func mkdirPlots(dir string) error {
	if err := os.MkdirAll(filepath.Join(dir, PlotsDir), 0o755); err != nil {
		return fmt.Errorf("plots: %w", err)
	}
	return nil
}

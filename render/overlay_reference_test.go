package render

import (
	"fmt"
	"image"
	"math"

	"gocv.io/x/gocv"

	"spallscope/dic/region"
	"spallscope/subset"
)

// referenceOverlay is the overlay as it was drawn before the fast path
// (per-pixel At into a float raster, Colormap.At, OpenCV AddWeighted,
// an RGBA canvas copied to BGR): the reference the fast path is held
// against. It draws values (a field on its grid, reference px) over photo and
// returns a BGR image: the photo with the coloured field blended in at
// opacity Alpha, with the marks (zone outlines, onset badges, arrows), and
// to its right a panel with the colour bar, the quantity and unit, the
// limits, the frame's time and stress, a scale bar and the legend. The
// photo keeps its pixel size at the top left, so image positions are
// photo positions. The caller closes the result.
func referenceOverlay(photo *subset.Image, values *GridValues, opt OverlayOptions) (gocv.Mat, error) {
	w, h := photo.Width, photo.Height
	opt, err := opt.prepared(photo)
	if err != nil {
		return gocv.Mat{}, err
	}
	alpha := opt.Alpha
	var r *Raster
	if opt.Deform != nil {
		r, err = values.RasterOn(opt.Deform, w, h, opt.Keep)
	} else {
		r, err = referenceRaster(values, w, h, opt.Keep)
	}
	if err != nil {
		return gocv.Mat{}, fmt.Errorf("overlay of frame %s: %w", opt.Stamp.Frame, err)
	}
	blended, err := referenceBlend(photo, r, opt.Map, opt.Limits, alpha)
	if err != nil {
		return gocv.Mat{}, fmt.Errorf("overlay of frame %s: %w", opt.Stamp.Frame, err)
	}
	defer blended.Close()
	l := newPanelLayout(h)
	drawZoneOutlines(&blended, values.Grid, opt.Zones, opt.Deform, l.thick)
	gain := 0.0
	if opt.Vectors != nil {
		gain = vectorGain(opt.Vectors)
		drawVectors(&blended, opt.Vectors, opt.Deform, gain)
	}
	badges := placeOnsets(&blended, opt.Onsets, opt.Deform, l)
	over, under := beyondLimits(values, opt.Limits)
	return referenceCanvas(blended, opt, l, badges, gain, over, under)
}

// referenceRaster is Raster as it was: At at every pixel of the grid's
// box.
func referenceRaster(g *GridValues, width, height int, keep *region.Mask) (*Raster, error) {
	if err := g.check(); err != nil {
		return nil, err
	}
	r := (*overlayBuffers)(nil).newRaster(width, height)
	x0, y0, x1, y1 := g.bounds(width, height)
	for y := y0; y <= y1; y++ {
		row := r.Pix[y*width : (y+1)*width]
		for x := x0; x <= x1; x++ {
			if keep != nil && keep.Pix[y*width+x] == 0 {
				continue
			}
			if v, ok := g.At(float64(x), float64(y)); ok {
				row[x] = float32(v)
			}
		}
	}
	return r, nil
}

// referenceBlend colours the raster with the map and blends it over the gray
// photo at opacity alpha (OpenCV AddWeighted): colour·α + gray·(1 − α) where
// the field is drawn, the photo's gray elsewhere. Its gray and colour
// arrays are new each frame.
func referenceBlend(photo *subset.Image, r *Raster, m Colormap, lim Limits, alpha float64) (gocv.Mat, error) {
	w, h := photo.Width, photo.Height
	gray, colour := photoGray(photo), make([]byte, 3*w*h)
	for i, v := range r.Pix {
		if math.IsNaN(float64(v)) {
			g := gray[i]
			colour[3*i], colour[3*i+1], colour[3*i+2] = g, g, g
			continue
		}
		cr, cg, cb := m.At(lim.Position(float64(v)))
		colour[3*i], colour[3*i+1], colour[3*i+2] = cb, cg, cr
	}
	gm, err := gocv.NewMatFromBytes(h, w, gocv.MatTypeCV8U, gray)
	if err != nil {
		return gocv.Mat{}, err
	}
	defer gm.Close()
	base := gocv.NewMat()
	defer base.Close()
	gocv.CvtColor(gm, &base, gocv.ColorGrayToBGR)
	cm, err := gocv.NewMatFromBytes(h, w, gocv.MatTypeCV8UC3, colour)
	if err != nil {
		return gocv.Mat{}, err
	}
	defer cm.Close()
	out := gocv.NewMat()
	gocv.AddWeighted(base, 1-alpha, cm, alpha, 0, &out)
	return out, nil
}

// referenceCanvas lays the blended photo and the panel side by side on a
// white canvas tall enough for both and draws the panel and the onset
// badges.
func referenceCanvas(blended gocv.Mat, opt OverlayOptions, l panelLayout, badges []placedBadge, gain float64, over, under bool) (gocv.Mat, error) {
	w, h := blended.Cols(), blended.Rows()
	measure, err := newSidePanel(nil, w, l)
	if err != nil {
		return gocv.Mat{}, err
	}
	drawPanel(measure, opt, gain, over, under)
	H := max(h, measure.y+l.margin)
	canvas := image.NewRGBA(image.Rect(0, 0, w+l.width, H))
	for i := range canvas.Pix {
		canvas.Pix[i] = 0xff
	}
	bgr, err := blended.DataPtrUint8()
	if err != nil {
		return gocv.Mat{}, err
	}
	for y := 0; y < h; y++ {
		row := canvas.Pix[y*canvas.Stride:]
		src := bgr[3*y*w : 3*(y+1)*w]
		for x := 0; x < w; x++ {
			row[4*x], row[4*x+1], row[4*x+2] = src[3*x+2], src[3*x+1], src[3*x]
		}
	}
	p, err := newSidePanel(canvas, w, l)
	if err != nil {
		return gocv.Mat{}, err
	}
	drawPanel(p, opt, gain, over, under)
	if len(badges) > 0 {
		face, err := annotateFace(l.small, true)
		if err != nil {
			return gocv.Mat{}, err
		}
		for _, b := range badges {
			onsetBadge(canvas, face, b.at.X, b.at.Y, l.badgeR, b.number)
		}
	}
	return referenceBGR(canvas)
}

// referenceBGR converts an opaque RGBA image to an OpenCV BGR image, which
// is new.
func referenceBGR(img *image.RGBA) (gocv.Mat, error) {
	w, h := img.Rect.Dx(), img.Rect.Dy()
	out := make([]byte, 3*w*h)
	for y := 0; y < h; y++ {
		row := img.Pix[y*img.Stride:]
		dst := out[3*y*w:]
		for x := 0; x < w; x++ {
			dst[3*x], dst[3*x+1], dst[3*x+2] = row[4*x+2], row[4*x+1], row[4*x]
		}
	}
	return gocv.NewMatFromBytes(h, w, gocv.MatTypeCV8UC3, out)
}

package render

import (
	"fmt"
	"image"
	"math"

	"gocv.io/x/gocv"

	"spallscope/dic"
	"spallscope/dic/lens"
	"spallscope/dic/region"
	"spallscope/subset"
)

// DefaultAlpha is the default opacity of the coloured field over the photo:
// enough to read the colour, little enough to see the speckle and cracks.
const DefaultAlpha = 0.6

// Stamp says where a frame sits in the test.
type Stamp struct {
	Frame string
	// Time is the camera time in s, Stress the nominal stress in MPa
	// (compression positive); each only when its Has flag is set.
	Time, Stress       float64
	HasTime, HasStress bool
	// Peak is the test's peak nominal stress in MPa (0: unknown).
	Peak float64
}

// ZoneOutline is a localized zone to outline, by its grid points.
type ZoneOutline struct {
	Cells []int
	// Class is "localization" (white outline) or "decorrelation" (black).
	Class string
}

// OnsetMark is a measured onset to mark at the place it was first seen.
type OnsetMark struct {
	// X, Y is the zone's centroid in reference px.
	X, Y float64
	// Number is the badge number, Legend the panel line.
	Number int
	Legend string
}

// Vectors asks for displacement arrows.
type Vectors struct {
	U, V *GridValues
	// Every draws an arrow at every Every-th grid point along each axis.
	Every int
	// Gain is the arrow length in px per px of displacement; 0 picks one
	// for this frame (the 99th percentile of the displacement as 0.9 of
	// the arrow spacing). A sequence should fix it so lengths compare.
	Gain float64
}

// OverlayOptions say what an overlay shows.
type OverlayOptions struct {
	Quantity Quantity
	Limits   Limits
	// Map is the colour map (zero value: the quantity's own).
	Map Colormap
	// Alpha is the opacity of the field over the photo, in (0, 1]
	// (0: DefaultAlpha).
	Alpha float64
	// Scale is the image scale (0: unknown).
	Scale dic.Scale
	// Keep marks the measured reference pixels (nil: all); openings and
	// other exclusions stay clear.
	Keep *region.Mask
	// Deform, when set, draws the field where the material is in the frame
	// shown (the photo is the current frame); otherwise the photo is the
	// reference and the field is drawn where it was measured.
	Deform *Deformation
	Stamp  Stamp
	Zones  []ZoneOutline
	Onsets []OnsetMark
	// Lens, when set, is the lens whose distortion the run's fields were
	// corrected for (fields in undistorted px): the field and its marks are
	// drawn through it at their places on the photos as taken.
	Lens *lens.Model
	// Vectors, when set, adds displacement arrows.
	Vectors *Vectors
	// Notes are short lines at the foot of the panel (resolution, VSG).
	Notes []string
	// ReserveOnsets and ReserveZones keep room in the panel for that many
	// onset lines and for the zone legend, so every frame of a sequence
	// has the same size.
	ReserveOnsets int
	ReserveZones  bool
	// buffers, when set, are Run's arrays kept from frame to frame; the
	// overlay returned views them and is closed before the next one.
	buffers *overlayBuffers
}

// Overlay draws values (a field on its grid, reference px) over photo and
// returns a BGR image: the photo with the coloured field blended in at
// opacity Alpha, with the marks (zone outlines, onset badges, arrows), and
// to its right a panel with the colour bar, the quantity and unit, the
// limits, the frame's time and stress, a scale bar and the legend. The
// photo keeps its pixel size at the top left, so image positions are
// photo positions. The caller closes the result.
func Overlay(photo *subset.Image, values *GridValues, opt OverlayOptions) (gocv.Mat, error) {
	w, h := photo.Width, photo.Height
	if w == 0 || h == 0 {
		return gocv.Mat{}, fmt.Errorf("overlay of frame %s: empty photo", opt.Stamp.Frame)
	}
	alpha := opt.Alpha
	if alpha == 0 {
		alpha = DefaultAlpha
	}
	if !(alpha > 0 && alpha <= 1) {
		return gocv.Mat{}, fmt.Errorf("overlay: opacity %g, expected a number in (0, 1]", alpha)
	}
	if opt.Map.table == nil {
		opt.Map = opt.Quantity.Map()
	}
	if opt.Lens != nil {
		d := Deformation{Lens: opt.Lens}
		if opt.Deform != nil {
			d.U, d.V = opt.Deform.U, opt.Deform.V
		}
		opt.Deform = &d
	}
	var r *Raster
	var err error
	if opt.Deform != nil {
		r, err = values.rasterOnIn(opt.buffers, opt.Deform, w, h, opt.Keep)
	} else {
		r, err = values.rasterIn(opt.buffers, w, h, opt.Keep)
	}
	if err != nil {
		return gocv.Mat{}, fmt.Errorf("overlay of frame %s: %w", opt.Stamp.Frame, err)
	}
	blended, err := blendField(opt.buffers, photo, r, opt.Map, opt.Limits, alpha)
	if err != nil {
		return gocv.Mat{}, fmt.Errorf("overlay of frame %s: %w", opt.Stamp.Frame, err)
	}
	defer blended.Close()
	l := newPanelLayout(h)
	drawZoneOutlines(&blended, values.Grid, opt.Zones, opt.Deform, l.thick)
	gain := 0.0
	if opt.Vectors != nil {
		gain = drawVectors(&blended, opt.Vectors, opt.Deform)
	}
	badges := placeOnsets(&blended, opt.Onsets, opt.Deform, l)
	over, under := beyondLimits(values, opt.Limits)
	return composeCanvas(blended, opt, l, badges, gain, over, under)
}

// photoGray returns the photo as 8-bit gray levels (16-bit photos scaled
// from their full range, images of unknown depth taken as 0–1).
func photoGray(photo *subset.Image) []byte {
	return photoGrayInto(make([]byte, len(photo.Pix)), photo)
}

// photoGrayInto is photoGray into out, of the photo's pixel count.
func photoGrayInto(out []byte, photo *subset.Image) []byte {
	full := photo.MaxLevel()
	for i, v := range photo.Pix {
		out[i] = unit8(float64(v) / full)
	}
	return out
}

// blendField colours the raster with the map and blends it over the gray
// photo at opacity alpha (OpenCV AddWeighted): colour·α + gray·(1 − α) where
// the field is drawn, the photo's gray elsewhere. Its gray and colour
// arrays are buf's when buf is not nil (the Mats that view them are closed
// here, before buf's next use).
func blendField(buf *overlayBuffers, photo *subset.Image, r *Raster, m Colormap, lim Limits, alpha float64) (gocv.Mat, error) {
	w, h := photo.Width, photo.Height
	var gray, colour []byte
	if buf != nil {
		buf.gray, buf.colour = resize(buf.gray, len(photo.Pix)), resize(buf.colour, 3*w*h)
		gray, colour = photoGrayInto(buf.gray, photo), buf.colour
	} else {
		gray, colour = photoGray(photo), make([]byte, 3*w*h)
	}
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

// beyondLimits reports whether any measured value lies above or below the
// limits (shown as triangles at the ends of the colour bar).
func beyondLimits(g *GridValues, lim Limits) (over, under bool) {
	for _, v := range g.Values {
		if v > lim.Hi {
			over = true
		}
		if v < lim.Lo {
			under = true
		}
	}
	return
}

// composeCanvas lays the blended photo and the panel side by side on a
// white canvas tall enough for both and draws the panel and the onset
// badges.
func composeCanvas(blended gocv.Mat, opt OverlayOptions, l panelLayout, badges []placedBadge, gain float64, over, under bool) (gocv.Mat, error) {
	w, h := blended.Cols(), blended.Rows()
	measure, err := newSidePanel(nil, w, l)
	if err != nil {
		return gocv.Mat{}, err
	}
	drawPanel(measure, opt, gain, over, under)
	H := max(h, measure.y+l.margin)
	canvas := opt.buffers.newRGBA(w+l.width, H)
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
	return rgbaToBGR(opt.buffers, canvas)
}

// rgbaToBGR converts an opaque RGBA image to an OpenCV BGR image, which
// views buf's BGR array when buf is not nil (the caller closes it before
// buf's next use).
func rgbaToBGR(buf *overlayBuffers, img *image.RGBA) (gocv.Mat, error) {
	w, h := img.Rect.Dx(), img.Rect.Dy()
	var out []byte
	if buf != nil {
		buf.bgr = resize(buf.bgr, 3*w*h)
		out = buf.bgr
	} else {
		out = make([]byte, 3*w*h)
	}
	for y := 0; y < h; y++ {
		row := img.Pix[y*img.Stride:]
		dst := out[3*y*w:]
		for x := 0; x < w; x++ {
			dst[3*x], dst[3*x+1], dst[3*x+2] = row[4*x+2], row[4*x+1], row[4*x]
		}
	}
	return gocv.NewMatFromBytes(h, w, gocv.MatTypeCV8UC3, out)
}

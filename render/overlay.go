package render

import (
	"fmt"
	"image"

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

// prepared returns opt with its defaults filled in and checked for photo, as
// Overlay applies them: a photo that is not empty, the opacity (DefaultAlpha for 0, else in (0, 1]),
// the quantity's colour map when none is set, and the lens folded into
// the deformation the field is drawn through.
func (opt OverlayOptions) prepared(photo *subset.Image) (OverlayOptions, error) {
	if photo.Width == 0 || photo.Height == 0 {
		return opt, fmt.Errorf("overlay of frame %s: empty photo", opt.Stamp.Frame)
	}
	if opt.Alpha == 0 {
		opt.Alpha = DefaultAlpha
	}
	if !(opt.Alpha > 0 && opt.Alpha <= 1) {
		return opt, fmt.Errorf("overlay: opacity %g, expected a number in (0, 1]", opt.Alpha)
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
	return opt, nil
}

// Overlay draws values (a field on its grid, reference px) over photo and
// returns a BGR image: the photo with the coloured field blended in at
// opacity Alpha, with the marks (zone outlines, onset badges, arrows), and
// to its right a panel with the colour bar, the quantity and unit, the
// limits, the frame's time and stress, a scale bar and the legend. The
// photo keeps its pixel size at the top left, so image positions are
// photo positions. The caller closes the result.
//
// The field is sampled, coloured and blended a row at a time, straight
// into the canvas, on all cores (parallelRows); the marks are drawn on
// the canvas's photo part by OpenCV and the panel's lettering in Go on an
// image of the panel alone. It matches the path it replaced (a float
// raster, Colormap.At, OpenCV's AddWeighted, an RGBA canvas copied to BGR)
// to one gray level at every pixel (TestOverlayMatchesReferencePath).
func Overlay(photo *subset.Image, values *GridValues, opt OverlayOptions) (gocv.Mat, error) {
	w, h := photo.Width, photo.Height
	opt, err := opt.prepared(photo)
	if err != nil {
		return gocv.Mat{}, err
	}
	alpha := opt.Alpha
	if opt.Deform != nil && opt.Deform.Lens == nil && !opt.Deform.moves() {
		return gocv.Mat{}, fmt.Errorf("overlay of frame %s: raster on the current frame: no displacement field", opt.Stamp.Frame)
	}
	s, err := values.sampler(opt.Deform, w, h, opt.Keep)
	if err != nil {
		return gocv.Mat{}, fmt.Errorf("overlay of frame %s: %w", opt.Stamp.Frame, err)
	}
	l := newPanelLayout(h)
	gain := 0.0
	if opt.Vectors != nil {
		gain = vectorGain(opt.Vectors)
	}
	over, under := beyondLimits(values, opt.Limits)
	measure, err := newSidePanel(nil, w, l)
	if err != nil {
		return gocv.Mat{}, err
	}
	drawPanel(measure, opt, gain, over, under)
	cw, ch := w+l.width, max(h, measure.y+l.margin)
	pix := opt.buffers.canvas(3 * cw * ch)
	bt := newBlendTable(opt.buffers.table(), opt.Map, opt.Limits, alpha, photo)
	opt.buffers.keep(bt)
	rows := make([][]float32, workerCount(ch))
	parallelRows(ch, func(k, y0, y1 int) {
		if rows[k] == nil {
			rows[k] = make([]float32, w)
		}
		for y := y0; y < y1; y++ {
			line := pix[3*cw*y : 3*cw*(y+1)]
			from := 0
			if y < h {
				s.row(y, rows[k])
				bt.row(line, rows[k], photo, y)
				from = 3 * w
			}
			for i := from; i < len(line); i++ {
				line[i] = 0xff
			}
		}
	})
	canvas, err := gocv.NewMatFromBytes(ch, cw, gocv.MatTypeCV8UC3, pix)
	if err != nil {
		return gocv.Mat{}, err
	}
	ok := false
	defer func() {
		if !ok {
			canvas.Close()
		}
	}()
	onPhoto := canvas.Region(image.Rect(0, 0, w, h))
	drawZoneOutlines(&onPhoto, values.Grid, opt.Zones, opt.Deform, l.thick)
	if opt.Vectors != nil {
		drawVectors(&onPhoto, opt.Vectors, opt.Deform, gain)
	}
	badges := placeOnsets(&onPhoto, opt.Onsets, opt.Deform, l)
	onPhoto.Close()
	bgr := bgrCanvas{pix: pix, stride: 3 * cw, rect: image.Rect(0, 0, cw, ch)}
	panel := opt.buffers.newRGBA(image.Rect(w, 0, cw, ch))
	for i := range panel.Pix {
		panel.Pix[i] = 0xff
	}
	p, err := newSidePanel(panel, w, l)
	if err != nil {
		return gocv.Mat{}, err
	}
	drawPanel(p, opt, gain, over, under)
	bgr.put(panel)
	if len(badges) > 0 {
		face, err := annotateFace(l.small, true)
		if err != nil {
			return gocv.Mat{}, err
		}
		for _, b := range badges {
			// The badge is lettered in Go on an RGBA copy of its patch.
			r := 2*l.badgeR + 4
			patch := bgr.get(image.Rect(b.at.X-r, b.at.Y-r, b.at.X+r+1, b.at.Y+r+1))
			onsetBadge(patch, face, b.at.X, b.at.Y, l.badgeR, b.number)
			bgr.put(patch)
		}
	}
	ok = true
	return canvas, nil
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

// bgrCanvas is the overlay's BGR canvas seen from Go: 3 bytes a pixel,
// stride bytes a row.
type bgrCanvas struct {
	pix    []byte
	stride int
	rect   image.Rectangle
}

// get returns the part r of the canvas (clipped to it) as an RGBA image
// with the canvas's coordinates.
func (c bgrCanvas) get(r image.Rectangle) *image.RGBA {
	img := image.NewRGBA(r.Intersect(c.rect))
	b := img.Rect
	for y := b.Min.Y; y < b.Max.Y; y++ {
		src := c.pix[y*c.stride+3*b.Min.X : y*c.stride+3*b.Max.X]
		dst := img.Pix[img.PixOffset(b.Min.X, y):]
		for x := 0; x < b.Dx(); x++ {
			dst[4*x], dst[4*x+1], dst[4*x+2], dst[4*x+3] = src[3*x+2], src[3*x+1], src[3*x], 0xff
		}
	}
	return img
}

// put copies an opaque RGBA image into the canvas at its own coordinates.
func (c bgrCanvas) put(img *image.RGBA) {
	b := img.Rect.Intersect(c.rect)
	for y := b.Min.Y; y < b.Max.Y; y++ {
		dst := c.pix[y*c.stride+3*b.Min.X : y*c.stride+3*b.Max.X]
		src := img.Pix[img.PixOffset(b.Min.X, y):]
		for x := 0; x < b.Dx(); x++ {
			dst[3*x], dst[3*x+1], dst[3*x+2] = src[4*x+2], src[4*x+1], src[4*x]
		}
	}
}

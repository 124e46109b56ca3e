package speckle

import (
	"errors"
	"fmt"
	"strconv"

	"spallscope/dic/frames"
	"spallscope/subset"
)

// Thresholds of the notes (common practice, no source).
const (
	// clipNote is the clipped fraction above which exposure is flagged.
	clipNote = 0.01
	// smallSpeckle is the speckle size in px below which the pattern is
	// too fine for the camera: speckles sampled by fewer pixels alias.
	smallSpeckle = 3.0
	// flatResidual is the variance, in gray levels², below which what
	// remains of an image after removing its plane is rounding, not
	// texture (a thousandth of a level).
	flatResidual = 1e-6
)

// Assess measures the quality of the speckle pattern in img: gray levels
// and clipping, mean intensity gradient, speckle size, image noise (given,
// or from the static photo in opt), the predicted displacement noise of
// each subset size and the smallest size that meets opt.Target, and a map
// of SSSIG over the face. An image without texture is not an error: the
// report then says so. Errors are options that do not fit the image, or
// an empty image.
func Assess(img *subset.Image, opt Options) (*Report, error) {
	if img == nil || img.Width < 1 || img.Height < 1 {
		return nil, errors.New("speckle: empty image")
	}
	if len(img.Pix) != img.Width*img.Height {
		return nil, fmt.Errorf("speckle: %dx%d image has %d pixels", img.Width, img.Height, len(img.Pix))
	}
	opt = opt.withDefaults()
	if err := opt.validate(img); err != nil {
		return nil, fmt.Errorf("speckle: %w", err)
	}
	st := frames.Describe(img)
	r := &Report{
		Width: img.Width, Height: img.Height, Depth: img.Depth,
		Min: st.Min, Max: st.Max, Saturated: st.Saturated, Dark: st.Dark,
		Interpolation: opt.Interpolation.String(),
		Target:        opt.Target,
		NoiseSource:   NoiseNone,
		Notes:         []string{},
	}
	r.Mean, r.Contrast = grayLevels(img)
	r.Textured = st.Max > st.Min
	r.noise(img, opt)
	if !r.Textured {
		r.note("no texture: every pixel has gray level %g, so nothing can be tracked", st.Min)
	} else {
		r.MIG = meanIntensityGradient(img)
		r.speckleSize(img)
	}
	tables := newGradientTables(subset.NewSpline(img, opt.Interpolation))
	r.Subsets = subsetTable(tables, tableSizes(img.Width, img.Height, opt.Subset), r.Noise, opt.Target)
	r.Map = newMap(tables, opt.Subset, r.Noise, opt.Target)
	r.smallestSubset()
	r.clippingNotes()
	return r, nil
}

// noise fills the noise level and its source.
func (r *Report) noise(img *subset.Image, opt Options) {
	switch {
	case opt.Noise > 0:
		r.Noise, r.NoiseSource = opt.Noise, NoiseGiven
	case opt.Static != nil:
		sigma, n := staticPairNoise(img, opt.Static)
		if n < 2 {
			r.note("the static pair has no pixel unclipped in both photos: noise unknown")
			return
		}
		r.Noise, r.NoiseSource, r.NoisePixels = sigma, NoiseStaticPair, n
		if sigma == 0 {
			r.note("the static photo is identical to the image: noise 0 cannot be right (the same file twice?)")
			r.Noise, r.NoiseSource = 0, NoiseNone
		}
	default:
		r.note("noise unknown: give its level or a second photo of the still face to predict the displacement noise")
	}
}

// speckleSize fills the correlation radii and the speckle size.
func (r *Report) speckleSize(img *subset.Image) {
	f := detrended(img)
	if lagCovariance(f, img.Width, img.Height, 0, 0) < flatResidual {
		r.note("no speckle size: the gray levels are a plane (a smooth ramp of light) without speckles")
		return
	}
	maxLag := max(2, min(img.Width, img.Height)/4)
	rx, okx := correlationRadius(f, img.Width, img.Height, 1, 0, maxLag)
	ry, oky := correlationRadius(f, img.Width, img.Height, 0, 1, maxLag)
	if !okx || !oky {
		r.note("no speckle size: the image stays correlated beyond %d px (blobs far too large, or lighting that varies across the face)", maxLag)
		return
	}
	r.CorrelationRadiusX, r.CorrelationRadiusY = rx, ry
	r.CorrelationRadius = (rx + ry) / 2
	r.SpeckleSize = 2 * r.CorrelationRadius
	if r.SpeckleSize < smallSpeckle {
		r.note("speckles of %.1f px are finer than about %g px: they alias and bias subpixel matching; use larger speckles or more magnification", r.SpeckleSize, smallSpeckle)
	}
}

// smallestSubset picks the smallest table size that meets the target.
func (r *Report) smallestSubset() {
	switch {
	case !r.Textured:
		r.SmallestSubsetText = "none"
		return
	case r.Noise <= 0:
		r.SmallestSubsetText = "unknown"
		return
	}
	for _, s := range r.Subsets {
		if s.MeetsTarget {
			r.SmallestSubset = s.Size
			r.SmallestSubsetText = strconv.Itoa(s.Size)
			return
		}
	}
	r.SmallestSubsetText = "none"
	if n := len(r.Subsets); n > 0 {
		r.note("no subset up to %d px reaches %g px of displacement noise (predicted %.3g px there): lower the noise or improve the pattern", r.Subsets[n-1].Size, r.Target, r.Subsets[n-1].Predicted)
	}
}

// clippingNotes flags clipped highlights and shadows.
func (r *Report) clippingNotes() {
	if r.Saturated > clipNote {
		r.note("%.1f %% of pixels are saturated: shorten the exposure or dim the light", 100*r.Saturated)
	}
	if r.Dark > clipNote {
		r.note("%.1f %% of pixels are clipped dark: lengthen the exposure or add light", 100*r.Dark)
	}
}

func (r *Report) note(format string, args ...any) {
	r.Notes = append(r.Notes, fmt.Sprintf(format, args...))
}

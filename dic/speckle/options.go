package speckle

import (
	"fmt"
	"math"

	"spallscope/subset"
)

// Defaults used for zero Options fields.
const (
	// DefaultSubset is the subset size of the map, in px.
	DefaultSubset = 21
	// DefaultTarget is the displacement noise a subset should reach, in
	// px (0.01 px: the order of what IC-GN reaches on a good pattern;
	// common practice, no source).
	DefaultTarget = 0.01
)

// Options sets up Assess. Zero fields take the documented defaults.
type Options struct {
	// Subset is the subset size in px (odd, at least 7) of the SSSIG map;
	// default DefaultSubset.
	Subset int
	// Interpolation is the B-spline whose gradient enters the SSSIG; the
	// zero value is the tracker's default, bicubic.
	Interpolation subset.Interpolation
	// Noise is the standard deviation of the image noise in gray levels,
	// if known; 0 means not given.
	Noise float64
	// Static is a second photo of the same still face, taken like the
	// first; the noise is then estimated from the pair. Give Noise or
	// Static, not both.
	Static *subset.Image
	// Target is the displacement noise in px that the smallest suitable
	// subset must reach; default DefaultTarget.
	Target float64
}

// withDefaults returns o with zero fields replaced by their defaults.
func (o Options) withDefaults() Options {
	if o.Subset == 0 {
		o.Subset = DefaultSubset
	}
	if o.Target == 0 {
		o.Target = DefaultTarget
	}
	return o
}

// validate reports options that cannot be used on img, after defaults.
func (o Options) validate(img *subset.Image) error {
	switch {
	case o.Subset < 7 || o.Subset%2 == 0:
		return fmt.Errorf("subset %d px, expected an odd size of at least 7 px", o.Subset)
	case o.Subset > img.Width || o.Subset > img.Height:
		return fmt.Errorf("subset %d px does not fit in the %dx%d image", o.Subset, img.Width, img.Height)
	case o.Interpolation != subset.Bicubic && o.Interpolation != subset.Biquintic:
		return fmt.Errorf("unknown interpolation %v", o.Interpolation)
	case !(o.Noise >= 0) || math.IsInf(o.Noise, 0):
		return fmt.Errorf("noise %g gray levels, expected a finite number ≥ 0", o.Noise)
	case o.Noise > 0 && o.Static != nil:
		return fmt.Errorf("both a noise level (%g) and a static image were given; give one", o.Noise)
	case !(o.Target > 0) || math.IsInf(o.Target, 0):
		return fmt.Errorf("target %g px, expected a positive displacement noise", o.Target)
	}
	if o.Static != nil {
		if !o.Static.SameSize(img) {
			return fmt.Errorf("static image is %dx%d, the image %dx%d: expected the same size", o.Static.Width, o.Static.Height, img.Width, img.Height)
		}
		if o.Static.Depth != img.Depth {
			return fmt.Errorf("static image has bit depth %d, the image %d: expected the same camera settings", o.Static.Depth, img.Depth)
		}
		if len(o.Static.Pix) != o.Static.Width*o.Static.Height {
			return fmt.Errorf("static %dx%d image has %d pixels", o.Static.Width, o.Static.Height, len(o.Static.Pix))
		}
	}
	return nil
}

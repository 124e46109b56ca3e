package model

import (
	"fmt"
	"math"

	"spallscope/dic"
)

// Units is the length unit of a model file's coordinates and
// displacements.
type Units string

const (
	// MM: millimetres on the specimen face; Format.Scale converts them.
	MM Units = "mm"
	// PX: reference-image pixels, the measurement's own unit.
	PX Units = "px"
)

// Format states how a model file's frame relates to the reference image,
// so that its points, displacements and strains can be put on the same
// footing as the measurement. Models are usually set up on the specimen in
// mm, with the origin at a feature such as an opening's centre or a corner
// and y pointing up, while the measurement is in image pixels with y
// pointing down; nothing in the file says which, so the caller does.
//
// The mapping from model coordinates (xm, ym) to reference px is
//
//	x = OriginX + xm/s,   y = OriginY ∓ ym/s   (− when YUp, + otherwise),
//
// with s = Scale in mm/px for MM and s = 1 for PX. The model's axes are
// taken parallel to the image's (no rotation; the x axis points right).
// Displacements map the same way without the origin: u = um/s, v = ∓vm/s.
// Strains are dimensionless, so only signs change: with YUp the shear exy
// changes sign (one axis is reversed) while exx and eyy do not; with
// CompressionPositive all three change sign.
type Format struct {
	Units Units `json:"units"`
	// Scale is the size of one reference pixel in mm (needed for MM,
	// ignored for PX).
	Scale dic.Scale `json:"scale_mm_per_px,omitempty"`
	// OriginX, OriginY is the reference pixel at the model's (0, 0).
	OriginX float64 `json:"origin_x_px"`
	OriginY float64 `json:"origin_y_px"`
	// YUp says the model's y axis (and v) points up the image.
	YUp bool `json:"y_up"`
	// CompressionPositive says the model's strains are compression
	// positive (the rock-mechanics habit); they are negated on reading.
	// Displacements are unaffected.
	CompressionPositive bool `json:"compression_positive"`
}

// Validate reports a format that cannot map a model.
func (f Format) Validate() error {
	switch f.Units {
	case MM:
		if !f.Scale.Known() || math.IsInf(float64(f.Scale), 0) {
			return fmt.Errorf("model format: units mm need the scale in mm/px, got %g", float64(f.Scale))
		}
	case PX:
	case "":
		return fmt.Errorf("model format: units not stated, expected mm or px")
	default:
		return fmt.Errorf("model format: units %q, expected mm or px", string(f.Units))
	}
	if math.IsNaN(f.OriginX) || math.IsNaN(f.OriginY) || math.IsInf(f.OriginX, 0) || math.IsInf(f.OriginY, 0) {
		return fmt.Errorf("model format: origin (%g, %g) px is not a finite point", f.OriginX, f.OriginY)
	}
	return nil
}

// pxPer returns reference px per model length unit.
func (f Format) pxPer() float64 {
	if f.Units == MM {
		return 1 / float64(f.Scale)
	}
	return 1
}

// ySign is the sign that turns the model's y direction into the image's.
func (f Format) ySign() float64 {
	if f.YUp {
		return -1
	}
	return 1
}

// ToImage maps a model point (model units) to reference px.
func (f Format) ToImage(xm, ym float64) (x, y float64) {
	k := f.pxPer()
	return f.OriginX + xm*k, f.OriginY + f.ySign()*ym*k
}

// DisplacementToImage maps a model displacement (model units) to px along
// the image axes.
func (f Format) DisplacementToImage(um, vm float64) (u, v float64) {
	k := f.pxPer()
	return um * k, f.ySign() * vm * k
}

// StrainToImage maps a model strain to the image axes, tension positive.
func (f Format) StrainToImage(exx, eyy, exy float64) (float64, float64, float64) {
	exy *= f.ySign()
	if f.CompressionPositive {
		return -exx, -eyy, -exy
	}
	return exx, eyy, exy
}

package dic

import (
	"fmt"
	"math"
)

// Scale is the size of one reference pixel on the specimen face, in mm per
// px; zero means unknown (results stay in px).
type Scale float64

// ScaleFromPoints returns the scale at which two reference points (x1, y1)
// and (x2, y2), in px, are mm apart — a known distance marked on the face
// or a ruler in the picture.
func ScaleFromPoints(x1, y1, x2, y2, mm float64) (Scale, error) {
	d := math.Hypot(x2-x1, y2-y1)
	if !(d > 0) || !(mm > 0) {
		return 0, fmt.Errorf("scale: points %.1f px apart and a distance of %g mm; expected two distinct points and a positive distance", d, mm)
	}
	return Scale(mm / d), nil
}

// Known reports whether the scale is set.
func (s Scale) Known() bool { return s > 0 }

// MM converts a length in px to mm.
func (s Scale) MM(px float64) float64 { return px * float64(s) }

package config

import (
	"fmt"

	"spallscope/dic/region"
)

// Camera holds the keys that describe the camera rather than the test
// (inline in Test and Face: they are top-level keys of a test or a face).
type Camera struct {
	// Lens is a lens file written by `spallscope calibrate` for this
	// camera and lens at this focus (empty: a perfect lens). With a lens,
	// tracked displacements are corrected for its distortion and the
	// fields are in undistorted px (see package lens).
	Lens string `yaml:"lens"`
	// CompensationPlate is a rigid, unloaded plate in view beside the
	// specimen, as a shape in photo pixels (rect:..., polygon:...): it is
	// tracked on its own, its apparent isotropic magnification in each
	// frame (out-of-plane motion) is taken out of the specimen's field,
	// and it is excluded from the specimen's field. Empty: no plate; the
	// magnification is then estimated from the specimen's far field and
	// only reported.
	CompensationPlate string `yaml:"compensation_plate"`
	// StandoffMM is the distance from the face to the lens in mm, when
	// known (0: unknown): it turns a magnification m into the face's
	// motion towards the camera, w = Z·m/(1 + m), in the records.
	StandoffMM float64 `yaml:"standoff_mm"`
}

// check checks the camera keys of a test (prefix "") or a face.
func (c Camera) check(prefix string) error {
	var p Problems
	if c.CompensationPlate != "" {
		if _, err := region.ParseShape(c.CompensationPlate); err != nil {
			p.add(fmt.Errorf("%scompensation_plate: %w", prefix, err))
		}
	}
	p.add(checkBounds(bound{prefix + "standoff_mm", c.StandoffMM, finite(c.StandoffMM) && c.StandoffMM >= 0, "a distance in mm ≥ 0 (0: unknown)"}))
	return p.err()
}

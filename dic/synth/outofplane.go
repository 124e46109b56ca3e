package synth

import (
	"errors"
	"fmt"
	"math"

	"spallscope/dic/region"
)

// OutOfPlane is a motion of the specimen's face along the camera's axis:
// at full drive the face is TowardMM closer to a camera whose stand-off
// (face to the lens's centre of projection) was StandoffMM at the
// reference. A pinhole camera then shows every point of the face at
// c + Z/(Z − w)·(X − c) about the principal point c: an apparent
// isotropic magnification w/(Z − w) ≈ w/Z (Sutton, Yan, Tiwari, Schreier
// and Orteu 2008, Optics and Lasers in Engineering 46, 746–757). The lab
// applies it exactly to each sample's position (between the lens and the
// field; no bitmap is resampled), and the truth (FieldAt) stays the
// in-plane field without it.
type OutOfPlane struct {
	StandoffMM float64 `json:"standoff_mm"`
	TowardMM   float64 `json:"toward_camera_mm"`
	// Drive says how w follows the test (load, ramp or growth, as fields).
	Drive      Drive `json:"drive"`
	StartFrame int   `json:"start_frame,omitempty"`
	FullFrame  int   `json:"full_frame,omitempty"`
	// Plate, if set, is a rigid, unloaded plate in view beside the
	// specimen, in reference pixels: the fields do not move it, it moves
	// towards the camera with the face, and it hides what lies behind it.
	// It shows the same speckle pattern the face would show there.
	Plate *region.Rect `json:"plate,omitempty"`
}

// OutOfPlaneAt returns the face's motion towards the camera w (mm) at a
// frame and the exact apparent magnification Z/(Z − w) − 1 it causes; 0, 0
// without an out-of-plane motion.
func (sc *Scenario) OutOfPlaneAt(frame int) (w, magnification float64) {
	o := sc.OutOfPlane
	if o == nil {
		return 0, 0
	}
	w = o.TowardMM * sc.driveFactor(o.Drive, o.StartFrame, o.FullFrame, frame)
	return w, w / (o.StandoffMM - w)
}

// PrincipalPoint is where the camera's axis meets the photo: the lens's
// principal point, or the image centre for a perfect lens.
func (sc *Scenario) PrincipalPoint() (cx, cy float64) {
	if m := sc.LensModel(); m != nil {
		return m.Cx, m.Cy
	}
	return float64(sc.Width-1) / 2, float64(sc.Height-1) / 2
}

// Validate reports an out-of-plane motion that cannot be rendered.
func (o *OutOfPlane) Validate(sc *Scenario) error {
	var errs []error
	if !(o.StandoffMM > 0) || math.IsInf(o.StandoffMM, 0) {
		errs = append(errs, fmt.Errorf("standoff_mm %g, expected a positive distance", o.StandoffMM))
	}
	if math.IsNaN(o.TowardMM) || math.Abs(o.TowardMM) >= 0.5*o.StandoffMM {
		errs = append(errs, fmt.Errorf("toward_camera_mm %g, expected less than half the stand-off in size", o.TowardMM))
	}
	switch o.Drive {
	case DriveRamp:
	case DriveLoad:
		if !(sc.Load.PeakStress > 0) {
			errs = append(errs, errors.New("drive load needs load.peak_stress_MPa > 0"))
		}
	case DriveGrowth:
		if o.FullFrame <= o.StartFrame {
			errs = append(errs, fmt.Errorf("growth needs full_frame (%d) after start_frame (%d)", o.FullFrame, o.StartFrame))
		}
	default:
		errs = append(errs, fmt.Errorf("drive %q, expected load, ramp or growth", o.Drive))
	}
	if o.Plate != nil {
		if err := o.Plate.Validate(); err != nil {
			errs = append(errs, fmt.Errorf("plate: %w", err))
		}
	}
	return errors.Join(errs...)
}

// Plate returns the rigid plate's region, or nil.
func (sc *Scenario) Plate() *region.Rect {
	if sc.OutOfPlane == nil {
		return nil
	}
	return sc.OutOfPlane.Plate
}

package runfolder

import "spallscope/dic/similarity"

// Motion sources of a MotionRecord.
const (
	// MotionFromPlate: fitted to a compensation plate and taken out of the
	// fields.
	MotionFromPlate = "compensation_plate"
	// MotionFromFarField: fitted to the specimen's points far from its
	// openings, and only reported.
	MotionFromFarField = "far_field"
)

// MotionSection is the run.json section of a MotionRecord.
const MotionSection = "motion"

// MotionRecord is each frame's rigid-body motion and apparent isotropic
// magnification (similarity.Motion), the run.json "motion" section.
type MotionRecord struct {
	// Source is MotionFromPlate or MotionFromFarField.
	Source string `json:"source"`
	// Plate is the compensation plate's shape, as given.
	Plate string `json:"compensation_plate,omitempty"`
	// Compensated says the magnification was taken out of the fields
	// (about Centre).
	Compensated bool `json:"compensated"`
	// Centre is the point magnifications are taken about, in the fields'
	// pixels, and CentreIs says what it is (the lens's principal point or
	// the image centre).
	Centre   [2]float64 `json:"centre_px"`
	CentreIs string     `json:"centre_is"`
	// StandoffMM is the face's distance from the lens, when given; then
	// TowardCameraMM holds each frame's motion towards the camera,
	// Z·m/(1 + m).
	StandoffMM     float64             `json:"standoff_mm,omitempty"`
	TowardCameraMM []float64           `json:"toward_camera_mm,omitempty"`
	Frames         []similarity.Motion `json:"frames"`
	// Baseline is the far field's elastic magnification, when the frames'
	// stresses are known.
	Baseline *MotionBaseline `json:"elastic_baseline,omitempty"`
	// Unfitted lists far-field frames with too few points for a fit.
	Unfitted []string `json:"unfitted_frames,omitempty"`
	// Warning, when set, tells of a magnification change above the strain
	// noise floor.
	Warning string `json:"warning,omitempty"`
}

// MotionBaseline is the far field's magnification as a line against
// nominal stress, Intercept + PerMPa·σ, fitted over Frames calibration
// frames; Stress holds each frame's stress.
type MotionBaseline struct {
	Intercept float64   `json:"intercept"`
	PerMPa    float64   `json:"per_MPa"`
	Frames    int       `json:"calibration_frames"`
	Stress    []float64 `json:"stress_MPa"`
}

// Add appends a frame's motion, with its motion towards the camera when
// the stand-off is known.
func (r *MotionRecord) Add(m similarity.Motion) {
	r.Frames = append(r.Frames, m)
	if r.StandoffMM > 0 {
		r.TowardCameraMM = append(r.TowardCameraMM, r.StandoffMM*m.Magnification/(1+m.Magnification))
	}
}

// Truncate keeps the first n frames' motions (a resumed run continues
// after them).
func (r *MotionRecord) Truncate(n int) {
	if n < len(r.Frames) {
		r.Frames = r.Frames[:n]
	}
	if n < len(r.TowardCameraMM) {
		r.TowardCameraMM = r.TowardCameraMM[:n]
	}
}

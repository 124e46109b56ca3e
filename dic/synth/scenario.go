package synth

import (
	"errors"
	"fmt"
	"math"

	"spallscope/dic/lens"
)

// Drive says how a field's magnitude follows the test, frame by frame.
type Drive string

const (
	// DriveLoad scales the field by the nominal stress over the peak stress.
	DriveLoad Drive = "load"
	// DriveRamp scales it linearly from 0 at the first frame to 1 at the last.
	DriveRamp Drive = "ramp"
	// DriveGrowth is 0 up to StartFrame, grows linearly to 1 at FullFrame
	// and stays 1: a crack or band that appears and grows.
	DriveGrowth Drive = "growth"
)

// FieldSpec is one component of a scenario's displacement field: exactly
// one of the field kinds is set, with its full magnitude, and Drive says how
// it is applied over the frames.
type FieldSpec struct {
	Translation *Translation   `json:"translation,omitempty"`
	Rotation    *Rotation      `json:"rotation,omitempty"`
	Strain      *UniformStrain `json:"strain,omitempty"`
	Kirsch      *Kirsch        `json:"kirsch,omitempty"`
	SineSweep   *SineSweep     `json:"sine_sweep,omitempty"`
	Crack       *Crack         `json:"crack,omitempty"`
	Band        *ShearBand     `json:"band,omitempty"`
	Notch       *Notch         `json:"notch,omitempty"`
	KirschPair  *KirschPair    `json:"kirsch_pair,omitempty"`
	Disc        *BrazilianDisc `json:"brazilian_disc,omitempty"`
	Drive       Drive          `json:"drive"`
	StartFrame  int            `json:"start_frame,omitempty"`
	FullFrame   int            `json:"full_frame,omitempty"`
}

// Kind names the field kind that is set, or "" if none or several are.
func (f FieldSpec) Kind() string {
	kind, n := "", 0
	for name, set := range map[string]bool{
		"translation": f.Translation != nil, "rotation": f.Rotation != nil,
		"strain": f.Strain != nil, "kirsch": f.Kirsch != nil,
		"sine_sweep": f.SineSweep != nil, "crack": f.Crack != nil, "band": f.Band != nil,
		"notch": f.Notch != nil, "kirsch_pair": f.KirschPair != nil,
		"brazilian_disc": f.Disc != nil,
	} {
		if set {
			kind, n = name, n+1
		}
	}
	if n != 1 {
		return ""
	}
	return kind
}

func (f FieldSpec) scalable() Scalable {
	switch {
	case f.Translation != nil:
		return *f.Translation
	case f.Rotation != nil:
		return *f.Rotation
	case f.Strain != nil:
		return *f.Strain
	case f.Kirsch != nil:
		return *f.Kirsch
	case f.SineSweep != nil:
		return *f.SineSweep
	case f.Crack != nil:
		return *f.Crack
	case f.Band != nil:
		return *f.Band
	case f.Notch != nil:
		return *f.Notch
	case f.KirschPair != nil:
		return *f.KirschPair
	case f.Disc != nil:
		return *f.Disc
	}
	return nil
}

// Load is the nominal-stress history of the test: zero up to StartFrame,
// then a smooth rise σ = P·x(1.5 − 0.5x²), x = (t − t_start)/(t_peak −
// t_start), which reaches the peak P with zero
// slope at PeakFrame, then a linear drop to Residual·P at the last frame
// (post-peak softening). With PeakFrame at or after the last frame there is
// no drop.
type Load struct {
	// StartFrame is the last frame before loading starts: frames up to it
	// are static shots at zero load (for the noise floor).
	StartFrame int     `json:"start_frame,omitempty"`
	PeakStress float64 `json:"peak_stress_MPa"`
	PeakFrame  int     `json:"peak_frame"`
	Residual   float64 `json:"residual,omitempty"`
	// LogRate is the load log's sampling rate in Hz (default 10).
	LogRate float64 `json:"log_rate_hz,omitempty"`
	// ClockOffset is the test frame's clock minus the camera's, in s: the
	// log's time of camera time t is t + ClockOffset.
	ClockOffset float64 `json:"clock_offset_s,omitempty"`
	// StrokeRate is the actuator speed in mm/s (displacement control).
	StrokeRate float64 `json:"stroke_rate_mm_per_s,omitempty"`
}

// Specimen holds the sizes that turn pixels and stresses into the units of
// a lab: image scale and the loaded cross-section.
type Specimen struct {
	MMPerPx     float64 `json:"mm_per_px"`
	WidthMM     float64 `json:"width_mm"`
	ThicknessMM float64 `json:"thickness_mm"`
}

// LoadedArea is the loaded cross-section in mm².
func (s Specimen) LoadedArea() float64 { return s.WidthMM * s.ThicknessMM }

// Spall makes the material inside Region show fresh, uncorrelated texture
// from frame Frame on.
type Spall struct {
	Region Opening `json:"region"`
	Frame  int     `json:"frame"`
}

// Scenario is a complete synthetic test: specimen face, pattern, camera,
// openings, the displacement field over time, spalling and the load history.
// Its JSON form is the truth file's "scenario" and can be edited and
// rendered again.
type Scenario struct {
	Name     string      `json:"name"`
	Width    int         `json:"width_px"`
	Height   int         `json:"height_px"`
	Frames   int         `json:"frames"`
	FPS      float64     `json:"fps"`
	Pattern  Pattern     `json:"pattern"`
	Camera   Camera      `json:"camera"`
	Openings []Opening   `json:"openings,omitempty"`
	Fields   []FieldSpec `json:"fields"`
	Spalls   []Spall     `json:"spalls,omitempty"`
	Load     Load        `json:"load"`
	Specimen Specimen    `json:"specimen"`
	// TruthStep is the spacing in px of the dense truth grid (default 8).
	TruthStep int `json:"truth_step_px,omitempty"`
	// Format is the frame file format: "png" (default) or "tif".
	Format string `json:"format,omitempty"`
	// FourierTranslation renders frames whose field is a single translation
	// by the Fourier shift theorem applied to the reference frame (exact for
	// a periodic pattern) instead of moving the spots.
	FourierTranslation bool `json:"fourier_translation,omitempty"`
	// Lens, if set, is the camera's lens: frames are shot through its
	// distortion, while the pattern, the fields, the openings and the truth
	// stay in its ideal pixels (see lens.Model). Its image size may be left
	// out (zero): it is the scenario's.
	Lens *lens.Model `json:"lens,omitempty"`
	// Detection is the VSG and detection limit the truth file's damage
	// features are stated for (FeatureTruth; default DefaultDetection,
	// its VSG capped below the image's smaller side).
	Detection *Detection `json:"detection,omitempty"`
	// Targets, if set, asks for chessboard photos through the lens for
	// calibration, written beside the frames (needs Lens).
	Targets *Targets `json:"targets,omitempty"`
	// OutOfPlane, if set, moves the face towards the camera (an apparent
	// magnification), with an optional rigid plate beside the specimen.
	OutOfPlane *OutOfPlane `json:"out_of_plane,omitempty"`
	// Lighting, if set, changes the light on the face over the frames.
	Lighting *Lighting `json:"lighting,omitempty"`
	// Exif, if set, stamps each photo with its capture time (format jpg).
	Exif *ExifClock `json:"exif,omitempty"`
}

// LensModel returns the scenario's lens with its image size filled in,
// or nil for a perfect lens.
func (sc *Scenario) LensModel() *lens.Model {
	if sc.Lens == nil {
		return nil
	}
	m := *sc.Lens
	if m.Width == 0 && m.Height == 0 {
		m.Width, m.Height = sc.Width, sc.Height
	}
	return &m
}

// Validate reports the first problem that would stop the scenario from
// rendering, naming the setting.
func (sc *Scenario) Validate() error {
	var errs []error
	if sc.Width < 16 || sc.Height < 16 || sc.Width > 20000 || sc.Height > 20000 {
		errs = append(errs, fmt.Errorf("image size %dx%d, expected 16 to 20000 px per side", sc.Width, sc.Height))
	}
	if sc.Frames < 1 {
		errs = append(errs, fmt.Errorf("frames %d, expected at least 1", sc.Frames))
	}
	if !(sc.FPS > 0) {
		errs = append(errs, fmt.Errorf("fps %g, expected a positive frame rate", sc.FPS))
	}
	if err := sc.Pattern.withDefaults().Validate(); err != nil {
		errs = append(errs, fmt.Errorf("pattern: %w", err))
	}
	if err := sc.Camera.Validate(); err != nil {
		errs = append(errs, fmt.Errorf("camera: %w", err))
	}
	for i, f := range sc.Fields {
		if f.Kind() == "" {
			errs = append(errs, fmt.Errorf("fields[%d]: set exactly one of translation, rotation, strain, kirsch, kirsch_pair, sine_sweep, crack, band, notch, brazilian_disc", i))
		}
		switch f.Drive {
		case DriveLoad, DriveRamp:
		case DriveGrowth:
			if f.FullFrame <= f.StartFrame {
				errs = append(errs, fmt.Errorf("fields[%d]: growth needs full_frame (%d) after start_frame (%d)", i, f.FullFrame, f.StartFrame))
			}
		default:
			errs = append(errs, fmt.Errorf("fields[%d]: drive %q, expected load, ramp or growth", i, f.Drive))
		}
		if k := f.Kirsch; k != nil && (!(k.Radius > 0) || !(k.E > 0) || k.Nu < 0 || k.Nu >= 0.5) {
			errs = append(errs, fmt.Errorf("fields[%d]: kirsch needs radius > 0, E > 0 and 0 ≤ ν < 0.5", i))
		}
		if p := f.KirschPair; p != nil {
			if err := p.Validate(); err != nil {
				errs = append(errs, fmt.Errorf("fields[%d]: kirsch_pair: %w", i, err))
			}
		}
		if d := f.Disc; d != nil && (!(d.Radius > 0) || !(d.Thickness > 0) || !(d.MMPerPx > 0) || !(d.E > 0) || d.Nu < 0 || d.Nu >= 0.5) {
			errs = append(errs, fmt.Errorf("fields[%d]: brazilian_disc needs radius, thickness, mm_per_px and E > 0 and 0 ≤ ν < 0.5", i))
		}
		if f.Drive == DriveLoad && !(sc.Load.PeakStress > 0) {
			errs = append(errs, fmt.Errorf("fields[%d]: drive load needs load.peak_stress_MPa > 0", i))
		}
	}
	if sc.Load.StartFrame < 0 || (sc.Frames > 1 && sc.Load.StartFrame >= sc.Frames-1) {
		errs = append(errs, fmt.Errorf("load: start_frame %d, expected 0 to %d", sc.Load.StartFrame, sc.Frames-2))
	}
	if sc.Load.PeakStress < 0 || sc.Load.Residual < 0 || sc.Load.Residual > 1 {
		errs = append(errs, fmt.Errorf("load: peak %g MPa and residual %g, expected peak ≥ 0 and residual in [0, 1]", sc.Load.PeakStress, sc.Load.Residual))
	}
	if sc.Load.PeakStress > 0 && !(sc.Specimen.LoadedArea() > 0) {
		errs = append(errs, errors.New("specimen: width_mm and thickness_mm are needed to turn stress into force"))
	}
	if m := sc.LensModel(); m != nil {
		switch {
		case m.Width != sc.Width || m.Height != sc.Height:
			errs = append(errs, fmt.Errorf("lens: image size %dx%d, expected the scenario's %dx%d (or leave it out)", m.Width, m.Height, sc.Width, sc.Height))
		case sc.FourierTranslation:
			errs = append(errs, errors.New("fourier_translation cannot render through a lens (a shift in ideal pixels is no shift of the photo)"))
		default:
			if err := m.Validate(); err != nil {
				errs = append(errs, fmt.Errorf("lens: %w", err))
			}
		}
	}
	if sc.Targets != nil {
		if sc.Lens == nil {
			errs = append(errs, errors.New("targets: need a lens (the camera the targets are shot with)"))
		} else if err := sc.Targets.Validate(); err != nil {
			errs = append(errs, fmt.Errorf("targets: %w", err))
		}
	}
	if d := sc.Detection; d != nil && (d.VSG < 2 || d.VSG >= min(sc.Width, sc.Height) || !(d.Limit > 0)) {
		errs = append(errs, fmt.Errorf("detection: VSG %d px and limit %g, expected 2 px up to less than the image's smaller side and a positive strain", d.VSG, d.Limit))
	}
	switch sc.Format {
	case "", "png", "tif":
	case "jpg":
		if sc.Camera.withDefaults().Depth != 8 {
			errs = append(errs, errors.New("format jpg needs camera depth 8"))
		}
	default:
		errs = append(errs, fmt.Errorf("format %q, expected png, tif or jpg", sc.Format))
	}
	errs = append(errs, sc.validateCameraEffects()...)
	return errors.Join(errs...)
}

// DetectionOrDefault returns the scenario's Detection, or
// DefaultDetection with its VSG capped below the image's smaller side.
func (sc *Scenario) DetectionOrDefault() Detection {
	if sc.Detection != nil {
		return *sc.Detection
	}
	d := DefaultDetection
	d.VSG = max(2, min(d.VSG, min(sc.Width, sc.Height)-1))
	return d
}

// Time returns the camera time of a frame in s.
func (sc *Scenario) Time(frame int) float64 { return float64(frame) / sc.FPS }

// StressAt returns the nominal stress in MPa (compression positive) at
// camera time t.
func (sc *Scenario) StressAt(t float64) float64 {
	l := sc.Load
	t0 := sc.Time(l.StartFrame)
	if l.PeakStress == 0 || t <= t0 {
		return 0
	}
	last := sc.Time(sc.Frames - 1)
	tp := sc.Time(l.PeakFrame)
	if l.PeakFrame <= l.StartFrame || l.PeakFrame >= sc.Frames-1 {
		tp = last
	}
	if t <= tp {
		x := (t - t0) / (tp - t0)
		return l.PeakStress * x * (1.5 - 0.5*x*x)
	}
	if tp >= last {
		return l.PeakStress // no post-peak part: the load is held
	}
	drop := (1 - l.Residual) * (t - tp) / (last - tp)
	return math.Max(0, l.PeakStress*(1-drop))
}

// Stress returns the nominal stress of a frame in MPa.
func (sc *Scenario) Stress(frame int) float64 { return sc.StressAt(sc.Time(frame)) }

// Factor returns the magnitude fraction of field spec i at a frame.
func (sc *Scenario) Factor(i, frame int) float64 {
	f := sc.Fields[i]
	return sc.driveFactor(f.Drive, f.StartFrame, f.FullFrame, frame)
}

// driveFactor is the magnitude fraction at a frame of drive d, with start
// and full the first and the full frame of a growth: what Factor gives a
// field and the out-of-plane motion its magnitude by.
func (sc *Scenario) driveFactor(d Drive, start, full, frame int) float64 {
	switch d {
	case DriveLoad:
		if !(sc.Load.PeakStress > 0) {
			return 0
		}
		return sc.Stress(frame) / sc.Load.PeakStress
	case DriveRamp:
		if sc.Frames < 2 {
			return 0
		}
		return float64(frame) / float64(sc.Frames-1)
	case DriveGrowth:
		g := float64(frame-start) / float64(full-start)
		return math.Min(1, math.Max(0, g))
	}
	return 0
}

// FieldAt returns the exact displacement field of a frame, relative to the
// undeformed pattern (frame 0 is undeformed when all drives start at zero).
func (sc *Scenario) FieldAt(frame int) Field {
	var sum Sum
	for i, f := range sc.Fields {
		if s := sc.Factor(i, frame); s != 0 {
			sum = append(sum, f.scalable().Scaled(s))
		}
	}
	switch len(sum) {
	case 0:
		return nil
	case 1:
		return sum[0]
	}
	return sum
}

// FrameName is the file stem of a frame: the scenario name and a
// zero-padded index.
func (sc *Scenario) FrameName(frame int) string {
	digits := max(4, len(fmt.Sprint(sc.Frames-1)))
	name := sc.Name
	if name == "" {
		name = "frame"
	}
	return fmt.Sprintf("%s_%0*d", name, digits, frame)
}

// Material reports whether reference point (x, y) is rock that the camera
// sees at a frame: not in an opening and not spalled by then.
func (sc *Scenario) Material(x, y float64, frame int) bool {
	for _, o := range sc.Openings {
		if o.Contains(x, y) {
			return false
		}
	}
	for _, s := range sc.Spalls {
		if frame >= s.Frame && s.Region.Contains(x, y) {
			return false
		}
	}
	return true
}

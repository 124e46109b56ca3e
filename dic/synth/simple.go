package synth

import (
	"fmt"
	"strings"
)

// FieldKinds lists the names Simple accepts for its one field, with what
// each one is.
var FieldKinds = []struct{ Name, About string }{
	{"translation", "rigid translation by (u, v) px reached at the last frame"},
	{"rotation", "rigid rotation about the image centre by angle degrees at the last frame"},
	{"strain", "uniform strain exx, eyy, exy (tensor shear) about the centre at the last frame"},
	{"kirsch", "circular opening of radius px under vertical stress with lateral ratio k (Kirsch solution), following the load"},
	{"sine-sweep", "vertical sinusoidal displacement whose period grows from period-min (top) to period-max (bottom)"},
	{"crack", "opening crack from a mouth to a tip, appearing at start-frame and growing to the last frame"},
	{"band", "localized shear band from a mouth to a tip, appearing at start-frame and growing to the last frame"},
}

// Simple describes a sequence with one prescribed field, the common case of
// a settings check; it builds the full Scenario. Zero values take the
// defaults documented on each field.
type Simple struct {
	Name                  string
	Field                 string // one of FieldKinds
	Width, Height, Frames int
	FPS                   float64
	Pattern               Pattern
	Camera                Camera
	Format                string

	U, V          float64 // translation, px
	AngleDeg      float64 // rotation
	Exx, Eyy, Exy float64 // uniform strain

	Radius      float64  // kirsch opening radius, px (default a tenth of the smaller side)
	Stress      float64  // peak far-field vertical stress, MPa (compression positive; default 40)
	K           float64  // lateral stress ratio
	E           float64  // Young's modulus, MPa (default 20000)
	Nu          *float64 // Poisson's ratio (nil: 0.2; 0 is a material's value, so not the default)
	PlaneStress bool

	Amplitude, PeriodMin, PeriodMax float64 // sine-sweep, px

	From, To   [2]float64 // crack/band mouth and tip, px
	Opening    float64    // crack opening, px
	Slip       float64    // band slip, px
	HalfWidth  float64    // band half-width, px (default 3)
	StartFrame int        // crack/band appears

	MMPerPx     float64 // image scale (default 0.1 mm/px)
	ThicknessMM float64 // specimen thickness (default 50 mm)
	Fourier     bool    // render translations by the Fourier shift theorem
}

// Scenario builds the scenario.
func (s Simple) Scenario() (*Scenario, error) {
	if s.Width == 0 {
		s.Width = 512
	}
	if s.Height == 0 {
		s.Height = s.Width
	}
	if s.Frames == 0 {
		s.Frames = 10
	}
	if s.FPS == 0 {
		s.FPS = 1
	}
	if s.Stress == 0 {
		s.Stress = 40
	}
	if s.E == 0 {
		s.E = 20000
	}
	nu := 0.2
	if s.Nu != nil {
		nu = *s.Nu
	}
	if s.MMPerPx == 0 {
		s.MMPerPx = 0.1
	}
	if s.ThicknessMM == 0 {
		s.ThicknessMM = 50
	}
	if s.Pattern.Radius == 0 {
		s.Pattern.Radius = 2.5
	}
	if s.Pattern.Coverage == 0 {
		s.Pattern.Coverage = 0.5
	}
	if s.Name == "" {
		s.Name = strings.ReplaceAll(s.Field, "-", "")
	}
	cx, cy := float64(s.Width-1)/2, float64(s.Height-1)/2
	sc := &Scenario{
		Name: s.Name, Width: s.Width, Height: s.Height, Frames: s.Frames, FPS: s.FPS,
		Pattern: s.Pattern, Camera: s.Camera, Format: s.Format,
		Load:               Load{PeakStress: s.Stress, PeakFrame: s.Frames - 1},
		Specimen:           Specimen{MMPerPx: s.MMPerPx, WidthMM: float64(s.Width) * s.MMPerPx, ThicknessMM: s.ThicknessMM},
		FourierTranslation: s.Fourier,
	}
	spec := FieldSpec{Drive: DriveRamp}
	switch s.Field {
	case "translation":
		spec.Translation = &Translation{U: s.U, V: s.V}
	case "rotation":
		spec.Rotation = &Rotation{Cx: cx, Cy: cy, AngleDeg: s.AngleDeg}
	case "strain":
		spec.Strain = &UniformStrain{Cx: cx, Cy: cy, Exx: s.Exx, Eyy: s.Eyy, Exy: s.Exy}
	case "kirsch":
		r := s.Radius
		if r == 0 {
			r = float64(min(s.Width, s.Height)) / 10
		}
		spec.Kirsch = &Kirsch{Cx: cx, Cy: cy, Radius: r, Stress: s.Stress, K: s.K, E: s.E, Nu: nu, PlaneStress: s.PlaneStress}
		spec.Drive = DriveLoad
		sc.Openings = []Opening{Circle(cx, cy, r)}
	case "sine-sweep":
		a, p0, p1 := s.Amplitude, s.PeriodMin, s.PeriodMax
		if a == 0 {
			a = 0.5
		}
		if p0 == 0 {
			p0 = 10
		}
		if p1 == 0 {
			p1 = float64(s.Width) / 2
		}
		spec.SineSweep = &SineSweep{Amplitude: a, PeriodMin: p0, PeriodMax: p1, X0: cx, Height: float64(s.Height)}
	case "crack", "band":
		if s.From == s.To {
			return nil, fmt.Errorf("%s: give distinct mouth and tip points", s.Field)
		}
		if s.StartFrame >= s.Frames-1 {
			return nil, fmt.Errorf("%s: start frame %d must come before the last frame %d", s.Field, s.StartFrame, s.Frames-1)
		}
		spec.Drive, spec.StartFrame, spec.FullFrame = DriveGrowth, s.StartFrame, s.Frames-1
		if s.Field == "crack" {
			spec.Crack = &Crack{X0: s.From[0], Y0: s.From[1], X1: s.To[0], Y1: s.To[1], Opening: s.Opening}
		} else {
			hw := s.HalfWidth
			if hw == 0 {
				hw = 3
			}
			spec.Band = &ShearBand{X0: s.From[0], Y0: s.From[1], X1: s.To[0], Y1: s.To[1], Slip: s.Slip, HalfWidth: hw}
		}
	default:
		names := make([]string, len(FieldKinds))
		for i, k := range FieldKinds {
			names[i] = k.Name
		}
		return nil, fmt.Errorf("field %q, expected one of %s", s.Field, strings.Join(names, ", "))
	}
	sc.Fields = []FieldSpec{spec}
	if err := sc.Validate(); err != nil {
		return nil, err
	}
	return sc, nil
}

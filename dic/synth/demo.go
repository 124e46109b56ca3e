package synth

// DemoBlock is the built-in demo test, invented for spallscope: a 100 mm
// square, 50 mm thick block of a mortar-like rock analogue with one 24 mm
// circular opening, loaded vertically with lateral confinement K = 0.25 up
// to a peak of 32 MPa and into post-peak softening. Localized damage grows
// first as V-shaped notches at both sidewalls, then as a tensile crack from
// the crown; late in the test slabs spall off the sidewalls, exposing
// texture that no longer correlates with the reference.
//
// The camera sees the face at 0.2 mm/px (512×512 px) and takes one photo
// every 2 s, the first four before loading starts (static shots for the
// noise floor); the frame's log runs at 10 Hz with its clock 3.5 s ahead.
func DemoBlock() *Scenario {
	const (
		size   = 512
		cx, cy = 256.0, 256.0
		radius = 60.0 // 12 mm
		frames = 72
		peak   = 50
		static = 4 // static shots before loading, for the noise floor
	)
	sc := &Scenario{
		Name: "demo", Width: size, Height: size, Frames: frames, FPS: 0.5,
		Pattern:  Pattern{Radius: 2.2, Coverage: 0.5, Seed: 20261201},
		Camera:   Camera{Depth: 8, Noise: 1.5, Oversample: 2, Seed: 77},
		Openings: []Opening{Circle(cx, cy, radius)},
		Load: Load{StartFrame: static - 1, PeakStress: 32, PeakFrame: peak, Residual: 0.55, LogRate: 10,
			ClockOffset: 3.5, StrokeRate: 0.002},
		Specimen:  Specimen{MMPerPx: 0.2, WidthMM: 100, ThicknessMM: 50},
		TruthStep: 16,
	}
	elastic := Kirsch{Cx: cx, Cy: cy, Radius: radius, Stress: 32, K: 0.25, E: 12000, Nu: 0.22}
	sc.Fields = append(sc.Fields, FieldSpec{Kirsch: &elastic, Drive: DriveLoad})
	// V-notches: two bands from each sidewall, growing from frame 9 (the
	// boundary stress then is about 0.3 UCS of the demo rock's 60 MPa).
	for _, side := range []float64{1, -1} {
		wx := cx + side*radius
		for _, up := range []float64{-1, 1} {
			b := ShearBand{X0: wx, Y0: cy, X1: wx + side*48, Y1: cy + up*30, Slip: 1.2, HalfWidth: 3.5}
			sc.Fields = append(sc.Fields, FieldSpec{Band: &b, Drive: DriveGrowth, StartFrame: 9, FullFrame: 33})
		}
	}
	// Tensile crack from the crown, running up parallel to the load.
	crack := Crack{X0: cx, Y0: cy - radius, X1: cx + 6, Y1: cy - radius - 110, Opening: 1.6, Decay: 18}
	sc.Fields = append(sc.Fields, FieldSpec{Crack: &crack, Drive: DriveGrowth, StartFrame: 24, FullFrame: frames - 1})
	sc.Spalls = []Spall{
		{Region: Opening{Cx: cx + radius + 6, Cy: cy, Rx: 11, Ry: 24}, Frame: peak + 4},
		{Region: Opening{Cx: cx - radius - 5, Cy: cy + 2, Rx: 9, Ry: 20}, Frame: peak + 9},
	}
	return sc
}

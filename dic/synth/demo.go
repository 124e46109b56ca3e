package synth

// DemoBlock is the built-in demo test's front face, invented for
// spallscope: a 100 mm square, 50 mm thick block of a mortar-like rock
// analogue with one 24 mm circular opening, loaded vertically with lateral
// confinement K = 0.25 up to a peak of 32 MPa and into post-peak softening.
// Localized damage grows first as V-shaped notches at both sidewalls, then
// as a tensile crack from the crown; late in the test slabs spall off the
// sidewalls, exposing texture that no longer correlates with the reference.
//
// The camera sees the face at 0.2 mm/px (512×512 px) and takes one photo
// every 2 s, the first four before loading starts (static shots for the
// noise floor); the frame's log runs at 10 Hz with its clock 3.5 s ahead.
func DemoBlock() *Scenario {
	return demoFace(demoFaceSpec{name: "demo", size: 512, seed: 20261201, camSeed: 77, oversample: 2,
		notchStart: 9, crackStart: 24, spallRight: 54, spallLeft: 59})
}

// DemoBack is the demo block's back face, filmed by a second camera: a
// smaller view (384×384 px, 0.267 mm/px) of the same specimen, seen from
// behind so left and right swap, with its own speckle paint. The notches
// there start three frames later than on the front and the back face spalls
// on one side only.
func DemoBack() *Scenario {
	return demoFace(demoFaceSpec{name: "back", size: 384, mirror: true, seed: 20261202, camSeed: 78, oversample: 1,
		notchStart: 12, crackStart: 30, spallRight: 62})
}

// demoFaceSpec says how one face of the demo block differs from the other.
type demoFaceSpec struct {
	name                   string
	size                   int
	mirror                 bool
	seed, camSeed          uint64
	oversample             int
	notchStart, crackStart int
	spallRight, spallLeft  int // 0: no slab on that side
}

func demoFace(d demoFaceSpec) *Scenario {
	const (
		frames = 72
		peak   = 50
		static = 4 // static shots before loading, for the noise floor
	)
	s := float64(d.size) / 512 // px of this view per px of the front view
	c := float64(d.size) / 2
	radius := 60 * s // 12 mm
	sc := &Scenario{
		Name: d.name, Width: d.size, Height: d.size, Frames: frames, FPS: 0.5,
		Pattern:  Pattern{Radius: 2.2 * s, Coverage: 0.5, Seed: d.seed},
		Camera:   Camera{Depth: 8, Noise: 1.5, Oversample: d.oversample, Seed: d.camSeed},
		Openings: []Opening{Circle(c, c, radius)},
		Load: Load{StartFrame: static - 1, PeakStress: 32, PeakFrame: peak, Residual: 0.55, LogRate: 10,
			ClockOffset: 3.5, StrokeRate: 0.002},
		Specimen:  Specimen{MMPerPx: 0.2 / s, WidthMM: 100, ThicknessMM: 50},
		TruthStep: 16,
	}
	elastic := Kirsch{Cx: c, Cy: c, Radius: radius, Stress: 32, K: 0.25, E: 12000, Nu: 0.22}
	sc.Fields = append(sc.Fields, FieldSpec{Kirsch: &elastic, Drive: DriveLoad})
	// V-notches: two bands from each sidewall, growing from notchStart (on
	// the front the boundary stress then is about 0.3 UCS of the demo
	// rock's 60 MPa).
	for _, side := range []float64{1, -1} {
		wx := c + side*radius
		for _, up := range []float64{-1, 1} {
			b := ShearBand{X0: wx, Y0: c, X1: wx + side*48*s, Y1: c + up*30*s, Slip: 1.2 * s, HalfWidth: 3.5 * s}
			sc.Fields = append(sc.Fields, FieldSpec{Band: &b, Drive: DriveGrowth, StartFrame: d.notchStart, FullFrame: d.notchStart + 24})
		}
	}
	// Tensile crack from the crown, running up parallel to the load.
	tilt := 6 * s
	if d.mirror {
		tilt = -tilt
	}
	crack := Crack{X0: c, Y0: c - radius, X1: c + tilt, Y1: c - radius - 110*s, Opening: 1.6 * s, Decay: 18 * s}
	sc.Fields = append(sc.Fields, FieldSpec{Crack: &crack, Drive: DriveGrowth, StartFrame: d.crackStart, FullFrame: frames - 1})
	right, left := 1.0, -1.0
	if d.mirror {
		right, left = -1, 1
	}
	if d.spallRight > 0 {
		sc.Spalls = append(sc.Spalls, Spall{Region: Opening{Cx: c + right*(radius+6*s), Cy: c, Rx: 11 * s, Ry: 24 * s}, Frame: d.spallRight})
	}
	if d.spallLeft > 0 {
		sc.Spalls = append(sc.Spalls, Spall{Region: Opening{Cx: c + left*(radius+5*s), Cy: c + 2*s, Rx: 9 * s, Ry: 20 * s}, Frame: d.spallLeft})
	}
	return sc
}

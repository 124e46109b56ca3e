package synth

// DemoDetection is the detection the demo faces' truth files state: the
// VSG of the demo's strain window of 7 points at its 8 px step over 21 px
// subsets, (7 − 1)·8 + 21 = 69 px — the strain stage's definition
// (strain.Window.VSG, which this package cannot import; the demo's test
// holds the two equal) — and a nominal limit of 1000 µε in γmax. The demo
// itself applies each face's own limit, VSG and grid from its run.
var DemoDetection = Detection{VSG: 69, Limit: 1e-3}

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
	const (
		size = 512
		c    = size / 2
		r    = 60.0 // 12 mm
	)
	sc := demoScenario("demo", size, 20261201, 77, 2)
	sc.Openings = []Opening{Circle(c, c, r)}
	elastic := Kirsch{Cx: c, Cy: c, Radius: r, Stress: 32, K: 0.25, E: 12000, Nu: 0.22}
	sc.Fields = append(sc.Fields, FieldSpec{Kirsch: &elastic, Drive: DriveLoad})
	// V-notches at both sidewalls, growing from frame 9 (the boundary
	// stress then is about 0.3 UCS of the demo rock's 60 MPa).
	for _, side := range []float64{1, -1} {
		sc.Fields = append(sc.Fields, demoNotch(c+side*r, c, side, 48, 30, 9, 1))
	}
	// Tensile crack from the crown, running up parallel to the load.
	crack := Crack{X0: c, Y0: c - r, X1: c + 6, Y1: c - r - 110, Opening: 1.6, Decay: 18}
	sc.Fields = append(sc.Fields, FieldSpec{Crack: &crack, Drive: DriveGrowth, StartFrame: 24, FullFrame: sc.Frames - 1})
	sc.Spalls = []Spall{
		{Region: Opening{Cx: c + r + 6, Cy: c, Rx: 11, Ry: 24}, Frame: 54},
		{Region: Opening{Cx: c - r - 5, Cy: c + 2, Rx: 9, Ry: 20}, Frame: 59},
	}
	return sc
}

// DemoTwin is the demo test's second face, filmed by a second camera: a
// second block of the same mix and size, with twin 18 mm openings side by
// side (centres 38 mm apart: a 20 mm pillar between them), stacked on the
// first in the frame so that both carry the same force and, with the same
// cross-section, the same nominal stress. The camera sees it at 0.26 mm/px
// (384×384 px) with its own speckle paint. The pillar concentrates the
// stress (KirschPair), so damage begins there: notches at both pillar
// walls (the left opening's first), then at the outer sidewalls, then a
// shear band across the pillar and a crack from the right opening's
// crown; late in the test both pillar walls spall.
func DemoTwin() *Scenario {
	const size = 384
	s := float64(size) / 512 // px of this view per px of the front view
	c := float64(size) / 2
	r, half := 45*s, 95*s // opening radius and half the centre spacing
	ax, bx := c-half, c+half
	sc := demoScenario("twin", size, 20261202, 78, 1)
	sc.Specimen.MMPerPx = 0.2 / s
	sc.Openings = []Opening{Circle(ax, c, r), Circle(bx, c, r)}
	elastic := KirschPair{X1: ax, Y1: c, R1: r, X2: bx, Y2: c, R2: r, Stress: 32, K: 0.25, E: 12000, Nu: 0.22}
	sc.Fields = append(sc.Fields, FieldSpec{KirschPair: &elastic, Drive: DriveLoad})
	// Pillar walls first (arms 30 px into the 100 px pillar, in px of the front
	// view's px), then the outer sidewalls.
	sc.Fields = append(sc.Fields,
		demoNotch(ax+r, c, 1, 30, 22, 7, s),
		demoNotch(bx-r, c, -1, 30, 22, 10, s),
		demoNotch(ax-r, c, -1, 44, 28, 20, s),
		demoNotch(bx+r, c, 1, 44, 28, 25, s))
	band := ShearBand{X0: ax + r + 12*s, Y0: c - 34*s, X1: bx - r - 12*s, Y1: c + 34*s, Slip: 1.0 * s, HalfWidth: 4 * s, Embedded: true}
	sc.Fields = append(sc.Fields, FieldSpec{Band: &band, Drive: DriveGrowth, StartFrame: 33, FullFrame: 60})
	crack := Crack{X0: bx, Y0: c - r, X1: bx - 5*s, Y1: c - r - 90*s, Opening: 1.4 * s, Decay: 16 * s}
	sc.Fields = append(sc.Fields, FieldSpec{Crack: &crack, Drive: DriveGrowth, StartFrame: 38, FullFrame: sc.Frames - 1})
	sc.Spalls = []Spall{
		{Region: Opening{Cx: ax + r + 6*s, Cy: c, Rx: 9 * s, Ry: 20 * s}, Frame: 52},
		{Region: Opening{Cx: bx - r - 6*s, Cy: c + 2*s, Rx: 8 * s, Ry: 18 * s}, Frame: 58},
	}
	return sc
}

// demoScenario is what the demo's faces share: 72 frames at 0.5 fps, the
// first four static, the load history and the block's size; Pattern and
// Camera are the face's own.
func demoScenario(name string, size int, seed, camSeed uint64, oversample int) *Scenario {
	const (
		frames = 72
		peak   = 50
		static = 4 // static shots before loading, for the noise floor
	)
	s := float64(size) / 512
	det := DemoDetection
	return &Scenario{
		Name: name, Width: size, Height: size, Frames: frames, FPS: 0.5,
		Pattern: Pattern{Radius: 2.2 * s, Coverage: 0.5, Seed: seed},
		Camera:  Camera{Depth: 8, Noise: 1.5, Oversample: oversample, Seed: camSeed},
		Load: Load{StartFrame: static - 1, PeakStress: 32, PeakFrame: peak, Residual: 0.55, LogRate: 10,
			ClockOffset: 3.5, StrokeRate: 0.002},
		Specimen:  Specimen{MMPerPx: 0.2 / s, WidthMM: 100, ThicknessMM: 50},
		TruthStep: 16,
		Detection: &det,
	}
}

// demoNotch is a V-notch at the wall point (wx, wy) opening towards side
// (+1 right, −1 left): arms out by dx and up and down by dy px, growing
// over 24 frames from start; lengths and slip are in px of the front
// view, scaled by s (px of this view per px of the front view).
func demoNotch(wx, wy, side, dx, dy float64, start int, s float64) FieldSpec {
	n := Notch{X0: wx, Y0: wy, X1: wx + side*dx*s, Y1: wy - dy*s, X2: wx + side*dx*s, Y2: wy + dy*s, Slip: 1.2 * s, HalfWidth: 3.5 * s}
	return FieldSpec{Notch: &n, Drive: DriveGrowth, StartFrame: start, FullFrame: start + 24}
}

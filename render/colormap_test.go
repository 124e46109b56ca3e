package render

import (
	"math"
	"testing"

	"gocv.io/x/gocv"
)

// The published end and middle colours of viridis in 8-bit sRGB, the hex
// codes #440154, #21918C and #FDE725 that viridis is quoted with (e.g. the
// R package viridisLite's viridis(3); quoted from memory, and they agree
// with the table rows 0, 128 and 255 rounded to 8 bits).
func TestColormapViridisEndsAndMiddle(t *testing.T) {
	m := Sequential()
	for _, c := range []struct {
		t       float64
		r, g, b uint8
		tol     int
	}{
		{0, 0x44, 0x01, 0x54, 0},
		{1, 0xfd, 0xe7, 0x25, 0},
		// t = 0.5 lies halfway between rows 127 and 128; the quoted middle
		// colour is row 128, so one level of slack.
		{0.5, 0x21, 0x91, 0x8c, 1},
	} {
		r, g, b := m.At(c.t)
		if absDiff(r, c.r) > c.tol || absDiff(g, c.g) > c.tol || absDiff(b, c.b) > c.tol {
			t.Errorf("viridis(%g) = (%d, %d, %d), published (%d, %d, %d) ± %d", c.t, r, g, b, c.r, c.g, c.b, c.tol)
		}
	}
}

// OpenCV carries its own copy of the viridis table (COLORMAP_VIRIDIS = 16 in
// OpenCV 4.x, imgproc.hpp); every entry of ours must agree with it to one
// 8-bit level (the two round the same published floats, possibly
// differently), which catches a mistyped row.
func TestColormapViridisMatchesOpenCV(t *testing.T) {
	ramp := make([]byte, 256)
	for i := range ramp {
		ramp[i] = byte(i)
	}
	src, err := gocv.NewMatFromBytes(1, 256, gocv.MatTypeCV8U, ramp)
	if err != nil {
		t.Fatal(err)
	}
	defer src.Close()
	dst := gocv.NewMat()
	defer dst.Close()
	const colormapViridis = 16 // cv::COLORMAP_VIRIDIS
	gocv.ApplyColorMap(src, &dst, gocv.ColormapTypes(colormapViridis))
	bgr, err := dst.DataPtrUint8()
	if err != nil {
		t.Fatal(err)
	}
	m := Sequential()
	worst := 0
	for i := 0; i < 256; i++ {
		r, g, b := m.Entry(i)
		d := max(absDiff(b, bgr[3*i]), absDiff(g, bgr[3*i+1]), absDiff(r, bgr[3*i+2]))
		if d > 1 {
			t.Errorf("viridis row %d: ours (%d, %d, %d), OpenCV (%d, %d, %d)", i, r, g, b, bgr[3*i+2], bgr[3*i+1], bgr[3*i])
		}
		worst = max(worst, d)
	}
	t.Logf("viridis: largest difference from OpenCV's table %d level(s) over 256 rows", worst)
}

// Viridis's lightness rises monotonically (its design goal, van der Walt &
// Smith 2015); checked in CIELAB L*, which tracks CAM02-UCS lightness
// closely enough for the sign of each step.
func TestColormapViridisLightnessRises(t *testing.T) {
	prev := -1.0
	for i, c := range viridisTable {
		m := srgbToMsh(c)
		L := m[0] * math.Cos(m[1])
		if L <= prev {
			t.Errorf("viridis row %d: L* %.2f after %.2f", i, L, prev)
		}
		prev = L
	}
}

// coolWarm33 is Moreland's published table CoolWarmFloat33 (33 rows, t =
// k/32, sRGB in [0, 1]), as reproduced in matplotlib's "coolwarm" segment
// data.
var coolWarm33 = [33][3]float64{
	{0.2298057, 0.298717966, 0.753683153}, {0.26623388, 0.353094838, 0.801466763},
	{0.30386891, 0.406535296, 0.84495867}, {0.342804478, 0.458757618, 0.883725899},
	{0.38301334, 0.50941904, 0.917387822}, {0.424369608, 0.558148092, 0.945619588},
	{0.46666708, 0.604562568, 0.968154911}, {0.509635204, 0.648280772, 0.98478814},
	{0.552953156, 0.688929332, 0.995375608}, {0.596262162, 0.726149107, 0.999836203},
	{0.639176211, 0.759599947, 0.998151185}, {0.681291281, 0.788964712, 0.990363227},
	{0.722193294, 0.813952739, 0.976574709}, {0.761464949, 0.834302879, 0.956945269},
	{0.798691636, 0.849786142, 0.931688648}, {0.833466556, 0.860207984, 0.901068838},
	{0.865395197, 0.86541021, 0.865395561}, {0.897787179, 0.848937047, 0.820880546},
	{0.924127593, 0.827384882, 0.774508472}, {0.944468518, 0.800927443, 0.726736146},
	{0.958852946, 0.769767752, 0.678007945}, {0.96732803, 0.734132809, 0.628751763},
	{0.969954137, 0.694266682, 0.579375448}, {0.966811177, 0.650421156, 0.530263762},
	{0.958003065, 0.602842431, 0.481775914}, {0.943660866, 0.551750968, 0.434243684},
	{0.923944917, 0.49730856, 0.387970225}, {0.89904617, 0.439559467, 0.343229596},
	{0.869186849, 0.378313092, 0.300267182}, {0.834620542, 0.312874446, 0.259301199},
	{0.795631745, 0.24128379, 0.220525627}, {0.752534934, 0.157246067, 0.184115123},
	{0.705673158, 0.01555616, 0.150232812},
}

// The diverging map, built by Moreland's Msh construction from the end
// colours alone, must reproduce all 33 rows of his published table, the
// neutral middle (0.8654, L* = 88) included, to half an 8-bit level (the
// table was computed with its own colour-space constants; beyond half a
// level the 8-bit colours would differ).
func TestColormapCoolWarmMatchesMoreland(t *testing.T) {
	m := Diverging()
	worst := 0.0
	for k, want := range coolWarm33 {
		x := float64(k) / 32
		r, g, b := m.RGB(x)
		d := 255 * math.Max(math.Abs(r-want[0]), math.Max(math.Abs(g-want[1]), math.Abs(b-want[2])))
		const tol = 0.5
		if d > tol {
			t.Errorf("cool-warm(%.5f) = (%.4f, %.4f, %.4f), Moreland (%.4f, %.4f, %.4f): %.2f levels apart, tolerance %g",
				x, r, g, b, want[0], want[1], want[2], d, tol)
		}
		worst = math.Max(worst, d)
	}
	t.Logf("cool-warm: largest difference from Moreland's 33-row table %.2f levels", worst)
	// The middle is a neutral gray: zero maps to no hue.
	r, g, b := m.At(0.5)
	if r != g || g != b {
		t.Errorf("cool-warm(0.5) = (%d, %d, %d), expected a neutral gray", r, g, b)
	}
}

func absDiff(a, b uint8) int {
	if a > b {
		return int(a - b)
	}
	return int(b - a)
}

package render

import (
	"image"
	"math"
	"os"
	"path/filepath"
	"testing"

	"gocv.io/x/gocv"

	"spallscope/dic"
	"spallscope/dic/frames"
	"spallscope/dic/lens"
	"spallscope/dic/region"
	"spallscope/dic/synth"
	"spallscope/subset"
)

// kirschCase is a known field to draw: εxx of the Kirsch (1898) solution
// about a circular opening (synth.Kirsch, the lab's exact field) on a grid
// of step px over a w×h photo, invalid inside the opening, the opening
// excluded by the mask, with the solution's displacement for the current
// frame.
type kirschCase struct {
	photo      *subset.Image
	values     *GridValues
	u, v       *GridValues
	keep       *region.Mask
	hole       region.Shape
	lim        Limits
	q          Quantity
	cx, cy, ra float64
}

// newKirschCase builds the case; its photo is a cheap deterministic speckle
// (the lab's renderer takes minutes at 20 MP).
func newKirschCase(tb testing.TB, w, h, step int) *kirschCase {
	tb.Helper()
	c := &kirschCase{cx: float64(w) * 0.45, cy: float64(h) * 0.5, ra: float64(h) / 8}
	k := synth.Kirsch{Cx: c.cx, Cy: c.cy, Radius: c.ra, Stress: 30, K: 0.3, E: 12000, Nu: 0.22}
	c.hole = synth.Circle(c.cx, c.cy, c.ra)
	inHole := func(x, y float64) bool { return c.hole.Contains(x, y) }
	g := dic.Grid{X0: step, Y0: step, Step: step, Cols: (w - 2*step) / step, Rows: (h - 2*step) / step}
	c.values = sampleGrid(g, func(x, y float64) float64 { return k.At(x, y).UX }, inHole)
	c.u = sampleGrid(g, func(x, y float64) float64 { return k.At(x, y).U }, inHole)
	c.v = sampleGrid(g, func(x, y float64) float64 { return k.At(x, y).V }, inHole)
	var err error
	if c.keep, err = (region.Layout{Exclude: []region.Shape{c.hole}}).Rasterise(w, h); err != nil {
		tb.Fatal(err)
	}
	c.photo = subset.NewImage(w, h, 8)
	s := uint32(12345)
	for i := range c.photo.Pix {
		s = s*1664525 + 1013904223
		x, y := float64(i%w), float64(i/w)
		v := 128 + 70*math.Sin(0.71*x+0.3*math.Sin(0.05*y))*math.Cos(0.53*y) + float64(s>>24)/4 - 32
		c.photo.Pix[i] = float32(math.Round(min(255, max(0, v))))
	}
	c.q, _ = QuantityNamed("exx")
	var pool Pool
	pool.Add(c.values.Values)
	if c.lim, err = AutoLimits(c.q, &pool, LimitsFrame, DefaultLowPercentile, DefaultHighPercentile); err != nil {
		tb.Fatal(err)
	}
	return c
}

// options are the case's overlay options with zone outlines and an
// onset badge, as a run's frame has them.
func (c *kirschCase) options(buf *overlayBuffers) OverlayOptions {
	g := c.values.Grid
	var cells []int
	cr := int((c.cy - float64(g.Y0)) / float64(g.Step))
	cc := int((c.cx - c.ra - float64(g.X0)) / float64(g.Step))
	for r := cr - 3; r <= cr+3; r++ {
		for k := cc - 4; k <= cc-1; k++ {
			cells = append(cells, g.Index(k, r))
		}
	}
	return OverlayOptions{Quantity: c.q, Limits: c.lim, Keep: c.keep, Scale: 0.05, buffers: buf,
		Stamp:  Stamp{Frame: "kirsch", Time: 120, HasTime: true, Stress: 30, HasStress: true, Peak: 60},
		Zones:  []ZoneOutline{{Cells: cells, Class: "localization"}},
		Onsets: []OnsetMark{{X: c.cx - c.ra - 20, Y: c.cy, Number: 1, Legend: "localization, left-sidewall, 30.0 MPa"}}}
}

// BenchmarkOverlayFrame20MP is one frame of the outputs stage at 20 MP
// (5472×3648, grid step 10, the Kirsch case with a zone and an onset):
// the overlay, its PNG and a video frame, by the path before the fast one
// (reference: referenceOverlay, OpenCV's PNG writer, a video of the
// overlay's own size) and by the fast path (Overlay with Run's buffers,
// WritePNGStripes, a video DefaultVideoWidth wide), side by side in one
// run; png-MB is the PNG's size.
func BenchmarkOverlayFrame20MP(b *testing.B) {
	c := newKirschCase(b, 5472, 3648, 10)
	for _, path := range []struct {
		name    string
		overlay func(opt OverlayOptions) (gocv.Mat, error)
		png     func(string, gocv.Mat) error
		width   int
	}{
		{"reference", func(opt OverlayOptions) (gocv.Mat, error) {
			opt.buffers = nil
			return referenceOverlay(c.photo, c.values, opt)
		}, frames.WriteMat, 0},
		{"fast", func(opt OverlayOptions) (gocv.Mat, error) { return Overlay(c.photo, c.values, opt) }, frames.WritePNGStripes, DefaultVideoWidth},
	} {
		b.Run(path.name, func(b *testing.B) {
			dir := b.TempDir()
			var buf overlayBuffers
			file := filepath.Join(dir, "frame.png")
			for i := 0; i < b.N; i++ {
				m, err := path.overlay(c.options(&buf))
				if err != nil {
					b.Fatal(err)
				}
				if err := path.png(file, m); err != nil {
					b.Fatal(err)
				}
				frame := m
				if path.width > 0 {
					frame = gocv.NewMat()
					gocv.Resize(m, &frame, image.Pt(path.width, m.Rows()*path.width/m.Cols()), 0, 0, gocv.InterpolationArea)
				}
				v, err := CreateVideo(filepath.Join(dir, "video.mp4"), VideoMP4, 10, frame.Cols(), frame.Rows())
				if err != nil {
					b.Fatal(err)
				}
				if err := v.Write(frame, "kirsch"); err != nil {
					b.Fatal(err)
				}
				v.Abort()
				if path.width > 0 {
					frame.Close()
				}
				m.Close()
			}
			if st, err := os.Stat(file); err == nil {
				b.ReportMetric(float64(st.Size())/1e6, "png-MB")
			}
		})
	}
}

// The fast overlay (rows sampled, coloured through a table and blended
// straight into the canvas on all cores) draws the picture of the path it
// replaced (referenceOverlay: a float raster, Colormap.At per pixel,
// OpenCV's AddWeighted, an RGBA canvas copied to BGR) on a known field,
// the Kirsch solution's εxx about an opening with a zone outline and an
// onset badge: on the reference photo, on the current frame moved with the
// Kirsch displacement (scaled to 20 px at most, so the warp has work to
// do), through a lens, and with arrows. Tolerance (ours): every channel of
// every pixel within 1 gray level, and at least 99.9 % of pixels equal
// in all three channels. The table's positions are 1/262143 of the map
// apart, so a colour can round to the level next to the exact one; the
// panel, marks and the photo's gray are the same code and must be equal.
func TestOverlayMatchesReferencePath(t *testing.T) {
	const w, h = 640, 480
	c := newKirschCase(t, w, h, 8)
	ulo, uhi := finiteRange(c.u.Values)
	vlo, vhi := finiteRange(c.v.Values)
	gain := 20 / math.Max(math.Max(-ulo, uhi), math.Max(-vlo, vhi))
	big := func(g *GridValues) *GridValues {
		out := &GridValues{Grid: g.Grid, Values: make([]float64, len(g.Values))}
		for i, v := range g.Values {
			out.Values[i] = gain * v
		}
		return out
	}
	m := lens.Model{Width: w, Height: h, Fx: 600, Fy: 600, Cx: 319.5, Cy: 239.5, K1: -0.2, P2: 0.001}
	for _, tc := range []struct {
		name string
		set  func(o *OverlayOptions)
	}{
		{"reference photo", func(o *OverlayOptions) {}},
		{"current frame", func(o *OverlayOptions) { o.Deform = &Deformation{U: big(c.u), V: big(c.v)} }},
		{"through a lens", func(o *OverlayOptions) { o.Lens = &m }},
		{"arrows", func(o *OverlayOptions) { o.Vectors = &Vectors{U: big(c.u), V: big(c.v), Every: 4} }},
	} {
		t.Run(tc.name, func(t *testing.T) {
			var buf overlayBuffers
			opt := c.options(&buf)
			tc.set(&opt)
			fast, err := Overlay(c.photo, c.values, opt)
			if err != nil {
				t.Fatal(err)
			}
			defer fast.Close()
			opt.buffers = nil
			ref, err := referenceOverlay(c.photo, c.values, opt)
			if err != nil {
				t.Fatal(err)
			}
			defer ref.Close()
			if fast.Cols() != ref.Cols() || fast.Rows() != ref.Rows() || fast.Channels() != 3 {
				t.Fatalf("fast overlay %dx%d×%d, reference %dx%d×%d", fast.Cols(), fast.Rows(), fast.Channels(), ref.Cols(), ref.Rows(), ref.Channels())
			}
			a, _ := fast.DataPtrUint8()
			b, _ := ref.DataPtrUint8()
			worst, differ, coloured := 0, 0, 0
			for i := 0; i < len(a); i += 3 {
				d := 0
				for k := 0; k < 3; k++ {
					d = max(d, annotateAbs(int(a[i+k])-int(b[i+k])))
				}
				worst = max(worst, d)
				if d > 0 {
					differ++
				}
				if b[i] != b[i+1] || b[i+1] != b[i+2] {
					coloured++
				}
			}
			n := len(a) / 3
			t.Logf("%d pixels (%d coloured): %d differ (%.4f %%), by at most %d", n, coloured, differ, 100*float64(differ)/float64(n), worst)
			if coloured < n/2 {
				t.Errorf("only %d of %d pixels coloured: the case does not test the field", coloured, n)
			}
			if worst > 1 || float64(differ) > 0.001*float64(n) {
				t.Errorf("fast overlay differs from the reference at %d of %d pixels (%.4f %%), by up to %d levels; expected ≤ 1 level, ≤ 0.1 %% of pixels", differ, n, 100*float64(differ)/float64(n), worst)
			}
		})
	}
}

// The colour table's spacing bound holds for the maps offered: no entry of
// a table moves a component by 0.03 of full scale or more from the entry
// before (what colourSteps's one-level claim rests on).
func TestColourTableSpacing(t *testing.T) {
	for _, m := range []Colormap{Sequential(), Diverging()} {
		worst := 0.0
		for i := 1; i < len(m.table); i++ {
			for k := 0; k < 3; k++ {
				worst = math.Max(worst, math.Abs(m.table[i][k]-m.table[i-1][k]))
			}
		}
		if worst >= 0.03 {
			t.Errorf("%s: entries up to %.3f apart, expected < 0.03", m.Name, worst)
		}
		t.Logf("%s: largest step between entries %.4f", m.Name, worst)
	}
}

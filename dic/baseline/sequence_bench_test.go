package baseline

import (
	"fmt"
	"math"
	"os"
	"testing"
	"time"

	"spallscope/dic"
	"spallscope/dic/synth"
	"spallscope/subset"
)

// sequenceCase is a sequence that looks like a test rather than flattering
// the tracker: sensor noise σ = 1.5 gray levels (8-bit), a strain ramp
// (exx to 3000 µε, eyy to −1500 µε over the frames) with a small rotation
// (0.05° a frame) and a drift, on a side × side face. It returns the
// reference, the frames 1…frames−1 and each frame's exact field.
func sequenceCase(side, frames int) (ref *subset.Image, imgs []*subset.Image, fields []synth.Field, err error) {
	sp, err := synth.NewSpeckles(Pattern, side, side)
	if err != nil {
		return nil, nil, nil, err
	}
	cam := synth.Camera{Depth: 8, Noise: 1.5, Seed: 41}
	c := float64(side) / 2
	fieldAt := func(k int) synth.Field {
		s := float64(k) / float64(frames-1)
		return synth.Sum{
			synth.UniformStrain{Cx: c, Cy: c, Exx: 3e-3 * s, Eyy: -1.5e-3 * s},
			synth.Rotation{Cx: c, Cy: c, AngleDeg: 0.05 * float64(k)},
			synth.Translation{U: 0.6 * s, V: -0.35 * s},
		}
	}
	if ref, err = synth.Render(synth.Scene{Speckles: sp}, cam, side, side, 0); err != nil {
		return nil, nil, nil, err
	}
	for k := 1; k < frames; k++ {
		img, err := synth.Render(synth.Scene{Speckles: sp, Field: fieldAt(k)}, cam, side, side, k)
		if err != nil {
			return nil, nil, nil, err
		}
		imgs, fields = append(imgs, img), append(fields, fieldAt(k))
	}
	return ref, imgs, fields, nil
}

// BenchmarkSequence times a frame after the first of the noisy strain
// ramp (sequenceCase, 1 MP; 20 MP with SPALLSCOPE_BENCH_20MP=1, 5472×3648
// as a 20 MP DSLR, squared here to 4472 px a side for the same point
// count): spallscope's tracker, warm from the frames before as in a run,
// against OpenCV's pyramidal Lucas–Kanade on the same frame and points
// (which rebuilds its pyramids each frame too). Metrics: POI/s, the mean
// IC-GN iterations per point, the RMSE against the exact field, and for
// Lucas–Kanade its ns/point and RMSE. Read ratios of one run: the machine
// is shared.
func BenchmarkSequence(b *testing.B) {
	sides := []int{1024}
	if os.Getenv("SPALLSCOPE_BENCH_20MP") != "" {
		sides = append(sides, 4472)
	}
	for _, side := range sides {
		ref, imgs, fields, err := sequenceCase(side, 4)
		if err != nil {
			b.Fatal(err)
		}
		for _, sub := range []int{21, 31} {
			for _, step := range []int{10, 5} {
				b.Run(fmt.Sprintf("side=%d/subset=%d/step=%d", side, sub, step), func(b *testing.B) {
					benchmarkSequence(b, ref, imgs, fields, sub, step)
				})
			}
		}
	}
}

func benchmarkSequence(b *testing.B, ref *subset.Image, imgs []*subset.Image, fields []synth.Field, sub, step int) {
	last := len(imgs) - 1
	var f *dic.Field
	b.ResetTimer()
	for range b.N {
		// A fresh tracker warmed by the frames before, untimed, so that the
		// timed frame starts from the previous frame's solution as in a run
		// (tracking one frame twice would start it from its own answer).
		b.StopTimer()
		tr, err := dic.NewTracker(ref, 0, nil, dic.Settings{Subset: sub, Step: step})
		if err != nil {
			b.Fatal(err)
		}
		for k := 0; k < last; k++ {
			if _, err := tr.Track(imgs[k], k+1, "warm"); err != nil {
				b.Fatal(err)
			}
		}
		b.StartTimer()
		if f, err = tr.Track(imgs[last], last+1, "timed"); err != nil {
			b.Fatal(err)
		}
	}
	b.StopTimer()
	elapsed := b.Elapsed().Seconds() / float64(b.N)
	var iters, sq float64
	var pts [][2]int
	var truth []synth.Motion
	n := 0
	for i := range f.Points {
		p := &f.Points[i]
		if !p.Valid() {
			continue
		}
		u, v := p.U()
		m := fields[last].At(float64(p.X), float64(p.Y))
		iters += float64(p.Iterations)
		sq += (u-m.U)*(u-m.U) + (v-m.V)*(v-m.V)
		pts, truth = append(pts, [2]int{p.X, p.Y}), append(truth, m)
		n++
	}
	b.ReportMetric(float64(n)/elapsed, "POI/s")
	b.ReportMetric(iters/float64(n), "iterations")
	b.ReportMetric(math.Sqrt(sq/float64(n)), "rmse_px")
	// Lucas–Kanade on the same frame and points, timed alone.
	c := &Case{Name: "sequence", Ref: ref, Def: imgs[last], Points: pts, Truth: truth, Search: 3}
	t0 := time.Now()
	u, v, err := LucasKanade(c, sub)
	lk := time.Since(t0).Seconds()
	if err != nil {
		b.Fatal(err)
	}
	var lsq float64
	ln := 0
	for i := range u {
		if !math.IsNaN(u[i]) {
			lsq += (u[i]-truth[i].U)*(u[i]-truth[i].U) + (v[i]-truth[i].V)*(v[i]-truth[i].V)
			ln++
		}
	}
	b.ReportMetric(1e9*lk/float64(len(pts)), "LK_ns/point")
	b.ReportMetric(math.Sqrt(lsq/float64(max(ln, 1))), "LK_rmse_px")
	b.ReportMetric(1e9*elapsed/float64(n), "ns/point")
}

package baseline

import (
	"fmt"
	"os"
	"testing"

	"spallscope/dic"
	"spallscope/subset"
)

// BenchmarkSequence tracks the noisy strain ramp of NewSequence (sensor
// noise σ = 1.5 gray levels, 1 MP, 6 frames; with SPALLSCOPE_BENCH_20MP=1
// also 5472×3648 px as a 20 MP DSLR, 4 frames rendered one at a time so
// that memory holds what a run would) and scores the frames after
// the first tracked one (TrackSequence): spallscope's tracker, warm from
// the frames before as in a run, against OpenCV's pyramidal Lucas–Kanade
// on the same frames and points. The held-out variant (σ = 2, another
// pattern and ramp) is for accuracy: tuning is done on the main one.
// Metrics: POI/s, s/frame, the mean IC-GN iterations per point, the RMSE
// against the exact field, the peak RSS of the case, Lucas–Kanade's RMSE,
// the points a frame each method lost (left out of its RMSE), time/LK
// (below 1: faster than Lucas–Kanade; OpenCV's call alone) and the time a
// frame takes to convert to OpenCV's 8-bit image (in neither time). Read ratios of one run:
// the machine is shared.
func BenchmarkSequence(b *testing.B) {
	type bcase struct {
		name  string
		spec  SequenceSpec
		cases [][2]int // subset, step
	}
	all := [][2]int{{21, 10}, {21, 5}, {31, 10}, {31, 5}}
	list := []bcase{
		{"1MP", SequenceSpec{Width: 1024, Height: 1024, Frames: 6, Noise: 1.5}, all},
		{"1MP-heldout", SequenceSpec{Width: 1024, Height: 1024, Frames: 6, Noise: 2, HeldOut: true}, [][2]int{{21, 10}}},
	}
	if os.Getenv("SPALLSCOPE_BENCH_20MP") != "" {
		list = append(list, bcase{"20MP", SequenceSpec{Width: 5472, Height: 3648, Frames: 4, Noise: 1.5, OnDemand: true}, [][2]int{{21, 10}, {31, 10}}})
	}
	for _, bc := range list {
		var seq *Sequence
		for _, c := range bc.cases {
			b.Run(fmt.Sprintf("%s/subset=%d/step=%d", bc.name, c[0], c[1]), func(b *testing.B) {
				if seq == nil { // rendered once, on the first case run
					var err error
					if seq, err = NewSequence(bc.spec); err != nil {
						b.Fatal(err)
					}
				}
				b.ResetTimer()
				var sum SequenceRow
				for range b.N {
					r, err := TrackSequence(seq, c[0], c[1])
					if err != nil {
						b.Fatal(err)
					}
					sum.PointsPerSecond += r.PointsPerSecond
					sum.SecondsPerFrame += r.SecondsPerFrame
					sum.Iterations += r.Iterations
					sum.RMSE += r.RMSE
					sum.LKRMSE += r.LKRMSE
					sum.LKLost += r.LKLost
					sum.ConvertSecondsPerFrame += r.ConvertSecondsPerFrame
					sum.Lost += r.Lost
					sum.VsLK += r.VsLK
					sum.PeakRSS = max(sum.PeakRSS, r.PeakRSS)
				}
				k := float64(b.N)
				b.ReportMetric(sum.PointsPerSecond/k, "POI/s")
				b.ReportMetric(sum.SecondsPerFrame/k, "s/frame")
				b.ReportMetric(sum.Iterations/k, "iterations")
				b.ReportMetric(sum.RMSE/k, "rmse_px")
				b.ReportMetric(sum.LKRMSE/k, "LK_rmse_px")
				b.ReportMetric(sum.Lost/k, "lost/frame")
				b.ReportMetric(sum.LKLost/k, "LK_lost/frame")
				b.ReportMetric(sum.ConvertSecondsPerFrame/k, "convert_s/frame")
				b.ReportMetric(sum.VsLK/k, "time/LK")
				b.ReportMetric(float64(sum.PeakRSS)/(1<<20), "peakRSS_MB")
			})
		}
	}
}

// BenchmarkSequenceBudget splits the RMSE of the 1 MP noisy strain ramp of
// BenchmarkSequence into its random and systematic parts over 6 noise
// realisations (SequenceErrorBudget), beside the theoretical random error
// of the pattern's subsets, for the tracker (21 and 31 px subsets on
// bicubic splines, and 21 px on biquintic ones) and Lucas–Kanade. Metrics in
// px: rmse, random, systematic, noisefree (the tracker on exact frames),
// pan and affine (theory), and LK_rmse, LK_random, LK_systematic.
func BenchmarkSequenceBudget(b *testing.B) {
	seq, err := NewSequence(SequenceSpec{Width: 1024, Height: 1024, Frames: 6, Noise: 1.5})
	if err != nil {
		b.Fatal(err)
	}
	for _, s := range []dic.Settings{{Subset: 21}, {Subset: 31}, {Subset: 21, Interpolation: subset.Biquintic}} {
		s.Step = 10
		b.Run(fmt.Sprintf("1MP/subset=%d/step=10/%v", s.Subset, s.Effective().Interpolation), func(b *testing.B) {
			var r ErrorBudget
			for range b.N {
				if r, err = SequenceErrorBudget(seq, s, 6); err != nil {
					b.Fatal(err)
				}
			}
			for _, m := range []struct {
				v    float64
				unit string
			}{
				{r.RMSE, "rmse_px"}, {r.Random, "random_px"}, {r.Systematic, "systematic_px"},
				{r.NoiseFree, "noisefree_px"}, {r.TheoryPan, "pan_px"}, {r.TheoryAffine, "affine_px"},
				{r.LKRMSE, "LK_rmse_px"}, {r.LKRandom, "LK_random_px"}, {r.LKSystematic, "LK_systematic_px"},
			} {
				b.ReportMetric(m.v, m.unit)
			}
		})
	}
}

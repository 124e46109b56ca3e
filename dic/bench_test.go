package dic_test

import (
	"testing"

	"spallscope/dic"
	"spallscope/dic/synth"
)

// BenchmarkTrack1024 tracks one 1024×1024 frame on a 5 px grid (about
// 40,000 points) with 21 px subsets, affine shape, bicubic splines, from
// the previous frame's solution as a run does after its first frame.
// POI/s is points per second; with workers=1 it is the per-core rate.
func BenchmarkTrack1024(b *testing.B) {
	const w = 1024
	sp, _ := synth.NewSpeckles(speckle4, w, w)
	cam := synth.Camera{Depth: 8, Noise: 1}
	ref, _ := synth.Render(synth.Scene{Speckles: sp}, cam, w, w, 0)
	f1 := synth.Sum{synth.UniformStrain{Cx: 512, Cy: 512, Exx: 2e-3, Eyy: -1e-3}, synth.Translation{U: 0.4, V: 0.3}}
	f2 := synth.Sum{synth.UniformStrain{Cx: 512, Cy: 512, Exx: 2.2e-3, Eyy: -1.1e-3}, synth.Translation{U: 0.45, V: 0.32}}
	img1, _ := synth.Render(synth.Scene{Speckles: sp, Field: f1}, cam, w, w, 1)
	img2, _ := synth.Render(synth.Scene{Speckles: sp, Field: f2}, cam, w, w, 2)
	for _, workers := range []int{1, 0} {
		name := "workers=1"
		if workers == 0 {
			name = "workers=all"
		}
		b.Run(name, func(b *testing.B) {
			tr, err := dic.NewTracker(ref, 0, nil, dic.Settings{Subset: 21, Step: 5, Workers: workers})
			if err != nil {
				b.Fatal(err)
			}
			if _, err := tr.Track(img1, 1, "f1"); err != nil {
				b.Fatal(err)
			}
			b.ResetTimer()
			points := 0
			for i := 0; i < b.N; i++ {
				f, err := tr.Track(img2, 2, "f2")
				if err != nil {
					b.Fatal(err)
				}
				points += f.Valid()
			}
			b.ReportMetric(float64(points)/b.Elapsed().Seconds(), "POI/s")
		})
	}
}

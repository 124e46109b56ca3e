package synth

import (
	"bufio"
	"fmt"
	"math"
	"math/rand/v2"

	"spallscope/dic/runfolder"
)

// DemoAEOffset is the demo's AE clock minus the front camera's clock, s.
const DemoAEOffset = 1.2

// WriteDemoAE writes an invented acoustic-emission hit list for the demo
// scenario sc: a quiet background of about one hit per second, a rise
// while the notches grow (their growth frames), a stronger one after the
// peak, and a 10 s stretch where the recording stopped (88–98 s camera
// time) — on an AE clock DemoAEOffset ahead of the camera. Hits are drawn
// from a seeded Poisson process, so the file is the same every time.
func WriteDemoAE(path string, sc *Scenario) error {
	rng := rand.New(rand.NewPCG(20261203, 5))
	notchStart, notchFull := sc.Time(sc.Fields[1].StartFrame), sc.Time(sc.Fields[1].FullFrame)
	peak := sc.Time(sc.Load.PeakFrame)
	end := sc.Time(sc.Frames - 1)
	rate := func(t float64) float64 {
		r := 1.0
		if t > notchStart && t < notchFull+20 {
			r += 4
		}
		if t > peak {
			r += 8
		}
		return r
	}
	return runfolder.WriteAtomic(path, func(w *bufio.Writer) error {
		fmt.Fprintf(w, "# invented AE hits for the demo test %q; AE clock = camera clock %+g s\n", sc.Name, DemoAEOffset)
		w.WriteString("time_s,amplitude_dB,energy\n")
		for t := 0.0; t < end; {
			t += rng.ExpFloat64() / 13 // thinning of a 13 hits/s process
			if t >= end || rng.Float64() > rate(t)/13 || (t > 88 && t < 98) {
				continue
			}
			amp := 40 + 25*rng.Float64()
			fmt.Fprintf(w, "%.4f,%.1f,%.3g\n", t+DemoAEOffset, amp, math.Pow(10, (amp-40)/20))
		}
		return nil
	})
}

// WriteKirschModel writes the elastic Kirsch field k (reference px) as a
// model file of our own layout: points on a stepMM grid in mm with the
// origin at the opening's centre and y up, columns x_mm,y_mm,u_mm,v_mm and
// the strains exx,eyy,exy (tension positive), leaving out the opening.
// This is the "numerical model" the demo holds against its measurement.
func WriteKirschModel(path string, k Kirsch, mmPerPx, halfMM, stepMM float64) error {
	return runfolder.WriteAtomic(path, func(w *bufio.Writer) error {
		fmt.Fprintf(w, "# elastic Kirsch model: %g MPa vertical, K = %g, E = %g MPa, nu = %g; origin at the opening's centre, y up, mm\n",
			k.Stress, k.K, k.E, k.Nu)
		w.WriteString("x_mm,y_mm,u_mm,v_mm,exx,eyy,exy\n")
		for ym := -halfMM; ym <= halfMM+1e-9; ym += stepMM {
			for xm := -halfMM; xm <= halfMM+1e-9; xm += stepMM {
				px, py := k.Cx+xm/mmPerPx, k.Cy-ym/mmPerPx
				if math.Hypot(px-k.Cx, py-k.Cy) < k.Radius {
					continue
				}
				m := k.At(px, py)
				// y up: v and the shear change sign.
				fmt.Fprintf(w, "%g,%g,%.9g,%.9g,%.9g,%.9g,%.9g\n", xm, ym, m.U*mmPerPx, -m.V*mmPerPx, m.UX, m.VY, -(m.UY+m.VX)/2)
			}
		}
		return nil
	})
}

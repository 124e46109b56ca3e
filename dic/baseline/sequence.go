package baseline

import (
	"fmt"
	"math"
	"time"

	"spallscope/dic"
	"spallscope/dic/frames"
	"spallscope/dic/synth"
	"spallscope/subset"
)

// SequenceSpec describes a synthetic sequence that looks like a test
// rather than flattering the tracker: sensor noise, a strain ramp with a
// small rotation and a drift, tracked frame after frame against the first.
type SequenceSpec struct {
	Width, Height int
	// Frames counts the frames including the reference; at least 3, so
	// that at least one frame after the first tracked one is timed.
	Frames int
	// Noise is the sensor noise σ in gray levels (8-bit).
	Noise float64
	// HeldOut selects the held-out variant: another pattern, noise seed,
	// ramp (compression across, tension along) and rotation sense. The
	// tracker's tuning was done on the main variant only, so its accuracy
	// here is an honest check against over-fitting.
	HeldOut bool
	// OnDemand renders each frame when it is asked for instead of keeping
	// them all, so that memory holds the reference and one frame, as in a
	// run that reads its photos one at a time (for 20 MP frames).
	OnDemand bool
}

// Sequence is a SequenceSpec: the reference, the frames after it and the
// exact field of each.
type Sequence struct {
	Spec   SequenceSpec
	Ref    *subset.Image
	Fields []synth.Field
	frames []*subset.Image // nil with Spec.OnDemand
	scene  synth.Scene
	cam    synth.Camera
}

// Frame returns frame k (1 … Frames−1) and its exact field.
func (q *Sequence) Frame(k int) (*subset.Image, synth.Field, error) {
	if k < 1 || k > len(q.Fields) {
		return nil, nil, fmt.Errorf("sequence: no frame %d (1…%d)", k, len(q.Fields))
	}
	if q.frames != nil {
		return q.frames[k-1], q.Fields[k-1], nil
	}
	sc := q.scene
	sc.Field = q.Fields[k-1]
	img, err := synth.Render(sc, q.cam, q.Spec.Width, q.Spec.Height, k)
	return img, q.Fields[k-1], err
}

// NewSequence renders spec. The main variant strains to exx = 3000 µε,
// eyy = −1500 µε over the frames with 0.05° of rotation a frame and a
// drift of (0.6, −0.35) px; the held-out variant to exx = −2000 µε,
// eyy = 2500 µε with −0.04° a frame and a drift of (−0.4, 0.5) px. Both
// ramps are linear in the frame index, as under a constant loading rate.
func NewSequence(spec SequenceSpec) (*Sequence, error) {
	if spec.Frames < 3 {
		return nil, fmt.Errorf("sequence: %d frames, want at least 3", spec.Frames)
	}
	if spec.Width < 64 || spec.Height < 64 {
		return nil, fmt.Errorf("sequence: %dx%d px, want at least 64 px a side", spec.Width, spec.Height)
	}
	if !(spec.Noise >= 0) {
		return nil, fmt.Errorf("sequence: noise %g, want at least 0", spec.Noise)
	}
	pattern, seed := Pattern, uint64(41)
	exx, eyy, rot, du, dv := 3e-3, -1.5e-3, 0.05, 0.6, -0.35
	if spec.HeldOut {
		pattern.Seed, seed = 7, 97
		exx, eyy, rot, du, dv = -2e-3, 2.5e-3, -0.04, -0.4, 0.5
	}
	sp, err := synth.NewSpeckles(pattern, spec.Width, spec.Height)
	if err != nil {
		return nil, err
	}
	cam := synth.Camera{Depth: 8, Noise: spec.Noise, Seed: seed}
	cx, cy := float64(spec.Width)/2, float64(spec.Height)/2
	seq := &Sequence{Spec: spec, scene: synth.Scene{Speckles: sp}, cam: cam}
	if seq.Ref, err = synth.Render(seq.scene, cam, spec.Width, spec.Height, 0); err != nil {
		return nil, err
	}
	for k := 1; k < spec.Frames; k++ {
		s := float64(k) / float64(spec.Frames-1)
		f := synth.Sum{
			synth.UniformStrain{Cx: cx, Cy: cy, Exx: exx * s, Eyy: eyy * s},
			synth.Rotation{Cx: cx, Cy: cy, AngleDeg: rot * float64(k)},
			synth.Translation{U: du * s, V: dv * s},
		}
		seq.Fields = append(seq.Fields, f)
	}
	if !spec.OnDemand {
		frames := make([]*subset.Image, 0, spec.Frames-1)
		for k := 1; k < spec.Frames; k++ {
			img, _, err := seq.Frame(k)
			if err != nil {
				return nil, err
			}
			frames = append(frames, img)
		}
		seq.frames = frames
	}
	return seq, nil
}

// SequenceRow is spallscope's tracker and Lucas–Kanade on the frames of a
// Sequence after the first tracked one (frames 2, 3, …: the first needs
// seed searches and propagation from scratch, every later one starts from
// the frames before, as most of a run does). Figures are means over those
// frames.
type SequenceRow struct {
	Subset, Step int
	// Points is the mean number of valid points a frame.
	Points float64
	// SecondsPerFrame is the tracker's wall time a frame, spline included.
	SecondsPerFrame float64
	// PointsPerSecond is Points / SecondsPerFrame.
	PointsPerSecond float64
	// Iterations is the mean number of IC-GN iterations per valid point.
	Iterations float64
	// RMSE is the root mean square error vector length against the exact
	// field over the valid points, px.
	RMSE float64
	// Lost is the mean number of grid points a frame that the tracker
	// tried and lost (diverged, or below the correlation gate): they are
	// left out of both RMSE and LKRMSE, and Lucas–Kanade is not run on them.
	Lost float64
	// LKSecondsPerFrame and LKRMSE are OpenCV's pyramidal Lucas–Kanade on
	// the same frames and points (its pyramids rebuilt each frame; the
	// conversion of the frames to 8-bit OpenCV images is not timed, as a
	// run with OpenCV would decode its photos into them); LKRMSE is over
	// the points it tracked, NaN when it tracked none.
	LKSecondsPerFrame, LKRMSE float64
	// ConvertSecondsPerFrame is the time a frame takes to convert to an
	// 8-bit OpenCV image for Lucas–Kanade: the harness's work, shown so
	// that it can be told from the tracker's (it is in neither time).
	ConvertSecondsPerFrame float64
	// LKLost is the mean number of those points a frame that Lucas–Kanade
	// reported lost (status 0), left out of LKRMSE. A point it tracks
	// badly without saying so stays in LKRMSE, as the tracker's do in RMSE.
	LKLost float64
	// VsLK is SecondsPerFrame / LKSecondsPerFrame: the tracker's time per
	// point over Lucas–Kanade's on the same points, measured in the same
	// run (below 1: faster).
	VsLK float64
	// PeakRSS is the process's peak resident memory in bytes while the
	// row was measured (Linux; 0 where unknown): the tracker, Lucas–Kanade
	// and the frames the sequence holds (all of them unless OnDemand).
	PeakRSS int64
}

// TrackSequence tracks every frame of seq with subsets of side sub on a
// grid of step px (affine shape, bicubic splines, all workers) and scores
// the frames after the first tracked one. Lucas–Kanade runs with a sub×sub
// window on each of those frames, timed alone. Both are scored at the
// same reference pixels against the exact field there.
func TrackSequence(seq *Sequence, sub, step int) (SequenceRow, error) {
	row := SequenceRow{Subset: sub, Step: step}
	resetPeakRSS()
	tr, err := dic.NewTracker(seq.Ref, 0, nil, dic.Settings{Subset: sub, Step: step})
	if err != nil {
		return row, err
	}
	lkRef, err := frames.ToMat(seq.Ref, 8)
	if err != nil {
		return row, fmt.Errorf("sequence: reference frame: %w", err)
	}
	defer lkRef.Close()
	var secs, lkSecs, convSecs, iters, sq, lkSq float64
	var n, lkN, lost, lkLost, scored int
	for k := 1; k < seq.Spec.Frames; k++ {
		img, field, err := seq.Frame(k)
		if err != nil {
			return row, err
		}
		t0 := time.Now()
		f, err := tr.Track(img, k, fmt.Sprintf("frame %d", k))
		dt := time.Since(t0).Seconds()
		if err != nil {
			return row, err
		}
		if k == 1 {
			continue
		}
		scored++
		secs += dt
		var pts [][2]int
		var truth []synth.Motion
		for i := range f.Points {
			p := &f.Points[i]
			if p.Status == subset.Lost || p.Status == subset.Diverged {
				lost++
			}
			if !p.Valid() {
				continue
			}
			u, v := p.U()
			m := field.At(float64(p.X), float64(p.Y))
			iters += float64(p.Iterations)
			sq += (u-m.U)*(u-m.U) + (v-m.V)*(v-m.V)
			pts, truth = append(pts, [2]int{p.X, p.Y}), append(truth, m)
		}
		n += len(pts)
		t0 = time.Now()
		lkDef, err := frames.ToMat(img, 8)
		if err != nil {
			return row, fmt.Errorf("sequence: frame %d: %w", k, err)
		}
		convSecs += time.Since(t0).Seconds()
		t0 = time.Now()
		lu, lv, err := lucasKanadeMats(lkRef, lkDef, pts, sub)
		lkSecs += time.Since(t0).Seconds()
		lkDef.Close()
		if err != nil {
			return row, err
		}
		for i := range lu {
			if math.IsNaN(lu[i]) {
				lkLost++
				continue
			}
			lkSq += (lu[i]-truth[i].U)*(lu[i]-truth[i].U) + (lv[i]-truth[i].V)*(lv[i]-truth[i].V)
			lkN++
		}
	}
	if n == 0 {
		return row, fmt.Errorf("sequence: no valid point in the frames after the first")
	}
	row.Points = float64(n) / float64(scored)
	row.Lost = float64(lost) / float64(scored)
	row.LKLost = float64(lkLost) / float64(scored)
	row.SecondsPerFrame = secs / float64(scored)
	row.PointsPerSecond = row.Points / row.SecondsPerFrame
	row.Iterations = iters / float64(n)
	row.RMSE = math.Sqrt(sq / float64(n))
	row.LKSecondsPerFrame = lkSecs / float64(scored)
	row.ConvertSecondsPerFrame = convSecs / float64(scored)
	row.LKRMSE = math.NaN() // Lucas–Kanade lost every point: no score, not a perfect one
	if lkN > 0 {
		row.LKRMSE = math.Sqrt(lkSq / float64(lkN))
	}
	row.VsLK = row.SecondsPerFrame / row.LKSecondsPerFrame
	row.PeakRSS = peakRSS()
	return row, nil
}

package baseline

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/mat"

	"spallscope/dic"
	"spallscope/dic/frames"
	"spallscope/dic/synth"
	"spallscope/subset"
)

// ErrorBudget splits the displacement error of spallscope's tracker and of
// Lucas–Kanade on a Sequence into a random part (what changes with the
// sensor noise) and a systematic part (what does not: interpolation bias,
// shape-function mismatch, convergence residue, noise-induced bias), by
// tracking the same exposures recorded again with independent noise, and
// sets beside them the random error that theory predicts for the pattern.
// Lengths are RMS lengths of the error vector (u, v) in px over the points
// of the frames after the first tracked one that both methods measured in
// every realisation.
type ErrorBudget struct {
	Subset, Step int
	// Realisations is the number of independent noise draws of every frame
	// (reference included); PointFrames the number of points × frames scored.
	Realisations, PointFrames int
	// RMSE is over every realisation: the figure TrackSequence reports.
	RMSE float64
	// Random is the RMS scatter of each point's error about its mean over
	// the realisations (unbiased, n−1); Systematic is the RMS of each
	// point's mean error, less the share of the random part left in a
	// mean of Realisations draws. RMSE² ≈ Random² + Systematic².
	Random, Systematic float64
	// NoiseFree is the tracker's RMSE on the frames' exact exposures (no
	// noise, no quantisation), over the points it measured there: the
	// systematic part that does not come from noise.
	NoiseFree float64
	// TheoryPan is √2·σ/√SSSIG per component (Pan et al. 2008, Optics
	// Express 16(10):7037–7048), as a vector RMS over the points: the
	// random error of a translation-only subset with noise σ in both
	// images. TheoryAffine is the least-squares covariance 2σ²·H⁻¹ of the
	// tracker's own model (affine shape plus the offset and gain ZNSSD
	// ignores, H the Gauss–Newton Hessian of the noise-free reference;
	// textbook least squares, common practice, no source), the floor no
	// choice of iteration or interpolation moves. σ is the sensor noise
	// with 8-bit quantisation added, √(σ² + 1/12) gray levels (uniform
	// rounding error; common practice, no source).
	TheoryPan, TheoryAffine float64
	// LKRMSE, LKRandom and LKSystematic are the same for Lucas–Kanade with
	// a window of the subset's size.
	LKRMSE, LKRandom, LKSystematic float64
}

// SequenceErrorBudget measures the ErrorBudget of the tracker with
// settings s (its subset, step and interpolation; zero fields take
// dic.DefaultSettings) over seq's frames, with realisations ≥ 2 noise
// draws (the first is seq's own frames); Lucas–Kanade's window is the
// subset. It holds every frame's exposure in memory: use it on 1 MP
// sequences, not 20 MP ones.
func SequenceErrorBudget(seq *Sequence, s dic.Settings, realisations int) (ErrorBudget, error) {
	s = s.Effective()
	sub := s.Subset
	b := ErrorBudget{Subset: sub, Step: s.Step, Realisations: realisations}
	if realisations < 2 {
		return b, fmt.Errorf("error budget: %d realisations, want at least 2", realisations)
	}
	if seq.cam.Depth != 8 {
		return b, fmt.Errorf("error budget: %d-bit frames, want 8-bit", seq.cam.Depth)
	}
	w, h := seq.Spec.Width, seq.Spec.Height
	exposures := make([]*subset.Image, seq.Spec.Frames)
	for k := range exposures {
		sc := seq.scene
		if k > 0 {
			sc.Field = seq.Fields[k-1]
		}
		var err error
		if exposures[k], err = synth.Expose(sc, seq.cam, w, h); err != nil {
			return b, fmt.Errorf("error budget: frame %d: %w", k, err)
		}
	}
	// Realisation r ≥ 0 records every exposure with its own seed; r = 0 is
	// the sequence's own noise, r < 0 the exact exposure.
	record := func(k, r int) *subset.Image {
		img := &subset.Image{Width: w, Height: h, Depth: 8, Pix: append([]float32(nil), exposures[k].Pix...)}
		if r >= 0 {
			cam := seq.cam
			cam.Seed += uint64(r) * 1_000_003
			synth.Record(img, cam, k)
		}
		return img
	}
	ours := &scatter{frames: seq.Spec.Frames - 2}
	lk := &scatter{frames: seq.Spec.Frames - 2}
	for r := -1; r < realisations; r++ {
		if err := trackRealisation(seq, s, func(k int) *subset.Image { return record(k, r) }, r, ours, lk); err != nil {
			return b, err
		}
	}
	b.PointFrames = ours.common(lk)
	b.RMSE, b.Random, b.Systematic = ours.split(realisations)
	b.LKRMSE, b.LKRandom, b.LKSystematic = lk.split(realisations)
	b.NoiseFree = math.Sqrt(ours.exactSq / float64(ours.exactN))
	sigma := math.Sqrt(seq.cam.Noise*seq.cam.Noise + 1.0/12)
	var err error
	if b.TheoryPan, b.TheoryAffine, err = ours.theory(exposures[0], s.Interpolation, sub/2, sigma); err != nil {
		return b, err
	}
	return b, nil
}

// scatter accumulates one method's errors per point and frame over the
// realisations.
type scatter struct {
	frames, points int
	grid           [][2]int     // the points' reference pixels
	sum            [][2]float64 // per point and frame: Σ error
	sq             []float64    // Σ |error|²
	count          []int        // realisations measured
	exactSq        float64      // Σ |error|² on the exact exposures
	exactN         int
}

// add records the error (ex, ey) of point i in scored frame j (0: the
// second frame after the reference) of realisation r (< 0: exact).
func (s *scatter) add(j, i, r int, ex, ey float64) {
	if r < 0 {
		s.exactSq += ex*ex + ey*ey
		s.exactN++
		return
	}
	q := j*s.points + i
	s.sum[q][0] += ex
	s.sum[q][1] += ey
	s.sq[q] += ex*ex + ey*ey
	s.count[q]++
}

// setGrid sizes the accumulators for the tracker's grid.
func (s *scatter) setGrid(f *dic.Field) {
	if s.grid != nil {
		return
	}
	s.points = len(f.Points)
	for i := range f.Points {
		s.grid = append(s.grid, [2]int{f.Points[i].X, f.Points[i].Y})
	}
	m := s.frames * s.points
	s.sum, s.sq, s.count = make([][2]float64, m), make([]float64, m), make([]int, m)
}

// common keeps the point-frames that both s and o measured in every
// realisation (the others' counts are zeroed) and returns their number.
func (s *scatter) common(o *scatter) int {
	n := 0
	top := 0
	for q := range s.count {
		top = max(top, s.count[q])
	}
	for q := range s.count {
		if s.count[q] != top || o.count[q] != top {
			s.count[q], o.count[q] = 0, 0
			continue
		}
		n++
	}
	return n
}

// split returns the RMSE and its random and systematic parts over the
// point-frames common kept (see ErrorBudget).
func (s *scatter) split(realisations int) (rmse, random, systematic float64) {
	var tot, rnd, sys float64
	n := 0
	r := float64(realisations)
	for q, c := range s.count {
		if c == 0 {
			continue
		}
		mx, my := s.sum[q][0]/r, s.sum[q][1]/r
		m2 := mx*mx + my*my
		v := (s.sq[q]/r - m2) * r / (r - 1)
		tot += s.sq[q] / r
		rnd += v
		sys += m2 - v/r
		n++
	}
	if n == 0 {
		return math.NaN(), math.NaN(), math.NaN()
	}
	return math.Sqrt(tot / float64(n)), math.Sqrt(rnd / float64(n)), math.Sqrt(max(sys, 0) / float64(n))
}

// theory returns the vector RMS over the kept point-frames of Pan's
// √2·σ/√SSSIG and of the affine model's least-squares covariance, both
// from the spline of the exact reference exposure (the gradient the
// solver uses).
func (s *scatter) theory(ref *subset.Image, kind subset.Interpolation, rad int, sigma float64) (pan, affine float64, err error) {
	sp := subset.NewSpline(ref, kind)
	perPoint := make([][2]float64, s.points) // pan², affine² of each grid point; NaN: not computed
	for i := range perPoint {
		perPoint[i] = [2]float64{math.NaN(), math.NaN()}
	}
	var sumPan, sumAff float64
	n := 0
	for q, c := range s.count {
		if c == 0 {
			continue
		}
		i := q % s.points
		if math.IsNaN(perPoint[i][0]) {
			x, y := s.grid[i][0], s.grid[i][1]
			p, a, ok := subsetTheory(sp, x, y, rad, sigma)
			if !ok {
				return 0, 0, fmt.Errorf("error budget: singular Hessian at (%d, %d)", x, y)
			}
			perPoint[i] = [2]float64{p, a}
		}
		sumPan += perPoint[i][0]
		sumAff += perPoint[i][1]
		n++
	}
	return math.Sqrt(sumPan / float64(n)), math.Sqrt(sumAff / float64(n)), nil
}

// subsetTheory returns the predicted squared error vector lengths of the
// subset of radius rad centred on (x, y): Pan's 2σ²(1/Σfx² + 1/Σfy²) and
// the affine model's 2σ²[(H⁻¹)_uu + (H⁻¹)_vv], H over the parameters
// (u, ux, uy, v, vx, vy, offset, gain).
func subsetTheory(sp *subset.Spline, x, y, rad int, sigma float64) (pan, affine float64, ok bool) {
	sx, sy := subset.SSSIGXY(sp, x, y, rad)
	nx, ny := subset.PredictedNoise(sigma, sx), subset.PredictedNoise(sigma, sy)
	pan = nx*nx + ny*ny
	side := 2*rad + 1
	vals := make([][3]float64, 0, side*side) // value and gradient at each pixel
	mean := 0.0
	for j := -rad; j <= rad; j++ {
		for i := -rad; i <= rad; i++ {
			v, gx, gy := sp.ValueGrad(float64(x+i), float64(y+j))
			vals = append(vals, [3]float64{v, gx, gy})
			mean += v
		}
	}
	mean /= float64(len(vals))
	hess := mat.NewSymDense(8, nil)
	k := 0
	for j := -rad; j <= rad; j++ {
		for i := -rad; i <= rad; i++ {
			v, gx, gy := vals[k][0], vals[k][1], vals[k][2]
			di, dj := float64(i), float64(j)
			jac := [8]float64{gx, gx * di, gx * dj, gy, gy * di, gy * dj, 1, v - mean}
			k++
			for a := range 8 {
				for c := a; c < 8; c++ {
					hess.SetSym(a, c, hess.At(a, c)+jac[a]*jac[c])
				}
			}
		}
	}
	var inv mat.Dense
	if err := inv.Inverse(hess); err != nil {
		return 0, 0, false
	}
	return pan, 2 * sigma * sigma * (inv.At(0, 0) + inv.At(3, 3)), true
}

// trackRealisation tracks one realisation of seq's frames (frame(k) gives
// frame k, reference included) with the tracker (settings s) and
// Lucas–Kanade and adds both methods' errors in the frames after the
// first tracked one.
func trackRealisation(seq *Sequence, s dic.Settings, frame func(k int) *subset.Image, r int, ours, lk *scatter) error {
	ref := frame(0)
	tr, err := dic.NewTracker(ref, 0, nil, s)
	if err != nil {
		return fmt.Errorf("error budget: %w", err)
	}
	lkRef, err := frames.ToMat(ref, 8)
	if err != nil {
		return fmt.Errorf("error budget: reference: %w", err)
	}
	defer lkRef.Close()
	for k := 1; k < seq.Spec.Frames; k++ {
		img := frame(k)
		f, err := tr.Track(img, k, fmt.Sprintf("frame %d", k))
		if err != nil {
			return fmt.Errorf("error budget: frame %d: %w", k, err)
		}
		if k == 1 {
			continue
		}
		ours.setGrid(f)
		lk.setGrid(f)
		field := seq.Fields[k-1]
		var pts [][2]int
		var idx []int
		for i := range f.Points {
			p := &f.Points[i]
			if !p.Valid() {
				continue
			}
			u, v := p.U()
			m := field.At(float64(p.X), float64(p.Y))
			ours.add(k-2, i, r, u-m.U, v-m.V)
			pts, idx = append(pts, [2]int{p.X, p.Y}), append(idx, i)
		}
		if r < 0 {
			continue // Lucas–Kanade's exact-exposure figure is not reported
		}
		lkDef, err := frames.ToMat(img, 8)
		if err != nil {
			return fmt.Errorf("error budget: frame %d: %w", k, err)
		}
		lu, lv, err := lucasKanadeMats(lkRef, lkDef, pts, s.Subset)
		lkDef.Close()
		if err != nil {
			return fmt.Errorf("error budget: frame %d: %w", k, err)
		}
		for n, i := range idx {
			if math.IsNaN(lu[n]) {
				continue
			}
			m := field.At(float64(pts[n][0]), float64(pts[n][1]))
			lk.add(k-2, i, r, lu[n]-m.U, lv[n]-m.V)
		}
	}
	return nil
}

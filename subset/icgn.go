package subset

import (
	"fmt"
	"math"
)

// Defaults used for zero Config fields.
const (
	DefaultMaxIterations    = 50
	DefaultTolerance        = 1e-3
	DefaultMinValidFraction = 0.75
	DefaultMaxZNSSD         = 1.0
	DefaultNoiseTolerance   = 4
)

// Config sets up a Solver. Zero fields take the documented defaults.
type Config struct {
	// Radius is the subset half-size in pixels: subsets are square with
	// 2·Radius+1 pixels on a side. It must be at least 1.
	Radius int
	// Order is the shape function.
	Order ShapeOrder
	// MaxIterations bounds the Gauss–Newton iterations (default 50).
	MaxIterations int
	// Tolerance is the convergence threshold in pixels (default 1e-3): the
	// iteration stops when an update moves every subset corner by less
	// (or by less than NoiseTolerance allows).
	Tolerance float64
	// MinValidFraction is the smallest fraction of subset pixels that must
	// lie inside the mask (default 0.75); below it the status is Masked.
	MinValidFraction float64
	// MinSSSIG is the low-texture gate: a reference subset whose SSSIG
	// (the smaller directional sum, see SSSIG) over its valid pixels is
	// below it is LowTexture. 0 disables the gate.
	MinSSSIG float64
	// MaxZNSSD is the correlation gate: a converged subset whose ZNSSD
	// exceeds it is Lost (default 1.0, that is ZNCC below 0.5; common
	// practice, no source). A negative value disables the gate.
	MaxZNSSD float64
	// NoiseTolerance widens the convergence threshold on noisy images
	// (default 4; negative: off): the iteration also stops when an update
	// moves every corner by less than NoiseTolerance times the subset's
	// predicted displacement precision σ (see Solver.precision), which
	// the noise of the images, not the solver, limits. A Gauss–Newton step
	// from that close lands within a small fraction of the step of the
	// optimum, so stopping there changes the answer by far less than σ;
	// without it a noisy subset spends an extra sampling of the deformed
	// image confirming an update already below its noise. On noise-free
	// images σ is tiny and Tolerance rules. The rule and its default are
	// our own, no published source; TestNoiseTolerance measures what they
	// cost in accuracy.
	NoiseTolerance float64
}

// withDefaults returns c with zero fields replaced by their defaults.
func (c Config) withDefaults() Config {
	if c.MaxIterations == 0 {
		c.MaxIterations = DefaultMaxIterations
	}
	if c.Tolerance == 0 {
		c.Tolerance = DefaultTolerance
	}
	if c.MinValidFraction == 0 {
		c.MinValidFraction = DefaultMinValidFraction
	}
	if c.MaxZNSSD == 0 {
		c.MaxZNSSD = DefaultMaxZNSSD
	}
	if c.NoiseTolerance == 0 {
		c.NoiseTolerance = DefaultNoiseTolerance
	}
	return c
}

// Validate reports the first field of c that NewSolver would reject.
func (c Config) Validate() error {
	switch {
	case c.Radius < 1:
		return fmt.Errorf("subset: radius %d, want at least 1", c.Radius)
	case c.Order != Affine && c.Order != Quadratic:
		return fmt.Errorf("subset: unknown shape order %d", int(c.Order))
	case c.MaxIterations < 0:
		return fmt.Errorf("subset: max iterations %d, want at least 0", c.MaxIterations)
	case !(c.Tolerance >= 0) || math.IsInf(c.Tolerance, 0):
		return fmt.Errorf("subset: tolerance %g px, want finite and at least 0", c.Tolerance)
	case !(c.MinValidFraction >= 0 && c.MinValidFraction <= 1):
		return fmt.Errorf("subset: min valid fraction %g, want 0…1", c.MinValidFraction)
	case !(c.MinSSSIG >= 0):
		return fmt.Errorf("subset: min SSSIG %g, want at least 0", c.MinSSSIG)
	case math.IsNaN(c.MaxZNSSD):
		return fmt.Errorf("subset: max ZNSSD is NaN")
	case math.IsNaN(c.NoiseTolerance) || math.IsInf(c.NoiseTolerance, 0):
		return fmt.Errorf("subset: noise tolerance %g, want finite", c.NoiseTolerance)
	}
	return nil
}

// Result is the outcome of measuring one subset.
type Result struct {
	// P is the final shape estimate, or the guess if no iteration ran.
	P Params
	// ZNCC is the zero-normalized cross-correlation of the last evaluated
	// warp, 0 if none was evaluated. On convergence it differs from that of
	// P by an amount of the order of the tolerance.
	ZNCC float64
	// Iterations is the number of Gauss–Newton updates computed.
	Iterations int
	Status     Status
}

// Solver measures subsets by the inverse compositional Gauss–Newton
// (IC-GN) algorithm with the ZNSSD criterion (Baker & Matthews 2004,
// "Lucas–Kanade 20 years on: a unifying framework", IJCV 56(3):221–255;
// Pan, Li & Tong 2013, "Fast, robust and accurate digital image
// correlation calculation without redundant computations", Experimental
// Mechanics 53:1277–1289).
//
// The reference subset's intensities, gradients, the sums of its
// steepest-descent images and its Hessian are computed once (Prepare);
// each iteration then only samples the deformed image at the warped pixel
// positions, so an iteration costs one interpolation and a few
// multiply-adds per pixel.
//
// A Solver owns all its scratch memory and does not allocate after
// NewSolver. It is not safe for concurrent use: use one Solver per
// goroutine.
type Solver struct {
	cfg Config
	np  int // number of shape parameters

	// The prepared reference subset. Its valid pixels are stored in
	// row-major order, grouped in runs of consecutive pixels of one row.
	ref    *Spline
	status Status // outcome of the last Prepare
	cx, cy float64
	n      int       // valid pixels
	runs   []run     // runs of valid pixels
	square bool      // runs, dx and dy are those of the full square
	dx, dy []float64 // n local offsets
	fc     []float64 // n reference values minus fMean
	gx, gy []float64 // n reference gradients
	fMean  float64
	fNorm  float64 // ‖f - f̄‖
	sumJ   [12]float64
	sumJf  [12]float64  // Σ J·(f - f̄)
	chol   [144]float64 // Cholesky factor of the Hessian, leading np×np
	scale  [12]float64  // parameter scales for the rank test
	invUV  float64      // (H⁻¹)_uu + (H⁻¹)_vv, see precision

	// Scratch: the reference window (side² values and gradients), the
	// stencil columns of centres, and the warped positions and deformed
	// values of the current iteration (n each).
	winV, winX, winY []float64
	colV, colD       []float64
	xs, ys, gs       []float64
	ls               []float64 // the values sampleShared interpolates, listed (n)
	// The affine warp of the current iteration: where each run's first
	// pixel lands, and the step along the runs (see affineWarp).
	ox, oy []float64
	ax, ay float64

	// Shared samples of the current SolveShared (nil otherwise), and the
	// shape the last Iterate sampled at.
	prior            *Samples
	priorDX, priorDY int
	sampled          bool
	sampledAt        Params
}

// run is a maximal sequence of consecutive valid pixels in one subset row:
// pixels k0 … k0+n-1 have offsets (dx0 + i, dy), i = 0 … n-1.
type run struct {
	k0, n   int
	dx0, dy float64
}

// NewSolver returns a Solver for cfg. It panics if cfg.Validate fails.
func NewSolver(cfg Config) *Solver {
	if err := cfg.Validate(); err != nil {
		panic(err)
	}
	cfg = cfg.withDefaults()
	side := 2*cfg.Radius + 1
	area := side * side
	np := cfg.Order.NumParams()
	buf := make([]float64, 12*area+2*centreScratch(side))
	next := func(m int) []float64 {
		b := buf[:m:m]
		buf = buf[m:]
		return b
	}
	s := &Solver{
		cfg: cfg,
		np:  np,
		// A row of side pixels holds at most (side+1)/2 runs.
		runs: make([]run, 0, side*((side+1)/2)),
		ox:   make([]float64, side*((side+1)/2)), oy: make([]float64, side*((side+1)/2)),
		dx: next(area), dy: next(area),
		fc: next(area), gx: next(area), gy: next(area),
		winV: next(area), winX: next(area), winY: next(area),
		xs: next(area), ys: next(area), gs: next(area), ls: next(area),
		colV: next(centreScratch(side)), colD: next(centreScratch(side)),
	}
	r := float64(cfg.Radius)
	s.scale = [12]float64{1, r, r, 1, r, r, r * r / 2, r * r, r * r / 2, r * r / 2, r * r, r * r / 2}
	return s
}

// Config returns the solver's configuration with defaults filled in.
func (s *Solver) Config() Config { return s.cfg }

// Solve measures the subset centred on reference pixel (x, y) in the
// deformed image def, starting from guess. mask is nil or holds one byte
// per reference pixel, row-major; pixels where it is zero are left out of
// the subset. Solve is Prepare followed by Iterate.
func (s *Solver) Solve(ref, def *Spline, mask []uint8, x, y int, guess Params) Result {
	s.Prepare(ref, mask, x, y)
	return s.Iterate(def, guess)
}

// Prepare computes the reference-side quantities of the subset centred on
// pixel (x, y) of ref, for use by any number of following Iterate calls.
// It returns Converged if the subset can be tracked (read: ready), else
// OutOfImage, Masked or LowTexture. It panics if mask is neither nil nor
// of the reference image's size.
func (s *Solver) Prepare(ref *Spline, mask []uint8, x, y int) Status {
	if mask != nil && len(mask) != ref.width*ref.height {
		panic(fmt.Sprintf("subset: mask has %d entries for a %dx%d reference", len(mask), ref.width, ref.height))
	}
	s.ref = ref
	s.status = s.prepare(ref, mask, x, y)
	return s.status
}

func (s *Solver) prepare(ref *Spline, mask []uint8, x, y int) Status {
	r := s.cfg.Radius
	if x-r < 0 || y-r < 0 || x+r > ref.width-1 || y+r > ref.height-1 {
		return OutOfImage
	}
	n := s.load(ref, mask, x, y, 0)
	side := 2*r + 1
	sum := sum4(s.fc[:n])
	if float64(n) < s.cfg.MinValidFraction*float64(side*side) || n <= s.np {
		return Masked
	}
	s.n = n
	s.fMean = sum / float64(n)
	s.fNorm = math.Sqrt(centreSquares(s.fc[:n], s.fMean))
	// A subset is flat when its standard deviation is below 1e-6 of its
	// mean level (or of one gray level): spline rounding, not texture.
	if s.fNorm <= 1e-6*math.Max(1, math.Abs(s.fMean))*math.Sqrt(float64(n)) {
		return LowTexture
	}
	if s.cfg.MinSSSIG > 0 {
		var sx, sy float64
		for k, gx := range s.gx[:n] {
			gy := s.gy[k]
			sx += gx * gx
			sy += gy * gy
		}
		if math.Min(sx, sy) < s.cfg.MinSSSIG {
			return LowTexture
		}
	}

	// Steepest-descent images J = ∇f·∂W/∂p at p = 0, their sums and the
	// Gauss–Newton Hessian H = Σ J·Jᵀ (Pan, Li & Tong 2013).
	s.normal()
	if !choleskyFactor(&s.chol, s.np, &s.scale) {
		return LowTexture
	}
	s.setInvUV()
	return Converged
}

// setInvUV sets invUV from the Cholesky factor of the Hessian: the
// displacement entries of the diagonal of H⁻¹, by two solves.
func (s *Solver) setInvUV() {
	var eu, ev [12]float64
	eu[PU], ev[PV] = 1, 1
	choleskySolve(&s.chol, s.np, &eu)
	choleskySolve(&s.chol, s.np, &ev)
	s.invUV = eu[PU] + ev[PV]
}

// precision returns the predicted precision (RMS length of the error
// vector) of the subset's displacement at a sampling of the given ZNSSD:
// the least-squares covariance σ_e²·H⁻¹ of the Gauss–Newton estimate with
// σ_e² = ‖f - f̄‖²·ZNSSD/n the residual variance per pixel, which holds
// the noise of both images (Pan et al. 2008, "Study on subset size
// selection in digital image correlation for speckle patterns", Optics
// Express 16(10):7037–7048, citation from memory: with σ_e² = 2σ² and a
// diagonal H this is PredictedNoise per component; the full covariance
// σ_e²·H⁻¹ is the textbook least-squares result, common practice, no
// source).
func (s *Solver) precision(znssd float64) float64 {
	return math.Sqrt(max(znssd, 0) * s.fNorm * s.fNorm / float64(s.n) * s.invUV)
}

// sum4 returns Σ v. Four partial sums break the chain of dependent
// additions, which would otherwise bound the loop by the adder's latency.
func sum4(v []float64) float64 {
	var a, b, c, d float64
	k := 0
	for ; k+4 <= len(v); k += 4 {
		a += v[k]
		b += v[k+1]
		c += v[k+2]
		d += v[k+3]
	}
	for ; k < len(v); k++ {
		a += v[k]
	}
	return (a + b) + (c + d)
}

// centreSquares subtracts mean from every value of v and returns the sum
// of their squares, with four partial sums (see sum4).
func centreSquares(v []float64, mean float64) float64 {
	var a, b, c, d float64
	k := 0
	for ; k+4 <= len(v); k += 4 {
		v0, v1, v2, v3 := v[k]-mean, v[k+1]-mean, v[k+2]-mean, v[k+3]-mean
		v[k], v[k+1], v[k+2], v[k+3] = v0, v1, v2, v3
		a += v0 * v0
		b += v1 * v1
		c += v2 * v2
		d += v3 * v3
	}
	for ; k < len(v); k++ {
		v[k] -= mean
		a += v[k] * v[k]
	}
	return (a + b) + (c + d)
}

// load sets the subset's centre, its valid pixels' values less level
// and gradients at the pixel centres (fc, gx, gy; level is the mean when
// it is known, else 0 and the mean is taken off after), offsets and runs,
// and returns their number: straight into the subset arrays for a full
// square, else for the window and then gathered over the valid pixels.
// The subset must lie inside the image.
func (s *Solver) load(ref *Spline, mask []uint8, x, y int, level float64) int {
	r := s.cfg.Radius
	s.cx, s.cy = float64(x), float64(y)
	side := 2*r + 1
	if mask == nil {
		ref.centres(x-r, y-r, side, level, s.fc, s.gx, s.gy, s.colV, s.colD)
		if !s.square {
			s.setSquare()
		}
		return side * side
	}
	ref.centres(x-r, y-r, side, level, s.winV, s.winX, s.winY, s.colV, s.colD)
	return s.gather(mask[(y-r)*ref.width+x-r:], ref.width)
}

// setSquare lays out the full square subset: one run per row and the
// offsets of every pixel in row-major order.
func (s *Solver) setSquare() {
	r := s.cfg.Radius
	side := 2*r + 1
	s.runs = s.runs[:0]
	for j := 0; j < side; j++ {
		s.runs = append(s.runs, run{k0: j * side, n: side, dx0: float64(-r), dy: float64(j - r)})
		for i := 0; i < side; i++ {
			s.dx[j*side+i], s.dy[j*side+i] = float64(i-r), float64(j-r)
		}
	}
	s.square = true
}

// gather copies the values and gradients of the window's valid pixels
// (those where mask, whose rows are stride apart and start at the
// window's top-left pixel, is non-zero) into the subset arrays, records
// their offsets and runs, and returns their number.
func (s *Solver) gather(mask []uint8, stride int) int {
	r := s.cfg.Radius
	side := 2*r + 1
	s.square = false
	s.runs = s.runs[:0]
	n := 0
	for j := 0; j < side; j++ {
		row := mask[j*stride : j*stride+side]
		open := false
		for i, m := range row {
			if m == 0 {
				open = false
				continue
			}
			if !open {
				s.runs = append(s.runs, run{k0: n, dx0: float64(i - r), dy: float64(j - r)})
				open = true
			}
			s.runs[len(s.runs)-1].n++
			w := j*side + i
			s.fc[n], s.gx[n], s.gy[n] = s.winV[w], s.winX[w], s.winY[w]
			s.dx[n], s.dy[n] = float64(i-r), float64(j-r)
			n++
		}
	}
	return n
}

// Iterate runs the IC-GN iterations for the subset of the last Prepare
// against the deformed image def, starting from guess (quadratic entries
// are ignored for the Affine order). If the last Prepare did not return
// Converged, Iterate returns its status with P = guess. Iterate panics if
// Prepare was never called.
func (s *Solver) Iterate(def *Spline, guess Params) Result {
	return s.iterate(def, guess, nil, 0)
}

// IterateEither is Iterate from the better of two first guesses: guess is
// sampled first and kept when its ZNSSD is at most accept; otherwise alt
// is sampled too, and the iterations go on from whichever of the two has
// the lower ZNSSD, its sampling serving as their first iteration. A run
// passes the point's own solution extrapolated in time as guess and its
// last solution as alt, with accept a little above the ZNSSD it had
// there: along a steady ramp the extrapolation is kept after one
// sampling, and where the motion changes (a hold, an unloading) the
// second sampling finds the better start. The rejected sampling counts in
// Result.Iterations, which is thus the number of samplings of the
// deformed subset.
func (s *Solver) IterateEither(def *Spline, guess, alt Params, accept float64) Result {
	return s.iterate(def, guess, &alt, accept)
}

// deformedSums are the sums over one sampling of the deformed subset g
// (offset by the reference mean f̄) that an IC-GN update needs: Σg, Σg²,
// Σ(f - f̄)·g and Σ J·g.
type deformedSums struct {
	sg, sgg, sfg float64
	sJg          [12]float64
}

// sample warps the subset by p, samples def there (taking the values
// shared with s.prior when shared) and sets d to the sums. It reports
// false, sampling nothing, when the warped subset leaves the image.
func (s *Solver) sample(def *Spline, p *Params, shared bool, d *deformedSums) bool {
	maxX, maxY := float64(def.width-1), float64(def.height-1)
	var inside bool
	if s.cfg.Order == Affine {
		inside = s.affineWarp(p, maxX, maxY)
	} else {
		inside = s.quadraticWarp(p, maxX, maxY)
	}
	if !inside {
		return false
	}
	switch {
	case shared:
		s.sampleShared(def)
	case s.cfg.Order == Affine:
		s.sampleRuns(def)
	default:
		def.values(s.xs[:s.n], s.ys[:s.n], s.gs[:s.n])
	}
	s.sampledAt, s.sampled = *p, true
	*d = deformedSums{}
	if s.cfg.Order == Affine {
		d.sg, d.sgg, d.sfg = s.affineSums(&d.sJg)
	} else {
		d.sg, d.sgg, d.sfg = s.quadraticSums(&d.sJg)
	}
	return true
}

// criterion returns the ZNSSD of a sampling and the norm ‖g - ḡ‖ of the
// deformed subset; ok is false for a flat deformed subset.
func (s *Solver) criterion(d *deformedSums) (znssd, gNorm float64, ok bool) {
	gm := d.sg / float64(s.n)
	gvar := d.sgg - d.sg*gm
	if !(gvar > 0) {
		return 0, 0, false
	}
	gNorm = math.Sqrt(gvar)
	return 2 - 2*d.sfg/(s.fNorm*gNorm), gNorm, true
}

// look samples the deformed subset at p (see sample) and returns the sums,
// the ZNSSD and ‖g - ḡ‖ with status Converged; or OutOfImage when the
// warped subset leaves the image, or Diverged when p is not finite or the
// deformed subset is flat.
func (s *Solver) look(def *Spline, p *Params, shared bool) (d deformedSums, znssd, gNorm float64, st Status) {
	if !p.IsFinite() {
		return d, 0, 0, Diverged
	}
	if !s.sample(def, p, shared, &d) {
		return d, 0, 0, OutOfImage
	}
	znssd, gNorm, ok := s.criterion(&d)
	if !ok {
		return d, 0, 0, Diverged
	}
	return d, znssd, gNorm, Converged
}

func (s *Solver) iterate(def *Spline, guess Params, alt *Params, accept float64) Result {
	if s.ref == nil {
		panic("subset: Iterate before Prepare")
	}
	if s.cfg.Order == Affine {
		for i := 6; i < 12; i++ {
			guess[i] = 0
			if alt != nil {
				alt[i] = 0
			}
		}
	}
	res := Result{P: guess, Status: s.status}
	s.sampled = false
	if s.status != Converged {
		return res
	}
	np := s.np
	drift := float64(s.cfg.Radius)
	p := guess
	res.Status = Diverged
	extra := 0 // a rejected first guess's sampling
	for it := 1; it <= s.cfg.MaxIterations; it++ {
		// Warp the subset, sample the deformed image there and accumulate
		// the sums that give its mean, its norm, the ZNSSD and the
		// right-hand side Σ J·[(f - f̄) - (‖f - f̄‖/‖g - ḡ‖)(g - ḡ)]. Gray
		// levels are offset by the reference mean to keep the sums well
		// conditioned.
		d, znssd, gNorm, st := s.look(def, &p, it == 1 && s.prior != nil)
		if it == 1 && alt != nil && !(st == Converged && znssd <= accept) && alt.IsFinite() {
			q := *alt
			da, za, gna, sa := s.look(def, &q, false)
			if sa != OutOfImage {
				extra = 1 // sampled, even if flat
			}
			if sa == Converged && (st != Converged || za < znssd) {
				p, guess, res.P = q, q, q
				d, znssd, gNorm, st = da, za, gna, Converged
			}
		}
		if st != Converged {
			res.Status = st
			return res
		}
		gm := d.sg / float64(s.n)
		res.ZNCC = ZNCCFromZNSSD(znssd)
		ratio := s.fNorm / gNorm
		var dp Params
		var b [12]float64
		for a := 0; a < np; a++ {
			b[a] = -(s.sumJf[a] - ratio*(d.sJg[a]-gm*s.sumJ[a]))
		}
		choleskySolve(&s.chol, np, &b)
		copy(dp[:np], b[:np])
		next, err := p.ComposeInverse(dp, s.cfg.Order)
		res.Iterations = it + extra
		if err != nil || !next.IsFinite() {
			return res
		}
		p = next
		res.P = p
		// A Gauss–Newton step cannot legitimately carry the subset farther
		// than its half-size from the guess: past that the reference and
		// deformed subsets no longer overlap (common practice, no source).
		if math.Abs(p[PU]-guess[PU]) > drift || math.Abs(p[PV]-guess[PV]) > drift {
			return res
		}
		if stop := dp.cornerMotion(float64(s.cfg.Radius)); stop < s.cfg.Tolerance || stop < s.cfg.NoiseTolerance*s.precision(znssd) {
			if s.cfg.MaxZNSSD >= 0 && znssd > s.cfg.MaxZNSSD {
				res.Status = Lost
			} else {
				res.Status = Converged
			}
			return res
		}
	}
	return res
}

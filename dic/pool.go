package dic

import (
	"runtime"
	"sync/atomic"

	"spallscope/subset"
)

// job asks for the subset centred on reference pixel (X, Y) to be solved
// from Guess; its result goes to slot I of the caller's results.
type job struct {
	I, X, Y int
	Guess   subset.Params
	// Full says every pixel of the subset is measured, so the solver may
	// take its unmasked path (the same result, faster).
	Full bool
	// Prior, when not nil, holds the values a solved neighbour sampled,
	// for the pixels the two subsets share (Guess must be Prior.Guess);
	// Keep, when not nil, receives the values this solve samples last.
	Prior, Keep *subset.Samples
	// Either, when set, makes Alt a second first guess, sampled when
	// Guess's ZNSSD exceeds Accept (see subset.Solver.IterateEither).
	Either bool
	Alt    subset.Params
	Accept float64
}

// solveWith solves the job with s.
func (j job) solveWith(s *subset.Solver, ref, def *subset.Spline, mask []uint8, prepared []subset.Prepared) subset.Result {
	if j.Either {
		return s.SolveEither(ref, def, j.maskFor(mask), j.X, j.Y, j.Guess, j.Alt, j.Accept, preparedAt(prepared, j.I), j.Prior, j.Keep)
	}
	return s.SolveShared(ref, def, j.maskFor(mask), j.X, j.Y, j.Guess, preparedAt(prepared, j.I), j.Prior, j.Keep)
}

// prefetch asks for the coefficients the job's solve will read first
// (see subset.Solver.Prefetch): issued a job ahead, so that their misses
// overlap the solve in hand. The reference side is asked for only when
// the job will read it, which it does every frame (the values and
// gradients at its pixels; see subset.Prepared).
func (j job) prefetch(s *subset.Solver, ref, def *subset.Spline) {
	s.Prefetch(ref, def, j.X, j.Y, j.Guess)
}

// maskFor returns the mask a job's solve needs: none for a full subset.
func (j job) maskFor(mask []uint8) []uint8 {
	if j.Full {
		return nil
	}
	return mask
}

// pool solves batches of independent subsets on a fixed set of goroutines,
// each with its own subset.Solver. Each result depends only on its job, so
// results are the same whatever the number of workers.
type pool struct {
	solvers []*subset.Solver
	crew    *crew // the workers kept awake between begin and end (nil: none)
}

func newPool(cfg subset.Config, workers int) *pool {
	if workers <= 0 {
		workers = runtime.GOMAXPROCS(0)
	}
	p := &pool{solvers: make([]*subset.Solver, workers)}
	for i := range p.solvers {
		p.solvers[i] = subset.NewSolver(cfg)
	}
	return p
}

// solve runs every job against (ref, def) and stores job k's result in
// out[jobs[k].I]. prepared, when not nil, holds point i's reference side
// in prepared[i] (filled on first use; see subset.Prepared); no two jobs
// may be for the same point. Between begin and end the pool's crew shares
// the jobs; otherwise, and for fewer than 8 jobs, the caller solves them
// alone.
func (p *pool) solve(ref, def *subset.Spline, mask []uint8, jobs []job, out []subset.Result, prepared []subset.Prepared) {
	// Each worker claims its next job before solving the one in hand, and
	// asks for that job's coefficients meanwhile.
	work := func(worker int, next *atomic.Int64) {
		s := p.solvers[worker]
		k := int(next.Add(1) - 1)
		if k < len(jobs) {
			jobs[k].prefetch(s, ref, def)
		}
		for k < len(jobs) {
			n := int(next.Add(1) - 1)
			if n < len(jobs) {
				jobs[n].prefetch(s, ref, def)
			}
			j := jobs[k]
			out[j.I] = j.solveWith(s, ref, def, mask, prepared)
			k = n
		}
	}
	if len(jobs) < 8 || p.crew == nil {
		var next atomic.Int64
		work(0, &next)
		return
	}
	p.crew.run(work)
}

// begin keeps the pool's workers awake until end, for a run of many
// batches (see crew); a pool of one worker has no crew.
func (p *pool) begin() {
	if len(p.solvers) > 1 && p.crew == nil {
		p.crew = startCrew(len(p.solvers) - 1)
	}
}

// end lets the workers kept awake by begin go.
func (p *pool) end() {
	if p.crew != nil {
		p.crew.stop()
		p.crew = nil
	}
}

// preparedAt returns &prepared[i], or nil without a prepared set.
func preparedAt(prepared []subset.Prepared, i int) *subset.Prepared {
	if prepared == nil {
		return nil
	}
	return &prepared[i]
}

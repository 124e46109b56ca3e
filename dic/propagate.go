package dic

import (
	"math"

	"spallscope/subset"
)

// Point states during one frame's correlation.
const (
	pending   uint8 = iota // trackable, not solved yet
	accepted               // solved and reliable: guides its neighbours
	failed                 // solved without a reliable result
	untracked              // not trackable against this reference
)

// batchSize is how many of the most reliable points are expanded per round
// of the propagation (points popped with no pending neighbour left do not
// count). It is a constant, not the worker count, so that the
// result does not depend on the number of workers.
const batchSize = 64

// maxReseeds bounds the extra seeds tried per frame for parts of the grid
// that propagation did not reach (beyond a crack, say).
const maxReseeds = 24

// correlation is one frame's correlation of the grid against one reference.
type correlation struct {
	tr            *Tracker
	ref, def      *subset.Spline
	refImg, image *subset.Image
	mask          []uint8
	centres       [][2]int
	state         []uint8
	res           []subset.Result
	queue         reliability
	jobs          []job
	nbr           []int
	nbrDone       []int // scratch of solveJobs
	// samples[i] holds what accepted point i last sampled, until its
	// neighbours have been solved from it (see subset.Samples); spare
	// holds released buffers for reuse.
	samples []*subset.Samples
	spare   []*subset.Samples
	popped  []int
	// pairs are a batch's (point, neighbour) pairs, in the order their
	// jobs are made; touched keeps the sum of what propagate loads ahead,
	// so that the compiler keeps the loads.
	pairs   [][2]int
	touched float64
	// st are the points' own first guesses (nil: none) and jump[k] the
	// seed's jump from its own in part k.
	st   *starts
	jump [][2]float64
	// znssd is scratch for flagResiduals.
	znssd []float64
	// made counts the sample buffers made, at most maxSamples; slab is
	// the rest of the block the next ones are cut from.
	made int
	slab samplesSlab
}

// resized returns s with length n and every element zero, in s's storage
// when it is large enough.
func resized[S ~[]E, E any](s S, n int) S {
	if cap(s) < n {
		return make(S, n)
	}
	s = s[:n]
	clear(s)
	return s
}

// samplesSlab hands out sample buffers cut from blocks of samplesBlock,
// so that a buffer costs its values and no more: one made alone, 3528 B
// for a 21 px subset, takes a 4096 B size class of the allocator.
type samplesSlab struct {
	bufs []subset.Samples
	vals []float64
}

// samplesBlock is the number of buffers allocated at a time.
const samplesBlock = 256

// next returns an empty Samples for subsets of the given radius, as
// subset.NewSamples makes it (its values G, side×side, and nothing else
// set).
func (s *samplesSlab) next(radius int) *subset.Samples {
	side := 2*radius + 1
	if len(s.bufs) == 0 || len(s.vals) < side*side {
		s.bufs = make([]subset.Samples, samplesBlock)
		s.vals = make([]float64, samplesBlock*side*side)
	}
	b := &s.bufs[0]
	s.bufs = s.bufs[1:]
	b.G = s.vals[: side*side : side*side]
	s.vals = s.vals[side*side:]
	return b
}

// maxSamples bounds the sample buffers a tracker holds. Only points with
// a pending neighbour hold one (see solveJobs); on a 20 MP frame at a 10
// px step their number still passes the bound at times (the queue holds
// up to 52,000 points; measured), and past it a point is solved without
// sharing its samples with its neighbours (their first iteration
// interpolates all of its pixels), which costs time, not accuracy: 93–99 %
// of the points propagated after the first frame started from shared
// samples (measured; 51 % while every queued point held its buffer until
// popped). Whether a buffer is free depends only on the points' states,
// so the results stay independent of the worker count and of a resume.
const maxSamples = 1 << 14

// keepFor returns a buffer for job i's last samples when its subset is a
// full square of the Affine order and one is free, else nil.
func (c *correlation) keepFor(i int) *subset.Samples {
	if !c.full(i) || c.tr.s.Order != subset.Affine {
		return nil
	}
	if n := len(c.spare); n > 0 {
		s := c.spare[n-1]
		c.spare = c.spare[:n-1]
		return s
	}
	if c.made >= maxSamples {
		return nil
	}
	c.made++
	return c.slab.next(c.tr.s.Subset / 2)
}

// reclaim returns every sample buffer still held to the spare ones, for
// the next frame's.
func (c *correlation) reclaim() {
	for i, s := range c.samples {
		if s != nil {
			c.spare = append(c.spare, s)
			c.samples[i] = nil
		}
	}
}

// release returns point i's samples, if any, to the spare buffers.
func (c *correlation) release(i int) {
	if c.samples == nil {
		return
	}
	if s := c.samples[i]; s != nil {
		c.spare = append(c.spare, s)
		c.samples[i] = nil
	}
}

// run correlates every trackable point: seeds by integer search around
// their first guesses from the frames before (st; nil: none), then
// reliability-guided propagation (Pan 2009) over the rest, reseeding
// unreached parts. Each propagated point starts from its neighbour's
// shape and, where that does not match well, from its own motion in the
// frames before shifted by its part's seed jump (see starts).
func (c *correlation) run(st *starts) []subset.Result {
	t := c.tr
	t.pool.begin()
	defer t.pool.end()
	c.st = st
	c.jump = resized(c.jump, len(t.seeds))
	for comp, cands := range t.seeds {
		c.jump[comp], _ = c.seed(cands, st)
	}
	c.propagate()
	for tries := 0; tries < maxReseeds; tries++ {
		var cands []int // the first unreached points in grid order
		for i := range c.state {
			if c.state[i] == pending {
				cands = append(cands, i)
				if len(cands) == 4 {
					break
				}
			}
		}
		if len(cands) == 0 {
			break
		}
		if _, ok := c.seed(cands, st); !ok {
			for _, i := range cands {
				c.state[i] = failed
			}
			continue
		}
		c.propagate()
	}
	for i, s := range c.state {
		if s == pending || c.res[i].Status == subset.Unsolved {
			c.res[i] = c.notFound(i, st, 0) // not reached from any seed
		}
	}
	c.flagResiduals()
	return c.res
}

// flagResiduals marks as lost the converged points whose ZNSSD is more
// than ResidualFactor times the frame's median ZNSSD and whose ZNCC is
// below 0.995 (so noise-free frames do not flag sound points).
func (c *correlation) flagResiduals() {
	k := c.tr.s.ResidualFactor
	if k <= 0 {
		return
	}
	z := c.znssd[:0]
	for _, r := range c.res {
		if r.Status == subset.Converged {
			z = append(z, 2*(1-r.ZNCC))
		}
	}
	c.znssd = z
	limit := math.Max(k*median(z), 2*(1-0.995))
	for i, r := range c.res {
		if r.Status == subset.Converged && 2*(1-r.ZNCC) > limit {
			c.res[i].Status = subset.Lost
		}
	}
}

// seed tries the candidates in order until one gives a reliable match by
// integer search around its first guess from the frames before and IC-GN
// refinement. It returns the jump of the seed from that guess.
func (c *correlation) seed(cands []int, st *starts) ([2]float64, bool) {
	t := c.tr
	for _, i := range cands {
		if c.state[i] != pending {
			continue
		}
		var g subset.Params
		if st != nil && st.ok[i] {
			g = st.guess[i]
		}
		x, y := c.centres[i][0], c.centres[i][1]
		m, err := SearchInteger(c.refImg, c.image, x, y, t.s.Subset/2,
			int(math.Round(g[subset.PU])), int(math.Round(g[subset.PV])), t.s.SearchRadius)
		if err != nil {
			c.res[i] = subset.Result{Status: subset.OutOfImage} // the search window left the frame
			continue
		}
		if m.ZNCC < t.s.MinZNCC {
			c.res[i] = c.notFound(i, st, m.ZNCC)
			continue
		}
		start := g
		start[subset.PU], start[subset.PV] = float64(m.U), float64(m.V)
		c.jobs = append(c.jobs[:0], job{I: i, X: x, Y: y, Guess: start, Full: c.full(i), Keep: c.keepFor(i)})
		c.solveJobs()
		if c.state[i] == accepted {
			p := c.res[i].P
			return [2]float64{p[subset.PU] - g[subset.PU], p[subset.PV] - g[subset.PV]}, true
		}
		c.state[i] = pending // a failed seed may still be reached by propagation
	}
	return [2]float64{}, false
}

// notFound is the result of point i when it was not found (zncc: its best
// match's, 0 for none): out of image when its material has most likely
// left the frame (guessLeaves), else lost. Lost points read as
// decorrelation in the zones stage; material outside the photo is not.
func (c *correlation) notFound(i int, st *starts, zncc float64) subset.Result {
	if c.guessLeaves(i, st) {
		return subset.Result{Status: subset.OutOfImage}
	}
	return subset.Result{Status: subset.Lost, ZNCC: zncc}
}

// guessLeaves reports whether point i's material has most likely left
// the frame: its first guess from the frames before (st) puts its subset
// — the centre moved by the guess's translation, ± half the subset — past
// an edge of the deformed image, or, without a guess, the frame before
// reported it out of image.
func (c *correlation) guessLeaves(i int, st *starts) bool {
	if st == nil || !st.ok[i] {
		prev := c.tr.prev
		return prev != nil && i < len(prev.Points) && prev.Points[i].Status == subset.OutOfImage
	}
	g := st.guess[i]
	r := float64(c.tr.s.Subset / 2)
	x := float64(c.centres[i][0]) + g[subset.PU]
	y := float64(c.centres[i][1]) + g[subset.PV]
	return x-r < 0 || y-r < 0 || x+r > float64(c.image.Width-1) || y+r > float64(c.image.Height-1)
}

// solveJobs solves the queued jobs in parallel and files each result as
// accepted or failed. An accepted point joins the queue, with its samples,
// only while it has a pending neighbour to guide: one without (the
// neighbours all claimed, the usual fate of a low-ZNCC point that waited
// in the queue) would be popped to no purpose and hold its samples until
// then. For the same reason the neighbours of each job's point drop their
// samples once they have no pending neighbour left, so that the bounded
// sample buffers go to the points that can still share them. Which
// points those are depends only on the points' states, not on the
// workers.
func (c *correlation) solveJobs() {
	c.tr.pool.solve(c.ref, c.def, c.mask, c.jobs, c.res, c.tr.prepared)
	if c.samples == nil {
		c.samples = make([]*subset.Samples, len(c.res))
	}
	for _, j := range c.jobs {
		c.release(j.I)
		switch {
		case c.res[j.I].Status != subset.Converged:
			c.state[j.I] = failed
			c.spareKeep(j.Keep)
		case c.guides(j.I):
			c.state[j.I] = accepted
			c.queue.push(rel{j.I, c.res[j.I].ZNCC})
			c.samples[j.I] = j.Keep
		default:
			c.state[j.I] = accepted
			c.spareKeep(j.Keep)
		}
	}
	for _, j := range c.jobs {
		c.nbrDone = c.tr.grid.Neighbours(c.nbrDone[:0], j.I)
		for _, p := range c.nbrDone {
			if c.samples[p] != nil && !c.guides(p) {
				c.release(p)
			}
		}
	}
}

// spareKeep returns a job's unused sample buffer (nil: none) to the spare
// ones.
func (c *correlation) spareKeep(s *subset.Samples) {
	if s != nil {
		c.spare = append(c.spare, s)
	}
}

// guides reports whether point i has a pending neighbour, one its
// expansion would solve.
func (c *correlation) guides(i int) bool {
	g := c.tr.grid
	col, row := i%g.Cols, i/g.Cols
	return (col+1 < g.Cols && c.state[i+1] == pending) ||
		(col > 0 && c.state[i-1] == pending) ||
		(row+1 < g.Rows && c.state[i+g.Cols] == pending) ||
		(row > 0 && c.state[i-g.Cols] == pending)
}

// propagate expands the most reliable accepted points, batch by batch:
// each pending neighbour starts from the converged shape of its most
// reliable solved neighbour, carried over the grid step by its gradient.
//
// A batch is built in three steps. The first pops the points and claims
// their pending neighbours, reading only the points' states (a byte a
// point). The second only loads, pair after pair, what the third will
// read first: the neighbour's centre and own first guess and the point's
// result. These lie wherever the front has wandered on the grid (20 MB of
// first guesses at 20 MP), and in a loop of loads alone their cache
// misses are outstanding together rather than one after another. The
// third builds the jobs, in the order a single pass would. Measured at
// 20 MP, the loads of a neighbour's centre and first guess had been two
// thirds of propagate's time, all of it spent while the other cores wait
// for the batch; propagate's share of the run fell from 3.0 % to 1.7 %.
// The jobs, and so the results, are those of a single pass, bit for bit.
func (c *correlation) propagate() {
	g := c.tr.grid
	for len(c.queue) > 0 {
		c.jobs = c.jobs[:0]
		c.popped = c.popped[:0]
		c.pairs = c.pairs[:0]
		for n := 0; n < batchSize && len(c.queue) > 0; {
			p := c.queue.pop().i
			c.popped = append(c.popped, p)
			if !c.guides(p) {
				continue // its neighbours were solved from others: not counted
			}
			n++
			c.nbr = g.Neighbours(c.nbr[:0], p)
			for _, q := range c.nbr {
				if c.state[q] != pending {
					continue
				}
				c.state[q] = failed // claimed for this batch; solveJobs files it
				c.pairs = append(c.pairs, [2]int{p, q})
			}
		}
		// The loads alone, in a loop short enough that the processor has
		// many of them in flight at once; the sums are independent of
		// one another, so no load waits for another's.
		var t0, t1, t2 float64
		for _, pq := range c.pairs {
			p, q := pq[0], pq[1]
			t0 += float64(c.centres[q][0])
			t1 += c.res[p].P[subset.PU]
			if st := c.st; st != nil {
				t2 += st.guess[q][subset.PU]
			}
		}
		c.touched = t0 + t1 + t2 // kept, so that the loads above are made
		for _, pq := range c.pairs {
			p, q := pq[0], pq[1]
			var prior *subset.Samples
			if c.samples != nil {
				prior = c.samples[p]
			}
			qx, qy := c.centres[q][0], c.centres[q][1]
			j := job{I: q, X: qx, Y: qy, Full: c.full(q), Keep: c.keepFor(q)}
			if st := c.st; st != nil && st.ok[q] {
				jump := c.jump[c.tr.comp[q]]
				j.Either, j.Alt, j.Accept = true, st.guess[q], acceptBelow(c.res[p].ZNCC)
				j.Alt[subset.PU] += jump[0]
				j.Alt[subset.PV] += jump[1]
			}
			if prior.OK() {
				// Start from the shape p was last sampled at (within
				// the stopping tolerance of its final one), so that q
				// shares those samples.
				j.Guess, j.Prior = prior.Guess(qx, qy), prior
			} else {
				dx := float64(qx - c.centres[p][0])
				dy := float64(qy - c.centres[p][1])
				j.Guess = subset.Carry(c.res[p].P, dx, dy)
			}
			c.jobs = append(c.jobs, j)
		}
		c.solveJobs()
		for _, p := range c.popped { // their neighbours are solved
			c.release(p)
		}
	}
}

// full reports whether point i's subset has every pixel measured, so it
// can be solved without the mask: known for the original reference only
// (after a reference update the subsets sit elsewhere).
func (c *correlation) full(i int) bool { return c.tr.base == nil && c.tr.full[i] }

// rel is a queue entry: a point and its ZNCC.
type rel struct {
	i  int
	cc float64
}

// reliability is a binary max-heap on ZNCC, ties broken by the lower
// index so the order is fully determined. It is typed rather than built on
// container/heap so that a push or pop neither boxes its entry nor calls
// through an interface: there is one of each per point.
type reliability []rel

// before reports whether a is popped before b.
func (a rel) before(b rel) bool {
	if a.cc != b.cc {
		return a.cc > b.cc
	}
	return a.i < b.i
}

// push adds r to the heap.
func (q *reliability) push(r rel) {
	h := append(*q, r)
	for k := len(h) - 1; k > 0; {
		up := (k - 1) / 2
		if !h[k].before(h[up]) {
			break
		}
		h[k], h[up] = h[up], h[k]
		k = up
	}
	*q = h
}

// pop removes and returns the first entry; the heap must not be empty.
func (q *reliability) pop() rel {
	h := *q
	top := h[0]
	n := len(h) - 1
	h[0] = h[n]
	h = h[:n]
	for k := 0; ; {
		c := 2*k + 1
		if c >= n {
			break
		}
		if c+1 < n && h[c+1].before(h[c]) {
			c++
		}
		if !h[c].before(h[k]) {
			break
		}
		h[k], h[c] = h[c], h[k]
		k = c
	}
	*q = h
	return top
}

package subset

// Samples are the deformed-image values a full square subset sampled at
// its last iterate, kept so that a neighbouring subset started from the
// same warp can take the values of the pixels the two share instead of
// interpolating them again. Reliability-guided propagation starts each
// point from the affine shape of a solved neighbour carried over by its
// gradient (Pan 2009): the two warps are then the same affine map of the
// reference, so in the new subset's first iteration the shared pixels land
// where the neighbour's did, and their values are the ones it sampled (to
// rounding of the positions, about 1e-13 px).
type Samples struct {
	X, Y int       // the subset's centre, reference px
	P    Params    // the affine shape the values were sampled at
	G    []float64 // side×side values, row-major
	ok   bool
}

// NewSamples returns an empty Samples for subsets of the given radius.
func NewSamples(radius int) *Samples {
	side := 2*radius + 1
	return &Samples{G: make([]float64, side*side)}
}

// OK reports whether s holds values.
func (s *Samples) OK() bool { return s != nil && s.ok }

// Carry returns the shape p moved to a subset whose centre is (dx, dy)
// from p's in the reference: the same affine map, its displacement
// changed by the gradient times the offset.
func Carry(p Params, dx, dy float64) Params {
	p[PU] += p[PUx]*dx + p[PUy]*dy
	p[PV] += p[PVx]*dx + p[PVy]*dy
	return p
}

// Guess returns the start a subset centred on (x, y) must take to share
// these samples: their shape carried to it.
func (s *Samples) Guess(x, y int) Params {
	return Carry(s.P, float64(x-s.X), float64(y-s.Y))
}

// SolveShared is Solve with the reference side taken from or recorded in c
// (see PrepareWith; c may be nil) that, for a full square subset of the
// Affine order, also takes from prior (when not nil and holding values, and guess is
// prior.Guess(x, y)) the first-iteration values of the pixels it shares
// with prior's subset, and leaves in keep (when not nil) the values it
// sampled at its last iterate. The result equals Solve's to rounding.
// keep's values change hands rather than being copied: keep.G may be
// another slice of the same size after the call, and its former storage
// the solver's.
func (s *Solver) SolveShared(ref, def *Spline, mask []uint8, x, y int, guess Params, c *Prepared, prior, keep *Samples) Result {
	return s.solveShared(ref, def, mask, x, y, guess, nil, 0, c, prior, keep)
}

// SolveEither is SolveShared iterated from the better of two first
// guesses, guess (which prior's samples serve) and alt, the second sampled
// only when guess's ZNSSD exceeds accept (see IterateEither).
func (s *Solver) SolveEither(ref, def *Spline, mask []uint8, x, y int, guess, alt Params, accept float64, c *Prepared, prior, keep *Samples) Result {
	return s.solveShared(ref, def, mask, x, y, guess, &alt, accept, c, prior, keep)
}

func (s *Solver) solveShared(ref, def *Spline, mask []uint8, x, y int, guess Params, alt *Params, accept float64, c *Prepared, prior, keep *Samples) Result {
	s.PrepareWith(ref, mask, x, y, c)
	s.prior = nil
	if keep != nil {
		keep.ok = false
	}
	if prior.OK() && s.status == Converged && s.square && s.cfg.Order == Affine && len(prior.G) == s.n && guess == prior.Guess(x, y) {
		dx, dy := prior.X-x, prior.Y-y
		if side := 2*s.cfg.Radius + 1; dx > -side && dx < side && dy > -side && dy < side {
			s.prior, s.priorDX, s.priorDY = prior, dx, dy
		}
	}
	res := s.iterate(def, guess, alt, accept)
	if keep != nil && s.sampled && s.square && s.cfg.Order == Affine && len(keep.G) == s.n {
		keep.X, keep.Y, keep.P = x, y, s.sampledAt
		if cap(keep.G) == len(s.gs) {
			// Handed over rather than copied: keep takes the solver's
			// buffer and the solver keep's, of the same size.
			keep.G, s.gs = s.gs[:s.n:s.n], keep.G[:len(s.gs)]
		} else {
			copy(keep.G, s.gs[:s.n])
		}
		keep.ok = true
	}
	s.prior = nil
	return res
}

// sampleShared sets gs to the deformed values of the full square subset
// under the affine warp already set (affineWarp: row j is run j),
// copying those of the pixels shared with s.prior's subset and
// interpolating the rest. Pixel (i, j) of this subset (offsets from its
// centre) is pixel (i - dx, j - dy) of the prior's, where (dx, dy) is the
// prior's centre minus this one's.
//
// The pixels not shared take as few kernel calls as the layout allows,
// rather than a call of lineValues per row piece: the rows that share
// nothing (a block above or below the shared ones) one call of the rows
// kernel (sampleRows); the pieces left of the shared spans (the prior to
// the right), which start their rows, another, a piece's width a row;
// and the pieces right of them (the prior to the left) another, from the
// piece's first pixel on (the kernel forms a row's positions from any
// first pixel as lineValues does). The values go through ls into gs
// beside the shared ones. The kernels' values do not depend on the call,
// block or lane a position falls in (see vector_amd64.go), so gs is, bit
// for bit, what lineValues row piece by row piece would give.
func (s *Solver) sampleShared(def *Spline) {
	r := s.cfg.Radius
	side := 2*r + 1
	dx, dy := s.priorDX, s.priorDY
	c0, c1 := max(-r, dx-r), min(r, dx+r) // shared columns, as offsets i
	j0, j1 := max(-r, dy-r), min(r, dy+r) // shared rows, as offsets j
	if c0 > c1 || j0 > j1 {
		s.sampleRows(def, 0, side)
		return
	}
	// The rows that share nothing: above the shared ones, then below.
	s.sampleRows(def, 0, j0+r)
	s.sampleRows(def, j1+r+1, side)
	a, b := c0+r, c1+r+1 // the shared span of a row, as indices in it
	if a == 0 && b == side {
		for j := j0; j <= j1; j++ {
			k, pk := (j+r)*side, (j-dy+r)*side
			copy(s.gs[k:k+side], s.prior.G[pk:pk+side])
		}
		return
	}
	rows := j1 - j0 + 1
	if b == side {
		// Only the pieces left of the shared span, each of a pixels from
		// the row's start.
		ls := s.ls[:rows*a]
		s.sampleRowsInto(def, j0+r, j1+r+1, 0, a, ls)
		for j := j0; j <= j1; j++ {
			row := s.gs[(j+r)*side : (j+r+1)*side]
			pk := (j-dy+r)*side + a - dx
			ls = ls[copy(row[:a], ls):]
			copy(row[a:], s.prior.G[pk:pk+side-a])
		}
		return
	}
	// Only the pieces right of the shared span (the span starts each
	// row), each of side − b pixels from pixel b.
	w := side - b
	ls := s.ls[:rows*w]
	s.sampleRowsInto(def, j0+r, j1+r+1, b, w, ls)
	for j := j0; j <= j1; j++ {
		row := s.gs[(j+r)*side : (j+r+1)*side]
		pk := (j-dy+r)*side - dx
		copy(row[:b], s.prior.G[pk:pk+b])
		ls = ls[copy(row[b:], ls):]
	}
}

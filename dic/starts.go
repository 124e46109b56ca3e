package dic

import "spallscope/subset"

// Acceptance of a point's first guess from its neighbour: it is kept after
// one sampling when its ZNSSD is at most acceptFactor times the point's
// ZNSSD in the frame before plus acceptFloor, else the point's own motion
// from the frames before is sampled too and the better of the two is
// iterated from (see subset.Solver.IterateEither). A sound neighbour's
// shape carried over is within the noise of the answer, and its ZNSSD
// within the frame to frame spread of the noise floor; a neighbour across
// a crack, or one that was solved wrong, gives several times that. Chosen
// on the noisy strain ramp (BenchmarkSequence), not on its held-out
// variant.
const (
	acceptFactor = 2
	acceptFloor  = 1e-4
)

// starts are each point's own first guess from the frames before against
// the same reference.
type starts struct {
	// guess is the point's last solution, extrapolated in time where the
	// frame before that is known too; ok says whether there is one.
	guess []subset.Params
	ok    []bool
	// znssd is the point's ZNSSD in the last frame.
	znssd []float64
}

// accept returns the ZNSSD up to which point i keeps its neighbour's
// guess without sampling its own.
func (st *starts) accept(i int) float64 { return acceptFactor*st.znssd[i] + acceptFloor }

// startsFor returns the first guesses for frame index, or nil when no
// frame has been tracked against the current reference. Motion is
// extrapolated linearly in the frame index (p + r·(p − p_older), r the
// ratio of the index steps): frames of a test come at a steady rate or
// close to it, and where the motion departs from the line (a hold, an
// unloading) the neighbour's guess, which is tried first, takes over.
func (t *Tracker) startsFor(index int) *starts {
	if t.prevInc == nil {
		return nil
	}
	st := &starts{guess: t.prevInc, ok: t.prevIncOK, znssd: t.prevZNSSD}
	if t.olderInc == nil || t.prevIndex == t.olderIndex {
		return st
	}
	r := float64(index-t.prevIndex) / float64(t.prevIndex-t.olderIndex)
	st.guess = make([]subset.Params, len(t.prevInc))
	for i, p := range t.prevInc {
		st.guess[i] = p
		if !t.prevIncOK[i] || !t.olderIncOK[i] {
			continue
		}
		q := t.olderInc[i]
		for k := range p {
			st.guess[i][k] = p[k] + r*(p[k]-q[k])
		}
	}
	return st
}

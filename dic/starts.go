package dic

import "spallscope/subset"

// Acceptance of a point's first guess from its neighbour: it is kept after
// one sampling when its ZNSSD is at most acceptFactor times the
// neighbour's own final ZNSSD in this frame plus acceptFloor, else the
// point's own motion from the frames before is sampled too and the better
// of the two is iterated from (see subset.Solver.IterateEither). A sound
// neighbour's shape carried over is within the noise of the answer, and
// its ZNSSD near the noise floor the neighbour itself reached (the
// subsets overlap); a neighbour across a crack, or a shape that does not
// carry over, gives several times that. The threshold uses this frame
// only, so that a resumed run, which reads the last frame's ZNCC rounded
// from its file, makes the same choices. Chosen on the noisy strain ramp
// (BenchmarkSequence), not on its held-out variant.
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
}

// acceptBelow returns the ZNSSD up to which a point keeps the guess from
// a neighbour that converged with the given ZNCC, without sampling its
// own.
func acceptBelow(neighbourZNCC float64) float64 {
	return acceptFactor*2*(1-neighbourZNCC) + acceptFloor
}

// startsFor returns the first guesses for frame index, or nil when no
// frame has been tracked against the current reference. Motion is
// extrapolated linearly in the frame index (p + r·(p − p_older), r the
// ratio of the index steps): frames of a test come at a steady rate or
// close to it, and where the motion departs from the line (a hold, an
// unloading) the neighbour's guess, which is tried first, takes over.
// The extrapolated guesses are written over the older solution, which
// nothing needs after them (Track recycles its storage): startsFor is
// called once a frame.
func (t *Tracker) startsFor(index int) *starts {
	if t.prevInc == nil {
		return nil
	}
	st := &starts{guess: t.prevInc, ok: t.prevIncOK}
	if t.olderInc == nil || t.prevIndex == t.olderIndex {
		return st
	}
	r := float64(index-t.prevIndex) / float64(t.prevIndex-t.olderIndex)
	guess := t.olderInc
	for i, p := range t.prevInc {
		q := guess[i]
		guess[i] = p
		if !t.prevIncOK[i] || !t.olderIncOK[i] {
			continue
		}
		for k := range p {
			guess[i][k] = p[k] + r*(p[k]-q[k])
		}
	}
	st.guess = guess
	return st
}

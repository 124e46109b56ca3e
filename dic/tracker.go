package dic

import (
	"fmt"
	"math"
	"slices"

	"spallscope/dic/region"
	"spallscope/subset"
)

// Tracker follows the grid of one reference image through the frames of a
// sequence. Frames are given one at a time, in order; the tracker keeps
// only what the next frame needs (the previous solution, and in
// incremental mode the current reference), so memory does not grow with
// the sequence.
type Tracker struct {
	s      Settings
	grid   Grid
	origin *subset.Image // the original reference
	mask   *region.Mask  // on the original reference: where grid points are measured
	pixels *region.Mask  // mask less the edge guard: the pixels subsets use
	pool   *pool

	static []subset.Status // per point, against the original reference
	full   []bool          // per point: every pixel of its subset is measured (original reference)
	comp   []int           // connected part of the trackable grid, −1 if none
	seeds  [][]int         // seed candidates per part, best first

	// The reference currently correlated against and what it needs.
	refIndex int
	ref      *subset.Image
	refSp    *subset.Spline
	refMask  []uint8
	prepared []subset.Prepared // per point, against the current reference
	base     *Field            // field of the current reference (nil: the original)
	centres  [][2]int          // integer subset centres in the current reference
	frac     [][2]float64      // material point − centre, in the current reference

	prev      *Field          // last field returned
	prevInc   []subset.Params // last solution against the current reference
	prevIncOK []bool
	prevIndex int // its frame's index
	// The solution of the frame before prev's against the same reference
	// (nil if none), for extrapolating each point's motion in time;
	// startsFor overwrites it with the next frame's first guesses.
	olderInc   []subset.Params
	olderIncOK []bool
	olderIndex int
	// spareInc and spareIncOK are the storage of a solution no longer
	// needed, for the next frame's: at 20 MP a solution is 19 MB.
	spareInc   []subset.Params
	spareIncOK []bool
	last       *subset.Image  // last frame (prevIndex), a candidate new reference: the tracker's own copy
	spareImage *subset.Image  // a former reference's copy, for the next copy of a frame
	cur        *subset.Spline // the frame being tracked, reloaded frame after frame
	// work is the correlation of one frame, its per-point state, results,
	// queue and sample buffers kept from frame to frame, so that a frame
	// allocates nothing per point but its field (see correlation).
	work correlation
}

// NewTracker prepares tracking of the grid over mask (nil: the whole
// image) on the reference image ref, which is frame refIndex of its
// sequence. It reports settings that cannot be used and a mask whose size
// differs from the reference. Pixels of ref that are NaN or infinite (a
// float image's unmeasured pixels) leave the mask.
func NewTracker(ref *subset.Image, refIndex int, mask *region.Mask, s Settings) (*Tracker, error) {
	if err := s.Validate(); err != nil {
		return nil, err
	}
	s = s.withDefaults()
	if mask == nil {
		mask = region.Full(ref.Width, ref.Height)
	}
	if mask.Width != ref.Width || mask.Height != ref.Height {
		return nil, fmt.Errorf("mask is %dx%d, expected the reference's %dx%d", mask.Width, mask.Height, ref.Width, ref.Height)
	}
	ref, bad := fillUnmeasured(ref)
	if bad != nil {
		var err error
		if mask, err = mask.Intersect(bad.measured()); err != nil {
			return nil, err
		}
		if mask.Count() == 0 {
			return nil, fmt.Errorf("reference frame %d: none of its measured pixels is a number (%d of %d pixels are NaN or infinite)", refIndex, bad.count, len(ref.Pix))
		}
	}
	if ref.Width < s.Subset || ref.Height < s.Subset {
		return nil, fmt.Errorf("reference %dx%d is smaller than one %d px subset", ref.Width, ref.Height, s.Subset)
	}
	// The reference spline does not depend on the mask: it is built while
	// the grid is laid and the edge guard drawn, which take as long.
	spline := make(chan *subset.Spline, 1)
	go func() { spline <- subset.NewSpline(ref, s.Interpolation) }()
	grid, err := NewGrid(mask, s.Step)
	if err != nil {
		<-spline
		return nil, err
	}
	t := &Tracker{s: s, grid: grid, origin: ref, mask: mask, pixels: guardEdges(mask, s.EdgeGuard),
		pool: newPool(s.solverConfig(), s.Workers)}
	t.setReference(ref, refIndex, nil, <-spline)
	t.classify()
	return t, nil
}

// Grid returns the grid of points of interest.
func (t *Tracker) Grid() Grid { return t.grid }

// Settings returns the settings in use, defaults filled in.
func (t *Tracker) Settings() Settings { return t.s }

// classify finds each point's static status against the original
// reference — masked (centre not measured, or too few measured pixels in
// its subset), out of image, or trackable — the connected parts of the
// trackable grid and their seed candidates. It counts mask pixels with a
// summed-area table, so it costs little per point; subsets too flat to
// track are found when they are solved (low texture).
func (t *Tracker) classify() {
	n := t.grid.Len()
	t.static = make([]subset.Status, n)
	r := t.s.Subset / 2
	side := 2*r + 1
	area := newSummedArea(t.pixels)
	t.full = make([]bool, n)
	for i := 0; i < n; i++ {
		x, y := t.grid.Pos(i)
		if x-r >= 0 && y-r >= 0 && x+r < t.mask.Width && y+r < t.mask.Height {
			t.full[i] = area.count(x-r, y-r, x+r, y+r) == side*side
		}
		switch {
		case !t.mask.At(x, y):
			t.static[i] = subset.Masked
		case x-r < 0 || y-r < 0 || x+r >= t.mask.Width || y+r >= t.mask.Height:
			t.static[i] = subset.OutOfImage
		case float64(area.count(x-r, y-r, x+r, y+r)) < t.s.MinValidFraction*float64(side*side):
			t.static[i] = subset.Masked
		default:
			t.static[i] = subset.Converged
		}
	}
	// Connected parts (4-connectivity) of the trackable points.
	t.comp = make([]int, n)
	for i := range t.comp {
		t.comp[i] = -1
	}
	var stack, nbr []int
	parts := 0
	for i := 0; i < n; i++ {
		if t.static[i] != subset.Converged || t.comp[i] >= 0 {
			continue
		}
		t.comp[i] = parts
		stack = append(stack[:0], i)
		for len(stack) > 0 {
			p := stack[len(stack)-1]
			stack = stack[:len(stack)-1]
			nbr = t.grid.Neighbours(nbr[:0], p)
			for _, q := range nbr {
				if t.static[q] == subset.Converged && t.comp[q] < 0 {
					t.comp[q] = parts
					stack = append(stack, q)
				}
			}
		}
		parts++
	}
	// Seed candidates: user seeds first (nearest trackable grid point), then
	// per part the best-textured (highest SSSIG) of the 32 points nearest
	// the part's centroid, up to 8.
	t.seeds = make([][]int, parts)
	for _, s := range t.s.Seeds {
		if i := t.nearestTrackable(s[0], s[1]); i >= 0 {
			t.seeds[t.comp[i]] = append(t.seeds[t.comp[i]], i)
		}
	}
	members := make([][]int, parts)
	cx, cy := make([]float64, parts), make([]float64, parts)
	for i, k := range t.comp {
		if k >= 0 {
			x, y := t.grid.Pos(i)
			cx[k] += float64(x)
			cy[k] += float64(y)
			members[k] = append(members[k], i)
		}
	}
	var byDist []distPoint
	for k, m := range members {
		// The 32 members nearest the centroid, ties in grid order: the
		// distances are computed once, not per comparison.
		mx, my := cx[k]/float64(len(m)), cy[k]/float64(len(m))
		byDist = byDist[:0]
		for _, i := range m {
			x, y := t.grid.Pos(i)
			byDist = append(byDist, distPoint{math.Hypot(float64(x)-mx, float64(y)-my), i})
		}
		slices.SortFunc(byDist, func(a, b distPoint) int {
			if c := cmpFloat(a.d, b.d); c != 0 {
				return c
			}
			return a.i - b.i
		})
		near := make([]int, min(len(m), 32))
		for j := range near {
			near[j] = byDist[j].i
		}
		sssig := make(map[int]float64, len(near))
		for _, i := range near {
			x, y := t.grid.Pos(i)
			sssig[i] = subset.SSSIG(t.refSp, x, y, r)
		}
		best := slices.Clone(near)
		slices.SortStableFunc(best, func(a, b int) int { return cmpFloat(sssig[b], sssig[a]) })
		t.seeds[k] = append(t.seeds[k], best[:min(len(best), 8)]...)
	}
}

// distPoint is a grid point and its distance to a part's centroid.
type distPoint struct {
	d float64
	i int
}

func cmpFloat(a, b float64) int {
	switch {
	case a < b:
		return -1
	case a > b:
		return 1
	}
	return 0
}

// nearestTrackable returns the trackable grid point nearest (x, y), or −1.
func (t *Tracker) nearestTrackable(x, y int) int {
	best, bd := -1, math.Inf(1)
	for i, s := range t.static {
		if s != subset.Converged {
			continue
		}
		px, py := t.grid.Pos(i)
		if d := math.Hypot(float64(px-x), float64(py-y)); d < bd {
			best, bd = i, d
		}
	}
	return best
}

// Track correlates one frame (index and name as in its sequence) and
// returns its field in the original reference's coordinates. Frames must
// come in order; the reference frame itself gives zero displacement. A
// point whose deformed subset lands on a pixel of img that is NaN or
// infinite is lost. The tracker holds no reference to img once Track
// returns (in incremental mode it keeps a copy), so the caller may decode
// the next frame into img's storage (frames.Sequence.ReadInto).
func (t *Tracker) Track(img *subset.Image, index int, name string) (*Field, error) {
	if !img.SameSize(t.origin) {
		return nil, fmt.Errorf("frame %d (%s): size %dx%d, expected %dx%d like the reference", index, name, img.Width, img.Height, t.origin.Width, t.origin.Height)
	}
	img, bad := fillUnmeasured(img)
	if t.cur == nil {
		t.cur = subset.NewSpline(img, t.s.Interpolation)
	} else {
		t.cur.Reload(img)
	}
	sp := t.cur
	inc := t.correlateFrame(img, sp, bad, t.startsFor(index))
	f := t.compose(inc, index, name)
	if t.s.Reference == IncrementalReference && t.last != nil && t.prevIndex != t.refIndex && !(f.MedianZNCC() >= t.s.UpdateBelow) {
		// Correlation has degraded: move the reference to the last frame
		// and correlate this one again against it.
		// The points whose subsets reached unmeasured pixels of that frame
		// were lost there, so none is correlated against them now.
		displaced := t.ref
		t.setReference(t.last, t.prevIndex, t.prev, nil)
		if displaced != t.origin {
			t.spareImage = displaced
		}
		inc = t.correlateFrame(img, sp, bad, nil)
		f = t.compose(inc, index, name)
	}
	// After a reference update prevInc is nil: nothing older against the
	// new reference. The older solution's storage, which startsFor turned
	// into this frame's guesses, takes this frame's solution.
	t.recycle(t.olderInc, t.olderIncOK)
	t.olderInc, t.olderIncOK, t.olderIndex = t.prevInc, t.prevIncOK, t.prevIndex
	t.prevInc, t.prevIncOK = t.solutionStorage(len(inc))
	for i, r := range inc {
		t.prevInc[i], t.prevIncOK[i] = r.P, r.Status == subset.Converged
	}
	t.prevIndex = index
	t.prev = f
	if t.s.Reference == IncrementalReference {
		t.keepLast(img)
	}
	return f, nil
}

// keepLast copies img into the tracker's own image of the last frame, so
// that the caller may reuse img's storage for the next frame. When the
// last copy has become the reference, a former reference's copy (spare
// for the length of one Track) is reused if there is one.
func (t *Tracker) keepLast(img *subset.Image) {
	if t.last == nil || t.last == t.ref {
		t.last, t.spareImage = t.spareImage, nil
		if t.last == nil {
			t.last = &subset.Image{Width: img.Width, Height: img.Height, Pix: make([]float32, len(img.Pix))}
		}
	}
	t.last.Depth = img.Depth
	copy(t.last.Pix, img.Pix)
}

// recycle keeps the storage of a solution no longer needed (nil: none)
// for solutionStorage.
func (t *Tracker) recycle(p []subset.Params, ok []bool) {
	if p != nil && cap(p) >= cap(t.spareInc) {
		t.spareInc, t.spareIncOK = p, ok
	}
}

// solutionStorage returns storage for a solution of n points: the spare
// one when there is one, else new.
func (t *Tracker) solutionStorage(n int) ([]subset.Params, []bool) {
	p, ok := t.spareInc, t.spareIncOK
	t.spareInc, t.spareIncOK = nil, nil
	if cap(p) < n || cap(ok) < n {
		return make([]subset.Params, n), make([]bool, n)
	}
	return p[:n], ok[:n]
}

// correlateFrame correlates a frame whose unmeasured pixels (nil: none)
// were filled, and flags lost the points whose deformed subsets reach them.
func (t *Tracker) correlateFrame(img *subset.Image, sp *subset.Spline, bad *unmeasured, st *starts) []subset.Result {
	res := t.correlate(img, sp, st)
	if bad != nil {
		bad.flag(res, t.centres, t.s.Subset/2)
	}
	return res
}

// Resume continues tracking after the given frames (read back from their
// files, oldest first; the last is the frame just tracked) as if Track had
// just returned them: the next frame starts from the last one's solution
// and, when the frame before it is given too, extrapolates each point's
// motion from the two as Track does, so a resumed run makes the choices of
// an uninterrupted one. Only the fixed reference can resume this way; an
// incremental run holds its current reference image, so it is tracked
// again from the start.
func (t *Tracker) Resume(fields ...*Field) error {
	if t.s.Reference != FixedReference {
		return fmt.Errorf("resume: the %s reference strategy cannot resume mid-sequence", t.s.Reference)
	}
	if len(fields) == 0 {
		return fmt.Errorf("resume: no frame to resume after")
	}
	for _, f := range fields {
		if f.Grid != t.grid {
			return fmt.Errorf("resume: frame %s is on another grid (%+v, expected %+v)", f.Name, f.Grid, t.grid)
		}
	}
	solution := func(f *Field) ([]subset.Params, []bool) {
		p, ok := make([]subset.Params, len(f.Points)), make([]bool, len(f.Points))
		for i := range f.Points {
			p[i], ok[i] = f.Points[i].P, f.Points[i].Valid()
		}
		return p, ok
	}
	f := fields[len(fields)-1]
	t.prev = f
	t.prevInc, t.prevIncOK = solution(f)
	t.prevIndex = f.Index
	t.olderInc, t.olderIncOK = nil, nil
	if len(fields) > 1 {
		o := fields[len(fields)-2]
		t.olderInc, t.olderIncOK = solution(o)
		t.olderIndex = o.Index
	}
	return nil
}

// correlate runs one frame against the current reference. The results
// are the tracker's storage, valid until the next call.
func (t *Tracker) correlate(img *subset.Image, sp *subset.Spline, st *starts) []subset.Result {
	n := t.grid.Len()
	c := &t.work
	c.tr, c.ref, c.def, c.refImg, c.image, c.mask, c.centres = t, t.refSp, sp, t.ref, img, t.refMask, t.centres
	c.state, c.res, c.queue = resized(c.state, n), resized(c.res, n), c.queue[:0]
	for i := range c.state {
		switch {
		case t.static[i] != subset.Converged:
			c.state[i] = untracked
			c.res[i].Status = t.static[i]
		case t.base != nil && !t.base.Points[i].Valid():
			c.state[i] = untracked
			c.res[i].Status = t.base.Points[i].Status
		}
	}
	res := c.run(st)
	c.reclaim()
	// The frame and its guesses are not held between frames.
	c.def, c.image, c.st = nil, nil, nil
	return res
}

// compose turns solutions against the current reference into the field
// relative to the original reference. With the original reference it
// copies them; after a reference update the increment measured at the
// subset centre is carried to the material point by its gradient and
// added to the reference's own displacement, and the gradients compose as
// F = (I + ∇Δu)(I + ∇u_ref) (continuum kinematics).
func (t *Tracker) compose(inc []subset.Result, index int, name string) *Field {
	f := &Field{Index: index, Name: name, Reference: t.refIndex, Grid: t.grid, Points: make([]Point, len(inc))}
	for i, r := range inc {
		x, y := t.grid.Pos(i)
		p := Point{X: x, Y: y, ZNCC: r.ZNCC, Iterations: r.Iterations, Status: r.Status}
		switch {
		case r.Status != subset.Converged:
		case t.base == nil:
			p.P = r.P
		default:
			b := t.base.Points[i].P
			d := subset.Carry(r.P, t.frac[i][0], t.frac[i][1])
			p.P = b
			p.P[subset.PU] += d[subset.PU]
			p.P[subset.PV] += d[subset.PV]
			// ∇u = ∇u_b + ∇Δu + ∇Δu·∇u_b
			bux, buy, bvx, bvy := b[subset.PUx], b[subset.PUy], b[subset.PVx], b[subset.PVy]
			dux, duy, dvx, dvy := d[subset.PUx], d[subset.PUy], d[subset.PVx], d[subset.PVy]
			p.P[subset.PUx] = bux + dux + dux*bux + duy*bvx
			p.P[subset.PUy] = buy + duy + dux*buy + duy*bvy
			p.P[subset.PVx] = bvx + dvx + dvx*bux + dvy*bvx
			p.P[subset.PVy] = bvy + dvy + dvx*buy + dvy*bvy
			for k := 6; k < 12; k++ { // second-order terms: added, not composed
				p.P[k] = b[k] + d[k]
			}
		}
		f.Points[i] = p
	}
	return f
}

// setReference makes img (frame index) the reference correlated against.
// base is its field relative to the original reference (nil for the
// original itself): subsets are centred on the integer pixel nearest each
// material point's position there, and the mask is carried over by the
// displacement field. sp is img's spline, or nil to build it.
func (t *Tracker) setReference(img *subset.Image, index int, base *Field, sp *subset.Spline) {
	t.ref, t.refIndex, t.base = img, index, base
	switch {
	case sp != nil:
	case t.refSp != nil:
		// The former reference's spline is not needed again: reloaded
		// rather than left to the collector (4 bytes a pixel).
		t.refSp.Reload(img)
		sp = t.refSp
	default:
		sp = subset.NewSpline(img, t.s.Interpolation)
	}
	t.refSp = sp
	t.prepared = subset.NewPrepared(t.grid.Len(), t.s.Order)
	n := t.grid.Len()
	t.centres = make([][2]int, n)
	t.frac = make([][2]float64, n)
	t.recycle(t.prevInc, t.prevIncOK)
	t.prevInc, t.prevIncOK = nil, nil
	t.olderInc, t.olderIncOK = nil, nil
	for i := 0; i < n; i++ {
		x, y := t.grid.Pos(i)
		t.centres[i] = [2]int{x, y}
		if base != nil && base.Points[i].Valid() {
			px := float64(x) + base.Points[i].P[subset.PU]
			py := float64(y) + base.Points[i].P[subset.PV]
			cx, cy := math.Round(px), math.Round(py)
			t.centres[i] = [2]int{int(cx), int(cy)}
			t.frac[i] = [2]float64{px - cx, py - cy}
		}
	}
	if base == nil {
		t.refMask = t.pixels.Pix
		return
	}
	t.refMask = carryMask(t.pixels, base)
}

package subset

// Prepared holds what Prepare computed for one subset that does not
// depend on the pixel values it will read again: its status, mean and
// norm, the sums of its steepest-descent images, the Cholesky factor of
// its Hessian and the displacement entries of its inverse (invUV). With a
// fixed reference every frame correlates the same reference subsets, so a
// run keeps one Prepared per point and each frame after the first skips
// the moments, the factorization and the solves for invUV (about three
// quarters of Prepare); the values restored are the very numbers computed
// the first time, so results are unchanged to the last bit.
//
// A Prepared belongs to one subset of one reference with one mask and one
// Config; the caller keeps that pairing (a tracker drops its Prepared
// when it changes reference).
type Prepared struct {
	set          bool
	status       Status
	n            int
	fMean, fNorm float64
	invUV        float64
	v            []float64 // sumJ, sumJf (np each), the factor's lower triangle
}

// NewPrepared returns n empty Prepared for subsets of the given order,
// their storage in one block.
func NewPrepared(n int, order ShapeOrder) []Prepared {
	np := order.NumParams()
	size := 2*np + np*(np+1)/2
	slab := make([]float64, n*size)
	ps := make([]Prepared, n)
	for i := range ps {
		ps[i].v = slab[i*size : (i+1)*size : (i+1)*size]
	}
	return ps
}

// store records the solver's prepared state in c.
func (s *Solver) store(c *Prepared, status Status) {
	c.set, c.status, c.n = true, status, s.n
	if status != Converged {
		return
	}
	c.fMean, c.fNorm, c.invUV = s.fMean, s.fNorm, s.invUV
	np := s.np
	v := c.v[:2*np+np*(np+1)/2]
	copy(v, s.sumJ[:np])
	copy(v[np:], s.sumJf[:np])
	k := 2 * np
	for a := 0; a < np; a++ {
		k += copy(v[k:k+a+1], s.chol[12*a:12*a+a+1])
	}
}

// restore sets the solver's prepared state from c, for the subset whose
// values less their mean, and gradients, are already in fc, gx and gy
// (load at the level c.fMean: the very numbers Prepare's subtraction
// gives).
func (s *Solver) restore(c *Prepared) {
	s.n, s.fMean, s.fNorm, s.invUV = c.n, c.fMean, c.fNorm, c.invUV
	// Element by element: the copies are of 1 to 12 values, for which a
	// call of copy (runtime.memmove) costs more than the moves (it was 1 %
	// of a 20 MP run's time).
	np := s.np
	v := c.v[:2*np+np*(np+1)/2]
	for a := range np {
		s.sumJ[a], s.sumJf[a] = v[a], v[np+a]
	}
	k := 2 * np
	for a := range np {
		row := s.chol[12*a : 12*a+a+1]
		for b := range row {
			row[b] = v[k+b]
		}
		k += a + 1
	}
}

// PrepareWith is Prepare with the reference side of the subset taken from
// c when c holds it, and recorded in c otherwise (c nil: Prepare).
func (s *Solver) PrepareWith(ref *Spline, mask []uint8, x, y int, c *Prepared) Status {
	if c == nil || !c.set {
		st := s.Prepare(ref, mask, x, y)
		if c != nil && st != OutOfImage {
			s.store(c, st)
		}
		return st
	}
	s.ref = ref
	s.status = c.status
	if c.status != Converged {
		return c.status
	}
	s.load(ref, mask, x, y, c.fMean)
	s.restore(c)
	return Converged
}

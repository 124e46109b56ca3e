package similarity

import (
	"spallscope/dic"
	"spallscope/subset"
)

// Demagnify returns field f with an apparent magnification mag about
// (cx, cy) taken out: each deformed position x becomes c + (x − c)/(1+mag)
// and the warp's gradient I + ∇u becomes (I + ∇u)/(1+mag) (its
// second-order terms are divided likewise). Reference positions, status
// and ZNCC stay. The strain of the result is the strain of f less the
// magnification, for any centre; the centre decides only the rigid
// translation left in the displacements, and about the principal point
// (the foot of the optical axis, which out-of-plane motion does not move)
// it leaves none. f is not changed.
func Demagnify(f *dic.Field, mag, cx, cy float64) *dic.Field {
	out := *f
	out.Points = make([]dic.Point, len(f.Points))
	copy(out.Points, f.Points)
	if mag == 0 {
		return &out
	}
	k := 1 / (1 + mag)
	for i := range out.Points {
		p := &out.Points[i]
		if !p.Valid() {
			continue
		}
		X, Y := float64(p.X), float64(p.Y)
		x := cx + (X+p.P[subset.PU]-cx)*k
		y := cy + (Y+p.P[subset.PV]-cy)*k
		p.P[subset.PU], p.P[subset.PV] = x-X, y-Y
		p.P[subset.PUx] = (1+p.P[subset.PUx])*k - 1
		p.P[subset.PVy] = (1+p.P[subset.PVy])*k - 1
		p.P[subset.PUy] *= k
		p.P[subset.PVx] *= k
		for _, j := range []int{subset.PUxx, subset.PUxy, subset.PUyy, subset.PVxx, subset.PVxy, subset.PVyy} {
			p.P[j] *= k
		}
	}
	return &out
}

package strain

import (
	"math"
	"math/rand/v2"
	"testing"

	"spallscope/dic"
	"spallscope/subset"
)

// The full-window shortcut and the general least-squares fit give the same
// strain (to rounding): on a symmetric window the plane's slope is the
// orthogonal projection Σdx·u/Σdx² (ordinary least squares with an
// orthogonal design, e.g. Draper & Smith §5).
func TestFullWindowMatchesLeastSquares(t *testing.T) {
	g := dic.Grid{Step: 4, Cols: 20, Rows: 20}
	f := &dic.Field{Grid: g, Points: make([]dic.Point, g.Len())}
	rng := rand.New(rand.NewPCG(3, 4))
	for i := range f.Points {
		x, y := g.Pos(i)
		f.Points[i] = dic.Point{X: x, Y: y, Status: subset.Converged}
		f.Points[i].P[subset.PU] = 1e-3*float64(x) + 2e-6*float64(x*y) + 1e-3*rng.NormFloat64()
		f.Points[i].P[subset.PV] = -4e-4*float64(y) + 1e-3*rng.NormFloat64()
	}
	for _, order := range []int{1, 2} {
		fast, _ := Window{Size: 7, Order: order}.Strain(f)
		slow, _ := Window{Size: 7, Order: order, general: true}.Strain(f)
		n := 0
		for i := range fast.Points {
			c, r := i%20, i/20
			if c < 3 || r < 3 || c > 16 || r > 16 {
				continue // not a full window
			}
			n++
			a, b := fast.Points[i], slow.Points[i]
			if math.Abs(a.Exx-b.Exx) > 1e-12 || math.Abs(a.Eyy-b.Eyy) > 1e-12 || math.Abs(a.Exy-b.Exy) > 1e-12 {
				t.Fatalf("order %d point %d: fast (%g,%g,%g) general (%g,%g,%g)", order, i, a.Exx, a.Eyy, a.Exy, b.Exx, b.Eyy, b.Exy)
			}
		}
		if n != 196 {
			t.Fatalf("compared %d full windows, want 196", n)
		}
	}
}

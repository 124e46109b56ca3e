package runfolder

import (
	"math/rand/v2"
	"path/filepath"
	"testing"

	"spallscope/dic"
	"spallscope/subset"
)

// BenchmarkWriteField writes the field of a 20 MP frame at a 10 px step
// (200,020 points) with displacements and gradients of a noisy strain
// ramp's size, the write the track stage does behind each frame.
func BenchmarkWriteField(b *testing.B) {
	g := dic.Grid{X0: 5, Y0: 3, Step: 10, Cols: 547, Rows: 365}
	f := &dic.Field{Name: "f", Grid: g, Points: make([]dic.Point, g.Len())}
	rng := rand.New(rand.NewPCG(1, 2))
	for i := range f.Points {
		x, y := g.Pos(i)
		p := dic.Point{X: x, Y: y, ZNCC: 0.99 + 0.01*rng.Float64(), Iterations: 1 + rng.IntN(2), Status: subset.Converged}
		p.P[subset.PU] = 0.002*float64(x) + 0.005*rng.NormFloat64()
		p.P[subset.PV] = -0.001*float64(y) + 0.005*rng.NormFloat64()
		p.P[subset.PUx], p.P[subset.PUy] = 0.002+1e-4*rng.NormFloat64(), 1e-4*rng.NormFloat64()
		p.P[subset.PVx], p.P[subset.PVy] = 1e-4*rng.NormFloat64(), -0.001+1e-4*rng.NormFloat64()
		f.Points[i] = p
	}
	path := filepath.Join(b.TempDir(), "fields", "f.csv")
	for b.Loop() {
		if err := WriteField(path, f, 0); err != nil {
			b.Fatal(err)
		}
	}
}

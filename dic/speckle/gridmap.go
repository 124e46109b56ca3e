package speckle

import (
	"slices"

	"spallscope/subset"
)

// newMap returns the SSSIG of size×size subsets centred on a grid of step
// size/2 (half-overlapping subsets: fine enough to show where the texture
// is poor, coarse enough that a map of a large photo stays small), wholly
// inside the image. With sigma > 0 it also records the fraction of
// subsets whose predicted noise meets target.
func newMap(t gradientTables, size int, sigma, target float64) Map {
	r := size / 2
	m := Map{Subset: size, Step: max(1, size/2), X0: r, Y0: r}
	m.Columns = (t.w-1-2*r)/m.Step + 1
	m.Rows = (t.h-1-2*r)/m.Step + 1
	m.SSSIG = make([]float64, 0, m.Columns*m.Rows)
	meets := 0
	for j := 0; j < m.Rows; j++ {
		for i := 0; i < m.Columns; i++ {
			s := t.sssig(m.X0+i*m.Step, m.Y0+j*m.Step, r)
			m.SSSIG = append(m.SSSIG, s)
			if s > 0 && sigma > 0 && subset.PredictedNoise(sigma, s) <= target {
				meets++
			}
		}
	}
	m.Min, m.Max = slices.Min(m.SSSIG), slices.Max(m.SSSIG)
	m.Median = median(slices.Clone(m.SSSIG))
	if sigma > 0 {
		f := float64(meets) / float64(len(m.SSSIG))
		m.MeetsTarget = &f
	}
	return m
}

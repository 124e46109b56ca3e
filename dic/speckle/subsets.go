package speckle

import (
	"math"
	"slices"

	"spallscope/subset"
)

// Table subset sizes: every odd size from smallestTableSubset to
// largestTableSubset px, the range within which a subset is usually chosen
// (common practice, no source).
const (
	smallestTableSubset = 11
	largestTableSubset  = 61
	// maxTableCentres bounds the subsets sampled per size: enough for a
	// median that moves by well under 1 % between grids, cheap on any
	// image.
	maxTableCentres = 40000
)

// tableSizes returns the odd subset sizes of the table that fit in a w×h
// image, with the map's size added if it lies outside the range.
func tableSizes(w, h, mapSize int) []int {
	var sizes []int
	for s := smallestTableSubset; s <= largestTableSubset; s += 2 {
		sizes = append(sizes, s)
	}
	if !slices.Contains(sizes, mapSize) {
		sizes = append(sizes, mapSize)
		slices.Sort(sizes)
	}
	fit := sizes[:0]
	for _, s := range sizes {
		if s <= w && s <= h {
			fit = append(fit, s)
		}
	}
	return fit
}

// subsetTable returns the median SSSIG and predicted displacement noise of
// each subset size in sizes (ascending). Every size is sampled on the same
// grid of centres, far enough from the border for the largest size, so
// each subset of a larger size contains that of a smaller one at the same
// centre. Both directional sums are then non-decreasing with size at
// every centre, so is their minimum, and so is its median: the predicted
// noise of the table never grows with subset size. sigma ≤ 0 means the
// noise is unknown.
func subsetTable(t gradientTables, sizes []int, sigma, target float64) []SubsetNoise {
	if len(sizes) == 0 {
		return nil
	}
	margin := sizes[len(sizes)-1] / 2
	nx, ny := t.w-2*margin, t.h-2*margin
	step := max(1, int(math.Ceil(math.Sqrt(float64(nx)*float64(ny)/maxTableCentres))))
	var xs, ys []int
	for x := margin; x < t.w-margin; x += step {
		xs = append(xs, x)
	}
	for y := margin; y < t.h-margin; y += step {
		ys = append(ys, y)
	}
	vals := make([]float64, 0, len(xs)*len(ys))
	rows := make([]SubsetNoise, 0, len(sizes))
	for _, size := range sizes {
		r := size / 2
		vals = vals[:0]
		for _, y := range ys {
			for _, x := range xs {
				vals = append(vals, t.sssig(x, y, r))
			}
		}
		row := SubsetNoise{Size: size, Samples: len(vals), SSSIG: median(vals)}
		if row.SSSIG > 0 {
			row.PerGray = subset.PredictedNoise(1, row.SSSIG)
			if sigma > 0 {
				row.Predicted = subset.PredictedNoise(sigma, row.SSSIG)
				row.MeetsTarget = row.Predicted <= target
			}
		}
		rows = append(rows, row)
	}
	return rows
}

// median returns the upper median of v (the element of rank ⌊n/2⌋ in
// ascending order), reordering v; 0 for no values. Taking an element
// rather than the mean of the middle two keeps median(√2σ/√S) equal to
// √2σ/√median(S) for an odd count.
func median(v []float64) float64 {
	if len(v) == 0 {
		return 0
	}
	slices.Sort(v)
	return v[len(v)/2]
}

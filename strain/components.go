package strain

import (
	"slices"

	"spallscope/dic"
)

// components returns the connected groups (8-connectivity on the grid) of
// the marked points, each group in increasing index order, groups ordered
// by their first point. Small-field labelling by flood fill; the grid is
// small enough that a two-pass union–find buys nothing.
func components(g dic.Grid, marked []bool) [][]int {
	seen := make([]bool, len(marked))
	var out [][]int
	var stack []int
	for i, m := range marked {
		if !m || seen[i] {
			continue
		}
		seen[i] = true
		stack = append(stack[:0], i)
		var comp []int
		for len(stack) > 0 {
			p := stack[len(stack)-1]
			stack = stack[:len(stack)-1]
			comp = append(comp, p)
			c, r := p%g.Cols, p/g.Cols
			for dr := -1; dr <= 1; dr++ {
				for dc := -1; dc <= 1; dc++ {
					q := g.Index(c+dc, r+dr)
					if q >= 0 && marked[q] && !seen[q] {
						seen[q] = true
						stack = append(stack, q)
					}
				}
			}
		}
		slices.Sort(comp)
		out = append(out, comp)
	}
	return out
}

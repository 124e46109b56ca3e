package calibrate

import (
	"math"

	"spallscope/dic/lens"
)

// CoverageCells is the number of cells per side of the frame in which
// coverage is counted.
const CoverageCells = 5

// cornerCellNames name the frame's corner cells, in the order Coverage
// checks them.
var cornerCellNames = [4]string{"top-left", "top-right", "bottom-left", "bottom-right"}

// Coverage measures how much of a width×height frame the detected
// corners of all poses reach. The frame is divided into 5 × 5 equal
// cells; the result holds the fraction of cells with at least one corner
// and names the frame's four corner cells that have none. Distortion is
// largest at the frame's corners and the higher radial terms are fixed
// only where there are corners to fit, so a corner cell left empty means
// the lens there is extrapolated (a rule of our own, after the common
// practice of covering the whole frame; no source).
func Coverage(width, height int, poses [][][2]float64) lens.Coverage {
	var hit [CoverageCells][CoverageCells]bool
	for _, pts := range poses {
		for _, p := range pts {
			i := int(math.Floor((p[0] + 0.5) / float64(width) * CoverageCells))
			j := int(math.Floor((p[1] + 0.5) / float64(height) * CoverageCells))
			if i >= 0 && j >= 0 && i < CoverageCells && j < CoverageCells {
				hit[j][i] = true
			}
		}
	}
	n := 0
	for _, row := range hit {
		for _, h := range row {
			if h {
				n++
			}
		}
	}
	c := lens.Coverage{Cells: CoverageCells, Covered: float64(n) / (CoverageCells * CoverageCells)}
	last := CoverageCells - 1
	for k, cell := range [4][2]int{{0, 0}, {last, 0}, {0, last}, {last, last}} {
		if !hit[cell[1]][cell[0]] {
			c.EmptyCorners = append(c.EmptyCorners, cornerCellNames[k])
		}
	}
	return c
}

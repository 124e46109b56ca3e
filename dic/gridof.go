package dic

import (
	"errors"
	"fmt"
)

// GridOf recovers the grid of row-major points read back from a file, and
// says which point is off the grid if they do not form one.
func GridOf(pts []Point) (Grid, error) {
	if len(pts) == 0 {
		return Grid{}, errors.New("no points")
	}
	g := Grid{X0: pts[0].X, Y0: pts[0].Y, Cols: 1, Step: 1}
	for g.Cols < len(pts) && pts[g.Cols].Y == g.Y0 {
		g.Cols++
	}
	if g.Cols > 1 {
		g.Step = pts[1].X - pts[0].X
	} else if len(pts) > 1 {
		g.Step = pts[1].Y - pts[0].Y
	}
	if g.Step <= 0 || len(pts)%g.Cols != 0 {
		return Grid{}, fmt.Errorf("points do not form a row-major grid (%d points, %d per row)", len(pts), g.Cols)
	}
	g.Rows = len(pts) / g.Cols
	for i, p := range pts {
		if x, y := g.Pos(i); p.X != x || p.Y != y {
			return Grid{}, fmt.Errorf("data line %d: point (%d,%d), expected (%d,%d) on a %d px grid", i+1, p.X, p.Y, x, y, g.Step)
		}
	}
	return g, nil
}

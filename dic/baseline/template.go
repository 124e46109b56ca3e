package baseline

import (
	"fmt"
	"image"

	"gocv.io/x/gocv"
)

// TemplateParabolic measures each point by OpenCV's template matching with
// the normalised correlation coefficient (TM_CCOEFF_NORMED, the ZNCC) of
// the window×window reference subset over the deformed frame within
// ±c.Search px, then refines the integer peak by a 1-D parabola through it
// and its two neighbours along each axis: the classic subpixel estimator
// of correlation peaks. A peak on the edge of the search range cannot be
// refined and is NaN. It makes one cgo call per point, acceptable for a
// baseline; the points are shared among the CPUs.
func TemplateParabolic(c *Case, window int) (u, v []float64, err error) {
	if err := checkWindow(c, window); err != nil {
		return nil, nil, fmt.Errorf("%s: %w", NameTemplate, err)
	}
	ref, def, release, err := caseMats(c)
	if err != nil {
		return nil, nil, fmt.Errorf("%s: %w", NameTemplate, err)
	}
	defer release()

	r, s := window/2, c.Search
	u, v = nanSlices(len(c.Points))
	err = forChunks(len(c.Points), func(lo, hi int) error {
		res, noMask := gocv.NewMat(), gocv.NewMat()
		defer res.Close()
		defer noMask.Close()
		for i := lo; i < hi; i++ {
			x, y := c.Points[i][0], c.Points[i][1]
			tpl := ref.Region(image.Rect(x-r, y-r, x+r+1, y+r+1))
			area := def.Region(image.Rect(x-r-s, y-r-s, x+r+s+1, y+r+s+1))
			gocv.MatchTemplate(area, tpl, &res, gocv.TmCcoeffNormed, noMask)
			tpl.Close()
			area.Close()
			if res.Rows() != 2*s+1 || res.Cols() != 2*s+1 {
				return fmt.Errorf("%s: point (%d, %d): score map %dx%d, want %dx%d", NameTemplate, x, y, res.Cols(), res.Rows(), 2*s+1, 2*s+1)
			}
			_, _, _, at := gocv.MinMaxLoc(res)
			ix, iy := at.X, at.Y
			if ix == 0 || iy == 0 || ix == 2*s || iy == 2*s {
				continue
			}
			at32 := func(col, row int) float64 { return float64(res.GetFloatAt(row, col)) }
			c0 := at32(ix, iy)
			u[i] = float64(ix-s) + parabolicPeak(at32(ix-1, iy), c0, at32(ix+1, iy))
			v[i] = float64(iy-s) + parabolicPeak(at32(ix, iy-1), c0, at32(ix, iy+1))
		}
		return nil
	})
	return u, v, err
}

// parabolicPeak returns the offset in (−½, ½) of the vertex of the parabola
// through (−1, a), (0, b), (1, c) when b is the largest of the three, and 0
// when the three are collinear.
func parabolicPeak(a, b, c float64) float64 {
	d := a - 2*b + c
	if d >= 0 {
		return 0
	}
	return (a - c) / (2 * d)
}

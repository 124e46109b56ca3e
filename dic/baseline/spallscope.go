package baseline

import (
	"fmt"

	"spallscope/dic"
	"spallscope/dic/region"
	"spallscope/subset"
)

// Spallscope measures the points the way a run does: dic.Tracker places a
// grid on the case's points (the case's step, over a rectangle of interest
// two steps wider on every side, so that no subset of a case point is cut
// by the edge of the region), finds seed points by an integer ZNCC search over
// ±c.Search px and spreads IC-GN solutions over the grid by
// reliability-guided propagation, with the affine shape function on bicubic
// B-splines, subset = window. The time includes building both splines,
// classifying the grid and the seed search. Points that are not measured
// are NaN.
func Spallscope(c *Case, window int) (u, v []float64, err error) {
	if err := checkWindow(c, window); err != nil {
		return nil, nil, fmt.Errorf("%s: %w", NameSpallscope, err)
	}
	x0, y0 := c.Points[0][0], c.Points[0][1]
	x1, y1 := c.Points[len(c.Points)-1][0], c.Points[len(c.Points)-1][1]
	step := 1
	if len(c.Points) > 1 {
		step = c.Points[1][0] - x0
	}
	pad := 2 * step
	if x0 < pad || y0 < pad || x1+pad >= c.Ref.Width || y1+pad >= c.Ref.Height {
		return nil, nil, fmt.Errorf("%s: points must lie %d px inside the frame", NameSpallscope, pad)
	}
	rect := region.Rect{X0: float64(x0 - pad), Y0: float64(y0 - pad), X1: float64(x1 + pad), Y1: float64(y1 + pad)}
	roi, err := region.Layout{ROI: []region.Shape{rect}}.Rasterise(c.Ref.Width, c.Ref.Height)
	if err != nil {
		return nil, nil, err
	}
	s := dic.Settings{Subset: window, Step: step, Order: subset.Affine, Interpolation: subset.Bicubic, SearchRadius: max(c.Search, 1)}
	tr, err := dic.NewTracker(c.Ref, 0, roi, s)
	if err != nil {
		return nil, nil, fmt.Errorf("%s: %w", NameSpallscope, err)
	}
	f, err := tr.Track(c.Def, 1, c.Name)
	if err != nil {
		return nil, nil, fmt.Errorf("%s: %w", NameSpallscope, err)
	}
	// Map grid points back to the case's points by position.
	at := make(map[[2]int]int, len(f.Points))
	for i := range f.Points {
		at[[2]int{f.Points[i].X, f.Points[i].Y}] = i
	}
	u, v = nanSlices(len(c.Points))
	for i, p := range c.Points {
		if k, ok := at[p]; ok && f.Points[k].Valid() {
			u[i], v[i] = f.Points[k].U()
		}
	}
	return u, v, nil
}

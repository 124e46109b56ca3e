package model

import (
	"fmt"
	"math"
	"strings"

	"spallscope/dic"
	"spallscope/dic/region"
)

// Outside counts and names the model points that lie outside the measured
// region, where nothing can be compared with them. They are not dropped:
// near the region's edge they still carry the interpolation. Many of them
// usually mean the format is wrong (origin, scale, units or y direction).
type Outside struct {
	// Count of the model's Total points lie outside.
	Count int `json:"count"`
	Total int `json:"total"`
	// First names up to MaxNamed of them, in file order.
	First []OutsidePoint `json:"first,omitempty"`
}

// MaxNamed is how many outside points Outside names.
const MaxNamed = 10

// OutsidePoint names one model point outside the measured region.
type OutsidePoint struct {
	Line   int     `json:"line"`
	ModelX float64 `json:"model_x"`
	ModelY float64 `json:"model_y"`
	X      float64 `json:"x_px"`
	Y      float64 `json:"y_px"`
}

// String is the warning, empty when every point is inside.
func (o Outside) String() string {
	if o.Count == 0 {
		return ""
	}
	var b strings.Builder
	fmt.Fprintf(&b, "%d of %d model points lie outside the measured region:", o.Count, o.Total)
	for i, p := range o.First {
		if i > 0 {
			b.WriteByte(';')
		}
		fmt.Fprintf(&b, " line %d (%g, %g) at (%.1f, %.1f) px", p.Line, p.ModelX, p.ModelY, p.X, p.Y)
	}
	if o.Count > len(o.First) {
		fmt.Fprintf(&b, "; and %d more", o.Count-len(o.First))
	}
	return b.String()
}

// measuredRegion returns the test for a point (px) lying in the measured
// region: the run's mask when given (the region of interest less its
// exclusions), else the part of the image within one grid step, along
// both axes, of a validly measured grid point.
func measuredRegion(f *dic.Field, mask *region.Mask) func(x, y float64) bool {
	if mask != nil {
		return func(x, y float64) bool {
			return mask.At(int(math.Round(x)), int(math.Round(y)))
		}
	}
	g := f.Grid
	step := float64(g.Step)
	return func(x, y float64) bool {
		fc, fr := (x-float64(g.X0))/step, (y-float64(g.Y0))/step
		if math.IsNaN(fc+fr) || math.Abs(fc) > 1e9 || math.Abs(fr) > 1e9 {
			return false
		}
		for r := int(math.Ceil(fr - 1)); r <= int(math.Floor(fr+1)); r++ {
			for c := int(math.Ceil(fc - 1)); c <= int(math.Floor(fc+1)); c++ {
				if i := g.Index(c, r); i >= 0 && f.Points[i].Valid() {
					return true
				}
			}
		}
		return false
	}
}

// outside finds the model points outside the measured region.
func outside(m *Field, inside func(x, y float64) bool) Outside {
	o := Outside{Total: len(m.Points)}
	for i := range m.Points {
		p := &m.Points[i]
		if inside(p.X, p.Y) {
			continue
		}
		o.Count++
		if len(o.First) < MaxNamed {
			o.First = append(o.First, OutsidePoint{Line: p.Line, ModelX: p.ModelX, ModelY: p.ModelY, X: p.X, Y: p.Y})
		}
	}
	return o
}

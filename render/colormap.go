package render

import (
	"math"
	"sync"
)

// Colormap turns a position t in [0, 1] into a colour through a table of
// 256 sRGB colours, the first for t = 0 and the last for t = 1, evenly
// spaced between. Between entries the colour is interpolated linearly, so
// t = 0.5 of a diverging map falls exactly on its neutral middle.
//
// Only perceptually uniform maps are offered: equal steps of the value look
// like equal steps of colour, so a map does not invent features (the
// rainbow maps common in field plots do). The zero value has no table; get
// maps from Sequential and Diverging.
type Colormap struct {
	// Name is the map's short name, Source where its table comes from.
	Name, Source string
	table        *[256][3]float64
}

// Sequential returns viridis (van der Walt & Smith 2015, CC0), for
// magnitudes: dark blue-violet at the low limit to yellow at the high one.
func Sequential() Colormap {
	return Colormap{Name: "viridis", Source: "viridis, van der Walt & Smith (2015), CC0", table: &viridisTable}
}

// Diverging returns the cool-to-warm map of Moreland (2009), for signed
// quantities with zero in the middle: blue for negative (compression),
// neutral gray at zero, red for positive (tension). The table is built from
// the published end colours by interpolation in Moreland's Msh space (see
// coolWarmTable).
func Diverging() Colormap {
	return Colormap{Name: "cool-warm", Source: "cool to warm, Moreland (2009), Msh interpolation", table: coolWarm()}
}

// coolWarm builds the diverging table once.
var coolWarm = sync.OnceValue(func() *[256][3]float64 {
	t := coolWarmTable()
	return &t
})

// Len is the number of table entries.
func (c Colormap) Len() int { return len(c.table) }

// Entry returns table entry i in 8-bit sRGB.
func (c Colormap) Entry(i int) (r, g, b uint8) {
	e := c.table[i]
	return unit8(e[0]), unit8(e[1]), unit8(e[2])
}

// At returns the colour at t in 8-bit sRGB; t is clamped to [0, 1] and NaN
// counts as 0 (callers keep unmeasured pixels out of the map).
func (c Colormap) At(t float64) (r, g, b uint8) {
	x, y, z := c.RGB(t)
	return unit8(x), unit8(y), unit8(z)
}

// RGB returns the colour at t as sRGB components in [0, 1].
func (c Colormap) RGB(t float64) (r, g, b float64) {
	if !(t > 0) {
		t = 0
	} else if t > 1 {
		t = 1
	}
	f := t * float64(len(c.table)-1)
	i := int(f)
	if i >= len(c.table)-1 {
		e := c.table[len(c.table)-1]
		return e[0], e[1], e[2]
	}
	w := f - float64(i)
	a, d := c.table[i], c.table[i+1]
	return a[0] + w*(d[0]-a[0]), a[1] + w*(d[1]-a[1]), a[2] + w*(d[2]-a[2])
}

// unit8 converts a component in [0, 1] to 0–255, rounding.
func unit8(v float64) uint8 {
	switch {
	case !(v > 0):
		return 0
	case v >= 1:
		return 255
	}
	return uint8(math.Round(v * 255))
}

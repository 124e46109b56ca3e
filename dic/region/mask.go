package region

import (
	"fmt"
	"math"
)

// Mask marks the measured pixels of an image: one byte per pixel,
// row-major, nonzero = measured, zero = excluded.
type Mask struct {
	Width, Height int
	Pix           []uint8
}

// Full returns a mask that measures every pixel.
func Full(width, height int) *Mask {
	m := &Mask{Width: width, Height: height, Pix: make([]uint8, width*height)}
	for i := range m.Pix {
		m.Pix[i] = 255
	}
	return m
}

// At reports whether pixel (x, y) is measured; pixels outside the image are not.
func (m *Mask) At(x, y int) bool {
	if x < 0 || y < 0 || x >= m.Width || y >= m.Height {
		return false
	}
	return m.Pix[y*m.Width+x] != 0
}

// Count returns the number of measured pixels.
func (m *Mask) Count() int {
	n := 0
	for _, v := range m.Pix {
		if v != 0 {
			n++
		}
	}
	return n
}

// Layout is a region of interest with exclusions: a pixel is measured when
// it lies in the union of ROI (or anywhere, if ROI is empty) and in none of
// Exclude (openings, background, labels).
type Layout struct {
	ROI     []Shape
	Exclude []Shape
}

// Rasterise returns the layout's mask for a width×height image, deciding
// each pixel by its centre. It fails for a shape that does not validate
// (one with a NaN radius would otherwise exclude nothing, silently) and
// when nothing is left to measure.
func (l Layout) Rasterise(width, height int) (*Mask, error) {
	for i, s := range l.ROI {
		if err := s.Validate(); err != nil {
			return nil, fmt.Errorf("region of interest, shape %d: %w", i+1, err)
		}
	}
	for i, s := range l.Exclude {
		if err := s.Validate(); err != nil {
			return nil, fmt.Errorf("exclusion %d: %w", i+1, err)
		}
	}
	m := &Mask{Width: width, Height: height, Pix: make([]uint8, width*height)}
	if len(l.ROI) == 0 {
		for i := range m.Pix {
			m.Pix[i] = 255
		}
	}
	for _, s := range l.ROI {
		fill(m, s, 255)
	}
	for _, s := range l.Exclude {
		fill(m, s, 0)
	}
	if m.Count() == 0 {
		return nil, fmt.Errorf("region of interest leaves no pixel of the %dx%d image to measure", width, height)
	}
	return m, nil
}

// fill sets the pixels whose centres lie in s to v, visiting only s's bounds.
// The bounds are clamped to the image as floats before they become ints: a
// float beyond int's range does not convert to a usable int, so a circle
// of radius 1e300 would otherwise fill nothing.
func fill(m *Mask, s Shape, v uint8) {
	x0, y0, x1, y1 := s.Bounds()
	clamp := func(f float64, hi int) int { return int(math.Max(-1, math.Min(f, float64(hi)))) }
	i0, j0 := max(0, clamp(math.Ceil(x0), m.Width)), max(0, clamp(math.Ceil(y0), m.Height))
	i1, j1 := min(m.Width-1, clamp(math.Floor(x1), m.Width)), min(m.Height-1, clamp(math.Floor(y1), m.Height))
	if _, ok := s.(Rect); ok { // every pixel centre within the bounds is inside
		for j := j0; j <= j1 && i0 <= i1; j++ {
			row := m.Pix[j*m.Width+i0 : j*m.Width+i1+1]
			for i := range row {
				row[i] = v
			}
		}
		return
	}
	for j := j0; j <= j1; j++ {
		for i := i0; i <= i1; i++ {
			if s.Contains(float64(i), float64(j)) {
				m.Pix[j*m.Width+i] = v
			}
		}
	}
}

// Intersect returns the pixels measured in both m and o (same size).
func (m *Mask) Intersect(o *Mask) (*Mask, error) {
	if m.Width != o.Width || m.Height != o.Height {
		return nil, fmt.Errorf("mask %dx%d does not match image %dx%d", o.Width, o.Height, m.Width, m.Height)
	}
	r := &Mask{Width: m.Width, Height: m.Height, Pix: make([]uint8, len(m.Pix))}
	for i := range r.Pix {
		if m.Pix[i] != 0 && o.Pix[i] != 0 {
			r.Pix[i] = 255
		}
	}
	return r, nil
}

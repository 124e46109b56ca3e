package region

import (
	"fmt"
	"strconv"
	"strings"
)

// ParseShape reads a shape written as KIND:NUMBERS, in reference px:
//
//	rect:x0,y0,x1,y1
//	circle:cx,cy,r
//	ellipse:cx,cy,rx,ry[,angle_deg]
//	polygon:x1,y1,x2,y2,x3,y3[,...]
func ParseShape(s string) (Shape, error) {
	kind, list, ok := strings.Cut(strings.TrimSpace(s), ":")
	if !ok {
		return nil, fmt.Errorf("shape %q: expected KIND:NUMBERS such as circle:256,200,40 (kinds: rect, circle, ellipse, polygon)", s)
	}
	var v []float64
	for _, f := range strings.Split(list, ",") {
		x, err := strconv.ParseFloat(strings.TrimSpace(f), 64)
		if err != nil {
			return nil, fmt.Errorf("shape %q: %q is not a number", s, f)
		}
		v = append(v, x)
	}
	want := func(n ...int) error {
		for _, k := range n {
			if len(v) == k {
				return nil
			}
		}
		return fmt.Errorf("shape %q: %s takes %v numbers, got %d", s, kind, n, len(v))
	}
	switch strings.ToLower(kind) {
	case "rect":
		if err := want(4); err != nil {
			return nil, err
		}
		if v[2] < v[0] || v[3] < v[1] {
			return nil, fmt.Errorf("shape %q: rect needs x0 ≤ x1 and y0 ≤ y1", s)
		}
		return Rect{v[0], v[1], v[2], v[3]}, nil
	case "circle":
		if err := want(3); err != nil {
			return nil, err
		}
		if v[2] <= 0 {
			return nil, fmt.Errorf("shape %q: radius must be positive", s)
		}
		return Circle(v[0], v[1], v[2]), nil
	case "ellipse":
		if err := want(4, 5); err != nil {
			return nil, err
		}
		e := Ellipse{Cx: v[0], Cy: v[1], Rx: v[2], Ry: v[3]}
		if len(v) == 5 {
			e.AngleDeg = v[4]
		}
		if e.Rx <= 0 || e.Ry <= 0 {
			return nil, fmt.Errorf("shape %q: semi-axes must be positive", s)
		}
		return e, nil
	case "polygon":
		if len(v)%2 != 0 {
			return nil, fmt.Errorf("shape %q: polygon takes x,y pairs, got %d numbers", s, len(v))
		}
		p := make(Polygon, len(v)/2)
		for i := range p {
			p[i] = [2]float64{v[2*i], v[2*i+1]}
		}
		if err := p.Validate(); err != nil {
			return nil, fmt.Errorf("shape %q: %w", s, err)
		}
		return p, nil
	}
	return nil, fmt.Errorf("shape %q: unknown kind %q, expected rect, circle, ellipse or polygon", s, kind)
}

// FromImage turns a decoded mask image (any gray levels) into a mask:
// nonzero pixels are measured.
func FromImage(width, height int, pix []float32) *Mask {
	m := &Mask{Width: width, Height: height, Pix: make([]uint8, width*height)}
	for i, v := range pix {
		if v != 0 {
			m.Pix[i] = 255
		}
	}
	return m
}

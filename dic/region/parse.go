package region

import (
	"fmt"
	"strconv"
	"strings"

	"spallscope/dic/logtable"
)

// ParseShape reads a shape written as KIND:NUMBERS, in reference px:
//
//	rect:x0,y0,x1,y1
//	circle:cx,cy,r
//	ellipse:cx,cy,rx,ry[,angle_deg]
//	polygon:x1,y1,x2,y2,x3,y3[,...]
//
// Every number must be finite, radii and semi-axes positive, a rect's
// corners in order and a polygon's three or more vertices not all on one
// line. Errors quote the shape text (an excerpt when it is long) and say
// what was expected.
func ParseShape(s string) (Shape, error) {
	text := logtable.Excerpt(s)
	kind, list, ok := strings.Cut(strings.TrimSpace(s), ":")
	if !ok {
		return nil, fmt.Errorf("shape %s: expected KIND:NUMBERS such as circle:256,200,40 (kinds: rect, circle, ellipse, polygon)", text)
	}
	var v []float64
	for i, f := range strings.Split(list, ",") {
		x, err := strconv.ParseFloat(strings.TrimSpace(f), 64)
		if err != nil {
			return nil, fmt.Errorf("shape %s: number %d, %s, is not a number of px", text, i+1, logtable.Excerpt(strings.TrimSpace(f)))
		}
		v = append(v, x)
	}
	want := func(n ...int) error {
		for _, k := range n {
			if len(v) == k {
				return nil
			}
		}
		return fmt.Errorf("shape %s: %s takes %v numbers, got %d", text, kind, n, len(v))
	}
	var shape Shape
	switch strings.ToLower(kind) {
	case "rect":
		if err := want(4); err != nil {
			return nil, err
		}
		shape = Rect{v[0], v[1], v[2], v[3]}
	case "circle":
		if err := want(3); err != nil {
			return nil, err
		}
		shape = Circle(v[0], v[1], v[2])
	case "ellipse":
		if err := want(4, 5); err != nil {
			return nil, err
		}
		e := Ellipse{Cx: v[0], Cy: v[1], Rx: v[2], Ry: v[3]}
		if len(v) == 5 {
			e.AngleDeg = v[4]
		}
		shape = e
	case "polygon":
		if len(v)%2 != 0 {
			return nil, fmt.Errorf("shape %s: polygon takes x,y pairs, got %d numbers", text, len(v))
		}
		p := make(Polygon, len(v)/2)
		for i := range p {
			p[i] = [2]float64{v[2*i], v[2*i+1]}
		}
		shape = p
	default:
		return nil, fmt.Errorf("shape %s: unknown kind %s, expected rect, circle, ellipse or polygon", text, logtable.Excerpt(kind))
	}
	if err := shape.Validate(); err != nil {
		return nil, fmt.Errorf("shape %s: %w", text, err)
	}
	return shape, nil
}

// FromImage turns a decoded mask image (any gray levels) into a mask:
// nonzero pixels are measured. NaN pixels (a float mask image) are not.
func FromImage(width, height int, pix []float32) *Mask {
	m := &Mask{Width: width, Height: height, Pix: make([]uint8, width*height)}
	for i, v := range pix {
		if v != 0 && v == v {
			m.Pix[i] = 255
		}
	}
	return m
}

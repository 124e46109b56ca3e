package config

import (
	"fmt"

	"spallscope/dic/region"
)

// Opening names an opening and its shape (circle:cx,cy,r,
// ellipse:cx,cy,rx,ry[,deg], polygon:x1,y1,...).
type Opening struct {
	Name  string `yaml:"name"`
	Shape string `yaml:"shape"`
}

// ParseROI reads a region of interest: a shape, or x0,y0,x1,y1 for a
// rect.
func ParseROI(s string) (region.Shape, error) {
	shape, err := region.ParseShape(s)
	if err != nil {
		if shape, err = region.ParseShape("rect:" + s); err != nil {
			return nil, fmt.Errorf("roi %q: expected x0,y0,x1,y1 or a shape such as polygon:x1,y1,...", s)
		}
	}
	return shape, nil
}

// checkShapes checks a test's or a face's shapes (prefix "" or
// "faces[1]."): the region of interest, the exclusions and the openings,
// each of which needs a shape and may have a name (a label in tables and
// reports, not a path: checkLabel), different from the others'.
func checkShapes(prefix, roi string, exclude []string, openings []Opening) error {
	var p Problems
	if roi != "" {
		if _, err := ParseROI(roi); err != nil {
			p.add(fmt.Errorf("%sroi: %w", prefix, err))
		}
	}
	for i, e := range exclude {
		if _, err := region.ParseShape(e); err != nil {
			p.add(fmt.Errorf("%sexclude[%d]: %w", prefix, i, err))
		}
	}
	names := map[string]int{}
	for i, o := range openings {
		at := fmt.Sprintf("%sopenings[%d]", prefix, i)
		if o.Shape == "" {
			p.add(fmt.Errorf("%s: shape is required", at))
		} else if _, err := region.ParseShape(o.Shape); err != nil {
			p.add(fmt.Errorf("%s: %w", at, err))
		}
		if err := checkLabel(at+".name", o.Name); err != nil {
			p.add(err)
		} else if j, ok := names[o.Name]; ok && o.Name != "" {
			p.add(fmt.Errorf("%s.name %q: used by %sopenings[%d] too; onsets are told apart by it", at, o.Name, prefix, j))
		} else {
			names[o.Name] = i
		}
	}
	return p.err()
}

package model

import (
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"math"
	"os"
	"strconv"
	"strings"
)

// Read reads a model field from the CSV file at path and maps it onto the
// reference image with f.
//
// The file starts with a header row naming its columns; lines starting
// with # are comments. Columns x and y (the point, in f.Units) are
// required, and at least one of u, v (the displacement, in f.Units) and
// exx, eyy, exy (the strain, exy the tensor shear, tension positive unless
// f.CompressionPositive). Names are case-insensitive and may be written
// with their unit (x_mm, u_px), which must then agree with f.Units; other
// columns are ignored and listed in Field.Ignored. Every cell of a
// quantity's column holds a number; NaN marks a point without that value.
// Rows are points, in any order: a regular grid, a mesh's nodes or
// element centroids.
//
// Errors name the file and, for a bad row, its line and column.
func Read(path string, f Format) (*Field, error) {
	if err := f.Validate(); err != nil {
		return nil, fmt.Errorf("model %s: %w", path, err)
	}
	fh, err := os.Open(path)
	if err != nil {
		return nil, fmt.Errorf("model: %w", err)
	}
	defer fh.Close()
	m, err := parse(fh, path, f)
	if err != nil {
		return nil, err
	}
	return m, nil
}

// columns is where a file's header puts x, y and each quantity (−1:
// absent).
type columns struct {
	x, y int
	q    [numQuantities]int
	name []string // header names as written, by column
}

// parseHeader reads the header row.
func parseHeader(head []string, line int, path string, f Format) (columns, []string, error) {
	c := columns{x: -1, y: -1, name: append([]string(nil), head...)}
	for i := range c.q {
		c.q[i] = -1
	}
	var ignored []string
	for i, raw := range head {
		name := strings.ToLower(strings.TrimSpace(strings.TrimPrefix(raw, "\ufeff")))
		base, unit, _ := strings.Cut(name, "_")
		if unit != "" && unit != string(MM) && unit != string(PX) {
			base, unit = name, ""
		}
		var slot *int
		switch base {
		case "x":
			slot = &c.x
		case "y":
			slot = &c.y
		default:
			if q, ok := parseQuantity(base); ok {
				slot = &c.q[q]
				if unit != "" && q.IsStrain() {
					return c, nil, fmt.Errorf("model %s line %d column %d: strain column %q has a length unit", path, line, i+1, raw)
				}
			}
		}
		if slot == nil {
			ignored = append(ignored, raw)
			continue
		}
		if *slot >= 0 {
			return c, nil, fmt.Errorf("model %s line %d column %d: %q repeats column %d (%s)", path, line, i+1, raw, *slot+1, head[*slot])
		}
		if unit != "" && Units(unit) != f.Units {
			return c, nil, fmt.Errorf("model %s line %d column %d: %q is in %s but the format says %s", path, line, i+1, raw, unit, f.Units)
		}
		*slot = i
	}
	switch {
	case c.x < 0 || c.y < 0:
		return c, nil, fmt.Errorf("model %s line %d: header %q lacks column x or y", path, line, strings.Join(head, ","))
	case c.q == [numQuantities]int{-1, -1, -1, -1, -1}:
		return c, nil, fmt.Errorf("model %s line %d: header %q has none of the columns u, v, exx, eyy, exy", path, line, strings.Join(head, ","))
	}
	return c, ignored, nil
}

// parse reads the CSV text of a model file.
func parse(r io.Reader, path string, f Format) (*Field, error) {
	cr := csv.NewReader(r)
	cr.Comment = '#'
	cr.FieldsPerRecord = -1
	cr.ReuseRecord = true
	head, err := cr.Read()
	if errors.Is(err, io.EOF) {
		return nil, fmt.Errorf("model %s: empty file, expected a header row", path)
	}
	if err != nil {
		return nil, fmt.Errorf("model %s: %w", path, err)
	}
	hline, _ := cr.FieldPos(0)
	c, ignored, err := parseHeader(head, hline, path, f)
	if err != nil {
		return nil, err
	}
	m := &Field{Path: path, Format: f, Ignored: ignored}
	for _, q := range Quantities {
		if c.q[q] >= 0 {
			m.Quantities = append(m.Quantities, q)
		}
	}
	// number reads column col of rec; NaN is allowed only where nanOK.
	number := func(rec []string, line, col int, nanOK bool) (float64, error) {
		if col >= len(rec) {
			return 0, fmt.Errorf("model %s line %d column %d (%s): missing, the row has %d of the header's %d columns", path, line, col+1, c.name[col], len(rec), len(c.name))
		}
		s := strings.TrimSpace(rec[col])
		if s == "" {
			return 0, fmt.Errorf("model %s line %d column %d (%s): empty; write NaN for a point without this value", path, line, col+1, c.name[col])
		}
		v, err := strconv.ParseFloat(s, 64)
		switch {
		case err != nil:
			return 0, fmt.Errorf("model %s line %d column %d (%s): %q is not a number", path, line, col+1, c.name[col], s)
		case math.IsInf(v, 0), math.IsNaN(v) && !nanOK:
			return 0, fmt.Errorf("model %s line %d column %d (%s): %q, expected a finite number", path, line, col+1, c.name[col], s)
		}
		return v, nil
	}
	for {
		rec, err := cr.Read()
		if errors.Is(err, io.EOF) {
			break
		}
		if err != nil {
			return nil, fmt.Errorf("model %s: %w", path, err)
		}
		line, _ := cr.FieldPos(0)
		if len(rec) > len(c.name) {
			return nil, fmt.Errorf("model %s line %d column %d: the row has %d columns, the header %d", path, line, len(c.name)+1, len(rec), len(c.name))
		}
		p := Point{Line: line}
		if p.ModelX, err = number(rec, line, c.x, false); err != nil {
			return nil, err
		}
		if p.ModelY, err = number(rec, line, c.y, false); err != nil {
			return nil, err
		}
		var raw [numQuantities]float64
		for q := range raw {
			raw[q] = math.NaN()
			if c.q[q] >= 0 {
				if raw[q], err = number(rec, line, c.q[q], true); err != nil {
					return nil, err
				}
			}
		}
		p.X, p.Y = f.ToImage(p.ModelX, p.ModelY)
		p.Values[U], p.Values[V] = f.DisplacementToImage(raw[U], raw[V])
		p.Values[Exx], p.Values[Eyy], p.Values[Exy] = f.StrainToImage(raw[Exx], raw[Eyy], raw[Exy])
		m.Points = append(m.Points, p)
	}
	if len(m.Points) == 0 {
		return nil, fmt.Errorf("model %s: no points after the header", path)
	}
	return m, nil
}

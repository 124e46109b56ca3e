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

	"spallscope/dic/logtable"
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
// Errors name the file and, for a bad row, its line and column: a cell
// that is not a number, an infinite one, a NaN position, a row with
// missing or extra cells, a line longer than logtable.MaxLine bytes, and
// a point or value that maps to a non-finite one in px (a huge number in
// mm at a small scale). A huge cell or header name is shown as an excerpt.
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
					return c, nil, fmt.Errorf("model %s line %d column %d: strain column %s has a length unit", path, line, i+1, logtable.Excerpt(raw))
				}
			}
		}
		if slot == nil {
			ignored = append(ignored, raw)
			continue
		}
		if *slot >= 0 {
			return c, nil, fmt.Errorf("model %s line %d column %d: %s repeats column %d (%s)", path, line, i+1, logtable.Excerpt(raw), *slot+1, logtable.Shown(head[*slot]))
		}
		if unit != "" && Units(unit) != f.Units {
			return c, nil, fmt.Errorf("model %s line %d column %d: %s is in %s but the format says %s", path, line, i+1, logtable.Excerpt(raw), unit, f.Units)
		}
		*slot = i
	}
	switch {
	case c.x < 0 || c.y < 0:
		return c, nil, fmt.Errorf("model %s line %d: header %s lacks column x or y", path, line, logtable.Excerpt(strings.Join(head, ",")))
	case c.q == [numQuantities]int{-1, -1, -1, -1, -1}:
		return c, nil, fmt.Errorf("model %s line %d: header %s has none of the columns u, v, exx, eyy, exy", path, line, logtable.Excerpt(strings.Join(head, ",")))
	}
	return c, ignored, nil
}

// parse reads the CSV text of a model file.
func parse(r io.Reader, path string, f Format) (*Field, error) {
	cr := csv.NewReader(logtable.LimitLines(r, logtable.MaxLine))
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
	// at names column col of line in errors.
	at := func(line, col int) string {
		return fmt.Sprintf("model %s line %d column %d (%s)", path, line, col+1, logtable.Shown(c.name[col]))
	}
	// number reads column col of rec; NaN is allowed only where nanOK.
	number := func(rec []string, line, col int, nanOK bool) (float64, error) {
		if col >= len(rec) {
			return 0, fmt.Errorf("%s: missing, the row has %d of the header's %d columns", at(line, col), len(rec), len(c.name))
		}
		s := strings.TrimSpace(rec[col])
		if s == "" {
			return 0, fmt.Errorf("%s: empty; write NaN for a point without this value", at(line, col))
		}
		v, err := strconv.ParseFloat(s, 64)
		switch {
		case errors.Is(err, strconv.ErrRange):
			return 0, fmt.Errorf("%s: %s is out of range, expected a finite number", at(line, col), logtable.Excerpt(s))
		case err != nil:
			return 0, fmt.Errorf("%s: %s is not a number", at(line, col), logtable.Excerpt(s))
		case math.IsInf(v, 0), math.IsNaN(v) && !nanOK:
			return 0, fmt.Errorf("%s: %s, expected a finite number", at(line, col), logtable.Excerpt(s))
		}
		return v, nil
	}
	// mapped checks that a number the format maps to px stayed finite
	// (NaN, for a value the file leaves out, stays NaN).
	mapped := func(line, col int, model, px float64) error {
		if math.IsInf(px, 0) || (math.IsNaN(px) && !math.IsNaN(model)) {
			return fmt.Errorf("%s: %g %s maps to %g px, expected a number that stays finite in px (check the scale and units)", at(line, col), model, f.Units, px)
		}
		return nil
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
		if err := mapped(line, c.x, p.ModelX, p.X); err != nil {
			return nil, err
		}
		if err := mapped(line, c.y, p.ModelY, p.Y); err != nil {
			return nil, err
		}
		for _, q := range []Quantity{U, V} {
			if c.q[q] >= 0 {
				if err := mapped(line, c.q[q], raw[q], p.Values[q]); err != nil {
					return nil, err
				}
			}
		}
		m.Points = append(m.Points, p)
	}
	if len(m.Points) == 0 {
		return nil, fmt.Errorf("model %s: no points after the header", path)
	}
	return m, nil
}

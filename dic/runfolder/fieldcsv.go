package runfolder

import (
	"bufio"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"

	"spallscope/dic"
	"spallscope/subset"
)

// FieldsDir is the run folder's subfolder of displacement fields.
const FieldsDir = "fields"

// FieldHeader is the header of a displacement field file.
const FieldHeader = "x,y,u,v,dudx,dudy,dvdx,dvdy,cc,iterations,status"

// FieldPath returns the path of a frame's field file in a run folder.
func FieldPath(dir, frame string) string { return filepath.Join(dir, FieldsDir, frame+".csv") }

// WriteField writes a displacement field as CSV, one row per grid point in
// row-major order: reference position (px), displacement (px), gradients,
// ZNCC, IC-GN iterations and status. Points without a measurement keep
// their row with NaN values and their status; the ZNCC of a point that
// decorrelated is kept, since it tells how badly. With a known scale the
// position and displacement in mm are appended (x_mm,y_mm,u_mm,v_mm). The
// file is written atomically.
func WriteField(path string, f *dic.Field, scale dic.Scale) error {
	if err := os.MkdirAll(filepath.Dir(path), 0o755); err != nil {
		return fmt.Errorf("write %s: %w", path, err)
	}
	return WriteAtomic(path, func(w *bufio.Writer) error {
		w.WriteString(FieldHeader)
		if scale.Known() {
			w.WriteString(",x_mm,y_mm,u_mm,v_mm")
		}
		w.WriteByte('\n')
		buf := make([]byte, 0, 256)
		for i := range f.Points {
			p := &f.Points[i]
			buf = strconv.AppendInt(buf[:0], int64(p.X), 10)
			buf = append(buf, ',')
			buf = strconv.AppendInt(buf, int64(p.Y), 10)
			for _, k := range [...]int{subset.PU, subset.PV, subset.PUx, subset.PUy, subset.PVx, subset.PVy} {
				buf = append(buf, ',')
				if p.Valid() {
					// Shortest form that reads back to the same float64: a
					// resumed run continues from exactly what was written.
					buf = strconv.AppendFloat(buf, p.P[k], 'g', -1, 64)
				} else {
					buf = append(buf, "NaN"...)
				}
			}
			buf = append(buf, ',')
			if p.Status != subset.Unsolved && p.ZNCC != 0 {
				buf = strconv.AppendFloat(buf, p.ZNCC, 'f', 6, 64)
			} else {
				buf = append(buf, "NaN"...)
			}
			buf = append(buf, ',')
			buf = strconv.AppendInt(buf, int64(p.Iterations), 10)
			buf = append(buf, ',')
			buf = append(buf, p.Status.String()...)
			if scale.Known() {
				u, v := p.U()
				for _, q := range [...]float64{float64(p.X), float64(p.Y), u, v} {
					buf = append(buf, ',')
					buf = strconv.AppendFloat(buf, scale.MM(q), 'g', 8, 64)
				}
			}
			buf = append(buf, '\n')
			if _, err := w.Write(buf); err != nil {
				return err
			}
		}
		return nil
	})
}

// ReadField reads a field file written by WriteField. The grid is
// recovered from the positions, which must form a complete row-major
// lattice; errors name the line.
func ReadField(path string) (*dic.Field, error) {
	rows, err := ReadCSV(path, FieldHeader, true)
	if err != nil {
		return nil, fmt.Errorf("field: %w", err)
	}
	cols := strings.Split(FieldHeader, ",")
	f := &dic.Field{Name: strings.TrimSuffix(filepath.Base(path), ".csv"), Points: make([]dic.Point, 0, len(rows))}
	for _, r := range rows {
		rec := r.Cells
		var p dic.Point
		var v [9]float64
		for k := 0; k < 9; k++ {
			if v[k], err = strconv.ParseFloat(rec[k], 64); err != nil {
				return nil, fmt.Errorf("field %s line %d column %s: %q is not a number", path, r.Line, cols[k], rec[k])
			}
		}
		it, err := strconv.Atoi(rec[9])
		if err != nil {
			return nil, fmt.Errorf("field %s line %d column iterations: %q is not an integer", path, r.Line, rec[9])
		}
		if p.Status, err = subset.ParseStatus(rec[10]); err != nil {
			return nil, fmt.Errorf("field %s line %d column status: %w", path, r.Line, err)
		}
		p.X, p.Y, p.Iterations = int(v[0]), int(v[1]), it
		if p.Valid() {
			p.P[subset.PU], p.P[subset.PV] = v[2], v[3]
			p.P[subset.PUx], p.P[subset.PUy], p.P[subset.PVx], p.P[subset.PVy] = v[4], v[5], v[6], v[7]
		}
		if !math.IsNaN(v[8]) {
			p.ZNCC = v[8]
		}
		f.Points = append(f.Points, p)
	}
	g, err := dic.GridOf(f.Points)
	if err != nil {
		return nil, fmt.Errorf("field %s: %w", path, err)
	}
	f.Grid = g
	return f, nil
}

package strainfile

import (
	"bufio"
	"fmt"
	"os"
	"path/filepath"
	"strconv"
	"strings"

	"spallscope/dic"
	"spallscope/dic/runfolder"
	"spallscope/strain"
)

// StrainDir is the run folder's subfolder of strain fields.
const StrainDir = "strain"

// StrainHeader is the header of a strain file; x_mm,y_mm follow when the
// scale is known.
const StrainHeader = "x,y,exx,eyy,exy,e1,e2,angle_deg,gamma_max,e_eq,valid"

// StrainPath returns the path of a frame's strain file in a run folder.
func StrainPath(dir, frame string) string { return filepath.Join(dir, StrainDir, frame+".csv") }

// WriteStrain writes a strain field as CSV, one row per grid point in
// row-major order: reference position (px), strain components
// (dimensionless, tension positive, exy the tensor shear), principal
// strains and direction, maximum shear, equivalent strain and valid (1/0);
// invalid points keep their row with NaN. With a known scale the position
// in mm is appended. The file is written atomically.
func WriteStrain(path string, f *strain.Field, scale dic.Scale) error {
	if err := os.MkdirAll(filepath.Dir(path), 0o755); err != nil {
		return err
	}
	return runfolder.WriteAtomic(path, func(w *bufio.Writer) error {
		w.WriteString(StrainHeader)
		if scale.Known() {
			w.WriteString(",x_mm,y_mm")
		}
		w.WriteByte('\n')
		buf := make([]byte, 0, 256)
		for i := range f.Points {
			p := &f.Points[i]
			buf = strconv.AppendInt(buf[:0], int64(p.X), 10)
			buf = append(buf, ',')
			buf = strconv.AppendInt(buf, int64(p.Y), 10)
			for _, v := range [...]float64{p.Exx, p.Eyy, p.Exy, p.E1, p.E2, p.AngleDeg, p.GammaMax, p.Eeq} {
				buf = append(buf, ',')
				if p.Valid {
					buf = strconv.AppendFloat(buf, v, 'g', 8, 64)
				} else {
					buf = append(buf, "NaN"...)
				}
			}
			if p.Valid {
				buf = append(buf, ",1"...)
			} else {
				buf = append(buf, ",0"...)
			}
			if scale.Known() {
				buf = append(buf, ',')
				buf = strconv.AppendFloat(buf, scale.MM(float64(p.X)), 'f', 4, 64)
				buf = append(buf, ',')
				buf = strconv.AppendFloat(buf, scale.MM(float64(p.Y)), 'f', 4, 64)
			}
			buf = append(buf, '\n')
			if _, err := w.Write(buf); err != nil {
				return err
			}
		}
		return nil
	})
}

// ReadStrain reads a strain file written by WriteStrain; errors name the
// line and column.
func ReadStrain(path string) (*strain.Field, error) {
	rows, err := runfolder.ReadCSV(path, StrainHeader, true)
	if err != nil {
		return nil, fmt.Errorf("strain: %w", err)
	}
	cols := strings.Split(StrainHeader, ",")
	f := &strain.Field{Name: strings.TrimSuffix(filepath.Base(path), ".csv"), Points: make([]strain.Point, 0, len(rows))}
	pts := make([]dic.Point, 0, len(rows)) // positions only, to recover the grid
	for _, r := range rows {
		rec := r.Cells
		var v [10]float64
		for k := 0; k < 10; k++ {
			if v[k], err = strconv.ParseFloat(rec[k], 64); err != nil {
				return nil, fmt.Errorf("strain %s line %d column %s: %q is not a number", path, r.Line, cols[k], rec[k])
			}
		}
		p := strain.Point{X: int(v[0]), Y: int(v[1]), Exx: v[2], Eyy: v[3], Exy: v[4], E1: v[5], E2: v[6], AngleDeg: v[7], GammaMax: v[8], Eeq: v[9]}
		switch rec[10] {
		case "1":
			p.Valid = true
		case "0":
		default:
			return nil, fmt.Errorf("strain %s line %d column valid: %q, expected 1 or 0", path, r.Line, rec[10])
		}
		f.Points = append(f.Points, p)
		pts = append(pts, dic.Point{X: p.X, Y: p.Y})
	}
	g, err := dic.GridOf(pts)
	if err != nil {
		return nil, fmt.Errorf("strain %s: %w", path, err)
	}
	f.Grid = g
	return f, nil
}

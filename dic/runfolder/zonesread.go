package runfolder

import (
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"strconv"
	"strings"
)

// ZoneRow is one row of zones.csv joined with the zone's grid points from
// zone_cells.csv.
type ZoneRow struct {
	Frame          string
	Time           float64
	Zone           int
	Sector         string
	Opening        string
	AreaMM2        float64
	Peak           float64
	Cx, Cy         float64
	Indicator      string
	Class          string
	AreaPx2        float64
	OrientationDeg float64
	Through        bool
	Cells          []int
}

// ReadZones reads the zones of a run folder (zones.csv and
// zone_cells.csv); errors name the file and line.
func ReadZones(dir string) ([]ZoneRow, error) {
	path := filepath.Join(dir, ZonesCSV)
	rows, err := readCSV(path, ZonesHeader)
	if err != nil {
		return nil, err
	}
	var out []ZoneRow
	index := map[string]int{}
	for _, r := range rows {
		z := ZoneRow{Frame: r.cells[0], Sector: r.cells[3], Opening: r.cells[4], Indicator: r.cells[9], Class: r.cells[10]}
		var perr error
		num := func(col int) float64 {
			v, err := strconv.ParseFloat(r.cells[col], 64)
			if err != nil && perr == nil {
				perr = fmt.Errorf("%s line %d column %s: %q is not a number", path, r.line, strings.Split(ZonesHeader, ",")[col], r.cells[col])
			}
			return v
		}
		z.Time, z.AreaMM2, z.Peak, z.Cx, z.Cy, z.AreaPx2, z.OrientationDeg = num(1), num(5), num(6), num(7), num(8), num(11), num(12)
		z.Zone = int(num(2))
		z.Through = r.cells[13] == "true"
		if perr != nil {
			return nil, perr
		}
		index[fmt.Sprintf("%s/%d/%s", z.Frame, z.Zone, z.Indicator)] = len(out)
		out = append(out, z)
	}
	cpath := filepath.Join(dir, ZoneCellsCSV)
	cells, err := readCSV(cpath, "frame,zone,indicator,cells")
	if err != nil {
		return nil, err
	}
	for _, r := range cells {
		k, ok := index[r.cells[0]+"/"+r.cells[1]+"/"+r.cells[2]]
		if !ok {
			return nil, fmt.Errorf("%s line %d: zone %s of frame %s is not in %s", cpath, r.line, r.cells[1], r.cells[0], ZonesCSV)
		}
		for _, c := range strings.Split(r.cells[3], ";") {
			n, err := strconv.Atoi(c)
			if err != nil {
				return nil, fmt.Errorf("%s line %d: cell %q is not a grid index", cpath, r.line, c)
			}
			out[k].Cells = append(out[k].Cells, n)
		}
	}
	return out, nil
}

type csvRow struct {
	line  int
	cells []string
}

// readCSV reads a CSV file whose header must be header, every row with as
// many cells.
func readCSV(path, header string) ([]csvRow, error) { return readCSVFrom(path, header, false) }

// readCSVFrom reads a CSV file whose header is header or, with extra, starts
// with it (optional columns may follow); every row must hold at least the
// header's cells. Errors name the file and line.
func readCSVFrom(path, header string, extra bool) ([]csvRow, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	r := csv.NewReader(f)
	r.FieldsPerRecord = -1
	head, err := r.Read()
	if err != nil {
		return nil, fmt.Errorf("%s: reading header: %w", path, err)
	}
	got := strings.Join(head, ",")
	if got != header && !(extra && strings.HasPrefix(got, header+",")) {
		return nil, fmt.Errorf("%s: header %q, expected %q", path, got, header)
	}
	want := len(strings.Split(header, ","))
	var out []csvRow
	for {
		rec, err := r.Read()
		if errors.Is(err, io.EOF) {
			return out, nil
		}
		line, _ := r.FieldPos(0)
		if err != nil {
			return nil, fmt.Errorf("%s: %w", path, err)
		}
		if len(rec) < want {
			return nil, fmt.Errorf("%s line %d: %d columns, expected %d", path, line, len(rec), want)
		}
		out = append(out, csvRow{line, rec})
	}
}

package strainfile

import (
	"fmt"
	"path/filepath"
	"strconv"
	"strings"

	"spallscope/dic/runfolder"
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
	rows, err := runfolder.ReadCSV(path, ZonesHeader, false)
	if err != nil {
		return nil, err
	}
	var out []ZoneRow
	index := map[string]int{}
	for _, r := range rows {
		z := ZoneRow{Frame: r.Cells[0], Sector: r.Cells[3], Opening: r.Cells[4], Indicator: r.Cells[9], Class: r.Cells[10]}
		var perr error
		num := func(col int) float64 {
			v, err := strconv.ParseFloat(r.Cells[col], 64)
			if err != nil && perr == nil {
				perr = fmt.Errorf("%s line %d column %s: %q is not a number", path, r.Line, strings.Split(ZonesHeader, ",")[col], r.Cells[col])
			}
			return v
		}
		z.Time, z.AreaMM2, z.Peak, z.Cx, z.Cy, z.AreaPx2, z.OrientationDeg = num(1), num(5), num(6), num(7), num(8), num(11), num(12)
		z.Zone = int(num(2))
		z.Through = r.Cells[13] == "true"
		if perr != nil {
			return nil, perr
		}
		index[fmt.Sprintf("%s/%d/%s", z.Frame, z.Zone, z.Indicator)] = len(out)
		out = append(out, z)
	}
	cpath := filepath.Join(dir, ZoneCellsCSV)
	cells, err := runfolder.ReadCSV(cpath, ZoneCellsHeader, false)
	if err != nil {
		return nil, err
	}
	for _, r := range cells {
		k, ok := index[r.Cells[0]+"/"+r.Cells[1]+"/"+r.Cells[2]]
		if !ok {
			return nil, fmt.Errorf("%s line %d: zone %s of frame %s is not in %s", cpath, r.Line, r.Cells[1], r.Cells[0], ZonesCSV)
		}
		for _, c := range strings.Split(r.Cells[3], ";") {
			n, err := strconv.Atoi(c)
			if err != nil {
				return nil, fmt.Errorf("%s line %d: cell %q is not a grid index", cpath, r.Line, c)
			}
			out[k].Cells = append(out[k].Cells, n)
		}
	}
	return out, nil
}

package strainfile

import (
	"bufio"
	"fmt"

	"spallscope/dic/runfolder"
	"spallscope/strain"
)

// Files of the zones stage.
const (
	ZonesCSV  = "zones.csv"
	OnsetJSON = "onset.json"
	// ZoneCellsCSV lists each zone's grid points (frame,zone,indicator,
	// cells with cells the ';'-separated row-major grid indices), for
	// drawing zone outlines.
	ZoneCellsCSV = "zone_cells.csv"
)

// ZonesHeader is the header of zones.csv: the output contract's columns,
// then the indicator, the onset class, the area in px², the orientation
// and whether the zone is through-going.
const ZonesHeader = "frame,time_s,zone,sector,opening,area_mm2,peak,cx,cy,indicator,class,area_px2,orientation_deg,through"

// ZoneCellsHeader is the header of zone_cells.csv.
const ZoneCellsHeader = "frame,zone,indicator,cells"

// WriteZones writes every zone of every frame, one row each.
func WriteZones(path string, f *strain.Finder, openingName func(int) string) error {
	frames := f.Frames()
	byIndex := map[int]strain.Frame{}
	for _, fr := range frames {
		byIndex[fr.Index] = fr
	}
	return runfolder.WriteAtomic(path, func(w *bufio.Writer) error {
		w.WriteString(ZonesHeader + "\n")
		for _, z := range f.Zones() {
			fr := byIndex[z.Frame]
			opening := openingName(z.Opening)
			fmt.Fprintf(w, "%s,%.3f,%d,%s,%s,%.4g,%.6g,%.1f,%.1f,%s,%s,%.0f,%.1f,%t\n",
				fr.Name, fr.Time, z.ID, z.Sector, opening, z.AreaMM2, z.Peak, z.Cx, z.Cy, z.Indicator, z.Indicator.Class(),
				z.AreaPx2, z.OrientationDeg, z.Through())
		}
		return nil
	})
}

// WriteZoneCells writes the grid points of every zone.
func WriteZoneCells(path string, f *strain.Finder) error {
	names := map[int]string{}
	for _, fr := range f.Frames() {
		names[fr.Index] = fr.Name
	}
	return runfolder.WriteAtomic(path, func(w *bufio.Writer) error {
		w.WriteString(ZoneCellsHeader + "\n")
		for _, z := range f.Zones() {
			fmt.Fprintf(w, "%s,%d,%s,", names[z.Frame], z.ID, z.Indicator)
			for k, c := range z.Cells {
				if k > 0 {
					w.WriteByte(';')
				}
				fmt.Fprint(w, c)
			}
			w.WriteByte('\n')
		}
		return nil
	})
}

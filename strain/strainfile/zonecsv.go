package strainfile

import (
	"bufio"
	"encoding/csv"
	"fmt"
	"strconv"
	"strings"

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
		cw := csv.NewWriter(w) // frame and opening names may hold commas and quotes
		cw.Write(strings.Split(ZonesHeader, ","))
		for _, z := range f.Zones() {
			fr := byIndex[z.Frame]
			cw.Write([]string{fr.Name, fmt.Sprintf("%.3f", fr.Time), strconv.Itoa(z.ID), string(z.Sector), openingName(z.Opening),
				fmt.Sprintf("%.4g", z.AreaMM2), fmt.Sprintf("%.6g", z.Peak), fmt.Sprintf("%.1f", z.Cx), fmt.Sprintf("%.1f", z.Cy),
				string(z.Indicator), z.Indicator.Class(), fmt.Sprintf("%.0f", z.AreaPx2), fmt.Sprintf("%.1f", z.OrientationDeg),
				strconv.FormatBool(z.Through())})
		}
		cw.Flush()
		return cw.Error()
	})
}

// WriteZoneCells writes the grid points of every zone.
func WriteZoneCells(path string, f *strain.Finder) error {
	names := map[int]string{}
	for _, fr := range f.Frames() {
		names[fr.Index] = fr.Name
	}
	return runfolder.WriteAtomic(path, func(w *bufio.Writer) error {
		cw := csv.NewWriter(w)
		cw.Write(strings.Split(ZoneCellsHeader, ","))
		var cells strings.Builder
		for _, z := range f.Zones() {
			cells.Reset()
			for k, c := range z.Cells {
				if k > 0 {
					cells.WriteByte(';')
				}
				cells.WriteString(strconv.Itoa(c))
			}
			cw.Write([]string{names[z.Frame], strconv.Itoa(z.ID), string(z.Indicator), cells.String()})
		}
		cw.Flush()
		return cw.Error()
	})
}

package runfolder

import (
	"bufio"
	"fmt"
	"path/filepath"

	"spallscope/dic"
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

// TimelineRecord is the run.json section of every frame's time and
// nominal stress (written by the zones stage).
type TimelineRecord struct {
	Frames []string  `json:"frames"`
	Times  []float64 `json:"times_s"`
	Stress []float64 `json:"stress_MPa"`
	InSpan []bool    `json:"in_load_log"`
}

// LoadRecord is the run.json section describing the load log used, with
// its nominal-stress history on the camera's clock (at most a few thousand
// samples) for plotting.
type LoadRecord struct {
	Path    string    `json:"path"`
	AreaMM2 float64   `json:"area_mm2"`
	Offset  float64   `json:"clock_offset_s"`
	Times   []float64 `json:"times_s"`
	Stress  []float64 `json:"stress_MPa"`
	Peak    float64   `json:"peak_MPa"`
	PeakAt  float64   `json:"peak_time_s"`
	Notes   []string  `json:"notes,omitempty"`
}

// ZonesHeader is the header of zones.csv: the output contract's columns,
// then the indicator, the onset class, the area in px², the orientation
// and whether the zone is through-going.
const ZonesHeader = "frame,time_s,zone,sector,opening,area_mm2,peak,cx,cy,indicator,class,area_px2,orientation_deg,through"

// FrameState is where a frame sits in the test: camera time and nominal
// stress from the load log, as plain values.
type FrameState struct {
	Name   string
	Time   float64
	Stress float64
	InSpan bool
}

// ZoneStage sets up the zones stage.
type ZoneStage struct {
	Finder strain.FinderConfig
	// OpeningNames name the openings of Finder.Sectors (default A, B, ...).
	OpeningNames []string
	// CalibrateBelow is the fraction of the peak stress up to which frames
	// calibrate each point's elastic response (default 0.2).
	CalibrateBelow float64
	// CalibrateFrames is the number of first frames that calibrate when
	// there is no load (no stress above zero): default 3.
	CalibrateFrames int
	// K is the lateral to vertical far-field stress ratio and UCS the
	// rock's uniaxial compressive strength (MPa, 0 = unknown), for the
	// Kirsch context of sidewall and crown onsets.
	K, UCS float64
}

// OnsetReport is the content of onset.json.
type OnsetReport struct {
	Tool       string            `json:"tool"`
	Peak       PeakRecord        `json:"peak"`
	Openings   []OpeningRecord   `json:"openings"`
	Onsets     []OnsetRecord     `json:"onsets"`
	Settings   ZoneSettings      `json:"settings"`
	Resolution *ResolutionRecord `json:"resolution,omitempty"`
	Cautions   []string          `json:"cautions"`
}

// PeakRecord is the peak nominal stress of the test.
type PeakRecord struct {
	Stress float64 `json:"stress_MPa"`
	Time   float64 `json:"time_s"`
	Frame  string  `json:"frame"`
}

// OpeningRecord names an opening.
type OpeningRecord struct {
	Index int    `json:"index"`
	Name  string `json:"name"`
}

// OnsetRecord is one onset with its opening's name and its context.
type OnsetRecord struct {
	strain.Onset
	OpeningName string          `json:"opening"`
	Context     *strain.Context `json:"context,omitempty"`
}

// ZoneSettings records how zones were found.
type ZoneSettings struct {
	Indicators     []strain.Indicator `json:"indicators"`
	Thresholds     strain.Thresholds  `json:"thresholds"`
	Persistence    int                `json:"persistence_frames"`
	CalibrateBelow float64            `json:"calibrate_below_fraction_of_peak"`
	CalibFrames    int                `json:"calibration_frames"`
	K              float64            `json:"k_lateral"`
	UCS            float64            `json:"ucs_MPa,omitempty"`
}

// Cautions are printed with every onset report.
var Cautions = []string{
	"Compression tests of brittle specimens can fail violently; onset times are no warning system for people near a loaded specimen.",
	"Onsets are measured events with the stated resolution, not design values.",
	"Support and excavation design belong to licensed engineers under local codes.",
}

// Zones runs the zones stage over run folder dir: it fits each point's
// elastic response on the calibration frames (stress up to CalibrateBelow
// of the peak), finds and tracks the localized zones of every frame, and
// writes dir/zones.csv and dir/onset.json. frames gives each recorded
// frame's time and stress (same order as the track record).
func Zones(dir string, st ZoneStage, frames []FrameState, tool string) (*OnsetReport, error) {
	names, err := Frames(dir)
	if err != nil {
		return nil, err
	}
	if len(frames) != len(names) {
		return nil, fmt.Errorf("zones: %d frame states for the run's %d frames", len(frames), len(names))
	}
	if st.CalibrateBelow == 0 {
		st.CalibrateBelow = 0.2
	}
	peak := PeakRecord{Frame: names[0]}
	for k, f := range frames {
		if f.Stress > peak.Stress {
			peak = PeakRecord{Stress: f.Stress, Time: f.Time, Frame: names[k]}
		}
	}
	// Calibration: the elastic part of the test.
	var calib []*strain.Field
	var calibStress []float64
	if st.CalibrateFrames == 0 {
		st.CalibrateFrames = 3
	}
	read := map[int]*strain.Field{} // calibration frames, read once for both passes
	for k, name := range names {
		loaded := peak.Stress > 0
		if (loaded && frames[k].Stress <= st.CalibrateBelow*peak.Stress) || (!loaded && k < st.CalibrateFrames) {
			sf, err := ReadStrain(StrainPath(dir, name))
			if err != nil {
				return nil, err
			}
			read[k] = sf
			calib, calibStress = append(calib, sf), append(calibStress, frames[k].Stress)
		}
	}
	ref, err := ReadField(FieldPath(dir, names[0]))
	if err != nil {
		return nil, err
	}
	finder, err := strain.NewFinder(st.Finder, ref, strain.FitBaseline(calib, calibStress))
	if err != nil {
		return nil, err
	}
	for k, name := range names {
		sf, ok := read[k]
		if !ok {
			if sf, err = ReadStrain(StrainPath(dir, name)); err != nil {
				return nil, err
			}
		}
		delete(read, k)
		df, err := ReadField(FieldPath(dir, name))
		if err != nil {
			return nil, err
		}
		fr := strain.Frame{Index: k, Name: name, Time: frames[k].Time, Stress: frames[k].Stress, InSpan: frames[k].InSpan, Strain: sf, Disp: df}
		if _, err := finder.Add(fr); err != nil {
			return nil, err
		}
	}
	rep := &OnsetReport{Tool: tool, Peak: peak, Cautions: Cautions,
		Settings: ZoneSettings{Indicators: finder.Config().Indicators, Thresholds: finder.Config().Thresholds, Persistence: finder.Config().Persistence,
			CalibrateBelow: st.CalibrateBelow, CalibFrames: len(calib), K: st.K, UCS: st.UCS}}
	openingName := func(i int) string {
		switch {
		case i < 0:
			return ""
		case i < len(st.OpeningNames) && st.OpeningNames[i] != "":
			return st.OpeningNames[i]
		}
		return string(rune('A' + i%26))
	}
	for i := range st.Finder.Sectors.Openings {
		rep.Openings = append(rep.Openings, OpeningRecord{Index: i, Name: openingName(i)})
	}
	if err := writeZones(filepath.Join(dir, ZonesCSV), finder, openingName); err != nil {
		return nil, err
	}
	if err := writeZoneCells(filepath.Join(dir, ZoneCellsCSV), finder); err != nil {
		return nil, err
	}
	tl := TimelineRecord{Frames: names}
	for _, f := range frames {
		tl.Times, tl.Stress, tl.InSpan = append(tl.Times, f.Time), append(tl.Stress, f.Stress), append(tl.InSpan, f.InSpan)
	}
	if err := SetSection(dir, "timeline", tl); err != nil {
		return nil, err
	}
	for _, o := range finder.Onsets(peak.Stress) {
		r := OnsetRecord{Onset: o, OpeningName: openingName(o.Opening)}
		if c, ok := strain.NewContext(o.Sector, o.Stress, st.K, st.UCS); ok && o.Opening >= 0 {
			r.Context = c
		}
		rep.Onsets = append(rep.Onsets, r)
	}
	var res ResolutionRecord
	if Section(dir, "resolution", &res) == nil {
		rep.Resolution = &res
	}
	err = WriteJSON(filepath.Join(dir, OnsetJSON), rep)
	return rep, err
}

// writeZones writes every zone of every frame, one row each.
func writeZones(path string, f *strain.Finder, openingName func(int) string) error {
	frames := f.Frames()
	byIndex := map[int]strain.Frame{}
	for _, fr := range frames {
		byIndex[fr.Index] = fr
	}
	return WriteAtomic(path, func(w *bufio.Writer) error {
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

// Scale returns the run's image scale from its track or strain record
// (0 when neither knows it).
func Scale(dir string) dic.Scale {
	var tr TrackRecord
	if Section(dir, "track", &tr) == nil && tr.MMPerPx.Known() {
		return tr.MMPerPx
	}
	var sr StrainRecord
	if Section(dir, "strain", &sr) == nil {
		return sr.MMPerPx
	}
	return 0
}

// writeZoneCells writes the grid points of every zone.
func writeZoneCells(path string, f *strain.Finder) error {
	names := map[int]string{}
	for _, fr := range f.Frames() {
		names[fr.Index] = fr.Name
	}
	return WriteAtomic(path, func(w *bufio.Writer) error {
		w.WriteString("frame,zone,indicator,cells\n")
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

package stage

import (
	"fmt"
	"path/filepath"

	"spallscope/dic/runfolder"
	"spallscope/strain"
	"spallscope/strain/strainfile"
)

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

// DefaultOpeningName names the i-th opening when it has no name: A, B, ...
func DefaultOpeningName(i int) string { return string(rune('A' + i%26)) }

// Effective returns the settings with defaults in their zero fields
// (calibration up to 0.2 of the peak, or the first 3 frames without a
// load, and the finder's defaults), as the stage applies them.
func (st ZoneStage) Effective() ZoneStage {
	if st.CalibrateBelow == 0 {
		st.CalibrateBelow = 0.2
	}
	if st.CalibrateFrames == 0 {
		st.CalibrateFrames = 3
	}
	st.Finder = st.Finder.Effective()
	return st
}

// Zones runs the zones stage over run folder dir: it fits each point's
// elastic response on the calibration frames (stress up to CalibrateBelow
// of the peak), finds and tracks the localized zones of every frame, and
// writes dir/zones.csv, dir/zone_cells.csv, dir/noise_scale.csv (the
// factor by which each point's bar was raised) and dir/onset.json. frames
// gives each recorded frame's time and stress (same order as the track
// record).
func Zones(dir string, st ZoneStage, frames []FrameState, tool string) (*strainfile.OnsetReport, error) {
	names, err := runfolder.Frames(dir)
	if err != nil {
		return nil, err
	}
	if len(frames) != len(names) {
		return nil, fmt.Errorf("zones: %d frame states for the run's %d frames", len(frames), len(names))
	}
	st = st.Effective()
	// The strain files do not carry the strain window; the run's strain
	// record does. The finder needs it for the VSG that groups onsets
	// into events (strain.JoinEvents): without it no two onsets a VSG
	// apart would join.
	var rec strainfile.StrainRecord
	if err := runfolder.Section(dir, "strain", &rec); err != nil {
		return nil, fmt.Errorf("zones: %w", err)
	}
	if rec.Window < 3 {
		return nil, fmt.Errorf("zones: run.json's strain section gives a %d-point strain window, expected 3 or more (run the strain stage first)", rec.Window)
	}
	readStrain := func(name string) (*strain.Field, error) {
		sf, err := strainfile.ReadStrain(strainfile.StrainPath(dir, name))
		if err != nil {
			return nil, err
		}
		sf.Window = rec.Window
		return sf, nil
	}
	peak := strainfile.PeakRecord{Frame: names[0]}
	for k, f := range frames {
		if f.Stress > peak.Stress {
			peak = strainfile.PeakRecord{Stress: f.Stress, Time: f.Time, Frame: names[k]}
		}
	}
	// Calibration: the elastic part of the test. Its frames are read
	// twice, for the baseline and then for the noise about it, rather
	// than held: a long test has hundreds (5 GB of strain fields for 300
	// frames of 200,000 points).
	var calibK []int
	calibration := make([]bool, len(names))
	for k := range names {
		loaded := peak.Stress > 0
		if (loaded && frames[k].Stress <= st.CalibrateBelow*peak.Stress) || (!loaded && k < st.CalibrateFrames) {
			calibK = append(calibK, k)
			calibration[k] = true
		}
	}
	eachCalibration := func(use func(sf *strain.Field, stress float64)) error {
		read := func(j int) (*strain.Field, error) { return readStrain(names[calibK[j]]) }
		return runfolder.ReadInOrder(len(calibK), read, func(j int, sf *strain.Field) error {
			use(sf, frames[calibK[j]].Stress)
			return nil
		})
	}
	var fit strain.BaselineFit
	if err := eachCalibration(fit.Add); err != nil {
		return nil, err
	}
	ref, err := runfolder.ReadField(runfolder.FieldPath(dir, names[0]))
	if err != nil {
		return nil, err
	}
	finder, err := strain.NewFinder(st.Finder, ref, fit.Baseline())
	if err != nil {
		return nil, err
	}
	noise := finder.NoiseFit()
	if err := eachCalibration(noise.Add); err != nil {
		return nil, err
	}
	finder.SetNoiseFrom(noise)
	// Pass 1 finds and confirms the zones; pass 2 reads the confirmed
	// zones' cells in every frame to back-date their onsets. Each pass
	// parses the next frames' files on all cores while one frame is used
	// (runfolder.ReadInOrder), in frame order.
	// The second pass reads the displacement fields only when a
	// decorrelation onset needs them (Dating.NeedsDisplacement).
	frameAt := func(disp bool) func(k int) (strain.Frame, error) {
		return func(k int) (strain.Frame, error) {
			name := names[k]
			sf, err := readStrain(name)
			if err != nil {
				return strain.Frame{}, err
			}
			fr := strain.Frame{Index: k, Name: name, Time: frames[k].Time, Stress: frames[k].Stress, InSpan: frames[k].InSpan, Strain: sf}
			if disp {
				if fr.Disp, err = runfolder.ReadField(runfolder.FieldPath(dir, name)); err != nil {
					return strain.Frame{}, err
				}
			}
			return fr, nil
		}
	}
	err = runfolder.ReadInOrder(len(names), frameAt(true), func(_ int, fr strain.Frame) error {
		_, err := finder.Add(fr)
		return err
	})
	if err != nil {
		return nil, err
	}
	calibFrames := len(calibK)
	onsets := finder.Onsets(peak.Stress)
	if len(onsets) > 0 {
		dating := finder.Dating(onsets)
		err := runfolder.ReadInOrder(len(names), frameAt(dating.NeedsDisplacement()), func(_ int, fr strain.Frame) error {
			dating.Add(fr)
			return nil
		})
		if err != nil {
			return nil, err
		}
		onsets = strain.JoinEvents(dating.Onsets(calibration, peak.Stress), finder.VSG())
	}
	rep := &strainfile.OnsetReport{Tool: tool, Peak: peak, Cautions: strainfile.Cautions,
		Settings: strainfile.ZoneSettings{Indicators: finder.Config().Indicators, Thresholds: finder.Config().Thresholds, Persistence: finder.Config().Persistence,
			CalibrateBelow: st.CalibrateBelow, CalibFrames: calibFrames, K: st.K, UCS: st.UCS, EventJoinPx: finder.VSG()}}
	openingName := func(i int) string {
		switch {
		case i < 0:
			return ""
		case i < len(st.OpeningNames) && st.OpeningNames[i] != "":
			return st.OpeningNames[i]
		}
		return DefaultOpeningName(i)
	}
	for i := range st.Finder.Sectors.Openings {
		rep.Openings = append(rep.Openings, strainfile.OpeningRecord{Index: i, Name: openingName(i)})
	}
	if err := strainfile.WriteZones(filepath.Join(dir, strainfile.ZonesCSV), finder, openingName); err != nil {
		return nil, err
	}
	if err := strainfile.WriteZoneCells(filepath.Join(dir, strainfile.ZoneCellsCSV), finder); err != nil {
		return nil, err
	}
	if err := strainfile.WriteNoiseScale(filepath.Join(dir, strainfile.NoiseScaleCSV), ref.Grid, finder.NoiseScale()); err != nil {
		return nil, err
	}
	tl := strainfile.TimelineRecord{Frames: names}
	for _, f := range frames {
		tl.Times, tl.Stress, tl.InSpan = append(tl.Times, f.Time), append(tl.Stress, f.Stress), append(tl.InSpan, f.InSpan)
	}
	if err := runfolder.SetSection(dir, "timeline", tl); err != nil {
		return nil, err
	}
	for _, o := range onsets {
		r := strainfile.OnsetRecord{Onset: o, OpeningName: openingName(o.Opening)}
		if c, ok := strain.NewContext(o.Sector, o.Stress, st.K, st.UCS); ok && o.Opening >= 0 {
			r.Context = c
		}
		rep.Onsets = append(rep.Onsets, r)
	}
	var res strainfile.ResolutionRecord
	if runfolder.Section(dir, "resolution", &res) == nil {
		rep.Resolution = &res
	}
	rep.DetectionLimits = detectionLimits(rec, finder)
	err = runfolder.WriteJSON(filepath.Join(dir, strainfile.OnsetJSON), rep)
	return rep, err
}

// detectionLimits are the smallest fractures the run could see, per strain
// indicator, from the finder's noise and the strain record's VSG.
func detectionLimits(sr strainfile.StrainRecord, finder *strain.Finder) []strainfile.DetectionLimit {
	k := finder.Config().Thresholds.K
	var out []strainfile.DetectionLimit
	for _, ind := range finder.Config().Indicators {
		floor, ok := finder.Floor()[ind]
		if !ok {
			continue
		}
		l := strainfile.DetectionLimit{Indicator: ind, Noise: finder.Noise()[ind], K: k, Strain: floor, VSG: sr.VSG,
			OpeningPx: floor * float64(sr.VSG)}
		if sr.MMPerPx.Known() {
			l.OpeningMM = sr.MMPerPx.MM(l.OpeningPx)
		}
		out = append(out, l)
	}
	return out
}

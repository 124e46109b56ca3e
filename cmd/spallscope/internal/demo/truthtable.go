package demo

import (
	"bufio"
	"encoding/csv"
	"encoding/json"
	"fmt"
	"os"
	"path/filepath"
	"strconv"

	"spallscope/dic"
	"spallscope/dic/runfolder"
	"spallscope/dic/synth"
	"spallscope/strain"
	"spallscope/strain/strainfile"
)

// TruthRow is one line of the demo's truth table: a damage feature of a
// face, where it starts, when it starts (its hidden start) and the first
// frame at which the face's run could report it. With the face's run at
// hand that is the kernel truth (strain.KernelTruth: the feature's own
// displacement, as the run's subsets would report it at the run's measured
// grid points, through the run's own strain window, above the run's γmax
// detection limit raised at each point as the run raised its bar there:
// by the noise scale its zones stage measured and recorded,
// noise_scale.csv, or by its window's theoretical noise gain for a run
// without that record), the earliest frame the run could report; the box
// truth (synth.FeatureTruthOnGrid: the exact gradient averaged over the
// VSG, windows centred on the grid's points) is kept beside it.
type TruthRow struct {
	Face    string
	Feature string
	Kind    string
	Opening string // the config's name of its opening, "-" for none
	Sector  string
	Wall    string // in a pillar, the pillar's wall of that opening
	// HiddenStart and Detectable are frame indices (Detectable −1:
	// never), with their frames' names. Detectable is the kernel truth's
	// where Kernel, else the box truth's (BoxDetectable).
	HiddenStart, Detectable    int
	HiddenName, DetectableName string
	Kernel                     bool
	// MeasuredBar says the kernel truth's bar at each point is the one
	// the run applied (its recorded noise scale); false with Kernel: the
	// window's theoretical noise gain, for the reason in BarNote.
	MeasuredBar                    bool
	BarNote                        string
	BoxDetectable                  int
	BoxDetectableName              string
	VSG                            int
	Limit                          float64 // the γmax limit applied
	LimitFromRun                   bool    // the face run's own limit, VSG and grid, not the truth file's nominal ones
	HiddenStress, DetectableStress float64 // nominal stress at those frames, MPa
}

// TruthTable returns the truth rows of both faces. With a face's run in
// faceDir(face), a feature's detectable frame is that of the run's own
// measurement: its γmax detection limit and VSG (the strain stage's,
// (window − 1) × step + subset, from onset.json's detection limits) over
// windows centred on the run's grid points (run.json's track grid;
// synth.FeatureTruthOnGrid), recomputed from the scenario. Without a run,
// it is the truth file's: its nominal limit and VSG, windows at every
// pixel.
func (d *Demo) TruthTable(faceDir func(face string) string) []TruthRow {
	var rows []TruthRow
	for _, f := range []struct {
		name  string
		sc    *synth.Scenario
		truth *synth.Truth
	}{{FrontFace, d.Front, d.Truth}, {TwinFace, d.Twin, d.TwinTruth}} {
		if f.truth == nil {
			continue
		}
		features, limit, fromRun := f.truth.Features, f.truth.Detection.Limit, false
		run, haveRun := runMeasurement(faceDir(f.name))
		if haveRun {
			if fs, err := f.sc.FeatureTruthOnGrid(run.vsg, run.limit, run.grid); err == nil {
				features, limit, fromRun = fs, run.limit, true
			}
		}
		name := func(i int) string {
			if i < 0 || i >= f.sc.Frames {
				return "never"
			}
			return f.sc.FrameName(i)
		}
		stress := func(i int) float64 {
			if i < 0 {
				return 0
			}
			return f.sc.Stress(i)
		}
		for _, ft := range features {
			boxDet := ft.FirstAbove(limit)
			det, kernel, measured, note := boxDet, false, false, ""
			var bar []float64
			if fromRun && run.window.Size > 0 && ft.Kind != synth.FeatureSpall {
				if kt, err := kernelTruth(f.sc, ft.Field, run); err == nil {
					// The run's own bar where it recorded one, else the
					// window's theoretical gain in its place.
					bar, note = kt.Gain, run.scaleNote
					if measured = run.scale != nil; measured {
						bar = run.scale
					}
					if det, err = kt.FirstAboveScale(run.limit, bar); err == nil {
						kernel = true
					} else {
						det, measured, note = boxDet, false, err.Error()
					}
				}
			}
			rows = append(rows, TruthRow{Face: f.name, Feature: ft.Feature, Kind: ft.Kind, Opening: OpeningName(ft.Opening),
				Sector: string(ft.Sector), Wall: string(ft.Wall), HiddenStart: ft.HiddenStart, Detectable: det,
				HiddenName: name(ft.HiddenStart), DetectableName: name(det), Kernel: kernel, MeasuredBar: measured, BarNote: note,
				BoxDetectable: boxDet, BoxDetectableName: name(boxDet),
				VSG: ft.VSG, Limit: limit, LimitFromRun: fromRun, HiddenStress: stress(ft.HiddenStart), DetectableStress: stress(det)})
		}
	}
	return rows
}

// measurement is what a run measured strain with: its γmax detection
// limit, its VSG and its grid; and, when its strain record and first
// field are readable, its strain window, subset size and measured points
// (window.Size 0: not known); and the factor by which its zones stage
// raised the γmax bar at each point (noise_scale.csv; nil when the run
// has none, why in scaleNote).
type measurement struct {
	limit     float64
	vsg       int
	grid      synth.Placement
	track     dic.Grid
	window    strain.Window
	subset    int
	measured  []bool
	scale     []float64
	scaleNote string
}

// kernelTruth is field i's kernel truth in γmax on run's grid: its own
// displacement as the run's subsets report it (synth.FeatureFieldOnGrid,
// the subset's mean) at the run's measured points, through the run's
// strain window.
func kernelTruth(sc *synth.Scenario, i int, run measurement) (strain.KernelTruth, error) {
	fields := make([]*dic.Field, sc.Frames)
	for f := range fields {
		df, err := sc.FeatureFieldOnGrid(i, f, run.track, run.measured, run.subset)
		if err != nil {
			return strain.KernelTruth{}, err
		}
		fields[f] = df
	}
	return run.window.KernelTruth(fields, strain.MaxShear)
}

// runMeasurement reads the γmax detection limit and VSG of the run in dir
// (onset.json) and its grid (run.json's track section).
func runMeasurement(dir string) (measurement, bool) {
	data, err := os.ReadFile(filepath.Join(dir, strainfile.OnsetJSON))
	if err != nil {
		return measurement{}, false
	}
	var rep struct {
		Limits []strainfile.DetectionLimit `json:"detection_limits"`
	}
	if json.Unmarshal(data, &rep) != nil {
		return measurement{}, false
	}
	var track runfolder.TrackRecord
	if runfolder.Section(dir, "track", &track) != nil || track.Grid.Step < 1 {
		return measurement{}, false
	}
	for _, l := range rep.Limits {
		if l.Indicator == strain.MaxShear && l.Strain > 0 && l.VSG >= 2 {
			m := measurement{limit: l.Strain, vsg: l.VSG, grid: synth.Placement{X0: track.Grid.X0, Y0: track.Grid.Y0, Step: track.Grid.Step}, track: track.Grid}
			m.window, m.subset, m.measured = runWindow(dir, track)
			m.scale, m.scaleNote = runScale(dir, track.Grid)
			return m, true
		}
	}
	return measurement{}, false
}

// runScale reads the factor by which the run in dir raised its γmax bar
// at each point of its grid (noise_scale.csv); nil, and why, when the
// run has no such record (a run folder from before it was written) or it
// is unreadable.
func runScale(dir string, g dic.Grid) ([]float64, string) {
	path := filepath.Join(dir, strainfile.NoiseScaleCSV)
	if _, err := os.Stat(path); err != nil {
		return nil, fmt.Sprintf("the run has no %s", strainfile.NoiseScaleCSV)
	}
	scale, err := strainfile.ReadNoiseScale(path, g)
	if err != nil {
		return nil, err.Error()
	}
	if scale[strain.MaxShear] == nil {
		return nil, fmt.Sprintf("%s has no %s rows", path, strain.MaxShear)
	}
	return scale[strain.MaxShear], ""
}

// runWindow reads the strain window and subset size of the run in dir
// (run.json's strain section) and its measured points (those valid in the
// field of its first tracked frame, on the track grid); a zero window
// when either is missing.
func runWindow(dir string, track runfolder.TrackRecord) (strain.Window, int, []bool) {
	var sr strainfile.StrainRecord
	if runfolder.Section(dir, "strain", &sr) != nil || sr.Window < 3 || len(track.Frames) == 0 {
		return strain.Window{}, 0, nil
	}
	ref, err := runfolder.ReadField(runfolder.FieldPath(dir, track.Frames[0]))
	if err != nil || ref.Grid != track.Grid {
		return strain.Window{}, 0, nil
	}
	measured := make([]bool, len(ref.Points))
	for i, p := range ref.Points {
		measured[i] = p.Valid()
	}
	return strain.Window{Size: sr.Window, Order: sr.Order, Measure: sr.Measure}, sr.Subset, measured
}

// WriteTruthTable writes the rows as CSV (atomically): face, feature,
// kind, opening, sector, wall, hidden_start_frame, hidden_start_name,
// hidden_start_stress_MPa, detectable_frame (−1: never), detectable_name,
// detectable_stress_MPa, vsg_px, limit_gamma_max, limit_source (run or
// nominal), detectable_source (kernel: the kernel truth at the run's own
// per-point bar, its noise_scale.csv; kernel_gain: the kernel truth with
// the window's theoretical noise gain in its place, for a run without
// that record; box: the box truth), box_detectable_frame and
// box_detectable_name (the box truth's, beside the kernel truth's).
func WriteTruthTable(path string, rows []TruthRow) error {
	return runfolder.WriteAtomic(path, func(w *bufio.Writer) error {
		cw := csv.NewWriter(w)
		cw.Write([]string{"face", "feature", "kind", "opening", "sector", "wall", "hidden_start_frame", "hidden_start_name",
			"hidden_start_stress_MPa", "detectable_frame", "detectable_name", "detectable_stress_MPa", "vsg_px", "limit_gamma_max", "limit_source",
			"detectable_source", "box_detectable_frame", "box_detectable_name"})
		f := func(v float64) string { return strconv.FormatFloat(v, 'g', 6, 64) }
		for _, r := range rows {
			src := "nominal"
			if r.LimitFromRun {
				src = "run"
			}
			cw.Write([]string{r.Face, r.Feature, r.Kind, r.Opening, r.Sector, r.Wall, strconv.Itoa(r.HiddenStart), r.HiddenName,
				f(r.HiddenStress), strconv.Itoa(r.Detectable), r.DetectableName, f(r.DetectableStress), strconv.Itoa(r.VSG), f(r.Limit), src,
				r.Source(), strconv.Itoa(r.BoxDetectable), r.BoxDetectableName})
		}
		cw.Flush()
		return cw.Error()
	})
}

// Source names the truth a row's detectable frame is: kernel (the kernel
// truth at the run's own per-point bar), kernel_gain (the kernel truth
// with the window's theoretical noise gain as the bar: the run recorded
// no noise scale) or box.
func (r TruthRow) Source() string {
	switch {
	case r.Kernel && r.MeasuredBar:
		return "kernel"
	case r.Kernel:
		return "kernel_gain"
	}
	return "box"
}

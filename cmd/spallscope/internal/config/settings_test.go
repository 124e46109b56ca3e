package config

import (
	"errors"
	"math"
	"strings"
	"testing"

	"spallscope/strain"
)

// settingCases are numeric settings out of their range, each with the key
// the error must name. "Before" is what Parse did with them: every one
// was accepted; the run then failed after tracking (the zones stage reads
// its settings last), or did not fail at all and gave a wrong answer.
var settingCases = []struct {
	yaml, key, before string
}{
	{"times: {fps: .inf}", "times.fps", "every frame at 0 s"},
	{"times: {fps: .nan}", "times.fps", "fps NaN ignored: frame times unknown"},
	{"scale: {mm_per_px: .nan}", "scale.mm_per_px", "scale NaN in every mm figure"},
	{"scale: {mm_per_px: -0.05}", "scale.mm_per_px", "refused only when tracking starts"},
	{"scale: {line: [0, 0, .inf, 0, 5]}", "scale.line", "scale 0: results silently in px"},
	{"scale: {line: [0, 0, 0, 0, 5]}", "scale.line", "refused only when tracking starts"},
	{"correlation: {subset: 20}", "correlation.subset", "refused only when tracking starts, without the key"},
	{"correlation: {step: -8}", "correlation.step", "refused only when tracking starts"},
	{"correlation: {min_zncc: 1.2}", "correlation.min_zncc", "refused only when tracking starts"},
	{"correlation: {update_below: .nan}", "correlation.update_below", "refused only when tracking starts"},
	{"correlation: {residual_factor: .nan}", "correlation.residual_factor", "NaN: the residual check silently off"},
	{"correlation: {residual_factor: 0.5}", "correlation.residual_factor", "refused only when tracking starts"},
	{"correlation: {search_radius: -3}", "correlation.search_radius", "refused only when tracking starts"},
	{"correlation: {edge_guard: 40}", "correlation.edge_guard", "refused only when tracking starts"},
	{"correlation: {min_valid: 1.5}", "correlation.min_valid", "refused only when tracking starts"},
	{"correlation: {workers: -2}", "correlation.workers", "refused only when tracking starts"},
	{"correlation: {workers: 100000000}", "correlation.workers", "a hundred million goroutines"},
	{"correlation: {seeds: [[-5, 10]]}", "correlation.seeds[0]", "a seed off the image"},
	{"correlation: {seeds: [[5]]}", "correlation.seeds[0]", "refused only when tracking starts"},
	{"correlation: {reference: moving}", "correlation.reference", "refused only when tracking starts"},
	{"strain: {window: 4}", "strain.window", "refused only after tracking"},
	{"strain: {order: 3}", "strain.order", "refused only after tracking"},
	{"strain: {min_points: 100}", "strain.min_points", "every strain unmeasured (a 9-point window holds 81)"},
	{"strain: {min_points: -1}", "strain.min_points", "taken as the default"},
	{"strain: {static_frames: -2}", "strain.static_frames", "a resolution from no frames"},
	{"strain: {measure: true_strain}", "strain.measure", "refused only after tracking"},
	{"zones: {min_zncc: 1.5}", "zones.min_zncc", "every point decorrelated: onsets at the reference frame"},
	{"zones: {min_zncc: -2}", "zones.min_zncc", "never decorrelated by ZNCC"},
	{"zones: {min_zncc: .nan}", "zones.min_zncc", "never decorrelated by ZNCC"},
	{"zones: {threshold: 0mad}", "zones.threshold", "the bar at the frame's median: half the points marked"},
	{"zones: {threshold: nanmad}", "zones.threshold", "a NaN bar: nothing ever marked"},
	{"zones: {threshold: infmad}", "zones.threshold", "an infinite bar: nothing ever marked"},
	{"zones: {threshold: \"6mad,7mad\"}", "zones.threshold", "the second silently won"},
	{"zones: {threshold: 1e-320ue}", "zones.threshold", "a bar of 0 µε"},
	{"zones: {threshold: 0ue}", "zones.threshold", "a bar of 0 µε"},
	{"zones: {min_cells: -1}", "zones.min_cells", "every lone point a zone"},
	{"zones: {persistence: -1}", "zones.persistence", "refused only after tracking and strain"},
	{"zones: {calibrate_below: 1.5}", "zones.calibrate_below", "every frame calibrates: no inelastic strain"},
	{"zones: {calibrate_below: -0.2}", "zones.calibrate_below", "no frame calibrates"},
	{"zones: {calibrate_frames: -3}", "zones.calibrate_frames", "no frame calibrates"},
	{"zones: {k: -0.5}", "zones.k", "a Kirsch context for a tensile far field"},
	{"zones: {k: .nan}", "zones.k", "NaN boundary stresses in onset.json"},
	{"zones: {ucs_mpa: -75}", "zones.ucs_mpa", "taken as unknown without a word"},
	{"zones: {load_angle_deg: .inf}", "zones.load_angle_deg", "NaN sectors"},
	{"zones: {crown_half_angle_deg: 95}", "zones.crown_half_angle_deg", "refused only after tracking and strain"},
	{"zones: {reach: .nan}", "zones.reach", "refused only after tracking and strain"},
	{"zones: {indicators: [e1, e1]}", "zones.indicators", "each zone found twice"},
	{"zones: {indicators: [e2]}", "zones.indicators", "refused only after tracking and strain"},
	{"load: {file: f.csv, area_mm2: .inf}", "load.area_mm2", "refused only after tracking"},
	{"load: {file: f.csv, area_mm2: -5000}", "load.area_mm2", "refused only after tracking"},
	{"load: {file: f.csv, area_mm2: 5000, skip_lines: -1}", "load.skip_lines", "refused only after tracking"},
	{"load: {file: f.csv, area_mm2: 5000, clock_offset_s: .nan}", "load.clock_offset_s", "refused only after tracking"},
	{"load: {file: f.csv, area_mm2: 5000, sync: [1, .inf]}", "load.sync", "refused only after tracking"},
	{"load: {area_mm2: 5000}", "load.file", "refused only after tracking"},
	{"ae: {file: a.csv, window_s: -1}", "ae.window_s", "refused only after tracking"},
	{"ae: {file: a.csv, k: 0.5}", "ae.k", "refused only after tracking"},
	{"ae: {file: a.csv, persistence: -1}", "ae.persistence", "refused only after tracking"},
	{"ae: {file: a.csv, background_s: [60, 0]}", "ae.background_s", "refused only after tracking"},
	{"ae: {file: a.csv, gap_s: .nan}", "ae.gap_s", "refused only after tracking"},
	{"ae: {file: a.csv, clock_offset_s: .inf}", "ae.clock_offset_s", "refused only after tracking"},
	{"model: {file: m.csv, load_mpa: .nan, units: px}", "model.load_mpa", "compared at no frame"},
	{"model: {file: m.csv, load_mpa: 20, units: px, origin_px: [1, .nan]}", "model.origin_px", "refused only after every stage"},
	{"model: {file: m.csv, load_mpa: 20, units: inch}", "model.units", "refused only after every stage"},
	{"faces: [{name: w, times: {fps: -1}}]", "faces[0].times.fps", "refused only when the face is tracked"},
	{"faces: [{name: w, scale: {mm_per_px: .inf}}]", "faces[0].scale.mm_per_px", "an infinite scale in the face's report"},
	{"load: {file: f.csv, area_mm2: 5000}\nfaces: [{name: w, clock_offset_s: .nan}]", "faces[0].clock_offset_s", "refused only after the face is tracked"},
}

// Every numeric setting out of its range is refused when the config is
// read, before any work, by an error that names its key (a FieldError, so
// the command line can restate it under its option's name).
func TestSettingsOutOfRange(t *testing.T) {
	for _, c := range settingCases {
		data := "images: p\n" + c.yaml + "\n"
		_, err := Parse([]byte(data), "t.yaml")
		if err == nil || !strings.Contains(err.Error(), c.key) {
			t.Errorf("%s: error %v, want one naming %s (before: %s)", c.yaml, err, c.key, c.before)
			continue
		}
		var fe *FieldError
		if !errors.As(err, &fe) || (fe.Key != c.key && fe.With == "") {
			t.Errorf("%s: %v is not a FieldError for %s", c.yaml, err, c.key)
		}
	}
}

// The ends of each range are accepted (ZNCC limits of -1 and 1, a
// calibration over the whole test, an odd subset of 7 px, ...), and so is
// every default (a config with every key left out).
func TestSettingsAtTheirLimits(t *testing.T) {
	for _, y := range []string{
		"zones: {min_zncc: -1, calibrate_below: 1, min_cells: 1, persistence: 1, calibrate_frames: 1, k: 0, ucs_mpa: 0, load_angle_deg: -360, crown_half_angle_deg: 89.9, threshold: \"0.5mad,1ue\"}",
		"zones: {min_zncc: 1, load_angle_deg: 360, threshold: 500ue}",
		"correlation: {subset: 7, step: 1, min_zncc: 0.01, update_below: 1, residual_factor: -1, search_radius: 1, edge_guard: 3, min_valid: 1, workers: 1024, seeds: [[0, 0]]}",
		"correlation: {residual_factor: 1, edge_guard: -1}",
		"strain: {window: 3, order: 2, min_points: 9, static_frames: 0}",
		"scale: {line: [0, 0, 3, 4, 5]}",
		"ae: {file: a.csv, k: 1, window_s: 0.001, persistence: 1, background_s: [0, 1e-3], gap_s: 1e6}",
		"load: {file: f.csv, area_mm2: 1e-6, sync: [0, -10]}",
		"",
	} {
		if _, err := Parse([]byte("images: p\n"+y+"\n"), "t.yaml"); err != nil {
			t.Errorf("%s: %v, want it accepted", y, err)
		}
	}
}

// The sections' conversions run the same check, so a section filled in
// code (or by the command line) cannot skip it. Before, Stage returned
// zone settings with a ZNCC limit of 1.5 and a threshold of 0 MAD.
func TestConversionsCheck(t *testing.T) {
	if _, err := (Zones{MinZNCC: 1.5}).Stage(nil); !isField(err, "zones.min_zncc") {
		t.Errorf("Stage with min_zncc 1.5: %v", err)
	}
	if _, err := (Zones{Threshold: "0mad"}).Stage(nil); !isField(err, "zones.threshold") {
		t.Errorf("Stage with threshold 0mad: %v", err)
	}
	if _, err := (Strain{MinPoints: 82}).StrainWindow(); !isField(err, "strain.min_points") {
		t.Errorf("StrainWindow with min_points 82: %v", err)
	}
	if _, err := (Correlation{ResidualFactor: math.NaN()}).Settings(); !isField(err, "correlation.residual_factor") {
		t.Errorf("Settings with a NaN residual factor: %v", err)
	}
	if _, err := (Load{File: "f.csv"}).Stress("f.csv"); !isField(err, "load.area_mm2") {
		t.Errorf("Stress without an area: %v", err)
	}
	if _, err := (AE{Sync: []float64{1, math.NaN()}}).Clock(); !isField(err, "ae.sync") {
		t.Errorf("AE clock with a NaN sync time: %v", err)
	}
	if _, err := (Scale{Line: []float64{0, 0, math.Inf(1), 0, 5}}).Value(); !isField(err, "scale.line") {
		t.Errorf("scale line to infinity: %v", err)
	}
}

// Thresholds parse to the numbers written: K robust deviations and an
// absolute bar in strain (1 µε = 1e-6, the SI prefix micro).
func TestParseThreshold(t *testing.T) {
	for _, c := range []struct {
		text   string
		k, abs float64
	}{
		{"", 6, 0}, {"6mad", 6, 0}, {"4.5MAD", 4.5, 0}, {"500ue", -1, 500e-6}, {"6mad, 800ue", 6, 800e-6},
	} {
		var th strain.Thresholds
		if err := parseThreshold(c.text, &th); err != nil {
			t.Errorf("%q: %v", c.text, err)
			continue
		}
		if th.K != c.k || math.Abs(th.Absolute-c.abs) > 1e-18 {
			t.Errorf("%q: K %g, absolute %g; want %g, %g (tolerance 1e-18)", c.text, th.K, th.Absolute, c.k, c.abs)
		}
	}
}

func isField(err error, key string) bool {
	var fe *FieldError
	return errors.As(err, &fe) && fe.Key == key
}

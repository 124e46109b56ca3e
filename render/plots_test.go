package render

import (
	"bytes"
	"encoding/csv"
	"image/png"
	"math"
	"os"
	"path/filepath"
	"slices"
	"strconv"
	"strings"
	"testing"

	"spallscope/dic/runfolder"
)

// Every plot of the fixture run is written as a PNG that Go's image/png
// decodes at the stated size (16 × 9.5 cm at 150 dpi: 945 × 561 px; the
// onset histories 16 cm wide and as tall as their panels, at the size the
// figure states) and an SVG document.
func TestPlotsWritten(t *testing.T) {
	dir := t.TempDir()
	writeFixtureRun(t, dir)
	figs, err := WritePlots(dir, PlotOptions{})
	if err != nil {
		t.Fatal(err)
	}
	var names []string
	for _, f := range figs {
		names = append(names, f.Name)
		data, err := os.ReadFile(filepath.Join(dir, f.PNG))
		if err != nil {
			t.Fatal(err)
		}
		img, err := png.Decode(bytes.NewReader(data))
		if err != nil {
			t.Errorf("%s: not a PNG: %v", f.PNG, err)
			continue
		}
		wantH := 561
		if f.Name == "onset_histories" {
			wantH = f.Height
		}
		if b := img.Bounds(); b.Dx() != 945 || b.Dy() != wantH || f.Width != b.Dx() || f.Height != b.Dy() {
			t.Errorf("%s: %v px (figure says %d × %d), want 945 × %d", f.PNG, b.Size(), f.Width, f.Height, wantH)
		}
		svg, err := os.ReadFile(filepath.Join(dir, f.SVG))
		if err != nil {
			t.Fatal(err)
		}
		if s := strings.TrimSpace(string(svg)); !(strings.HasPrefix(s, "<?xml") || strings.HasPrefix(s, "<svg")) || !strings.Contains(s, "</svg>") {
			t.Errorf("%s: not an SVG document: %.60q", f.SVG, s)
		}
		if f.Title == "" || f.Caption == "" {
			t.Errorf("%s has no title or caption", f.Name)
		}
	}
	want := []string{"stress_time", "onset_histories", "zones_area", "zones_peak", "sectors_peak", "stress_strain", "noise_floor"}
	if !slices.Equal(names, want) {
		t.Errorf("plots %v, want %v", names, want)
	}
}

// The virtual instruments' readings on the fixture's uniform fields, read
// back from plots/virtual_gauges.csv after the trip through the field and
// strain files: the extensometer reads eyy = −σ/E (continuum kinematics,
// Δu/L for a uniform strain along the line) and the gauge the same eyy
// (the strain window fits an affine field exactly), both within 1e-9.
func TestPlotsVirtualGaugeReadings(t *testing.T) {
	dir := t.TempDir()
	writeFixtureRun(t, dir)
	if _, err := WritePlots(dir, PlotOptions{}); err != nil {
		t.Fatal(err)
	}
	f, err := os.Open(filepath.Join(dir, PlotsDir, VirtualGaugesCSV))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	r := csv.NewReader(f)
	r.Comment = '#'
	rows, err := r.ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	if len(rows) != 1+len(fixtureNames) || strings.Join(rows[0], ",") != "frame,time_s,stress_MPa,extensometer,gauge_mean,gauge_points" {
		t.Fatalf("virtual_gauges.csv: %d rows, header %v", len(rows), rows[0])
	}
	for k, row := range rows[1:] {
		_, eyy := fixtureStrain(k)
		ext, err1 := strconv.ParseFloat(row[3], 64)
		mean, err2 := strconv.ParseFloat(row[4], 64)
		if err1 != nil || err2 != nil || math.Abs(ext-eyy) > 1e-9 || math.Abs(mean-eyy) > 1e-9 {
			t.Errorf("frame %s: extensometer %s, gauge %s, want eyy %.9g", row[0], row[3], row[4], eyy)
		}
		if row[0] != fixtureNames[k] || row[2] != strconv.FormatFloat(fixtureStress[k], 'g', 8, 64) {
			t.Errorf("row %d: %v", k, row)
		}
	}
}

// A run folder with only the track stage done gets the one plot its data
// allows (the virtual instruments against frames: no stresses, no
// strain files, so no gauge) and no error; a given extensometer off the
// grid is an error naming it.
func TestPlotsOnPartialRun(t *testing.T) {
	dir := t.TempDir()
	for k, name := range fixtureNames {
		fixtureMust(t, runfolder.WriteField(runfolder.FieldPath(dir, name), fixtureField(k), 0))
	}
	figs, err := WritePlots(dir, PlotOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if len(figs) != 1 || figs[0].Name != "virtual_gauges" {
		t.Errorf("plots of a tracked-only run: %+v", figs)
	}
	_, err = WritePlots(dir, PlotOptions{Extensometer: Extensometer{X1: 20, Y1: 16, X2: 20, Y2: 900}})
	if err == nil || !strings.Contains(err.Error(), "extensometer end 2") {
		t.Errorf("extensometer off the grid: %v", err)
	}
	if _, err := WritePlots(filepath.Join(dir, "nothing-here"), PlotOptions{}); err == nil {
		t.Error("a missing run folder gave no error")
	}
}

// Tick marks fall on round numbers 1, 2, 2.5 or 5 × 10ⁿ apart, the
// closest spacing with at most eight labels, each with just the needed
// decimals (common practice, no source).
func TestPlotTicks(t *testing.T) {
	cases := []struct {
		lo, hi float64
		labels []string
	}{
		{0, 32, []string{"0", "5", "10", "15", "20", "25", "30"}},
		{-2.1, 143, []string{"0", "20", "40", "60", "80", "100", "120", "140"}},
		{0, 0.0041, []string{"0.000", "0.001", "0.002", "0.003", "0.004"}},
		{0, 1.4, []string{"0.0", "0.2", "0.4", "0.6", "0.8", "1.0", "1.2", "1.4"}},
		{0, 17, []string{"0.0", "2.5", "5.0", "7.5", "10.0", "12.5", "15.0"}},
		{-1200, 300, []string{"-1200", "-1000", "-800", "-600", "-400", "-200", "0", "200"}},
	}
	for _, c := range cases {
		var got []string
		for _, tk := range (plotTicks{}).Ticks(c.lo, c.hi) {
			if tk.Label != "" {
				got = append(got, tk.Label)
			}
		}
		if !slices.Equal(got, c.labels) {
			t.Errorf("ticks over [%g, %g]: %v, want %v", c.lo, c.hi, got, c.labels)
		}
	}
}

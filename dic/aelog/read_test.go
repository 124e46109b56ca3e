package aelog

import (
	"encoding/json"
	"reflect"
	"strings"
	"testing"

	"spallscope/dic/loadlog"
)

func TestReadExampleFile(t *testing.T) {
	l, err := Read("testdata/example.csv", Format{})
	if err != nil {
		t.Fatal(err)
	}
	// The rows of testdata/example.csv, as written (s, dB, aJ); exact.
	want := []Hit{
		{2.25, 41.5, 120, 3, 1}, {2.75, 43.0, 210, 5, 2}, {3.50, 40.5, 95, 2, 1}, {4.00, 44.5, 330, 7, 3},
		{4.25, 46.0, 480, 11, 2}, {4.50, 42.0, 150, 4, 4}, {4.75, 47.5, 610, 13, 1}, {5.00, 49.0, 905, 18, 3},
	}
	if !reflect.DeepEqual(l.Hits, want) {
		t.Errorf("hits\n%v\nwant\n%v", l.Hits, want)
	}
	if l.Has != (Columns{Amplitude: true, Energy: true, Counts: true, Channel: true}) || l.EnergyUnit != "aJ" || len(l.Notes) != 0 {
		t.Errorf("has %+v, energy unit %q, notes %q; want all columns, aJ, no notes", l.Has, l.EnergyUnit, l.Notes)
	}
}

func TestReadLayouts(t *testing.T) {
	for _, c := range []struct {
		name, content string
		f             Format
		times         []float64
		has           Columns
		note          string // a note the Log must have, "" for none
	}{
		{"whitespace-ms", "# hits\ntime_ms  amp_dB  counts\n1500 40.5 3\n1500 41 2\n2250 44 9\n", Format{},
			[]float64{1.5, 1.5, 2.25}, Columns{Amplitude: true, Counts: true}, ""},
		{"semicolon-hms", "t;energy\n0:00:01.5;2\n0:01:00;3\n1:00:00;4\n", Format{TimeUnit: "hms"},
			[]float64{1.5, 60, 3600}, Columns{Energy: true}, "energies are in the file's own unit"},
		{"microseconds", "time_us\tenergy (aJ)\tchannel\n250000\t1\t2\n1250000\t2\t4\n", Format{},
			[]float64{0.25, 1.25}, Columns{Energy: true, Channel: true}, ""},
		{"quoted", "\"Time (s)\",\"Peak Amplitude (dB)\",\"E, abs\"\n0.5,40,7\n1.5,45,9\n", Format{EnergyColumn: "E, abs", EnergyUnit: "aJ"},
			[]float64{0.5, 1.5}, Columns{Amplitude: true, Energy: true}, ""},
		{"no-header", "0.5 40 3\n1.0 42 4\n", Format{AmplitudeColumn: "2", CountsColumn: "3"},
			[]float64{0.5, 1}, Columns{Amplitude: true, Counts: true}, "assumed s"},
		{"unit-disagrees", "time_s,counts\n500,1\n900,2\n", Format{TimeUnit: "ms"},
			[]float64{0.5, 0.9}, Columns{Counts: true}, "read as ms"},
		{"skip-and-other-columns", "AE export\nrun 7\nhit,time_s,x_mm,counts\n1,0.5,3.2,4\n2,0.75,1.1,6\n", Format{SkipLines: 2},
			[]float64{0.5, 0.75}, Columns{Counts: true}, ""},
		{"whole-as-float", "time_s,counts,channel\n0,3.0,2.0\n1,4,1\n", Format{},
			[]float64{0, 1}, Columns{Counts: true, Channel: true}, ""},
	} {
		l := mustRead(t, c.name+".csv", c.content, c.f)
		var times []float64
		for _, h := range l.Hits {
			times = append(times, h.Time)
		}
		equalSlices(t, c.name, times, c.times, 1e-12)
		if l.Has != c.has {
			t.Errorf("%s: has %+v, want %+v", c.name, l.Has, c.has)
		}
		notes := strings.Join(l.Notes, "; ")
		if c.note == "" && notes != "" || !strings.Contains(notes, c.note) {
			t.Errorf("%s: notes %q, want %q", c.name, notes, c.note)
		}
	}
}

func TestReadValues(t *testing.T) {
	l := mustRead(t, "v.csv", "\"Time (s)\",\"Peak Amplitude (dB)\",\"E, abs\",ch\n0.5,40.5,7.25,3\n", Format{EnergyColumn: "E, abs"})
	if want := (Hit{Time: 0.5, Amplitude: 40.5, Energy: 7.25, Channel: 3}); l.Hits[0] != want {
		t.Errorf("hit %+v, want %+v", l.Hits[0], want)
	}
	if l.EnergyUnit != "" {
		t.Errorf("energy unit %q, want none", l.EnergyUnit)
	}
}

func TestFormatSettings(t *testing.T) {
	// The tags of Format and loadlog.Delimiter's text form (definition of
	// the settings file keys, no source).
	var f Format
	err := json.Unmarshal([]byte(`{"time_column":"t","amplitude_column":"3","energy_unit":"aJ","time_unit":"ms","delimiter":"tab","skip_lines":2}`), &f)
	want := Format{TimeColumn: "t", AmplitudeColumn: "3", EnergyUnit: "aJ", TimeUnit: "ms", Delimiter: '\t', SkipLines: 2}
	if err != nil || f != want {
		t.Errorf("Format %+v (err %v), want %+v", f, err, want)
	}
	if want.Delimiter != loadlog.Delimiter('\t') {
		t.Error("delimiter type")
	}
}

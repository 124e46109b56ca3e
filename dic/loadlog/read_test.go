package loadlog

import (
	"encoding/json"
	"fmt"
	"math"
	"strings"
	"testing"
)

func TestReadImperialUnits(t *testing.T) {
	// The same invented samples in lbf and ms, blank-separated, and in N
	// and s, comma-separated. 1 lbf = 0.45359237 kg × 9.80665 m/s² =
	// 4.4482216152605 N exactly (international pound, 1959; standard
	// gravity, 3rd CGPM 1901); 1 ms = 1e-3 s (SI prefix).
	ms := []float64{0, 250, 500, 750, 1000}
	lbf := []float64{0, 1000.5, 2250, 3100.25, 2900}
	var imperial, metric strings.Builder
	imperial.WriteString("# invented, lbf and ms\ntime   force\n")
	metric.WriteString("time_s,force_N\n")
	for i := range ms {
		fmt.Fprintf(&imperial, "%g \t %g\n", ms[i], lbf[i])
		fmt.Fprintf(&metric, "%.17g,%.17g\n", ms[i]*1e-3, lbf[i]*4.4482216152605)
	}
	a := mustRead(t, "imperial.txt", imperial.String(), Format{TimeUnit: "ms", ForceUnit: "lbf"})
	b := mustRead(t, "metric.csv", metric.String(), Format{})
	if a.Len() != 5 || b.Len() != 5 {
		t.Fatalf("rows %d and %d, want 5", a.Len(), b.Len())
	}
	for i := range ms {
		if !near(a.Time[i], b.Time[i], 1e-9) || !near(a.Force[i], b.Force[i], 1e-9) {
			t.Errorf("row %d: %g s %g N vs %g s %g N", i, a.Time[i], a.Force[i], b.Time[i], b.Force[i])
		}
	}
	// Hand-worked: 1000.5 lbf = 4448.2216152605 + 0.5 × 4.4482216152605
	// = 4450.44572606813025 N.
	if !near(a.Force[1], 4450.44572606813025, 1e-12) {
		t.Errorf("1000.5 lbf = %.15g N, want 4450.44572606813", a.Force[1])
	}
	sa, _ := NewStress(a, 100, Clock{})
	sb, _ := NewStress(b, 100, Clock{})
	for _, ct := range []float64{0.1, 0.3, 0.61, 0.999} {
		x, _ := sa.At(ct)
		y, _ := sb.At(ct)
		if !near(x, y, 1e-9) {
			t.Errorf("At(%g): %g MPa from lbf/ms, %g MPa from N/s", ct, x, y)
		}
	}
}

func TestReadKipAndInch(t *testing.T) {
	// 1 kip = 1000 lbf = 4448.2216152605 N; 1 in = 25.4 mm exactly
	// (international yard and pound, 1959). 1 min = 60 s (SI).
	l := mustRead(t, "k.csv", "t,load,stroke\n0,0,0\n0.5,2,0.1\n", Format{TimeUnit: "min", ForceUnit: "kip", StrokeUnit: "in"})
	if l.Time[1] != 30 || !near(l.Force[1], 8896.443230521, 1e-12) || !near(l.Stroke[1], 2.54, 1e-12) {
		t.Errorf("got %g s, %g N, %g mm; want 30 s, 8896.443230521 N, 2.54 mm", l.Time[1], l.Force[1], l.Stroke[1])
	}
	h := mustRead(t, "h.csv", "time,force\n0,0\n0.25,1\n", Format{TimeUnit: "h", ForceUnit: "N"})
	if h.Time[1] != 900 {
		t.Errorf("0.25 h = %g s, want 900 (1 h = 3600 s, SI)", h.Time[1])
	}
}

func TestReadClockTimesByIndex(t *testing.T) {
	// No header: column 1 is a row counter, 2 the time as h:mm:ss, 3 the
	// force in kN. 0:01:02.5 = 60 + 2.5 = 62.5 s.
	l := mustRead(t, "clock.txt", "1,0:01:00.0,10.0\n2,0:01:02.5,12.5\n3,0:01:05,15\n4,1:00:00,0\n",
		Format{TimeColumn: "2", ForceColumn: "3", TimeUnit: "hms"})
	want := []float64{60, 62.5, 65, 3600}
	for i, w := range want {
		if l.Time[i] != w {
			t.Errorf("time %d = %g s, want %g", i, l.Time[i], w)
		}
	}
	if l.Force[1] != 12500 || l.Stroke != nil {
		t.Errorf("force %g N, stroke %v; want 12500 N, no stroke", l.Force[1], l.Stroke)
	}
	// Linear interpolation, hand-worked: (61.25−60)/(62.5−60) = 0.5, so
	// F = 10 + 0.5·(12.5−10) = 11.25 kN.
	if f, in := l.ForceAt(61.25); f != 11250 || !in {
		t.Errorf("ForceAt(61.25) = %g %v, want 11250 N", f, in)
	}
}

func TestReadSynthLog(t *testing.T) {
	// The synthetic lab's layout (time_s,force_kN,stroke_mm after two
	// comment lines), with invented numbers: a 10 MPa/s ramp on 5000 mm²
	// from camera time 0, i.e. 50 kN/s, stroke 0.01 mm/s, logged at 2 Hz
	// from camera −1 s, log clock 3.5 s ahead of the camera's.
	var b strings.Builder
	b.WriteString("# synthetic load log for scenario \"demo\", written by spallscope synth\n")
	b.WriteString("# loaded area 5000 mm2; log clock = camera clock +3.5 s\n")
	b.WriteString("time_s,force_kN,stroke_mm\n")
	for i := 0; i <= 8; i++ {
		t := -1 + 0.5*float64(i)
		fmt.Fprintf(&b, "%.4f,%.6g,%.6g\n", t+3.5, 50*math.Max(0, t), 0.01*math.Max(0, t))
	}
	l := mustRead(t, "loadlog.csv", b.String(), Format{})
	if l.Len() != 9 || len(l.Stroke) != 9 || len(l.Notes) != 0 {
		t.Fatalf("%d rows, %d strokes, notes %q; want 9, 9, none", l.Len(), len(l.Stroke), l.Notes)
	}
	if l.Time[0] != 2.5 || l.Force[8] != 150000 {
		t.Errorf("first time %g s, last force %g N; want 2.5 s, 150000 N", l.Time[0], l.Force[8])
	}
	s, err := NewStress(l, 5000, Clock{Offset: 3.5})
	if err != nil {
		t.Fatal(err)
	}
	// Camera 1.25 s: 10 MPa/s × 1.25 s = 12.5 MPa (between rows of 50 and
	// 75 kN: 62.5 kN / 5000 mm²).
	if got, in := s.At(1.25); !near(got, 12.5, 1e-12) || !in {
		t.Errorf("At(1.25) = %g %v, want 12.5 MPa", got, in)
	}
	if peak, at := s.Peak(); !near(peak, 30, 1e-12) || !near(at, 3, 1e-12) {
		t.Errorf("Peak = %g MPa at %g s, want 30 MPa at 3 s", peak, at)
	}
	if mm, _ := l.StrokeAt(l.Time[0] + 3.25); !near(mm, 0.0225, 1e-12) {
		t.Errorf("stroke at camera 2.25 s = %g mm, want 0.0225", mm)
	}
	if _, in := s.At(-1.5); in {
		t.Error("camera −1.5 s is before the log but flagged in span")
	}
}

func TestReadLayouts(t *testing.T) {
	// Equivalent invented logs in several layouts; each must read as
	// times 0, 1, 2 s and forces 1000, 2000, 4000 N.
	for _, c := range []struct {
		name, content string
		f             Format
	}{
		{"semicolon", "Time (s);Force (kN)\n0;1\n1;2\n2;4\n", Format{}},
		{"tab", "time\tforce\n0\t1\n1\t2\n2\t4\n", Format{}},
		{"crlf-bom", "\uFEFFtime_s,force_kN\r\n0,1\r\n\r\n1,2\r\n2,4\r\n", Format{}},
		{"quoted", "\"Time, s\",\"Force, kN\"\n0,1\n1,2\n2,4\n", Format{TimeColumn: "time, s", ForceColumn: "FORCE, KN"}},
		{"preamble", "Frame 3 export\nspecimen: B-12\ntime_s,force_kN\n0,1\n1,2\n2,4\n", Format{SkipLines: 2}},
		{"percent-comments", "% made up\ntime_s force_kN\n% again\n0 1\n1 2\n2 4\n", Format{Comment: "%"}},
		{"blank-trailing-cells", "time_s,force_kN,,\n0,1,,\n,,,\n1,2,,\n2,4,,\n", Format{}},
		{"header-units", "time_ms,force_N\n0,1000\n1000,2000\n2000,4000\n", Format{}},
		{"no-header", "0 1\n1 2\n2 4\n", Format{}},
		{"explicit-delimiter", "time_s|force_kN\n0|1\n1|2\n2|4\n", Format{Delimiter: '|'}},
		{"extra-columns", "row,status,time_s,force_kN\n1,ok,0,1\n2,ok,1,2\n3,peak,2,4\n", Format{}},
	} {
		l, err := Read(writeLog(t, c.name+".txt", c.content), c.f)
		if err != nil {
			t.Errorf("%s: %v", c.name, err)
			continue
		}
		if fmt.Sprint(l.Time, l.Force) != "[0 1 2] [1000 2000 4000]" {
			t.Errorf("%s: got %v %v", c.name, l.Time, l.Force)
		}
	}
}

func TestReadNotes(t *testing.T) {
	// A unit the Format gives against the header's is used, and noted.
	l := mustRead(t, "n.csv", "time_s,force_kN\n0,1\n1,2\n", Format{ForceUnit: "N"})
	if l.Force[1] != 2 || !hasNote(l, `"force_kN" names kN, but force_unit is N`) {
		t.Errorf("force %g, notes %q", l.Force[1], l.Notes)
	}
	// Units assumed without a header are noted.
	l = mustRead(t, "n.txt", "0 1\n1 2\n", Format{})
	if !hasNote(l, "assumed s") || !hasNote(l, "assumed kN") {
		t.Errorf("notes %q, want the assumed units", l.Notes)
	}
	// Repeated times are accepted; at the repeated time the later row wins,
	// just before it the value tends to the earlier row's.
	l = mustRead(t, "r.csv", "time_s,force_kN\n0,0\n1,10\n1,12\n2,14\n", Format{})
	if !hasNote(l, "1 rows repeat") {
		t.Errorf("notes %q, want the repeated time", l.Notes)
	}
	if f, _ := l.ForceAt(1); f != 12000 {
		t.Errorf("ForceAt(1) = %g, want the later row's 12000 N", f)
	}
	if f, _ := l.ForceAt(0.5); f != 5000 {
		t.Errorf("ForceAt(0.5) = %g, want 5000 N (towards the earlier row's 10 kN)", f)
	}
	if f, _ := l.ForceAt(1.5); f != 13000 {
		t.Errorf("ForceAt(1.5) = %g, want 13000 N", f)
	}
}

func TestReadCompressionSign(t *testing.T) {
	content := "time_s,force_kN\n0,0\n1,-10\n2,-20\n3,-15\n"
	l := mustRead(t, "neg.csv", content, Format{})
	if l.Force[2] != -20000 || !hasNote(l, "3 of 4 forces are negative") {
		t.Errorf("force %g, notes %q; want −20000 N left as read, and a note", l.Force[2], l.Notes)
	}
	l = mustRead(t, "neg.csv", content, Format{CompressionNegative: true})
	if l.Force[2] != 20000 || len(l.Notes) != 0 {
		t.Errorf("force %g, notes %q; want 20000 N and no notes", l.Force[2], l.Notes)
	}
	l = mustRead(t, "pos.csv", "time_s,force_kN\n0,0\n1,10\n2,20\n", Format{CompressionNegative: true})
	if !hasNote(l, "compression_negative is set") {
		t.Errorf("notes %q, want a warning that the flag looks wrong", l.Notes)
	}
}

func TestFormatJSON(t *testing.T) {
	var f Format
	err := json.Unmarshal([]byte(`{"time_column":"2","force_column":"Load","stroke_column":"3",
		"time_unit":"hms","force_unit":"lbf","stroke_unit":"in","delimiter":"tab","skip_lines":4,
		"comment":"//","compression_negative":true}`), &f)
	if err != nil {
		t.Fatal(err)
	}
	want := Format{TimeColumn: "2", ForceColumn: "Load", StrokeColumn: "3", TimeUnit: "hms", ForceUnit: "lbf",
		StrokeUnit: "in", Delimiter: '\t', SkipLines: 4, Comment: "//", CompressionNegative: true}
	if f != want {
		t.Errorf("got %+v, want %+v", f, want)
	}
	for _, d := range []Delimiter{0, ',', ';', '\t', Whitespace, '|'} {
		data, err := json.Marshal(Format{Delimiter: d})
		if err != nil {
			t.Fatal(err)
		}
		var back Format
		if err := json.Unmarshal(data, &back); err != nil || back.Delimiter != d {
			t.Errorf("delimiter %q: %s read back as %q, %v", rune(d), data, rune(back.Delimiter), err)
		}
	}
	if err := json.Unmarshal([]byte(`{"delimiter":"ab"}`), &f); err == nil {
		t.Error("two-character delimiter accepted")
	}
}

// hasNote reports whether some note of l contains s.
func hasNote(l *Log, s string) bool {
	for _, n := range l.Notes {
		if strings.Contains(n, s) {
			return true
		}
	}
	return false
}

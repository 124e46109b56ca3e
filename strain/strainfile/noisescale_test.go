package strainfile

import (
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"spallscope/dic"
	"spallscope/strain"
)

// noise_scale.csv reads back the factors written, to the last bit (the
// truth applies exactly the run's bar), and refuses a file of another
// grid, a factor below 1 or not a number, a point twice or missing, and an
// indicator without strain, naming the file and line.
func TestNoiseScaleRoundTripAndRefusals(t *testing.T) {
	g := dic.Grid{X0: 5, Y0: 7, Step: 4, Cols: 6, Rows: 5}
	scale := map[strain.Indicator][]float64{strain.MaxPrincipal: make([]float64, g.Len()), strain.MaxShear: make([]float64, g.Len())}
	for i := range g.Len() {
		scale[strain.MaxPrincipal][i] = 1
		scale[strain.MaxShear][i] = 1 + math.Pi*float64(i)/7 // digits that a short format would round
	}
	dir := t.TempDir()
	path := filepath.Join(dir, NoiseScaleCSV)
	if err := WriteNoiseScale(path, g, scale); err != nil {
		t.Fatal(err)
	}
	got, err := ReadNoiseScale(path, g)
	if err != nil {
		t.Fatal(err)
	}
	if len(got) != 2 {
		t.Fatalf("read %d indicators, want 2", len(got))
	}
	for ind, want := range scale {
		for i, v := range want {
			if got[ind][i] != v {
				t.Fatalf("%s point %d: read %.17g, want %.17g exactly", ind, i, got[ind][i], v)
			}
		}
	}
	if err := WriteNoiseScale(path, g, map[strain.Indicator][]float64{strain.MaxShear: make([]float64, 3)}); err == nil {
		t.Error("a scale short of one value a point written")
	}
	if _, err := ReadNoiseScale(path, dic.Grid{X0: 5, Y0: 7, Step: 5, Cols: 6, Rows: 5}); err == nil || !strings.Contains(err.Error(), "line 3") {
		t.Errorf("another grid: %v, want an error at line 3 (the first point off the grid's position)", err)
	}
	data, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	lines := strings.Split(strings.TrimSpace(string(data)), "\n")
	for _, c := range []struct {
		name, want string
		edit       func([]string) []string
	}{
		{"a factor below 1", "line 2: scale", func(l []string) []string { l[1] = "e1,0,5,7,0.5"; return l }},
		{"not a number", "line 2: scale", func(l []string) []string { l[1] = "e1,0,5,7,NaN"; return l }},
		{"a point off the grid", "line 2: point", func(l []string) []string { l[1] = "e1,30,5,7,1"; return l }},
		{"a point twice", "a second row", func(l []string) []string { l[2] = l[1]; return l }},
		{"a point missing", "no row for e1 at point 29", func(l []string) []string { return append(l[:30], l[31:]...) }},
		{"decorrelation", "line 2: indicator", func(l []string) []string { l[1] = "decorrelation,0,5,7,1"; return l }},
		{"a bad header", "header", func(l []string) []string { l[0] = "indicator,point,x,y"; return l }},
	} {
		bad := filepath.Join(dir, "bad.csv")
		if err := os.WriteFile(bad, []byte(strings.Join(c.edit(append([]string(nil), lines...)), "\n")+"\n"), 0o644); err != nil {
			t.Fatal(err)
		}
		if _, err := ReadNoiseScale(bad, g); err == nil || !strings.Contains(err.Error(), c.want) || !strings.Contains(err.Error(), bad) {
			t.Errorf("%s: %v, want an error naming %s and %q", c.name, err, bad, c.want)
		}
	}
}

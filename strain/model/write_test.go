package model_test

import (
	"encoding/csv"
	"encoding/json"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"spallscope/dic"
	"spallscope/strain/model"
)

// Write leaves a difference file with one row per grid point (NaN where
// not compared) whose values read back to the comparison's, and a JSON
// summary with the statistics (NaN written as null) and the warnings;
// no temporary file is left behind (atomic writes).
func TestWriteRoundTrip(t *testing.T) {
	g := dic.Grid{X0: 10, Y0: 10, Step: 5, Cols: 9, Rows: 9} // 10..50 px
	meas := handField(g, linear, func(c, r int) bool { return c == 4 && r == 4 })
	var b strings.Builder
	b.WriteString("x,y,u,v\n")
	for _, p := range [][2]float64{{5, 5}, {55, 5}, {5, 55}, {55, 55}} { // the linear field at four corners: no difference
		u, v := linear(p[0], p[1])
		fmt.Fprintf(&b, "%g,%g,%.17g,%.17g\n", p[0], p[1], u, v)
	}
	b.WriteString("200,200,0,0\n") // far off: outside
	m, err := model.Read(writeFile(t, "m.csv", b.String()), pxFormat)
	if err != nil {
		t.Fatal(err)
	}
	c, err := model.Compare(meas, nil, m, model.Options{})
	if err != nil {
		t.Fatal(err)
	}
	dir := filepath.Join(t.TempDir(), "cmp")
	if err := model.Write(dir, c); err != nil {
		t.Fatal(err)
	}
	fh, err := os.Open(filepath.Join(dir, model.DiffFile))
	if err != nil {
		t.Fatal(err)
	}
	defer fh.Close()
	rows, err := csv.NewReader(fh).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	if len(rows) != g.Len()+1 || strings.Join(rows[0], ",") != "x,y,u_diff,v_diff" {
		t.Fatalf("%d rows, header %q; want %d and x,y,u_diff,v_diff", len(rows), rows[0], g.Len()+1)
	}
	nan := 0
	for i, row := range rows[1:] {
		p := c.Points[i]
		for k, q := range []model.Quantity{model.U, model.V} {
			v, err := strconv.ParseFloat(row[2+k], 64)
			if err != nil || row[0] != strconv.Itoa(p.X) || row[1] != strconv.Itoa(p.Y) {
				t.Fatalf("row %d: %q", i+2, row)
			}
			if math.IsNaN(v) {
				nan++
			}
			if !(math.IsNaN(v) && math.IsNaN(p.Values[q])) && math.Abs(v-p.Values[q]) > 1e-7*math.Max(1e-9, math.Abs(p.Values[q])) {
				t.Errorf("row %d %s: %g, comparison has %g", i+2, q, v, p.Values[q])
			}
		}
	}
	if nan != 2 || !(c.Stats[0].MaxAbs < 1e-12) || c.Regular {
		t.Errorf("%d NaN cells (want 2, the lost point's u and v); max |u diff| %g (want 0: a linear field, fitted by a plane)", nan, c.Stats[0].MaxAbs)
	}
	raw, err := os.ReadFile(filepath.Join(dir, model.SummaryFile))
	if err != nil {
		t.Fatal(err)
	}
	var s struct {
		Model      string `json:"model"`
		Quantities []struct {
			Quantity    string   `json:"quantity"`
			Count       int      `json:"count"`
			RMS         *float64 `json:"rms"`
			Correlation *float64 `json:"correlation"`
		} `json:"quantities"`
		Outside  model.Outside `json:"outside"`
		Warnings []string      `json:"warnings"`
	}
	if err := json.Unmarshal(raw, &s); err != nil {
		t.Fatalf("summary: %v\n%s", err, raw)
	}
	if s.Model != m.Path || len(s.Quantities) != 2 || s.Quantities[1].Quantity != "v" || s.Quantities[1].Count != g.Len()-1 ||
		s.Quantities[0].RMS == nil || *s.Quantities[0].RMS != c.Stats[0].RMS || s.Outside.Count != 1 || len(s.Warnings) != 1 {
		t.Errorf("summary %s", raw)
	}
	ents, _ := os.ReadDir(dir)
	if len(ents) != 2 {
		t.Errorf("%d files in the folder, want the 2 outputs only", len(ents))
	}
}

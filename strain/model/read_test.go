package model_test

import (
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"spallscope/strain/model"
)

// writeFile writes text as a file in a fresh folder and returns its path.
func writeFile(t *testing.T, name, text string) string {
	t.Helper()
	path := filepath.Join(t.TempDir(), name)
	if err := os.WriteFile(path, []byte(text), 0o644); err != nil {
		t.Fatal(err)
	}
	return path
}

var pxFormat = model.Format{Units: model.PX}

// Malformed files are refused with an error that names the file and, for a
// bad row, its line and column (line numbers count comments and the
// header; columns from 1). None may panic.
func TestReadMalformed(t *testing.T) {
	mm := model.Format{Units: model.MM, Scale: 0.1}
	for _, c := range []struct {
		name, text string
		f          model.Format
		want       []string
	}{
		{"not a number", "x,y,u\n1,2,3\n4,5,abc\n", pxFormat, []string{"line 3 column 3 (u)", `"abc" is not a number`}},
		{"short row", "x,y,u,v\n1,2,3\n", pxFormat, []string{"line 2 column 4 (v)", "missing"}},
		{"long row", "x,y,u\n1,2,3,4\n", pxFormat, []string{"line 2 column 4", "4 columns"}},
		{"empty cell", "# comment\nx,y,u\n1,,3\n", pxFormat, []string{"line 3 column 2 (y)", "empty"}},
		{"NaN position", "x,y,u\n# c\nNaN,2,3\n", pxFormat, []string{"line 3 column 1 (x)", "finite"}},
		{"infinite value", "x,y,u\n1,2,Inf\n", pxFormat, []string{"line 2 column 3 (u)", "finite"}},
		{"broken quote", "x,y,u\n1,\"2,3\n", pxFormat, []string{"line", "column"}},
		{"no y", "x,u\n1,2\n", pxFormat, []string{"line 1", "lacks column x or y"}},
		{"no quantity", "x,y,z\n1,2,3\n", pxFormat, []string{"line 1", "none of the columns"}},
		{"repeated column", "x,y,u,U_mm\n1,2,3,4\n", mm, []string{"line 1 column 4", "repeats column 3"}},
		{"unit disagrees", "x_px,y,u\n1,2,3\n", mm, []string{"line 1 column 1", "the format says mm"}},
		{"strain with unit", "x,y,exx_mm\n1,2,3\n", mm, []string{"line 1 column 3", "length unit"}},
		{"header only", "x,y,u\n", pxFormat, []string{"no points"}},
		{"empty file", "", pxFormat, []string{"empty file"}},
		{"no scale for mm", "x,y,u\n1,2,3\n", model.Format{Units: model.MM}, []string{"scale"}},
		{"no units", "x,y,u\n1,2,3\n", model.Format{}, []string{"units not stated"}},
	} {
		path := writeFile(t, "bad.csv", c.text)
		m, err := model.Read(path, c.f)
		if err == nil {
			t.Errorf("%s: read %d points, want an error", c.name, len(m.Points))
			continue
		}
		for _, w := range append(c.want, path) {
			if !strings.Contains(err.Error(), w) {
				t.Errorf("%s: error %q lacks %q", c.name, err, w)
			}
		}
	}
	if _, err := model.Read(filepath.Join(t.TempDir(), "missing.csv"), pxFormat); err == nil || !strings.Contains(err.Error(), "missing.csv") {
		t.Errorf("missing file: %v", err)
	}
}

// Column names are case-insensitive and may carry their unit; other
// columns are listed as ignored; comments are skipped; NaN marks a missing
// value; quantities come in the package's order whatever the file's.
func TestReadColumns(t *testing.T) {
	path := writeFile(t, "m.csv", "# exported by hand\nEyy, X_px ,y,node,u\n# mid-file comment\n0.001,1,2,7,NaN\n-0.002,3,4,8,0.5\n")
	m, err := model.Read(path, pxFormat)
	if err != nil {
		t.Fatal(err)
	}
	if len(m.Points) != 2 || len(m.Quantities) != 2 || m.Quantities[0] != model.U || m.Quantities[1] != model.Eyy || !m.Has(model.Eyy) || m.Has(model.V) {
		t.Fatalf("read %d points with quantities %v", len(m.Points), m.Quantities)
	}
	if len(m.Ignored) != 1 || m.Ignored[0] != "node" {
		t.Errorf("ignored columns %q, want [node]", m.Ignored)
	}
	p, q := m.Points[0], m.Points[1]
	if p.X != 1 || p.Y != 2 || p.Line != 4 || !math.IsNaN(p.Value(model.U)) || p.Value(model.Eyy) != 0.001 || !math.IsNaN(p.Value(model.V)) {
		t.Errorf("first point %+v", p)
	}
	if q.X != 3 || q.Y != 4 || q.Line != 5 || q.Value(model.U) != 0.5 || q.Value(model.Eyy) != -0.002 {
		t.Errorf("second point %+v", q)
	}
}

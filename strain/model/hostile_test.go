package model_test

import (
	"strings"
	"testing"

	"spallscope/strain/model"
)

// Careless and hostile model files: non-finite numbers, overflow, points
// that leave float64 once mapped to px, missing cells, huge cells and
// header names, and a line of megabytes. Each is an error naming the file,
// the line and the column; a huge cell is shown as an excerpt. Before, a
// point at 1e308 mm at 0.001 mm/px was accepted at +Inf px, and a 200 kB
// cell came back whole in the message.
func TestReadHostile(t *testing.T) {
	mm := model.Format{Units: model.MM, Scale: 0.001}
	big := strings.Repeat("x", 200_000)
	for _, c := range []struct {
		name, text string
		f          model.Format
		want       []string
	}{
		{"inf x", "x,y,u\n-Inf,2,3\n", pxFormat, []string{"line 2 column 1 (x)", `"-Inf", expected a finite number`}},
		{"nan y", "x,y,u\n1,nan,3\n", pxFormat, []string{"line 2 column 2 (y)", `"nan", expected a finite number`}},
		{"inf strain", "x,y,exx\n1,2,+Inf\n", pxFormat, []string{"line 2 column 3 (exx)", `"+Inf", expected a finite number`}},
		{"overflow", "x,y,u\n1,2,1e999\n", pxFormat, []string{"line 2 column 3 (u)", `"1e999" is out of range`}},
		{"mapped x", "x,y,u\n1e308,2,3\n", mm, []string{"line 2 column 1 (x)", "1e+308 mm maps to +Inf px", "check the scale and units"}},
		{"mapped v", "x,y,v\n1,2,-1e308\n", mm, []string{"line 2 column 3 (v)", "-1e+308 mm maps to -Inf px"}},
		{"missing cells", "x,y,u,v,exx\n1,2,3\n", pxFormat, []string{"line 2 column 4 (v)", "missing, the row has 3 of the header's 5 columns"}},
		{"huge cell", "x,y,u\n1,2," + big + "\n", pxFormat, []string{"line 2 column 3 (u)", `"` + strings.Repeat("x", 60) + `"… (200000 bytes) is not a number`}},
		{"huge header", "x,y,u," + big + "\n1,2,3,4\n5,6\n", pxFormat, []string{"line 3 column 3 (u)", "missing"}},
		{"no columns", big + "\n1\n", pxFormat, []string{"line 1", "(200000 bytes) lacks column x or y"}},
		{"long line", "x,y,u\n1,2," + strings.Repeat("9", 2<<20) + "\n", pxFormat, []string{"line 2 is longer than 1048576 bytes"}},
	} {
		path := writeFile(t, "bad.csv", c.text)
		m, err := model.Read(path, c.f)
		if err == nil {
			t.Errorf("%s: read %d points, want an error", c.name, len(m.Points))
			continue
		}
		for _, w := range append(c.want, path) {
			if !strings.Contains(err.Error(), w) {
				t.Errorf("%s: error %.300q lacks %q", c.name, err, w)
			}
		}
		if len(err.Error()) > 400 {
			t.Errorf("%s: error of %d bytes, want an excerpt", c.name, len(err.Error()))
		}
	}
}

package model

import (
	"bytes"
	"math"
	"strings"
	"testing"
)

// fuzzFormats are the formats FuzzRead reads with, by mode: px, mm at a
// scale with y up, and mm at a tiny scale (where big numbers leave
// float64 once mapped) with strains compression positive.
var fuzzFormats = []Format{
	{Units: PX},
	{Units: MM, Scale: 0.05, OriginX: 100, OriginY: 200, YUp: true},
	{Units: MM, Scale: 1e-300, CompressionPositive: true},
}

// FuzzRead checks that no file makes the model reader panic or hang, that
// an error names the file and stays short (excerpts, never a cell whole),
// and that every field it accepts keeps Read's promises — one point or
// more, finite positions in px, values finite or NaN (never infinite), at
// least one quantity, each point's line after the header — and can be
// interpolated at its own points without a panic. `go test` runs the
// seeds; `go test -fuzz FuzzRead` explores further.
func FuzzRead(f *testing.F) {
	for _, s := range []string{
		"x,y,u,v\n0,0,1,2\n1,0,1,2\n0,1,1,2\n1,1,1,2\n",
		"# exported by hand\nEyy, X_px ,y,node,u\n# mid-file comment\n0.001,1,2,7,NaN\n-0.002,3,4,8,0.5\n",
		"x_mm,y_mm,exx,eyy,exy\n-1,-1,1e-3,2e-3,0\n1,1,NaN,NaN,NaN\n",
		"x,y,u\n1e308,2,3\n-1e308,2,3\n",
		"x,y,u\n\"1\",\"2\",\"3\"\n\"4\n\",5,6\n",
		"\ufeffx,y,u\n1,2,3\n",
		"x,y,u,v,exx\n1,2,3\n",
		"x,y,x,u\n1,2,3,4\n",
		"x,y,u\n1,2,0x1p-1074\n",
		"x,y,u\n0,0,1\n1e-300,1e-300,1\n1e300,1e300,1\n",
		"x,y,u\n" + strings.Repeat("1,1,1\n", 50),
	} {
		for mode := range fuzzFormats {
			f.Add([]byte(s), uint8(mode))
		}
	}
	f.Fuzz(func(t *testing.T, data []byte, mode uint8) {
		form := fuzzFormats[int(mode)%len(fuzzFormats)]
		m, err := parse(bytes.NewReader(data), "fuzz.csv", form)
		if err != nil {
			if msg := err.Error(); !strings.Contains(msg, "fuzz.csv") || len(msg) > 1000 {
				t.Fatalf("error of %d bytes, or without the file: %.300s", len(msg), msg)
			}
			return
		}
		if len(m.Points) == 0 || len(m.Quantities) == 0 {
			t.Fatalf("accepted %d points with %d quantities", len(m.Points), len(m.Quantities))
		}
		for i, p := range m.Points {
			if math.IsNaN(p.X) || math.IsInf(p.X, 0) || math.IsNaN(p.Y) || math.IsInf(p.Y, 0) || p.Line < 2 {
				t.Fatalf("point %d at (%g, %g) px, line %d", i, p.X, p.Y, p.Line)
			}
			for q, v := range p.Values {
				if math.IsInf(v, 0) || (!m.Has(Quantity(q)) && !math.IsNaN(v)) {
					t.Fatalf("point %d: %s = %g", i, Quantity(q), v)
				}
			}
		}
		ip, err := newInterpolator(m, 0)
		if err != nil {
			return // no spacing (points coincide or too far apart): an error, not a hang
		}
		for i := 0; i < len(m.Points) && i < 20; i++ {
			for _, q := range m.Quantities {
				ip.at(q, m.Points[i].X, m.Points[i].Y)
			}
		}
	})
}

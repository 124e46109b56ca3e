package loadlog

import (
	"bytes"
	"math"
	"strings"
	"testing"
)

// maxErrorBytes bounds an error's message: excerpts of cells (60
// characters), a part of a long header, the file and line.
const maxErrorBytes = 4000

// FuzzDecode checks that no input makes Read panic, that an error names
// the file within maxErrorBytes, and that every log it accepts keeps the
// Log's promises: two or more rows, finite values, times that never
// decrease. `go test` runs the seeds; `go test -fuzz
// FuzzDecode` explores further.
func FuzzDecode(f *testing.F) {
	for _, s := range []string{
		benchLog,
		"0 1\n1 2\n",
		"t;f\n0;1,5\n",
		"\"a,b\",\"c\"\"d\"\n0,1\n1,2\n",
		"1,0:01:00,1\n2,0:01:01,2\n",
		"\"unterminated,1\n",
		"time_s,force_kN,stroke_mm\n0,1\n",
		"\uFEFF\r\n\r\n",
		strings.Repeat("c,", 5000) + "\n0,1\n1,2\n",
		strings.Repeat("\""+strings.Repeat("h", 300)+"\",", 300) + "\n0,1\n1,2\n",
	} {
		f.Add([]byte(s), uint8(0))
		f.Add([]byte(s), uint8(1))
	}
	f.Fuzz(func(t *testing.T, data []byte, mode uint8) {
		fm := Format{}
		if mode%2 == 1 {
			fm = Format{TimeColumn: "2", ForceColumn: "3", TimeUnit: "hms", StrokeColumn: "1"}
		}
		l, err := decode(bytes.NewReader(data), "fuzz", fm)
		if err != nil {
			// An error names the file and shows excerpts: a header of a
			// hundred thousand columns is listed in part, a huge cell cut.
			if msg := err.Error(); !strings.Contains(msg, "fuzz") || len(msg) > maxErrorBytes {
				t.Fatalf("error of %d bytes, or without the file: %.300s", len(msg), msg)
			}
			return
		}
		if l.Len() < 2 || len(l.Force) != l.Len() || (l.Stroke != nil && len(l.Stroke) != l.Len()) {
			t.Fatalf("accepted a log with %d times, %d forces, %d strokes", l.Len(), len(l.Force), len(l.Stroke))
		}
		for i := range l.Time {
			if math.IsNaN(l.Time[i]) || math.IsInf(l.Time[i], 0) || math.IsNaN(l.Force[i]) || math.IsInf(l.Force[i], 0) {
				t.Fatalf("row %d: %g s, %g N", i, l.Time[i], l.Force[i])
			}
			if i > 0 && l.Time[i] < l.Time[i-1] {
				t.Fatalf("time decreases at row %d", i)
			}
		}
	})
}

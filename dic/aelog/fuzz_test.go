package aelog

import (
	"bytes"
	"math"
	"strings"
	"testing"

	"spallscope/dic/loadlog"
)

// maxErrorBytes bounds an error's message: excerpts of cells (60
// characters), a part of a long header, the file and line.
const maxErrorBytes = 4000

// FuzzDecode checks that no input makes Read or the derived series panic,
// that an error names the file within maxErrorBytes, and that every list
// Read accepts keeps the Log's promises: one hit or more, finite values,
// times that never decrease, and rates that add up to the number of hits. `go test` runs the seeds; `go test -fuzz
// FuzzDecode` explores further.
func FuzzDecode(f *testing.F) {
	for _, s := range []string{
		tenHits,
		"0 1\n1 2\n",
		"t;energy\n0;1,5\n",
		"\"a,b\",\"c\"\"d\"\n0,1\n1,2\n",
		"time,counts\n0:01:00,1\n0:01:01,2\n",
		"\"unterminated,1\n",
		"time_s,amplitude_dB,counts\n0,40\n",
		"time_s\tcounts\n1e300\t1\n1e301\t0\n",
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
			fm = Format{TimeColumn: "2", EnergyColumn: "1", TimeUnit: "hms"}
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
		if l.Len() == 0 {
			t.Fatal("accepted a list without hits")
		}
		for i, h := range l.Hits {
			for _, v := range []float64{h.Time, h.Amplitude, h.Energy, h.Counts} {
				if math.IsNaN(v) || math.IsInf(v, 0) {
					t.Fatalf("hit %d: %+v", i, h)
				}
			}
			if i > 0 && h.Time < l.Hits[i-1].Time {
				t.Fatalf("time decreases at hit %d", i)
			}
		}
		s, err := l.Series(loadlog.Clock{Offset: 1}, GapRule{})
		if err != nil {
			t.Fatalf("Series of an accepted list: %v", err)
		}
		t0, t1 := s.Span()
		if w := (t1 - t0) / 50; w > 0 && !math.IsInf(w, 0) {
			_, rates := s.HitRate(w)
			sum := 0.0
			for _, r := range rates {
				if !math.IsNaN(r) {
					sum += r * w
				}
			}
			if rates != nil && math.Abs(sum-float64(l.Len())) > 1e-6*float64(l.Len()) {
				t.Fatalf("rates add up to %g hits, want %d", sum, l.Len())
			}
		}
		_, _, _ = s.Onset(OnsetRule{})
	})
}

package loadlog

import (
	"strings"
	"testing"

	"spallscope/dic/logtable/logtabletest"
)

// Careless and hostile cells: non-finite numbers in any column, numbers
// that overflow once converted, clock times with hundreds of digits, and
// cells or header names of hundreds of kilobytes. Each is an error at its
// line and column; none echoes a huge cell whole (before, a 200 kB cell
// came back in full inside the message).
func TestReadHostileCells(t *testing.T) {
	big := strings.Repeat("x", 200_000)
	digits := strings.Repeat("9", 400)
	for _, c := range []struct {
		name, content string
		f             Format
		line, col     int
		parts         []string
	}{
		{"inf-force", "time_s,force_kN\n0,1\n1,Inf\n", Format{}, 3, 2, []string{`"Inf" is not a finite number`}},
		{"neg-infinity-time", "time_s,force_kN\n0,1\n-Infinity,2\n", Format{}, 3, 1, []string{`"-Infinity" is not a finite number`}},
		{"nan-time", "time_s,force_kN\nnan,1\n1,2\n", Format{}, 2, 1, []string{`"nan" is not a finite number`}},
		{"nan-stroke", "time_s,force_kN,stroke_mm\n0,1,0\n1,2,NaN\n", Format{}, 3, 3, []string{"not a finite number"}},
		{"overflow-time", "time_h,force_kN\n0,1\n1e306,2\n", Format{}, 3, 1, []string{"out of range"}},
		{"overflow-parse", "time_s,force_N\n0,1\n1,1e999\n", Format{}, 3, 2, []string{`"1e999" is out of range`}},
		{"huge-hours", "t,f\n0:00:01,1\n" + digits + ":00:00,2\n", Format{TimeUnit: "hms"}, 3, 1, []string{"is not a time", "(406 bytes)"}},
		{"huge-cell", "time_s,force_kN\n0,1\n1," + big + "\n", Format{}, 3, 2, []string{`"` + strings.Repeat("x", 60) + `"… (200000 bytes) is not a number`}},
		{"huge-number-backwards", "time_s,force_kN\n5,1\n0." + strings.Repeat("0", 100_000) + "1,2\n", Format{}, 3, 1,
			[]string{`time "0.` + strings.Repeat("0", 58) + `"… (100003 bytes) s is before the previous row's 5 s`}},
		{"huge-header", "time_s," + big + "\n0,1\n1,2\n", Format{}, 1, 0, []string{"no force column found", `2 "` + strings.Repeat("x", 60) + `"… (200000 bytes)`}},
	} {
		_, err := Read(writeLog(t, c.name+".csv", c.content), c.f)
		wantParseError(t, c.name, err, c.line, c.col, c.parts...)
		logtabletest.WantBrief(t, c.name, err, 400)
	}
}

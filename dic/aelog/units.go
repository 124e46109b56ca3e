package aelog

import (
	"strings"

	"spallscope/dic/logtable"
)

// timeUnits are the accepted time units with their factors to seconds. AE
// systems stamp hits to the microsecond, hence "us" beside loadlog's s, ms,
// min, h and hms.
var timeUnits = logtable.Units{
	{Name: "s", Factor: 1}, {Name: "ms", Factor: 1e-3},
	{Name: "us", Factor: 1e-6}, {Name: "µs", Factor: 1e-6}, {Name: "μs", Factor: 1e-6},
	{Name: "min", Factor: 60}, {Name: "h", Factor: 3600}, {Name: logtable.ClockUnit, Factor: 1},
}

// isDecibel reports whether a unit written in a header is the decibel of
// AE peak amplitudes: "dB", "dBAE", "dB_AE" or "dB AE", in any case.
func isDecibel(u string) bool {
	s := strings.NewReplacer(" ", "", "_", "", "-", "").Replace(strings.ToLower(u))
	return s == "db" || s == "dbae"
}

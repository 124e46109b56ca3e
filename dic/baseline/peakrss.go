package baseline

import (
	"bufio"
	"os"
	"runtime/debug"
	"strconv"
	"strings"
)

// resetPeakRSS returns freed heap to the system and resets the process's
// peak resident set size, so that a later peakRSS covers what follows
// (Linux: writing 5 to /proc/self/clear_refs resets VmHWM, proc(5)).
// Elsewhere it only frees memory.
func resetPeakRSS() {
	debug.FreeOSMemory()
	_ = os.WriteFile("/proc/self/clear_refs", []byte("5"), 0)
}

// peakRSS returns the process's peak resident set size in bytes (VmHWM of
// /proc/self/status, proc(5)), or 0 where it cannot be read.
func peakRSS() int64 {
	f, err := os.Open("/proc/self/status")
	if err != nil {
		return 0
	}
	defer f.Close()
	sc := bufio.NewScanner(f)
	for sc.Scan() {
		rest, ok := strings.CutPrefix(sc.Text(), "VmHWM:")
		if !ok {
			continue
		}
		kb, err := strconv.ParseInt(strings.TrimSuffix(strings.TrimSpace(rest), " kB"), 10, 64)
		if err != nil {
			return 0
		}
		return kb << 10
	}
	return 0
}

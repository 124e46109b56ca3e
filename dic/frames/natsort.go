package frames

import (
	"sort"
	"strings"
)

// NaturalLess reports whether a sorts before b in natural order: runs of
// decimal digits compare by numeric value, so "f_2.tif" sorts before
// "f_10.tif". Other characters compare byte-wise. Equal numeric values with
// different leading zeros ("f_02", "f_2") are ordered by their length so the
// order stays total.
func NaturalLess(a, b string) bool {
	for a != "" && b != "" {
		da, db := isDigit(a[0]), isDigit(b[0])
		switch {
		case da && db:
			na, ra := digitRun(a)
			nb, rb := digitRun(b)
			if c := compareDigits(na, nb); c != 0 {
				return c < 0
			}
			if len(na) != len(nb) {
				return len(na) < len(nb)
			}
			a, b = ra, rb
		case a[0] != b[0]:
			return a[0] < b[0]
		default:
			a, b = a[1:], b[1:]
		}
	}
	return len(a) < len(b)
}

// SortNatural sorts names in natural order (see NaturalLess).
func SortNatural(names []string) {
	sort.SliceStable(names, func(i, j int) bool { return NaturalLess(names[i], names[j]) })
}

func isDigit(c byte) bool { return '0' <= c && c <= '9' }

// digitRun splits s into its leading run of digits and the rest.
func digitRun(s string) (run, rest string) {
	i := 0
	for i < len(s) && isDigit(s[i]) {
		i++
	}
	return s[:i], s[i:]
}

// compareDigits compares two digit strings by numeric value without
// converting them, so runs longer than any integer type still work.
func compareDigits(a, b string) int {
	a = strings.TrimLeft(a, "0")
	b = strings.TrimLeft(b, "0")
	if len(a) != len(b) {
		if len(a) < len(b) {
			return -1
		}
		return 1
	}
	return strings.Compare(a, b)
}

package render

import (
	"fmt"
	"math"
	"strconv"
	"strings"
)

// formatFactor prints a factor or ratio the way people write one: rounded
// to three significant digits, without trailing zeros, so a computed
// 3.0000000000000004 reads "3" and 2.75 stays "2.75"; from 10⁵ up (and
// below 10⁻⁴) as a power of ten, "9.72 × 10⁶". Rounding happens before
// printing, never by cutting digits. Not finite values print as "—".
func formatFactor(v float64) string {
	if a := math.Abs(v); a >= 1e5 || (a > 0 && a < 1e-4) {
		return formatPowerOfTen(v, 3)
	}
	return formatSignificant(v, 3)
}

// formatPowerOfTen prints v as m × 10ⁿ with m rounded to digits
// significant digits, without trailing zeros.
func formatPowerOfTen(v float64, digits int) string {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return "—"
	}
	s := strconv.FormatFloat(v, 'e', digits-1, 64) // d.dde±XX
	mant, exp, _ := strings.Cut(s, "e")
	if strings.Contains(mant, ".") {
		mant = strings.TrimRight(strings.TrimRight(mant, "0"), ".")
	}
	n, err := strconv.Atoi(exp)
	if err != nil {
		return s
	}
	return mant + " × 10" + superscript(n)
}

// superscript writes an integer in superscript digits.
func superscript(n int) string {
	const digits = "⁰¹²³⁴⁵⁶⁷⁸⁹"
	sup := []rune(digits)
	var b strings.Builder
	if n < 0 {
		b.WriteRune('⁻')
		n = -n
	}
	for _, c := range strconv.Itoa(n) {
		b.WriteRune(sup[c-'0'])
	}
	return b.String()
}

// formatSignificant prints v rounded to digits significant digits in plain
// decimal notation, without trailing zeros ("—" when v is not finite).
func formatSignificant(v float64, digits int) string {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return "—"
	}
	if v == 0 {
		return "0"
	}
	// Round through the shortest decimal of the rounded value: 'g' rounds
	// half to even on the exact binary value, as strconv does everywhere.
	rounded, err := strconv.ParseFloat(strconv.FormatFloat(v, 'g', digits, 64), 64)
	if err != nil {
		return strconv.FormatFloat(v, 'g', digits, 64)
	}
	return strconv.FormatFloat(rounded, 'f', -1, 64)
}

// formatRange prints the range lo–hi with the verb (e.g. "%.2f") and the
// unit, or the one value when both print alike: "10.06–14.80 MPa",
// "29.26 MPa".
func formatRange(lo, hi float64, verb, unit string) string {
	a, b := fmt.Sprintf(verb, lo), fmt.Sprintf(verb, hi)
	if a == b {
		return a + " " + unit
	}
	return a + "–" + b + " " + unit
}

package logtable

import (
	"errors"
	"fmt"
	"math"
	"strconv"
	"strings"
)

// ParseNumber reads a cell as a finite decimal number with '.' as the
// decimal point ("12.5", "-3", "1.2e3").
func ParseNumber(cell string) (float64, bool) {
	v, err := strconv.ParseFloat(cell, 64)
	if err != nil || math.IsInf(v, 0) || math.IsNaN(v) {
		return 0, false
	}
	return v, true
}

// ParseClock reads a cell written h:mm:ss[.fff] or mm:ss[.fff] as seconds:
// "0:01:02.5" and "01:02.5" are 62.5 s. Hours, and minutes in mm:ss, may
// have any number of digits; minutes after hours and seconds must be below
// 60. A leading '-' makes the time negative. A time too large for a
// float64 is not a time.
func ParseClock(cell string) (float64, bool) {
	s, sign := cell, 1.0
	if strings.HasPrefix(s, "-") {
		s, sign = s[1:], -1
	}
	parts := strings.Split(s, ":")
	if len(parts) != 2 && len(parts) != 3 {
		return 0, false
	}
	total := 0.0
	for i, p := range parts[:len(parts)-1] {
		if p == "" || strings.Trim(p, "0123456789") != "" {
			return 0, false
		}
		v, err := strconv.ParseFloat(p, 64)
		if err != nil || (i == 1 && v >= 60) {
			return 0, false
		}
		total = total*60 + v
	}
	sec := parts[len(parts)-1]
	if sec == "" || sec[0] == '.' || strings.Trim(sec, "0123456789.") != "" || strings.Count(sec, ".") > 1 {
		return 0, false
	}
	v, err := strconv.ParseFloat(sec, 64)
	if err != nil || v >= 60 {
		return 0, false
	}
	t := sign * (total*60 + v)
	if math.IsInf(t, 0) {
		return 0, false // hours of hundreds of digits
	}
	return t, true
}

// CellProblem explains why a cell could not be read as a number (or, with
// clock, as an h:mm:ss time), with a hint when the cause is a common one: a
// decimal comma, or an h:mm:ss time in a column read as plain numbers. The
// hints name the time_unit setting, which every reader of this package
// calls so.
func CellProblem(cell string, clock bool) error {
	if cell == "" {
		return fmt.Errorf("empty cell, expected a number")
	}
	if clock {
		return fmt.Errorf("%s is not a time; expected h:mm:ss[.fff] or mm:ss (time_unit %q)", Excerpt(cell), ClockUnit)
	}
	if _, err := strconv.ParseFloat(cell, 64); err == nil {
		return fmt.Errorf("%s is not a finite number", Excerpt(cell))
	} else if errors.Is(err, strconv.ErrRange) {
		return fmt.Errorf("%s is out of range, expected a finite number (at most about 1.8e308)", Excerpt(cell))
	}
	if strings.Count(cell, ",") == 1 {
		if _, ok := ParseNumber(strings.Replace(cell, ",", ".", 1)); ok {
			return fmt.Errorf("%s is not a number: the decimal separator must be '.', not ','", Excerpt(cell))
		}
	}
	if _, ok := ParseClock(cell); ok {
		return fmt.Errorf("%s is not a number; for h:mm:ss times set time_unit %q", Excerpt(cell), ClockUnit)
	}
	return fmt.Errorf("%s is not a number", Excerpt(cell))
}

package config

import (
	"fmt"
	"math"
)

// A bound is one numeric setting against its range: ok says the value is
// in it, expected says the range in words for the error. Every numeric
// setting of every section is checked this way, once, where the section
// is checked (its check method), so YAML and command line get the same
// rule and the same message.
type bound struct {
	key      string
	value    any
	ok       bool
	expected string
}

// checkBounds returns a FieldError for each setting out of its range.
func checkBounds(bounds ...bound) error {
	var p Problems
	for _, b := range bounds {
		if !b.ok {
			p.add(&FieldError{Key: b.key, Value: fmt.Sprint(b.value), Expected: b.expected})
		}
	}
	return p.err()
}

// finite reports whether v is a number other than ±Inf and NaN.
func finite(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }

// finiteAll reports whether every v is finite.
func finiteAll(vs []float64) bool {
	for _, v := range vs {
		if !finite(v) {
			return false
		}
	}
	return true
}

// key joins a section prefix and a key: key("faces[0].times", "fps").
func key(prefix, name string) string {
	if prefix == "" {
		return name
	}
	return prefix + "." + name
}

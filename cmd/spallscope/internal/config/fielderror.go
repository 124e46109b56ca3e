package config

import (
	"fmt"
	"strings"

	"spallscope/dic/logtable"
)

// FieldError is a config value that cannot be used: the dotted YAML key
// ("correlation.order"), the value as given and what was expected. The
// command line, whose options fill the same fields, reports it under the
// option's name instead of the key.
type FieldError struct {
	Key, Value, Expected string
	// With, when set, is the key whose value makes this one required, and
	// the value is missing: load.area_mm2 is required with load.file.
	With string
}

func (e *FieldError) Error() string {
	if e.With != "" {
		return fmt.Sprintf("%s: required with %s, expected %s", e.Key, e.With, e.Expected)
	}
	return fmt.Sprintf("%s %s: expected %s", e.Key, logtable.Excerpt(e.Value), e.Expected)
}

// ShownValue is the value as a message shows it after an option's name:
// as given, or an excerpt when it is long (a value may be a megabyte).
func (e *FieldError) ShownValue() string { return logtable.Shown(e.Value) }

// Problems are the errors of several settings found together, so that one
// pass over a config reports all of them. errors.As and errors.Is see
// each; the message shows the first ProblemsShown.
type Problems []error

// ProblemsShown is how many problems a Problems message spells out: a
// hostile file may hold a million unknown keys.
const ProblemsShown = 10

func (p Problems) Error() string {
	var msgs []string
	for i, e := range p {
		if i == ProblemsShown {
			msgs = append(msgs, fmt.Sprintf("and %d more", len(p)-i))
			break
		}
		msgs = append(msgs, e.Error())
	}
	return strings.Join(msgs, "; ")
}

// Unwrap returns the problems, for errors.As and errors.Is.
func (p Problems) Unwrap() []error { return p }

// add appends err, flattening Problems; nil is skipped.
func (p *Problems) add(err error) {
	if more, ok := err.(Problems); ok {
		*p = append(*p, more...)
	} else if err != nil {
		*p = append(*p, err)
	}
}

// err returns the problems as one error, nil when there are none.
func (p Problems) err() error {
	if len(p) == 0 {
		return nil
	}
	return p
}

package config

import "fmt"

// FieldError is a config value that cannot be used: the dotted YAML key
// ("correlation.order"), the value as given and what was expected. The
// command line, whose options fill the same fields, reports it under the
// option's name instead of the key.
type FieldError struct {
	Key, Value, Expected string
}

func (e *FieldError) Error() string {
	return fmt.Sprintf("%s %q: expected %s", e.Key, e.Value, e.Expected)
}

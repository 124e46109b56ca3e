package config

import (
	"fmt"

	"github.com/goccy/go-yaml"
)

// Marshal writes test t as a test config in YAML: the keys t sets, in the
// order this package declares them; zero values, which mean the
// defaults, and sections left empty are left out. Read of the result
// gives t back (Dir and Path aside).
func Marshal(t *Test) ([]byte, error) {
	data, err := yaml.MarshalWithOptions(t, yaml.OmitEmpty())
	if err != nil {
		return nil, fmt.Errorf("test config %s: %w", t.Name, err)
	}
	var tree yaml.MapSlice
	if err := yaml.UnmarshalWithOptions(data, &tree, yaml.UseOrderedMap()); err != nil {
		return nil, fmt.Errorf("test config %s: %w", t.Name, err)
	}
	return yaml.Marshal(pruned(tree))
}

// pruned drops the empty mappings of a YAML tree, at any depth.
func pruned(v any) any {
	switch v := v.(type) {
	case yaml.MapSlice:
		var out yaml.MapSlice
		for _, it := range v {
			it.Value = pruned(it.Value)
			if m, ok := it.Value.(yaml.MapSlice); ok && len(m) == 0 {
				continue
			}
			out = append(out, it)
		}
		return out
	case []any:
		for i := range v {
			v[i] = pruned(v[i])
		}
	}
	return v
}

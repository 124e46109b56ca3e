package runfolder

import (
	"bufio"
	"encoding/json"
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
)

// ManifestFile is the run folder's record of settings, inputs, versions,
// resolution and timings, one JSON object with a section per stage.
const ManifestFile = "run.json"

// SetSection stores v as section name of dir's run.json, keeping the other
// sections, and writes the file atomically.
func SetSection(dir, name string, v any) error {
	path := filepath.Join(dir, ManifestFile)
	sections := map[string]json.RawMessage{}
	data, err := os.ReadFile(path)
	switch {
	case err == nil:
		if err := json.Unmarshal(data, &sections); err != nil {
			return fmt.Errorf("%s: %w", path, err)
		}
	case !errors.Is(err, fs.ErrNotExist):
		return err
	}
	raw, err := json.Marshal(v)
	if err != nil {
		return fmt.Errorf("%s: section %s: %w", path, name, err)
	}
	sections[name] = raw
	return WriteAtomic(path, func(w *bufio.Writer) error {
		out, err := json.MarshalIndent(sections, "", "  ")
		if err != nil {
			return err
		}
		_, err = w.Write(append(out, '\n'))
		return err
	})
}

// Section reads section name of dir's run.json into v; it reports
// fs.ErrNotExist when the file or the section is missing.
func Section(dir, name string, v any) error {
	path := filepath.Join(dir, ManifestFile)
	data, err := os.ReadFile(path)
	if err != nil {
		return err
	}
	sections := map[string]json.RawMessage{}
	if err := json.Unmarshal(data, &sections); err != nil {
		return fmt.Errorf("%s: %w", path, err)
	}
	raw, ok := sections[name]
	if !ok {
		return fmt.Errorf("%s: no section %q: %w", path, name, fs.ErrNotExist)
	}
	if err := json.Unmarshal(raw, v); err != nil {
		return fmt.Errorf("%s: section %s: %w", path, name, err)
	}
	return nil
}

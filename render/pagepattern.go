package render

import (
	"encoding/json"
	"errors"
	"fmt"
	"html/template"
	"io/fs"
	"os"
	"path/filepath"

	"spallscope/dic/speckle"
)

// pagePattern is the speckle pattern section: the assessment's figures,
// its notes and its SSSIG map when the map file sits beside it.
type pagePattern struct {
	Path  string
	Rows  []pageRow
	Notes []string
	Map   template.URL
}

// patternSection reads the pattern assessment at path, or at
// RUN/pattern/pattern.json when path is empty (nil when that does not
// exist; a given path must exist).
func patternSection(r *runRecords, path string, im pageImages) (*pagePattern, error) {
	given := path != ""
	if !given {
		path = filepath.Join(r.Dir, "pattern", "pattern.json")
	}
	data, err := os.ReadFile(path)
	if err != nil {
		if !given && errors.Is(err, fs.ErrNotExist) {
			return nil, nil
		}
		return nil, fmt.Errorf("pattern assessment: %w", err)
	}
	var rep speckle.Report
	if err := json.Unmarshal(data, &rep); err != nil {
		return nil, fmt.Errorf("pattern assessment %s: %w", path, err)
	}
	p := &pagePattern{Path: path, Notes: rep.Notes}
	add := func(label, value string) { p.Rows = append(p.Rows, pageRow{Label: label, Value: value}) }
	depth := "unknown depth"
	if rep.Depth > 0 {
		depth = fmt.Sprintf("%d-bit", rep.Depth)
	}
	add("Photo", fmt.Sprintf("%d × %d px, %s", rep.Width, rep.Height, depth))
	add("Gray levels", fmt.Sprintf("mean %.1f, contrast (std) %.1f, range %.0f to %.0f", rep.Mean, rep.Contrast, rep.Min, rep.Max))
	add("Clipped", fmt.Sprintf("saturated %.2f %%, dark %.2f %%", 100*rep.Saturated, 100*rep.Dark))
	add("Mean intensity gradient", fmt.Sprintf("%.2f gray levels/px", rep.MIG))
	if rep.SpeckleSize > 0 {
		add("Speckle size", fmt.Sprintf("%.1f px", rep.SpeckleSize))
	} else {
		add("Speckle size", "undefined")
	}
	switch rep.NoiseSource {
	case speckle.NoiseGiven, speckle.NoiseStaticPair:
		add("Image noise", fmt.Sprintf("%.3g gray levels (%s)", rep.Noise, rep.NoiseSource))
	default:
		add("Image noise", "unknown")
	}
	add(fmt.Sprintf("Smallest subset for σu ≤ %g px", rep.Target), rep.SmallestSubsetText)
	mapPath := filepath.Join(filepath.Dir(path), "pattern_map.png")
	if _, err := os.Stat(mapPath); err == nil {
		if p.Map, err = im.URL(mapPath); err != nil {
			return nil, err
		}
	}
	return p, nil
}

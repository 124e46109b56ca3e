package render

import (
	"fmt"
	"html/template"
	"path/filepath"
	"slices"
	"strings"

	"spallscope/dic/frames"
)

// OverlaysDir is the run folder's subfolder of overlay images, one or more
// per frame, named after the frame (<frame>.png, or <frame><suffix>.png
// for several overlays of a frame, one suffix per kind, e.g. _e1).
const OverlaysDir = "overlays"

// pageFrame is one overlay image under the frame slider, with the frame's
// name, time and stress as the page shows them.
type pageFrame struct {
	Src                template.URL
	Name, Time, Stress string
	File               string
}

// pageFrameSet is the overlays of one kind (one suffix after the frame
// name), in frame order.
type pageFrameSet struct {
	Kind   string
	Frames []pageFrame
}

// Last is the index of the set's last frame (the slider's maximum).
func (s pageFrameSet) Last() int { return len(s.Frames) - 1 }

// overlaySets lists the run's overlays, grouped by kind. Each file is
// matched to the longest frame name it starts with (followed by the end
// of the name or a separator); files of no frame are shown by file name.
func overlaySets(r *runRecords, im pageImages) ([]pageFrameSet, error) {
	files, err := filepath.Glob(filepath.Join(r.Dir, OverlaysDir, "*.png"))
	if err != nil {
		return nil, err
	}
	if len(files) == 0 {
		return nil, nil
	}
	type entry struct {
		frame int // position on the frame axis, −1 when unknown
		f     pageFrame
	}
	byKind := map[string][]entry{}
	var kinds []string
	names := make([]string, len(files))
	for i, f := range files {
		names[i] = filepath.Base(f)
	}
	frames.SortNatural(names)
	peak, _, hasPeak := r.peak()
	for _, base := range names {
		stem := strings.TrimSuffix(base, filepath.Ext(base))
		k, kind := matchFrame(r.Axis.Names, stem)
		src, err := im.URL(filepath.Join(r.Dir, OverlaysDir, base))
		if err != nil {
			return nil, err
		}
		pf := pageFrame{Src: src, Name: stem, File: OverlaysDir + "/" + base, Time: "time unknown", Stress: "stress unknown"}
		if k >= 0 {
			pf.Name = r.Axis.Names[k]
			if r.Axis.Timed {
				pf.Time = fmt.Sprintf("t = %.4g s", r.Axis.X[k])
			}
			if s := r.Axis.Stress[k]; plotFinite(s) {
				pf.Stress = fmt.Sprintf("σ = %.3g MPa", s)
				if hasPeak {
					pf.Stress += fmt.Sprintf(" (%.0f %% of peak)", 100*s/peak)
				}
			}
		} else {
			kind = ""
		}
		if _, ok := byKind[kind]; !ok {
			kinds = append(kinds, kind)
		}
		byKind[kind] = append(byKind[kind], entry{k, pf})
	}
	var sets []pageFrameSet
	for _, kind := range kinds {
		set := pageFrameSet{Kind: strings.Trim(kind, "_-. ")}
		if set.Kind == "" {
			set.Kind = "overlay"
		}
		es := byKind[kind]
		slices.SortStableFunc(es, func(a, b entry) int {
			switch { // files of no frame go last, in name order
			case a.frame < 0 && b.frame < 0:
				return 0
			case a.frame < 0:
				return 1
			case b.frame < 0:
				return -1
			}
			return a.frame - b.frame
		})
		for _, e := range es {
			set.Frames = append(set.Frames, e.f)
		}
		sets = append(sets, set)
	}
	return sets, nil
}

// matchFrame returns the position of the longest frame name that stem
// starts with, followed by the end of stem or a separator, and the rest of
// stem (the overlay's kind); −1 when none.
func matchFrame(names []string, stem string) (int, string) {
	best := -1
	for k, n := range names {
		if !strings.HasPrefix(stem, n) {
			continue
		}
		if rest := stem[len(n):]; rest != "" && !strings.ContainsAny(rest[:1], "_-. ") {
			continue
		}
		if best < 0 || len(n) > len(names[best]) {
			best = k
		}
	}
	if best < 0 {
		return -1, ""
	}
	return best, stem[len(names[best]):]
}

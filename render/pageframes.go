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
	// frame is the position of the frame in the sequence, −1 when the
	// file is of no frame.
	frame int
}

// pageFrameSet is the overlays of one kind (one suffix after the frame
// name), in frame order.
type pageFrameSet struct {
	Kind   string
	Frames []pageFrame
	// Start is the frame the slider shows first: the first onset's.
	Start int
}

// Last is the index of the set's last frame (the slider's maximum).
func (s pageFrameSet) Last() int { return len(s.Frames) - 1 }

// First is the frame the slider shows first.
func (s pageFrameSet) First() pageFrame { return s.Frames[s.Start] }

// startAt returns the index of the first overlay of a frame at or after
// position frame in the sequence (the last overlay when none is; 0 when
// frame < 0).
func (s pageFrameSet) startAt(frame int) int {
	if frame < 0 {
		return 0
	}
	for i, f := range s.Frames {
		if f.frame >= frame {
			return i
		}
	}
	return len(s.Frames) - 1
}

// firstOnsetFrame returns the position in the sequence of the earliest
// (back-dated) onset's frame, and its name; −1 when the run has no onset.
func firstOnsetFrame(r *runRecords) (int, string) {
	first, name := -1, ""
	if r.Onset == nil {
		return first, name
	}
	for _, o := range r.Onset.Onsets {
		k, ok := r.Axis.Index(o.Name)
		if !ok {
			k = o.Frame
		}
		if k >= 0 && (first < 0 || k < first) {
			first, name = k, o.Name
		}
	}
	return first, name
}

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
		pf := pageFrame{Src: src, Name: stem, File: OverlaysDir + "/" + base, Time: "time unknown", Stress: "stress unknown", frame: k}
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
	onset, _ := firstOnsetFrame(r)
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
		set.Start = set.startAt(onset)
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

package job

import (
	"context"
	"fmt"
	"math"
	"path/filepath"
	"slices"
	"time"

	"spallscope/cmd/spallscope/internal/config"
	"spallscope/dic/runfolder"
	"spallscope/render"
	"spallscope/strain/strainfile"
)

// FacesDir is the run folder's subfolder of per-face run folders.
const FacesDir = "faces"

// FacesFile is the run folder's record of every face's onsets on the load
// log's clock (FacesReport).
const FacesFile = "faces.json"

// FaceOnset is an onset of one face placed on the load log's clock.
type FaceOnset struct {
	Face string `json:"face"`
	strainfile.OnsetRecord
	// LogTime is the onset's time on the load log's clock (camera time
	// plus the face's clock offset), the common axis of all faces.
	LogTime float64 `json:"log_time_s"`
}

// FacesReport is the content of faces.json: every face's onsets on the
// load log's clock, in time order, and the first onset over all faces.
type FacesReport struct {
	Tool     string                `json:"tool"`
	Faces    []string              `json:"faces"`
	Onsets   []FaceOnset           `json:"onsets"`
	First    *FaceOnset            `json:"first,omitempty"`
	Peak     strainfile.PeakRecord `json:"peak"`
	Cautions []string              `json:"cautions"`
}

// runFaces runs each face of t as its own test into out/faces/<name> and
// writes the combined faces.json and an index page report.html showing the
// faces' reports side by side.
func runFaces(ctx context.Context, t *config.Test, out, tool string, progress Progress) (*Summary, error) {
	start := time.Now()
	sum := &Summary{Name: t.Name, Out: out}
	rep := FacesReport{Tool: tool, Cautions: strainfile.Cautions}
	for i := range t.Faces {
		ft := t.FaceTest(i)
		s, err := Run(ctx, ft, filepath.Join(out, FacesDir, ft.Name), tool, func(stage string, done, total int) {
			progress(ft.Name+"/"+stage, done, total)
		})
		if err != nil {
			return nil, fmt.Errorf("face %s: %w", ft.Name, err)
		}
		rep.Faces = append(rep.Faces, ft.Name)
		for _, n := range s.Notes {
			sum.Notes = append(sum.Notes, "face "+ft.Name+": "+n)
		}
		offset := ft.Load.ClockOffset
		if len(ft.Load.Sync) == 2 {
			offset = ft.Load.Sync[1] - ft.Load.Sync[0]
		}
		for _, o := range s.Onsets {
			rep.Onsets = append(rep.Onsets, FaceOnset{Face: ft.Name, OnsetRecord: o, LogTime: o.Time + offset})
		}
		if s.Peak.Stress > rep.Peak.Stress {
			rep.Peak = s.Peak
		}
		sum.Frames += s.Frames
		sum.Onsets = append(sum.Onsets, s.Onsets...)
		if sum.Resolution == nil {
			sum.Resolution = s.Resolution
		}
	}
	slices.SortStableFunc(rep.Onsets, func(a, b FaceOnset) int {
		switch {
		case a.LogTime < b.LogTime:
			return -1
		case a.LogTime > b.LogTime:
			return 1
		}
		return 0
	})
	if len(rep.Onsets) > 0 {
		first := rep.Onsets[0]
		rep.First = &first
	}
	sum.Peak = rep.Peak
	// The common timeline: the first face's load record (the log is shared)
	// on the log's clock, every face's onsets, and the AE record if any.
	var timeline string
	var ld runfolder.LoadRecord
	if len(rep.Faces) > 0 && runfolder.Section(filepath.Join(out, FacesDir, rep.Faces[0]), "load", &ld) == nil {
		logTimes := make([]float64, len(ld.Times))
		for i, t := range ld.Times {
			logTimes[i] = t + ld.Offset
		}
		var marks []render.TimelineMark
		timelines := map[string]*strainfile.TimelineRecord{}
		for _, f := range rep.Faces {
			var tl strainfile.TimelineRecord
			if runfolder.Section(filepath.Join(out, FacesDir, f), "timeline", &tl) == nil {
				timelines[f] = &tl
			}
		}
		for _, o := range rep.Onsets {
			marks = append(marks, timelineMark(o, timelines[o.Face]))
		}
		var aeT, aeH []float64
		var aer runfolder.AERecord
		if runfolder.Section(filepath.Join(out, FacesDir, rep.Faces[0]), "ae", &aer) == nil {
			for i, t := range aer.Times {
				aeT, aeH = append(aeT, t+ld.Offset), append(aeH, aer.Cumulative[i])
			}
			sum.AE = &aer
		}
		if fig, err := render.WriteTimeline(out, logTimes, ld.Stress, marks, aeT, aeH); err == nil {
			timeline = fig.PNG
		}
	}
	err := runfolder.WriteJSON(filepath.Join(out, FacesFile), rep)
	if err != nil {
		return nil, err
	}
	if t.Outputs.WantReport() {
		page := render.FacesPage{Name: t.Name, Faces: rep.Faces, Timeline: timeline, Cautions: rep.Cautions}
		for _, o := range rep.Onsets {
			page.Onsets = append(page.Onsets, render.FaceOnset{Face: o.Face, Onset: o.OnsetRecord, LogTime: o.LogTime})
		}
		if f := rep.First; f != nil {
			page.First = &render.FaceOnset{Face: f.Face, Onset: f.OnsetRecord, LogTime: f.LogTime}
		}
		if err := render.WriteFacesPage(filepath.Join(out, render.ReportFile), page); err != nil {
			return nil, err
		}
		sum.Report = filepath.Join(out, render.ReportFile)
	}
	sum.Seconds = time.Since(start).Seconds()
	return sum, nil
}

// timelineMark places an onset of a face on the common timeline: the
// onset, its interval (shifted by the face's clock offset) and its trigger
// frame, whose time and stress come from the face's timeline record
// (onset.json names the trigger frame but not its time).
func timelineMark(o FaceOnset, tl *strainfile.TimelineRecord) render.TimelineMark {
	m := render.TimelineMark{Face: o.Face, Label: o.Class, Time: o.LogTime, Stress: o.Stress}
	offset := o.LogTime - o.Time
	if iv := o.Interval; iv != nil {
		m.HasInterval = true
		m.TimeLo, m.TimeHi = iv.TimeLo+offset, iv.TimeHi+offset
		m.StressLo, m.StressHi = math.NaN(), math.NaN()
		if o.InSpan {
			m.StressLo, m.StressHi = iv.StressLo, iv.StressHi
		}
	}
	if tl != nil && o.TriggerName != "" {
		k := slices.Index(tl.Frames, o.TriggerName)
		if k >= 0 && k < len(tl.Times) && k < len(tl.Stress) && (k >= len(tl.InSpan) || tl.InSpan[k]) {
			m.HasTrigger = true
			m.TriggerTime, m.TriggerStress = tl.Times[k]+offset, tl.Stress[k]
		}
	}
	return m
}

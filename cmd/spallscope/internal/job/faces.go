package job

import (
	"bufio"
	"context"
	"fmt"
	"html/template"
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
		for _, o := range rep.Onsets {
			marks = append(marks, render.TimelineMark{Face: o.Face, Label: o.Class, Time: o.LogTime, Stress: o.Stress})
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
		err = runfolder.WriteAtomic(filepath.Join(out, render.ReportFile), func(w *bufio.Writer) error {
			return facesPage.Execute(w, struct {
				Name     string
				Timeline string
				FacesReport
			}{t.Name, timeline, rep})
		})
		if err != nil {
			return nil, err
		}
		sum.Report = filepath.Join(out, render.ReportFile)
	}
	sum.Seconds = time.Since(start).Seconds()
	return sum, nil
}

var facesPage = template.Must(template.New("faces").Parse(`<!DOCTYPE html>
<html lang="en"><head><meta charset="utf-8"><title>{{.Name}} — all faces</title>
<style>
body{font-family:system-ui,sans-serif;margin:1.5rem;color:#1d2733}
.caution{border-left:4px solid #b5651d;background:#fbf5ef;padding:.5rem 1rem;margin:1rem 0}
table{border-collapse:collapse;font-size:.9rem;margin:1rem 0}
th,td{border:1px solid #c9d1da;padding:.25rem .5rem;text-align:left}
th{background:#eef2f6}
.faces{display:flex;gap:1rem;flex-wrap:wrap}
.faces iframe{flex:1 1 45%;min-width:420px;height:80vh;border:1px solid #c9d1da}
</style></head><body>
<h1>{{.Name}} — all faces on the load log's clock</h1>
<div class="caution">{{range .Cautions}}<p>{{.}}</p>{{end}}</div>
{{with .First}}<p id="first">First onset over all faces: <b>{{.Face}}</b>, {{.Class}} at {{.OpeningName}} {{.Sector}},
log time {{printf "%.1f" .LogTime}} s, {{printf "%.2f" .Stress}} MPa ({{printf "%.0f" .Percent}} % of peak).</p>{{end}}
<table id="onsets"><thead><tr><th>face</th><th>class</th><th>opening</th><th>sector</th><th>indicator</th><th>frame</th><th>log time, s</th><th>stress, MPa</th><th>% of peak</th></tr></thead>
<tbody>{{range .Onsets}}<tr><td>{{.Face}}</td><td>{{.Class}}</td><td>{{.OpeningName}}</td><td>{{.Sector}}</td><td>{{.Indicator}}</td><td>{{.Name}}</td><td>{{printf "%.1f" .LogTime}}</td><td>{{printf "%.2f" .Stress}}</td><td>{{printf "%.0f" .Percent}}</td></tr>{{end}}</tbody></table>
{{with .Timeline}}<figure><img id="timeline" src="{{.}}" alt="all faces on the load log's clock" style="max-width:100%"><figcaption>All faces' onsets on the load log's clock over the nominal stress{{if $.First}}; the first onset over all faces is listed above{{end}}.</figcaption></figure>{{end}}
<div class="faces">{{range .Faces}}<iframe title="face {{.}}" src="faces/{{.}}/report.html"></iframe>{{end}}</div>
</body></html>
`))

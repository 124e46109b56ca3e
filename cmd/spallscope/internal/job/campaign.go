package job

import (
	"bufio"
	"context"
	"encoding/csv"
	"fmt"
	"html/template"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"sync"

	"spallscope/cmd/spallscope/internal/config"
	"spallscope/dic/runfolder"
	"spallscope/strain/strainfile"
)

// Result is one test of a campaign: its summary, or the error that
// stopped it.
type Result struct {
	Config  string   `json:"config"`
	Summary *Summary `json:"summary,omitempty"`
	Err     string   `json:"error,omitempty"`
}

// CampaignProgress reports progress of one test of a campaign.
type CampaignProgress func(test, stage string, done, total int)

// File names of a campaign's summary in its output folder.
const (
	SummaryCSV  = "summary.csv"
	SummaryHTML = "summary.html"
)

// CampaignOut is campaign c's output folder: out when given, else the
// campaign's out key, else "<name>_runs" beside the campaign file.
func CampaignOut(c *config.Campaign, out string) string {
	if out == "" {
		out = c.Out
	}
	if out == "" {
		out = filepath.Join(c.Dir, c.Name+"_runs")
	}
	return out
}

// RunCampaign runs the tests of campaign c that include selects (nil: all;
// a cluster task's share), at most jobs at once, each into <out>/<test
// name>, and records each test's outcome there (outcomeFile). A failing
// test does not stop the others; its Result carries the error. Results are
// in the campaign's order, for the selected tests only.
func RunCampaign(ctx context.Context, c *config.Campaign, out, tool string, jobs int, include func(k int) bool, progress CampaignProgress) []Result {
	if jobs <= 0 {
		jobs = max(c.Jobs, 1)
	}
	var picked []string
	for k, path := range c.Tests {
		if include == nil || include(k) {
			picked = append(picked, path)
		}
	}
	results := make([]Result, len(picked))
	sem := make(chan struct{}, jobs)
	var wg sync.WaitGroup
	for i, path := range picked {
		wg.Add(1)
		go func(i int, path string) {
			defer wg.Done()
			sem <- struct{}{}
			defer func() { <-sem }()
			results[i] = runOne(ctx, path, out, tool, progress)
			if err := WriteOutcome(out, results[i]); err != nil && results[i].Err == "" {
				results[i].Err = err.Error()
			}
		}(i, path)
	}
	wg.Wait()
	return results
}

func runOne(ctx context.Context, path, out, tool string, progress CampaignProgress) (res Result) {
	res.Config = path
	defer func() {
		if r := recover(); r != nil { // one test's bug must not lose the others' results
			res.Err = fmt.Sprintf("internal error: %v", r)
		}
	}()
	t, err := config.Read(path)
	if err != nil {
		res.Err = err.Error()
		return res
	}
	var p Progress
	if progress != nil {
		p = func(stage string, done, total int) { progress(t.Name, stage, done, total) }
	}
	s, err := Run(ctx, t, filepath.Join(out, t.Name), tool, p)
	if err != nil {
		res.Err = err.Error()
		return res
	}
	res.Summary = s
	return res
}

// summaryHeader is the campaign summary's CSV header: one row per onset
// (or one row for a test without onsets or that failed).
const summaryHeader = "test,status,frames,peak_MPa,peak_time_s,u_noise_px,exx_noise,vsg_px,class,opening,sector,indicator,onset_frame,onset_time_s,onset_MPa,percent_of_peak,error"

// WriteCampaignSummary writes dir/summary.csv and dir/summary.html (one
// row per onset, with the cautions).
func WriteCampaignSummary(dir, name string, results []Result) error {
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return err
	}
	rows := summaryRows(results)
	err := runfolder.WriteAtomic(filepath.Join(dir, SummaryCSV), func(w *bufio.Writer) error {
		cw := csv.NewWriter(w)
		cw.Write(splitHeader())
		for _, r := range rows {
			cw.Write(r)
		}
		cw.Flush()
		return cw.Error()
	})
	if err != nil {
		return err
	}
	return runfolder.WriteAtomic(filepath.Join(dir, SummaryHTML), func(w *bufio.Writer) error {
		return summaryPage.Execute(w, struct {
			Name     string
			Header   []string
			Rows     [][]string
			Cautions []string
		}{name, splitHeader(), rows, strainfile.Cautions})
	})
}

func splitHeader() []string { return strings.Split(summaryHeader, ",") }

func summaryRows(results []Result) [][]string {
	f := func(v float64, prec int) string { return strconv.FormatFloat(v, 'f', prec, 64) }
	var rows [][]string
	for _, r := range results {
		name := filepath.Base(r.Config)
		if r.Summary == nil {
			rows = append(rows, []string{name, "failed", "", "", "", "", "", "", "", "", "", "", "", "", "", "", r.Err})
			continue
		}
		s := r.Summary
		base := []string{s.Name, "ok", strconv.Itoa(s.Frames), f(s.Peak.Stress, 2), f(s.Peak.Time, 1), "", "", ""}
		if s.Resolution != nil {
			base[5], base[6], base[7] = f(s.Resolution.U, 4), strconv.FormatFloat(s.Resolution.Exx, 'g', 3, 64), strconv.Itoa(s.Resolution.VSG)
		}
		if len(s.Onsets) == 0 {
			rows = append(rows, append(base, "none", "", "", "", "", "", "", "", ""))
			continue
		}
		for _, o := range s.Onsets {
			rows = append(rows, append(append([]string{}, base...), o.Class, o.OpeningName, string(o.Sector), string(o.Indicator),
				o.Name, f(o.Time, 1), f(o.Stress, 2), f(o.Percent, 0), ""))
		}
	}
	return rows
}

var summaryPage = template.Must(template.New("summary").Parse(`<!DOCTYPE html>
<html lang="en"><head><meta charset="utf-8"><title>{{.Name}} — campaign summary</title>
<style>
body{font-family:system-ui,sans-serif;margin:2rem;color:#1d2733}
table{border-collapse:collapse;font-size:.9rem}
th,td{border:1px solid #c9d1da;padding:.3rem .5rem;text-align:left}
th{background:#eef2f6}
.caution{border-left:4px solid #b5651d;background:#fbf5ef;padding:.5rem 1rem;margin:1rem 0}
td.failed{color:#a01818}
</style></head><body>
<h1>Campaign {{.Name}}</h1>
<div class="caution">{{range .Cautions}}<p>{{.}}</p>{{end}}</div>
<table id="summary"><thead><tr>{{range .Header}}<th>{{.}}</th>{{end}}</tr></thead>
<tbody>{{range .Rows}}<tr>{{range .}}<td>{{.}}</td>{{end}}</tr>{{end}}</tbody></table>
</body></html>
`))

// outcomeFile is the file in a test's run folder that says how its last
// campaign run ended: written at the end, so a task that died leaves none.
const outcomeFile = "outcome.json"

// Outcome is the content of outcomeFile.
type Outcome struct {
	Config string `json:"config"`
	OK     bool   `json:"ok"`
	Error  string `json:"error,omitempty"`
}

// WriteOutcome records how test r ended in its run folder under out.
func WriteOutcome(out string, r Result) error {
	name, err := config.TestName(r.Config)
	if err != nil {
		return err
	}
	dir := filepath.Join(out, name)
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return err
	}
	return runfolder.WriteJSON(filepath.Join(dir, outcomeFile), Outcome{Config: r.Config, OK: r.Err == "", Error: r.Err})
}

// ReadOutcome reads the outcome of the test whose run folder under out is
// named test (config.TestName); fs.ErrNotExist when it has none yet.
func ReadOutcome(out, test string) (Outcome, error) {
	var o Outcome
	err := readJSON(filepath.Join(out, test, outcomeFile), &o)
	return o, err
}

// SummaryOf rebuilds a finished test's summary from its run folder.
func SummaryOf(dir string) (*Summary, error) {
	var rep strainfile.OnsetReport
	if err := readJSON(filepath.Join(dir, strainfile.OnsetJSON), &rep); err != nil {
		return nil, err
	}
	s := &Summary{Name: filepath.Base(dir), Out: dir, Peak: rep.Peak, Onsets: rep.Onsets, Resolution: rep.Resolution}
	var tr runfolder.TrackRecord
	if runfolder.Section(dir, "track", &tr) == nil {
		s.Frames = len(tr.Frames)
	}
	return s, nil
}

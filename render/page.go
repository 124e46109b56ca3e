package render

import (
	"embed"
	"html/template"
	"path/filepath"
	"slices"
	"time"

	"spallscope/dic/runfolder"
)

//go:embed templates/report.html.tmpl templates/report.css
var pageFiles embed.FS

// reportTemplate is the report page. Its style sheet is read from the
// embedded report.css and put inline, so the page needs no other file for
// its look.
var reportTemplate = template.Must(template.New("report.html.tmpl").ParseFS(pageFiles, "templates/report.html.tmpl"))

// reportCSS is the page's style sheet.
var reportCSS = func() template.CSS {
	data, err := pageFiles.ReadFile("templates/report.css")
	if err != nil {
		panic(err) // embedded at build time
	}
	return template.CSS(data)
}()

// reportCautions head every report: the hazards of the test and the limits
// of what it measures.
var reportCautions = []string{
	"Compression tests of brittle specimens can fail violently and throw fragments. Run them behind guards, with eye protection, under your laboratory's procedures; the onsets in this report are no warning system for people near a loaded specimen.",
	"Measured fields and onset stresses are test results with the stated measurement resolution, not design values.",
	"Support and excavation design belongs to licensed engineers working under the local codes.",
	"The boundary-stress comparison beside each onset is an elastic approximation for a single circular opening, shown to help read the result, never a verdict on it.",
}

// pageData is everything the report template shows, already formatted.
type pageData struct {
	Title, Tool, RunDir, Generated string
	CSS                            template.CSS
	Cautions                       []string
	Summary                        []pageRow
	Settings                       []pageRow
	Noise                          []pageNoise
	StaticFrames                   string
	Onsets                         []pageOnset
	OnsetsRun                      bool
	Overlays                       []pageFrameSet
	Figures                        []pageFigure
	Pattern                        *pagePattern
	Missing                        []string
	Embedded                       bool
}

// pageFigure is a plot on the page.
type pageFigure struct {
	Figure
	Src template.URL
	// SVG is the address of the SVG version, empty when embedded.
	SVG template.URL
}

// newPage formats the report of r, to be written to out.
func newPage(r *runRecords, figs []Figure, gauges *virtualReadings, out string, opt ReportOptions) (*pageData, error) {
	im, err := newPageImages(out, opt.Embed)
	if err != nil {
		return nil, err
	}
	abs, err := filepath.Abs(r.Dir)
	if err != nil {
		abs = r.Dir
	}
	now := opt.Now
	if now.IsZero() {
		now = time.Now()
	}
	p := &pageData{
		Title: opt.Title, Tool: opt.Tool, RunDir: abs, CSS: reportCSS,
		Generated: now.UTC().Format("2006-01-02 15:04 UTC"),
		Cautions:  slices.Clone(reportCautions),
		Summary:   summaryRows(r), Settings: settingsRows(r),
		Noise: noiseRows(r.Resolution), StaticFrames: staticFrames(r.Resolution),
		Onsets: onsetRows(r), OnsetsRun: r.Onset != nil,
		Missing: r.Missing, Embedded: opt.Embed,
	}
	if p.Title == "" {
		p.Title = "Test report — " + filepath.Base(abs)
	}
	if p.Tool == "" {
		p.Tool = "spallscope"
	}
	// The zones stage's own cautions, where they add to ours (its standard
	// ones say what ours say).
	if r.Onset != nil {
		for _, c := range r.Onset.Cautions {
			if !slices.Contains(p.Cautions, c) && !slices.Contains(runfolder.Cautions, c) {
				p.Cautions = append(p.Cautions, c)
			}
		}
	}
	if gauges != nil {
		p.Summary = append(p.Summary,
			pageRow{"Virtual extensometer", gauges.Extensometer.String(), "reference px, on the nearest grid points"},
			pageRow{"Virtual gauge", gauges.Gauge.String(), "mean over the grid points inside"})
	}
	for _, f := range figs {
		src, err := im.URL(filepath.Join(r.Dir, filepath.FromSlash(f.PNG)))
		if err != nil {
			return nil, err
		}
		pf := pageFigure{Figure: f, Src: src}
		if !opt.Embed {
			if pf.SVG, err = im.URL(filepath.Join(r.Dir, filepath.FromSlash(f.SVG))); err != nil {
				return nil, err
			}
		}
		p.Figures = append(p.Figures, pf)
	}
	if p.Overlays, err = overlaySets(r, im); err != nil {
		return nil, err
	}
	if p.Pattern, err = patternSection(r, opt.Pattern, im); err != nil {
		return nil, err
	}
	return p, nil
}

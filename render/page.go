package render

import (
	"embed"
	"fmt"
	"html/template"
	"math"
	"path/filepath"
	"slices"
	"sort"
	"time"

	"spallscope/strain/strainfile"
)

//go:embed templates/report.html.tmpl templates/report.css templates/faces.html.tmpl templates/faces.css
var pageFiles embed.FS

// reportTemplate is the report page. Its style sheet is read from the
// embedded report.css and put inline, so the page needs no other file for
// its look.
var reportTemplate = template.Must(template.New("report.html.tmpl").Funcs(template.FuncMap{
	"add1": func(k int) int { return k + 1 },
}).ParseFS(pageFiles, "templates/report.html.tmpl"))

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
	// IntervalMethods names the methods of the onsets' intervals.
	IntervalMethods string
	// Detection states the smallest fracture the run could see.
	Detection *pageDetection
	// Histories is the figure of the onsets' indicator histories, shown
	// with the onsets (nil without histories).
	Histories *pageFigure
	// FirstOnset names the frame of the first onset, where the frame
	// slider starts ("" without onsets).
	FirstOnset string
	AE         string
	Model      *pageModel
	Overlays   []pageFrameSet
	Figures    []pageFigure
	Pattern    *pagePattern
	Missing    []string
	Embedded   bool
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
		Onsets: onsetRows(r), OnsetsRun: r.Onset != nil, AE: aeLine(r),
		Detection: detectionSection(r), IntervalMethods: intervalMethods(r),
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
			if !slices.Contains(p.Cautions, c) && !slices.Contains(strainfile.Cautions, c) {
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
		src, err := im.URL(filepath.Join(r.plotRoot(), filepath.FromSlash(f.PNG)))
		if err != nil {
			return nil, err
		}
		pf := pageFigure{Figure: f, Src: src}
		if !opt.Embed {
			if pf.SVG, err = im.URL(filepath.Join(r.plotRoot(), filepath.FromSlash(f.SVG))); err != nil {
				return nil, err
			}
		}
		if f.Name == "onset_histories" {
			p.Histories = &pf
			continue
		}
		p.Figures = append(p.Figures, pf)
	}
	_, p.FirstOnset = firstOnsetFrame(r)
	if p.Model, err = modelSection(r.Dir, im); err != nil {
		return nil, err
	}
	if p.Overlays, err = overlaySets(r, im); err != nil {
		return nil, err
	}
	if p.Pattern, err = patternSection(r, opt.Pattern, im); err != nil {
		return nil, err
	}
	return p, nil
}

// aeLine says when the acoustic-emission hit rate rose, by the run's rule,
// at what stress, and how many gaps the record has ("" without a record).
func aeLine(r *runRecords) string {
	if r.AE == nil {
		return ""
	}
	gaps := ""
	if n := len(r.AE.Gaps); n > 0 {
		gaps = fmt.Sprintf("; %d gap(s) in the record, shown on the AE plot", n)
	}
	if r.AE.Onset == nil {
		return fmt.Sprintf("%d hits, no onset by the rule (%s)%s.", r.AE.Hits, r.AE.Rule, gaps)
	}
	o := r.AE.Onset
	stress := ""
	if r.Load != nil {
		if s, ok := interpolate(r.Load.Times, r.Load.Stress, o.Time); ok {
			stress = fmt.Sprintf(", %.2f MPa", s)
		}
	}
	return fmt.Sprintf("hit-rate onset at t = %.1f s%s (rate above %.3g hits/s, %s × the early background of %.3g hits/s; %d hits in all)%s.",
		o.Time, stress, o.Threshold, formatFactor(o.Threshold/math.Max(o.Background, 1e-12)), o.Background, r.AE.Hits, gaps)
}

// interpolate returns ys at x by linear interpolation over increasing xs.
func interpolate(xs, ys []float64, x float64) (float64, bool) {
	if len(xs) < 2 || x < xs[0] || x > xs[len(xs)-1] {
		return 0, false
	}
	k := sort.SearchFloat64s(xs, x)
	if k == 0 {
		return ys[0], true
	}
	t := (x - xs[k-1]) / (xs[k] - xs[k-1])
	return ys[k-1] + t*(ys[k]-ys[k-1]), true
}

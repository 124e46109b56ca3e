package render

import (
	"bufio"
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"time"

	"spallscope/dic/runfolder"
)

// ReportFile is the default name of the report in the run folder.
const ReportFile = "report.html"

// ReportOptions set up WriteReport.
type ReportOptions struct {
	// Out is the report's path (default RUN/report.html).
	Out string
	// Embed puts every image into the page as a data URI, so the one file
	// travels alone (and is larger). Without it the page refers to the
	// images by paths relative to its own folder, and needs the run
	// folder beside it.
	Embed bool
	// Title heads the page (default "Test report — <run folder name>").
	Title string
	// Tool names the program and version, for the footer.
	Tool string
	// Pattern is a speckle pattern assessment (pattern.json of the pattern
	// command) to include; default RUN/pattern/pattern.json when it
	// exists.
	Pattern string
	// Plots place the virtual extensometer and gauge.
	Plots PlotOptions
	// Now is the time stamp of the page (default: the current time).
	Now time.Time
}

// sameDir reports whether two paths name the same folder.
func sameDir(a, b string) bool {
	sa, errA := os.Stat(a)
	sb, errB := os.Stat(b)
	return errA == nil && errB == nil && os.SameFile(sa, sb)
}

// WriteReport writes the plots of run folder dir (see WritePlots) and the
// self-contained HTML report on the run: the job, the cautions, the
// settings and measurement resolution, the onsets with their stress and
// the Kirsch boundary-stress comparison, a frame slider over the overlays
// (RUN/overlays/*.png, when present), the plots and the speckle pattern
// assessment when one exists. A report whose Out is in another folder
// writes its plots beside it (OUT_STEM_files/plots/) and nothing into the
// run folder. The page has its style and its few lines of
// script inline and loads nothing from the network. It returns the
// report's path.
func WriteReport(dir string, opt ReportOptions) (string, error) {
	r, err := readRunRecords(dir)
	if err != nil {
		return "", err
	}
	out := opt.Out
	if out == "" {
		out = filepath.Join(dir, ReportFile)
	}
	if err := os.MkdirAll(filepath.Dir(out), 0o755); err != nil {
		return "", fmt.Errorf("report: %w", err)
	}
	if !sameDir(filepath.Dir(out), dir) {
		// A report written elsewhere leaves the run folder as it is (it
		// may be read-only, or an archive's): its plots go beside it.
		r.PlotDir = strings.TrimSuffix(out, filepath.Ext(out)) + "_files"
	}
	figs, gauges, err := writeRunPlots(r, opt.Plots)
	if err != nil {
		return "", err
	}
	page, err := newPage(r, figs, gauges, out, opt)
	if err != nil {
		return "", err
	}
	err = runfolder.WriteAtomic(out, func(w *bufio.Writer) error {
		return reportTemplate.Execute(w, page)
	})
	if err != nil {
		return "", fmt.Errorf("report %s: %w", out, err)
	}
	return out, nil
}

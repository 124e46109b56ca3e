package render

import (
	"fmt"
	"io/fs"
	"maps"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"
	"time"

	"spallscope/dic/aelog"
	"spallscope/dic/runfolder"
	"spallscope/strain/model"
)

// reportVoid are the HTML elements without an end tag (the HTML standard's
// void elements that the page uses).
var reportVoid = map[string]bool{"meta": true, "img": true, "input": true, "br": true, "hr": true, "link": true}

var (
	reportTag     = regexp.MustCompile(`<(/?)([a-zA-Z][a-zA-Z0-9]*)\b[^>]*>`)
	reportScript  = regexp.MustCompile(`(?s)<script>.*?</script>`)
	reportComment = regexp.MustCompile(`(?s)<!--.*?-->`)
)

// checkReportStructure is a simple structural check of the page: it starts
// with the doctype, has one html, head and body, and every element opened
// is closed in order (the page closes every element it opens; void
// elements excepted). Scripts and comments are set aside first.
func checkReportStructure(t *testing.T, page string) {
	t.Helper()
	if !strings.HasPrefix(page, "<!DOCTYPE html>\n") {
		t.Errorf("page does not start with the HTML doctype: %.40q", page)
	}
	body := reportComment.ReplaceAllString(reportScript.ReplaceAllString(page, "<script></script>"), "")
	var stack []string
	count := map[string]int{}
	for _, m := range reportTag.FindAllStringSubmatch(body, -1) {
		closing, name := m[1] == "/", strings.ToLower(m[2])
		if reportVoid[name] {
			continue
		}
		if !closing {
			stack = append(stack, name)
			count[name]++
			continue
		}
		if len(stack) == 0 || stack[len(stack)-1] != name {
			t.Fatalf("</%s> closes %v", name, stack)
		}
		stack = stack[:len(stack)-1]
	}
	if len(stack) != 0 {
		t.Errorf("elements left open: %v", stack)
	}
	for _, name := range []string{"html", "head", "body", "main", "footer"} {
		if count[name] != 1 {
			t.Errorf("%d <%s> elements, want 1", count[name], name)
		}
	}
}

// writeFixtureReport writes the fixture run and its report.
func writeFixtureReport(t *testing.T, opt ReportOptions) (dir, page string) {
	t.Helper()
	dir = filepath.Join(t.TempDir(), "run")
	writeFixtureRun(t, dir)
	if opt.Now.IsZero() {
		opt.Now = time.Date(2025, 3, 4, 5, 6, 0, 0, time.UTC)
	}
	path, err := WriteReport(dir, opt)
	if err != nil {
		t.Fatal(err)
	}
	data, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	return dir, string(data)
}

// The report of the fixture run: well-formed, with the cautions, the job,
// the settings and resolution, one onset row per onset with its
// comparison, the frame slider over every overlay, every plot and the
// pattern section, all by relative paths that exist.
func TestReportContent(t *testing.T) {
	dir, page := writeFixtureReport(t, ReportOptions{Tool: "spallscope test-1"})
	checkReportStructure(t, page)
	if n := strings.Count(page, `<tr class="onset"`); n != fixtureOnsetCount {
		t.Errorf("%d onset rows, want %d", n, fixtureOnsetCount)
	}
	wants := []string{
		`id="cautions"`, "eye protection", "not design values", "licensed engineers",
		"Test report — run", "spallscope test-1", "2025-03-04 05:06 UTC",
		// settings and resolution (fixture values)
		"15 px (1.5 mm)", "affine", "bicubic", "3 × 3 grid points", "31 px (3.1 mm)", "engineering",
		">0.004<", "0.4 µm", ">70<", "blk_0000, blk_0001",
		// onsets: the left sidewall back-dated to frame 2 at 12 MPa, 50 %
		// of the 24 MPa peak; Kirsch (3 − K)σ with K = 0: 3 × 12 = 36 MPa
		// = 0.60 of the 60 MPa UCS; the right sidewall at 18 MPa: 54 MPa
		// = 0.90 UCS (Kirsch 1898, worked by hand).
		"A left-sidewall", "blk_0002 (#2)", ">12.00<", ">50<",
		"σθ ≈ (3 − K)·σ = 3 × 12 MPa = 36 MPa (K = 0)", "0.60 UCS (UCS 60 MPa)",
		"σθ ≈ (3 − K)·σ = 3 × 18 MPa = 54 MPa (K = 0)", "0.90 UCS (UCS 60 MPa)",
		">36 MPa · 0.60 UCS<", ">54 MPa · 0.90 UCS<",
		"0.4 ± 0.1 UCS (Martin, Kaiser &amp; McCreath 1999)", "Approximation (single circular opening, elastic medium)",
		"tensile at the boundary", "not in the load log: stress not measured",
		// the interval (frames and stress) and the trigger of each onset
		`title="blk_0001 … blk_0003, 2.00–6.00 s, 6.00–18.00 MPa">#1–#3, 6.00–18.00 MPa<`,
		`>#3, 18.00 MPa<`, `<td class="trigger">blk_0003 (#3)</td>`, `<td class="trigger">—</td>`,
		"back-dated 1 frame(s) from the trigger blk_0003 (#3); zone area 1.92 mm²", "Intervals by fixture.", "at the trigger frame blk_0003 (#3)",
		"95 % interval blk_0001 … blk_0003 (#1–#3), 2.00–6.00 s, 6.00–18.00 MPa; change model slope, log-likelihood ratio 42.5 against no change",
		// one event: the left sidewall's zones grew into the crown, and
		// γmax confirmed a zone of it at frame 3 (the fixture's record)
		"One event: its zones grew into A crown.", "Also seen by γmax from #3 (first frame of each indicator",
		// the detection limits in words: strain = K × noise = 6 × 65 µε,
		// opening = 390 µε × 31 px = 0.01209 px = 1.209 µm at 0.1 mm/px
		// (arithmetic by hand)
		`id="detection-limits"`,
		"By e1, a localized strain below 390 µε over the 31 px VSG, or a crack opening below 1.21 µm (0.0121 px), cannot be seen in this run.",
		"By γmax, a localized strain below 480 µε over the 31 px VSG, or a crack opening below 1.49 µm (0.0149 px), cannot be seen in this run.",
		// slider: starts at the first onset, frame 2 (the third overlay)
		`<input type="range" id="frame-slider" min="0" max="5" value="2"`, `<span id="frame-pos" class="muted">3 / 6</span>`,
		`<img id="frame-image" src="overlays/blk_0002.png"`, `data-src="overlays/blk_0005.png"`, "σ = 18 MPa (75 % of peak)",
		// the onsets' histories, with the onsets
		`<figure class="plot" id="plot-onset_histories">`,
		// pattern
		`id="pattern"`, "3.2 px", "fixture note: speckles are small",
	}
	for _, w := range wants {
		if !strings.Contains(page, w) {
			t.Errorf("report lacks %q", w)
		}
	}
	for _, m := range regexp.MustCompile(`(?:src|href)="([^"]+)"`).FindAllStringSubmatch(page, -1) {
		ref := m[1]
		if strings.HasPrefix(ref, "#") {
			continue
		}
		if strings.Contains(ref, "://") || strings.HasPrefix(ref, "//") {
			t.Errorf("page refers to %q off the run folder", ref)
			continue
		}
		if _, err := os.Stat(filepath.Join(dir, filepath.FromSlash(ref))); err != nil {
			t.Errorf("page refers to %q: %v", ref, err)
		}
	}
	if n := strings.Count(page, `<figure class="plot"`); n != 7 {
		t.Errorf("%d plots on the page, want 7 (6 and the onset histories)", n)
	}
	// The onset histories sit with the onsets, before the frames.
	if h, f := strings.Index(page, `id="plot-onset_histories"`), strings.Index(page, `<section id="frames">`); h < 0 || h > f {
		t.Error("the onset histories are not in the onsets section")
	}
	// The decorrelation record from before back-dating shows no interval.
	row := page[strings.Index(page, `id="onset-3"`):]
	row = row[:strings.Index(row, "</tr>")]
	if !strings.Contains(row, `<td class="interval">—</td>`) {
		t.Errorf("onset 3 (no interval) row: %s", row)
	}
}

// Factors and ratios are printed rounded everywhere on the page: a
// threshold of 0.30000000000000004 hits/s over a background of 0.1 hits/s
// is "3 ×" (IEEE 754 double arithmetic: 0.1 + 0.2 is not 0.3, so ratios
// computed from such inputs carry round-off), and no number on the page
// carries seven or more decimals (common practice, no source).
func TestReportFactorsRounded(t *testing.T) {
	cases := []struct {
		v    float64
		want string
	}{
		{0.30000000000000004 / 0.1, "3"}, {2.75, "2.75"}, {100 * 0.95, "95"}, {0.1 + 0.2, "0.3"},
		{1.0 / 3, "0.333"}, {2.0 / 3, "0.667"}, {1234.5, "1230"}, {-0.25, "-0.25"}, {0, "0"},
		{9.72e6 + 0.4, "9.72 × 10⁶"}, {22500000.000000004, "2.25 × 10⁷"}, {1e5, "1 × 10⁵"}, {3.1e-5, "3.1 × 10⁻⁵"},
	}
	for _, c := range cases {
		if got := formatFactor(c.v); got != c.want {
			t.Errorf("formatFactor(%v) = %q, want %q", c.v, got, c.want)
		}
	}
	dir := filepath.Join(t.TempDir(), "run")
	writeFixtureRun(t, dir)
	ae := runfolder.AERecord{Path: "ae.csv", Hits: 40, Times: []float64{0, 5, 10}, Cumulative: []float64{0, 10, 40},
		Onset: &aelog.Onset{Time: 5, Background: 0.1, Threshold: 0.1 + 0.2}, Rule: "fixture rule"}
	fixtureMust(t, runfolder.SetSection(dir, "ae", ae))
	path, err := WriteReport(dir, ReportOptions{Embed: true})
	if err != nil {
		t.Fatal(err)
	}
	data, _ := os.ReadFile(path)
	page := string(data)
	if !strings.Contains(page, "3 × the early background of 0.1 hits/s") {
		i := strings.Index(page, `id="ae-onset"`)
		t.Errorf("AE factor not rounded: %.300s", page[max(i, 0):])
	}
	text := regexp.MustCompile(`data:[^"]*"|<script>(?s:.*?)</script>`).ReplaceAllString(page, "")
	if m := regexp.MustCompile(`\d\.\d{7,}`).FindAllString(text, 5); len(m) > 0 {
		t.Errorf("numbers with long decimals on the page: %v", m)
	}
}

// Text from the run folder is escaped: a title or a file name with markup
// shows as text.
func TestReportEscapes(t *testing.T) {
	_, page := writeFixtureReport(t, ReportOptions{Title: `Block <script>alert("x")</script> & co`})
	if strings.Contains(page, `<script>alert`) {
		t.Error("title markup reached the page unescaped")
	}
	if !strings.Contains(page, "Block &lt;script&gt;alert(&#34;x&#34;)&lt;/script&gt; &amp; co") {
		t.Error("escaped title missing")
	}
}

// With Embed the page carries its images as data URIs and refers to no
// file; written elsewhere without Embed it refers to the run folder's
// files by relative paths from its own folder.
func TestReportEmbedAndOut(t *testing.T) {
	_, page := writeFixtureReport(t, ReportOptions{Embed: true})
	checkReportStructure(t, page)
	if n := strings.Count(page, ` src="data:image/png;base64,`); n != 7+1+1 {
		t.Errorf("%d embedded images, want 9: 7 plots, the first overlay and the pattern map", n)
	}
	if n := strings.Count(page, `data-src="data:image/png;base64,`); n != len(fixtureNames) {
		t.Errorf("%d embedded overlays, want %d", n, len(fixtureNames))
	}
	if regexp.MustCompile(`(?:src|href)="(?:plots|overlays)/`).MatchString(page) {
		t.Error("embedded page still refers to files")
	}

	// A report written elsewhere only reads the run folder (it may be
	// read-only or an archive's): nothing in it is added or changed, the
	// plots go beside the report, the overlays are referred to where
	// they are.
	dir := filepath.Join(t.TempDir(), "run")
	writeFixtureRun(t, dir)
	before := folderState(t, dir)
	out := filepath.Join(filepath.Dir(dir), "share", "r.html")
	if _, err := WriteReport(dir, ReportOptions{Out: out}); err != nil {
		t.Fatal(err)
	}
	data, _ := os.ReadFile(out)
	if !strings.Contains(string(data), `src="r_files/plots/stress_time.png"`) {
		t.Error("report written elsewhere does not refer to its own r_files/plots/")
	}
	if _, err := os.Stat(filepath.Join(filepath.Dir(out), "r_files", PlotsDir, "stress_time.png")); err != nil {
		t.Errorf("plot beside the report: %v", err)
	}
	if !strings.Contains(string(data), `"../run/overlays/`) {
		t.Error("report written elsewhere does not refer to the run's overlays")
	}
	if after := folderState(t, dir); !maps.Equal(before, after) {
		t.Errorf("the run folder changed: %d files before, %d after", len(before), len(after))
	}
}

// folderState lists a folder's files with their sizes and modification
// times.
func folderState(t *testing.T, dir string) map[string]string {
	t.Helper()
	state := map[string]string{}
	filepath.WalkDir(dir, func(path string, d fs.DirEntry, err error) error {
		if err == nil && !d.IsDir() {
			if st, err := d.Info(); err == nil {
				state[path] = fmt.Sprint(st.Size(), st.ModTime().UnixNano())
			}
		}
		return nil
	})
	return state
}

// A run folder with fields only: the page still renders and says what is
// missing (no resolution, no zones, no overlays) instead of failing.
func TestReportOnPartialRun(t *testing.T) {
	dir := t.TempDir()
	writeFixtureRun(t, dir)
	for _, f := range []string{"onset.json", "zones.csv", "zone_cells.csv", "run.json"} {
		fixtureMust(t, os.Remove(filepath.Join(dir, f)))
	}
	fixtureMust(t, os.RemoveAll(filepath.Join(dir, OverlaysDir)))
	fixtureMust(t, os.RemoveAll(filepath.Join(dir, "pattern")))
	path, err := WriteReport(dir, ReportOptions{})
	if err != nil {
		t.Fatal(err)
	}
	data, _ := os.ReadFile(path)
	page := string(data)
	checkReportStructure(t, page)
	for _, w := range []string{`id="resolution-missing"`, "Zones have not been found", `id="frames-missing"`, "What this run lacks", "eye protection"} {
		if !strings.Contains(page, w) {
			t.Errorf("partial report lacks %q", w)
		}
	}
	if strings.Contains(page, `id="frame-slider"`) || strings.Contains(page, `<tr class="onset"`) {
		t.Error("partial report shows a slider or onsets it has no data for")
	}
	// A pattern file that was asked for must exist.
	if _, err := WriteReport(dir, ReportOptions{Pattern: filepath.Join(dir, "none.json")}); err == nil || !strings.Contains(err.Error(), "none.json") {
		t.Errorf("missing pattern file: %v", err)
	}
}

// Overlays are matched to frames by name, and several overlays of a frame
// (one suffix per kind) make one slider list per kind.
func TestReportOverlayKinds(t *testing.T) {
	names := []string{"f_1", "f_10", "f_2"}
	cases := []struct {
		stem  string
		frame int
		kind  string
	}{{"f_1", 0, ""}, {"f_10", 1, ""}, {"f_10_e1", 1, "_e1"}, {"f_1-eyy", 0, "-eyy"}, {"f_100", -1, ""}, {"g_1", -1, ""}}
	for _, c := range cases {
		if k, kind := matchFrame(names, c.stem); k != c.frame || kind != c.kind {
			t.Errorf("matchFrame(%q) = %d, %q, want %d, %q", c.stem, k, kind, c.frame, c.kind)
		}
	}
	dir := t.TempDir()
	writeFixtureRun(t, dir)
	for _, name := range fixtureNames[:3] {
		src, _ := os.ReadFile(filepath.Join(dir, OverlaysDir, name+".png"))
		fixtureMust(t, os.WriteFile(filepath.Join(dir, OverlaysDir, name+"_e1.png"), src, 0o644))
	}
	path, err := WriteReport(dir, ReportOptions{})
	if err != nil {
		t.Fatal(err)
	}
	data, _ := os.ReadFile(path)
	page := string(data)
	if !strings.Contains(page, `<select id="frame-kind">`) || !strings.Contains(page, `>e1</option>`) {
		t.Error("no overlay kind selector for two kinds of overlay")
	}
	if n := strings.Count(page, `<ol class="frame-list"`); n != 2 {
		t.Errorf("%d frame lists, want 2", n)
	}
}

// The model section shows the points without a value as counts: the 24
// model points outside the measured region (10 of them named in the
// summary) behind a <details> toggle, the measured points without a model
// value as one count per quantity, and no long warning paragraphs. The
// summary is written by the model package's own Write, as the compare
// stage writes it; the counts are the known answer.
func TestReportModelPointsCollapsed(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "run")
	writeFixtureRun(t, dir)
	c := &model.Comparison{Model: "m.csv", FrameName: fixtureNames[3], Radius: 10, Grid: fixtureGrid,
		Quantities: []model.Quantity{model.U, model.V},
		Stats:      []model.Stats{{Quantity: model.U, Count: 90, Uncovered: 12}, {Quantity: model.V, Count: 90, Uncovered: 7}},
		Outside:    model.Outside{Count: 24, Total: 500}}
	for k := range model.MaxNamed {
		c.Outside.First = append(c.Outside.First, model.OutsidePoint{Line: 100 + k, ModelX: float64(k), ModelY: -1, X: 10, Y: float64(k)})
	}
	fixtureMust(t, model.Write(filepath.Join(dir, model.Dir), c))
	path, err := WriteReport(dir, ReportOptions{})
	if err != nil {
		t.Fatal(err)
	}
	data, _ := os.ReadFile(path)
	page := string(data)
	sec := page[strings.Index(page, `<section id="model">`):]
	sec = sec[:strings.Index(sec, "</section>")]
	for _, w := range []string{
		`<details class="note" id="model-outside">`,
		"<summary>24 of 500 model points lie outside the measured region and have no measured value to compare with — list the first 10</summary>",
		"<li>line 100: model (0, -1) at (10.0, 0.0) px</li>", "<li>line 109: model (9, -1) at (10.0, 9.0) px</li>",
		"<li>and 14 more, not named in the summary</li>",
		"Measured points without a model value, by quantity: u 12, v 7 (no model point within 10 px, or too few to fix a plane; not compared).",
	} {
		if !strings.Contains(sec, w) {
			t.Errorf("model section lacks %q", w)
		}
	}
	if n := strings.Count(sec, "<li>line "); n != model.MaxNamed {
		t.Errorf("%d named outside points, want %d", n, model.MaxNamed)
	}
	// The summary's own warning texts (the long list) are not repeated.
	for _, w := range c.Warnings() {
		if strings.Contains(sec, w) {
			t.Errorf("model section repeats the warning %.60q…", w)
		}
	}
	if strings.Index(sec, "<details") > strings.Index(sec, "<li>line 100") {
		t.Error("the named points are not inside the toggle")
	}
}

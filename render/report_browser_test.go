package render

import (
	"bytes"
	"context"
	"encoding/json"
	"fmt"
	"image/png"
	"net/url"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"github.com/chromedp/chromedp"

	"spallscope/strain/strainfile"
)

// browserPath returns Debian's chromium, or "" when it is not installed.
func browserPath() string {
	if p, err := exec.LookPath("chromium"); err == nil {
		return p
	}
	if _, err := os.Stat("/usr/bin/chromium"); err == nil {
		return "/usr/bin/chromium"
	}
	return ""
}

// newBrowser starts a headless chromium with a fresh profile, no network
// chatter and no sandbox (containers), and returns a tab's context.
func newBrowser(t *testing.T) context.Context {
	t.Helper()
	path := browserPath()
	if path == "" {
		t.Skip("chromium is not installed (Debian package chromium; scripts/deps.sh installs it with WITH_BROWSER=1): browser test skipped")
	}
	opts := []chromedp.ExecAllocatorOption{
		chromedp.ExecPath(path),
		chromedp.Headless,
		chromedp.NoSandbox,
		chromedp.DisableGPU,
		chromedp.NoFirstRun,
		chromedp.NoDefaultBrowserCheck,
		chromedp.Flag("disable-background-networking", true),
		chromedp.Flag("disable-component-update", true),
		chromedp.Flag("disable-sync", true),
		chromedp.Flag("disable-dev-shm-usage", true),
		chromedp.Flag("disable-extensions", true),
		chromedp.UserDataDir(t.TempDir()),
		chromedp.WindowSize(1200, 900),
	}
	ctx, cancel := context.WithTimeout(context.Background(), 90*time.Second)
	t.Cleanup(cancel)
	actx, acancel := chromedp.NewExecAllocator(ctx, opts...)
	t.Cleanup(acancel)
	tab, tcancel := chromedp.NewContext(actx)
	t.Cleanup(tcancel)
	return tab
}

// fileURL is the file:// address of a local path.
func fileURL(t *testing.T, path string) string {
	abs, err := filepath.Abs(path)
	if err != nil {
		t.Fatal(err)
	}
	return (&url.URL{Scheme: "file", Path: filepath.ToSlash(abs)}).String()
}

// eval runs a JavaScript expression in the tab and returns its value.
func eval[T any](t *testing.T, ctx context.Context, expr string) T {
	t.Helper()
	v, err := chromedp.Run(ctx, chromedp.Evaluate[T](expr))
	if err != nil {
		t.Fatalf("%s: %v", expr, err)
	}
	return v
}

// firstOnsetOf returns the frame index and name of the earliest onset in
// a run folder's onset.json, read here on its own.
func firstOnsetOf(t *testing.T, dir string) (int, string) {
	t.Helper()
	data, err := os.ReadFile(filepath.Join(dir, strainfile.OnsetJSON))
	if err != nil {
		t.Fatal(err)
	}
	var rep strainfile.OnsetReport
	if err := json.Unmarshal(data, &rep); err != nil {
		t.Fatal(err)
	}
	first, name := -1, ""
	for _, o := range rep.Onsets {
		if first < 0 || o.Frame < first {
			first, name = o.Frame, o.Name
		}
	}
	return first, name
}

// imagesLoaded is true once every image of the page has loaded with a size.
const imagesLoaded = `Array.from(document.images).every(i => i.complete && i.naturalWidth > 0)`

// The report of the fixture run in a real browser (Debian's chromium,
// headless), opened from disk with no network: the onset rows, the
// cautions and the slider are there, every plot and overlay image loads,
// moving the slider (and the next button) shows another frame with its
// name, time and stress, and a screenshot is taken. The page embedded as
// data URIs loads all its images too.
func TestBrowserReport(t *testing.T) {
	ctx := newBrowser(t)
	dir := filepath.Join(t.TempDir(), "run")
	writeFixtureRun(t, dir)
	path, err := WriteReport(dir, ReportOptions{Tool: "spallscope browser-test"})
	if err != nil {
		t.Fatal(err)
	}
	if err := chromedp.Do(ctx, chromedp.Navigate(fileURL(t, path)), chromedp.WaitReady(chromedp.CSS("footer"))); err != nil {
		t.Fatal(err)
	}
	if _, err := chromedp.Run(ctx, chromedp.Poll[bool](imagesLoaded, chromedp.WithPollingTimeout(20*time.Second), chromedp.WithPollingInterval(50*time.Millisecond))); err != nil {
		bad := eval[[]string](t, ctx, `Array.from(document.images).filter(i => !(i.complete && i.naturalWidth > 0)).map(i => i.src.slice(0, 80))`)
		t.Fatalf("images did not load: %v (%v)", bad, err)
	}
	if n := eval[int](t, ctx, `document.querySelectorAll("#onset-table tbody tr.onset").length`); n != fixtureOnsetCount {
		t.Errorf("%d onset rows in the browser, want %d", n, fixtureOnsetCount)
	}
	if s := eval[string](t, ctx, `document.getElementById("cautions").innerText`); !strings.Contains(s, "eye protection") || !strings.Contains(s, "licensed engineers") {
		t.Errorf("cautions box reads %q", s)
	}
	// The cautions box is shown before the onsets, and is visible.
	if ok := eval[bool](t, ctx, `(() => { const c = document.getElementById("cautions").getBoundingClientRect(), o = document.getElementById("onsets").getBoundingClientRect(); return c.height > 40 && c.top < o.top; })()`); !ok {
		t.Error("cautions box is not shown above the onsets")
	}
	plots := eval[[]float64](t, ctx, `Array.from(document.querySelectorAll("#plots img")).map(i => i.naturalWidth)`)
	if len(plots) != 6 {
		t.Errorf("%d plot images, want 6", len(plots))
	}
	for k, w := range plots {
		if w != 945 {
			t.Errorf("plot %d: naturalWidth %v, want 945", k, w)
		}
	}
	if typ := eval[string](t, ctx, `document.getElementById("frame-slider").type`); typ != "range" {
		t.Fatalf("frame slider is a %q input", typ)
	}
	// The slider starts at the first onset's frame: the earliest
	// back-dated onset of onset.json (the left sidewall's, frame 2).
	first, firstName := firstOnsetOf(t, dir)
	start := eval[string](t, ctx, `document.getElementById("frame-slider").value + "|" + document.getElementById("frame-name").textContent + "|" + document.getElementById("frame-pos").textContent`)
	if want := fmt.Sprintf("%d|%s|%d / 6", first, firstName, first+1); start != want {
		t.Errorf("slider starts at %q, want %q (the first onset)", start, want)
	}
	if _, err := chromedp.Run(ctx, chromedp.Poll[bool](fmt.Sprintf(`(() => { const i = document.getElementById("frame-image"); return i.complete && i.naturalWidth === %d && i.src.endsWith("overlays/%s.png"); })()`, 144+4*first, firstName), chromedp.WithPollingTimeout(10*time.Second), chromedp.WithPollingInterval(50*time.Millisecond))); err != nil {
		t.Errorf("first frame image: %v (src %s)", err, eval[string](t, ctx, `document.getElementById("frame-image").src`))
	}
	// The onset histories are shown with the onsets, at their own size.
	if got := eval[[]float64](t, ctx, `(() => { const i = document.querySelector("#onsets figure img"); return i ? [i.naturalWidth, i.naturalHeight] : []; })()`); len(got) != 2 || got[0] != 945 || got[1] < 300 {
		t.Errorf("onset histories image %v, want 945 px wide and taller than 300 px", got)
	}
	// One event, one onset: the left sidewall's details name the places
	// its zones grew into and the other indicator that saw it (the
	// fixture's record), as a reader sees them.
	if s := eval[string](t, ctx, `document.getElementById("onset-detail-1").innerText`); !strings.Contains(s, "One event: its zones grew into A crown.") || !strings.Contains(s, "Also seen by γmax from #3") {
		t.Errorf("onset 1's details read %q", s)
	}
	// Move the slider to frame 3 as a user would (value, then the input event).
	got := eval[string](t, ctx, `(() => { const s = document.getElementById("frame-slider"); s.value = 3; s.dispatchEvent(new Event("input", {bubbles: true})); return document.getElementById("frame-caption").textContent; })()`)
	if !strings.Contains(got, "blk_0003") || !strings.Contains(got, "t = 6 s") || !strings.Contains(got, "σ = 18 MPa (75 % of peak)") {
		t.Errorf("caption after moving the slider: %q", got)
	}
	// The fixture's overlay of frame k is 144 + 4k px wide.
	if _, err := chromedp.Run(ctx, chromedp.Poll[bool](`(() => { const i = document.getElementById("frame-image"); return i.complete && i.naturalWidth === 156 && i.src.endsWith("overlays/blk_0003.png"); })()`, chromedp.WithPollingTimeout(10*time.Second), chromedp.WithPollingInterval(50*time.Millisecond))); err != nil {
		t.Errorf("frame image after the slider: %v (src %s)", err, eval[string](t, ctx, `document.getElementById("frame-image").src`))
	}
	if err := chromedp.Do(ctx, chromedp.Click(chromedp.CSS("#frame-next"))); err != nil {
		t.Fatal(err)
	}
	if s := eval[string](t, ctx, `document.getElementById("frame-name").textContent + " " + document.getElementById("frame-pos").textContent`); s != "blk_0004 5 / 6" {
		t.Errorf("after the next button: %q", s)
	}

	shot, err := chromedp.Run(ctx, chromedp.FullScreenshot(100))
	if err != nil {
		t.Fatal(err)
	}
	img, err := png.Decode(bytes.NewReader(shot))
	if err != nil {
		t.Fatalf("screenshot is not a PNG: %v", err)
	}
	if b := img.Bounds(); b.Dx() < 800 || b.Dy() < 2000 {
		t.Errorf("screenshot %v px: expected the whole long page", b.Size())
	}
	shotPath := filepath.Join(t.TempDir(), "report.png")
	if err := os.WriteFile(shotPath, shot, 0o644); err != nil {
		t.Fatal(err)
	}
	if dst := os.Getenv("SPALLSCOPE_SCREENSHOT"); dst != "" {
		if st, err := os.Stat(dst); err == nil && st.IsDir() {
			dst = filepath.Join(dst, "report.png")
		}
		if err := os.WriteFile(dst, shot, 0o644); err != nil {
			t.Errorf("copying the screenshot: %v", err)
		}
		t.Logf("screenshot copied to %s", dst)
	}

	// The same report with its images embedded.
	embedded := filepath.Join(t.TempDir(), "alone.html")
	if _, err := WriteReport(dir, ReportOptions{Out: embedded, Embed: true}); err != nil {
		t.Fatal(err)
	}
	if err := chromedp.Do(ctx, chromedp.Navigate(fileURL(t, embedded)), chromedp.WaitReady(chromedp.CSS("footer"))); err != nil {
		t.Fatal(err)
	}
	if _, err := chromedp.Run(ctx, chromedp.Poll[bool](imagesLoaded, chromedp.WithPollingTimeout(20*time.Second), chromedp.WithPollingInterval(50*time.Millisecond))); err != nil {
		t.Errorf("embedded page's images did not load: %v", err)
	}
	got = eval[string](t, ctx, `(() => { const s = document.getElementById("frame-slider"); s.value = 5; s.dispatchEvent(new Event("input")); return document.getElementById("frame-name").textContent + "|" + document.getElementById("frame-image").src.slice(0, 22); })()`)
	if got != "blk_0005|data:image/png;base64," {
		t.Errorf("embedded slider shows %q", got)
	}
}

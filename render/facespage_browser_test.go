package render

import (
	"encoding/json"
	"net/http"
	"net/http/httptest"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"github.com/chromedp/chromedp"

	"spallscope/strain/strainfile"
)

// writeFixtureFaces writes a test of two faces in dir — the fixture run as
// faces/front and faces/back, each with its report — the timeline and the
// faces page, and returns the page's path.
func writeFixtureFaces(t *testing.T, dir string) string {
	t.Helper()
	page := FacesPage{Name: "fixture block", Faces: []string{"front", "back"}, Cautions: strainfile.Cautions}
	var marks []TimelineMark
	for k, f := range page.Faces {
		face := filepath.Join(dir, "faces", f)
		writeFixtureRun(t, face)
		if _, err := WriteReport(face, ReportOptions{Tool: "spallscope faces-test"}); err != nil {
			t.Fatal(err)
		}
		data, err := os.ReadFile(filepath.Join(face, strainfile.OnsetJSON))
		fixtureMust(t, err)
		var rep strainfile.OnsetReport
		fixtureMust(t, json.Unmarshal(data, &rep))
		offset := float64(k) // the back camera's clock runs 1 s behind the log
		for _, o := range rep.Onsets {
			fo := FaceOnset{Face: f, Onset: o, LogTime: o.Time + offset}
			page.Onsets = append(page.Onsets, fo)
			m := TimelineMark{Face: f, Label: o.Class, Time: fo.LogTime, Stress: o.Stress}
			if iv := o.Interval; iv != nil {
				m.HasInterval, m.TimeLo, m.TimeHi, m.StressLo, m.StressHi = true, iv.TimeLo+offset, iv.TimeHi+offset, iv.StressLo, iv.StressHi
			}
			marks = append(marks, m)
		}
	}
	first := page.Onsets[0]
	page.First = &first
	var times, stress []float64
	for s := 0.0; s <= 9.0001; s += 0.25 {
		times, stress = append(times, s), append(stress, fixtureLoad(s))
	}
	fig, err := WriteTimeline(dir, times, stress, marks, nil, nil)
	if err != nil {
		t.Fatal(err)
	}
	page.Timeline = fig.PNG
	path := filepath.Join(dir, ReportFile)
	if err := WriteFacesPage(path, page); err != nil {
		t.Fatal(err)
	}
	return path
}

// The faces page, served over HTTP so that the page can read the face
// reports in its frames, in a 1400 × 900 px window (a lab's desktop
// screen) with the two reports side by side: no onset row — of the page's
// own table or of either face's table — is taller than 1.5 times a single
// line of its cells (line height, padding and border; common practice, no
// source). Before, the face reports' boundary-stress texts in a narrow
// frame made each onset row about seven lines tall.
func TestBrowserFacesPage(t *testing.T) {
	ctx := newBrowser(t)
	dir := t.TempDir()
	writeFixtureFaces(t, dir)
	srv := httptest.NewServer(http.FileServer(http.Dir(dir)))
	t.Cleanup(srv.Close)
	if err := chromedp.Do(ctx, chromedp.EmulateViewport(1400, 900), chromedp.Navigate(srv.URL+"/"+ReportFile), chromedp.WaitReady(chromedp.CSS("iframe"))); err != nil {
		t.Fatal(err)
	}
	ready := `Array.from(document.querySelectorAll("iframe")).every(f => f.contentDocument && f.contentDocument.readyState === "complete" && f.contentDocument.querySelector("footer"))`
	if _, err := chromedp.Run(ctx, chromedp.Poll[bool](ready, chromedp.WithPollingTimeout(20*time.Second), chromedp.WithPollingInterval(50*time.Millisecond))); err != nil {
		t.Fatalf("face reports did not load: %v", err)
	}
	// The reports are side by side, each far narrower than a report's own
	// page (the case that stretched rows).
	frames := eval[[]float64](t, ctx, `Array.from(document.querySelectorAll("iframe")).flatMap(f => { const r = f.getBoundingClientRect(); return [r.left, r.top, r.width]; })`)
	if len(frames) != 6 || frames[1] != frames[4] || frames[3] <= frames[0] || frames[2] > 700 {
		t.Fatalf("face frames at %v: want two side by side, each under 700 px wide", frames)
	}
	// Row height over one line's height, for every onset row.
	const ratios = `(doc, sel) => Array.from(doc.querySelectorAll(sel)).map(tr => {
		const cs = getComputedStyle(tr.cells[1]);
		const line = parseFloat(cs.lineHeight) + parseFloat(cs.paddingTop) + parseFloat(cs.paddingBottom) + parseFloat(cs.borderTopWidth) + parseFloat(cs.borderBottomWidth);
		return tr.getBoundingClientRect().height / line;
	})`
	outer := eval[[]float64](t, ctx, `(`+ratios+`)(document, "#onsets tbody tr")`)
	inner := eval[[][]float64](t, ctx, `Array.from(document.querySelectorAll("iframe")).map(f => (`+ratios+`)(f.contentDocument, "#onset-table tbody tr"))`)
	if len(outer) != 2*fixtureOnsetCount || len(inner) != 2 || len(inner[0]) != fixtureOnsetCount || len(inner[1]) != fixtureOnsetCount {
		t.Fatalf("rows: %d on the page, %v in the frames; want %d and %d each", len(outer), inner, 2*fixtureOnsetCount, fixtureOnsetCount)
	}
	check := func(where string, rs []float64) {
		for k, r := range rs {
			if r > 1.5 || r < 0.9 {
				t.Errorf("%s onset row %d is %.2f lines tall, want at most 1.5", where, k+1, r)
			}
		}
	}
	t.Logf("onset row heights in lines: page %.2f, front frame %.2f, back frame %.2f", outer, inner[0], inner[1])
	check("faces page", outer)
	check("front frame", inner[0])
	check("back frame", inner[1])
	// The cautions are on the page, and the timeline image loads.
	if s := eval[string](t, ctx, `document.querySelector(".caution").innerText`); !strings.Contains(s, "no warning system") || !strings.Contains(s, "licensed engineers") {
		t.Errorf("faces page cautions read %q", s)
	}
	if _, err := chromedp.Run(ctx, chromedp.Poll[bool](`(() => { const i = document.getElementById("timeline"); return i && i.complete && i.naturalWidth === 945; })()`, chromedp.WithPollingTimeout(10*time.Second), chromedp.WithPollingInterval(50*time.Millisecond))); err != nil {
		t.Errorf("timeline image: %v", err)
	}
	if dst := os.Getenv("SPALLSCOPE_SCREENSHOT"); dst != "" {
		shot, err := chromedp.Run(ctx, chromedp.FullScreenshot(100))
		if err != nil {
			t.Fatal(err)
		}
		if st, err := os.Stat(dst); err == nil && st.IsDir() {
			dst = filepath.Join(dst, "faces.png")
		}
		if err := os.WriteFile(dst, shot, 0o644); err != nil {
			t.Errorf("copying the screenshot: %v", err)
		}
	}
}

package render

import (
	"net/url"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"

	"spallscope/strain/strainfile"
)

// The faces page of two fixture faces (the back camera 1 s behind the
// log): well-formed, with the cautions, one row per onset with its
// interval on the log's clock (the back face's left sidewall: frames 1 to
// 3 at 2–6 s camera time, so 3.0–7.0 s on the log, and 6–18 MPa; a
// one-frame interval prints one value) and trigger, the first onset with
// its interval (0.95 printed as "95 %", not 95.00000000000001), the
// timeline and a frame per face report.
func TestFacesPageContent(t *testing.T) {
	dir := t.TempDir()
	data, err := os.ReadFile(writeFixtureFaces(t, dir))
	if err != nil {
		t.Fatal(err)
	}
	page := string(data)
	checkFacesStructure(t, page)
	wants := []string{
		strainfile.Cautions[0], strainfile.Cautions[2],
		`<p id="first">First onset over all faces: front, localization at A left-sidewall, log time 4.0 s, 12.00 MPa (50 % of peak); 95 % interval 2.0–6.0 s.</p>`,
		`<td title="blk_0001 … blk_0003">3.0–7.0 s, 6.00–18.00 MPa</td><td>blk_0003</td>`,
		`<td title="blk_0003">7.0 s, 18.00 MPa</td>`,
		`<img id="timeline" src="plots/timeline.png"`,
		`<iframe title="face front" src="faces/front/report.html"></iframe>`,
		`<iframe title="face back" src="faces/back/report.html"></iframe>`,
	}
	for _, w := range wants {
		if !strings.Contains(page, w) {
			t.Errorf("faces page lacks %q", w)
		}
	}
	if n := strings.Count(page, "<tr><td>"); n != 2*fixtureOnsetCount {
		t.Errorf("%d onset rows, want %d", n, 2*fixtureOnsetCount)
	}
}

// checkFacesStructure checks the faces page as checkReportStructure does
// the report, without the report's main and footer.
func checkFacesStructure(t *testing.T, page string) {
	t.Helper()
	if !strings.HasPrefix(page, "<!DOCTYPE html>\n") {
		t.Errorf("page does not start with the HTML doctype: %.40q", page)
	}
	var stack []string
	for _, m := range reportTag.FindAllStringSubmatch(page, -1) {
		closing, name := m[1] == "/", strings.ToLower(m[2])
		if reportVoid[name] {
			continue
		}
		if !closing {
			stack = append(stack, name)
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
}

// Face names reach a path and the page: markup in a name shows as text,
// characters that are not path-safe are escaped in the frame's address,
// and a name that would leave the faces folder is refused with an error
// naming it, before anything is written.
func TestFacesPageHostileNames(t *testing.T) {
	dir := t.TempDir()
	path := filepath.Join(dir, ReportFile)
	err := WriteFacesPage(path, FacesPage{Name: `<b>x</b>`, Faces: []string{`a"<script>alert(1)<script> #?`}})
	if err != nil {
		t.Fatal(err)
	}
	data, _ := os.ReadFile(path)
	page := string(data)
	if strings.Contains(page, "<script>") || strings.Contains(page, "<b>x</b>") {
		t.Error("markup from a name reached the page")
	}
	// Go's url.PathEscape is the reference for one escaped path segment.
	if !strings.Contains(page, `src="faces/`+url.PathEscape(`a"<script>alert(1)<script> #?`)+`/report.html"`) {
		i := strings.Index(page, "<iframe")
		t.Errorf("frame address not escaped: %.200s", page[max(i, 0):])
	}
	if m := regexp.MustCompile(`<iframe title="[^"]*" src="faces/([^"]*)/report.html">`).FindStringSubmatch(page); m == nil || strings.ContainsAny(m[1], "<> #?/") {
		t.Errorf("frame address %v holds characters a path segment must not", m)
	}
	for _, bad := range []string{"..", ".", "", "a/b", `a\b`, "a\nb"} {
		out := filepath.Join(dir, "bad.html")
		err := WriteFacesPage(out, FacesPage{Name: "x", Faces: []string{"ok", bad}})
		if err == nil || !strings.Contains(err.Error(), "face name") {
			t.Errorf("face %q: error %v, want a refusal naming the face name", bad, err)
		}
		if _, err := os.Stat(out); err == nil {
			t.Errorf("face %q: a page was written", bad)
		}
	}
}

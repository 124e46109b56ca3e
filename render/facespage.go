package render

import (
	"bufio"
	"fmt"
	"html/template"
	"net/url"
	"strings"

	"spallscope/dic/runfolder"
	"spallscope/strain/strainfile"
)

// FacesPage is the side-by-side page of a test photographed on several
// faces: every face's onsets on the load log's clock, the common timeline
// and each face's own report in a frame.
type FacesPage struct {
	// Name is the test's name.
	Name string
	// Faces name the faces; face f's report is faces/<f>/report.html
	// beside the page.
	Faces []string
	// Onsets are every face's onsets, in the order to show them.
	Onsets []FaceOnset
	// First is the first onset over all faces (nil: none).
	First *FaceOnset
	// Timeline is the timeline figure's path relative to the page ("":
	// none).
	Timeline string
	// Cautions head the page.
	Cautions []string
}

// FaceOnset is one face's onset placed on the load log's clock.
type FaceOnset struct {
	Face  string
	Onset strainfile.OnsetRecord
	// LogTime is the onset's time on the load log's clock; the face's
	// clock offset (LogTime − Onset.Time) places its interval there too.
	LogTime float64
}

// facesPageTemplate is the faces page; its style sheet is inline.
var facesPageTemplate = template.Must(template.New("faces.html.tmpl").ParseFS(pageFiles, "templates/faces.html.tmpl"))

// facesCSS is the faces page's style sheet.
var facesCSS = func() template.CSS {
	data, err := pageFiles.ReadFile("templates/faces.css")
	if err != nil {
		panic(err) // embedded at build time
	}
	return template.CSS(data)
}()

// facesRow is one onset of the faces page's table, formatted.
type facesRow struct {
	Face, Class, Place, Indicator, Frame string
	LogTime, Stress, Percent             string
	Interval, IntervalTitle, Trigger     string
}

// WriteFacesPage writes the faces page p to path (atomically). A face
// name that is not one plain folder name (empty, ".", "..", or holding a
// slash or a backslash) is refused: its report would lie outside the
// faces folder.
func WriteFacesPage(path string, p FacesPage) error {
	for _, f := range p.Faces {
		if err := checkFaceName(f); err != nil {
			return fmt.Errorf("faces page %s: %w", path, err)
		}
	}
	data := struct {
		FacesPage
		CSS     template.CSS
		Rows    []facesRow
		FirstOn string
		Reports []facesReport
	}{FacesPage: p, CSS: facesCSS}
	for _, o := range p.Onsets {
		data.Rows = append(data.Rows, newFacesRow(o))
	}
	if f := p.First; f != nil {
		data.FirstOn = firstOnsetLine(*f)
	}
	for _, f := range p.Faces {
		data.Reports = append(data.Reports, facesReport{Face: f, Src: facesReportURL(f)})
	}
	err := runfolder.WriteAtomic(path, func(w *bufio.Writer) error {
		return facesPageTemplate.Execute(w, data)
	})
	if err != nil {
		return fmt.Errorf("faces page %s: %w", path, err)
	}
	return nil
}

// checkFaceName reports whether a face name can name the face's folder
// under the faces folder (the test config refuses others at the edge; the
// page checks again, as a library function): one plain folder name, not empty, not "." or
// "..", without a slash, a backslash or a control character.
func checkFaceName(name string) error {
	switch {
	case name == "":
		return fmt.Errorf("face name is empty")
	case name == "." || name == "..":
		return fmt.Errorf("face name %q is not a folder name", name)
	case strings.ContainsAny(name, `/\`):
		return fmt.Errorf("face name %q holds a slash or backslash; expected one folder name", name)
	}
	for _, r := range name {
		if r < 0x20 || r == 0x7f {
			return fmt.Errorf("face name %q holds a control character", name)
		}
	}
	return nil
}

// facesReport is one face's report in a frame of the page.
type facesReport struct {
	Face string
	Src  template.URL
}

// facesReportURL is the relative address of face f's report: its name
// escaped as one path segment, so that no face name leaves the faces
// folder or reads as a scheme.
func facesReportURL(face string) template.URL {
	return template.URL("faces/" + url.PathEscape(face) + "/" + ReportFile)
}

// newFacesRow formats one onset of the faces page.
func newFacesRow(f FaceOnset) facesRow {
	o := f.Onset
	row := facesRow{
		Face: f.Face, Class: o.Class, Place: string(o.Sector), Indicator: indicatorLabel(o.Indicator),
		Frame:    o.Name,
		LogTime:  fmt.Sprintf("%.1f", f.LogTime),
		Stress:   fmt.Sprintf("%.2f", o.Stress),
		Percent:  fmt.Sprintf("%.0f", o.Percent),
		Interval: "—", Trigger: "—",
	}
	if o.OpeningName != "" {
		row.Place = o.OpeningName + " " + row.Place
	}
	if iv := o.Interval; iv != nil {
		offset := f.LogTime - o.Time
		frames := iv.First + " … " + iv.Last
		if iv.FirstFrame == iv.LastFrame {
			frames = iv.First
		}
		parts := []string{formatRange(iv.TimeLo+offset, iv.TimeHi+offset, "%.1f", "s")}
		if o.InSpan && plotFinite(iv.StressLo) && plotFinite(iv.StressHi) {
			parts = append(parts, formatRange(iv.StressLo, iv.StressHi, "%.2f", "MPa"))
		}
		row.Interval = strings.Join(parts, ", ")
		row.IntervalTitle = frames
	}
	if o.TriggerName != "" {
		row.Trigger = o.TriggerName
	}
	return row
}

// firstOnsetLine says which onset came first over all faces.
func firstOnsetLine(f FaceOnset) string {
	o := f.Onset
	place := string(o.Sector)
	if o.OpeningName != "" {
		place = o.OpeningName + " " + place
	}
	s := fmt.Sprintf("%s, %s at %s, log time %.1f s, %.2f MPa (%.0f %% of peak)", f.Face, o.Class, place, f.LogTime, o.Stress, o.Percent)
	if iv := o.Interval; iv != nil {
		offset := f.LogTime - o.Time
		s += fmt.Sprintf("; %s %% interval %s", formatFactor(100*iv.Confidence), formatRange(iv.TimeLo+offset, iv.TimeHi+offset, "%.1f", "s"))
	}
	return s + "."
}

package strainfile

import (
	"path/filepath"
	"testing"

	"spallscope/dic"
	"spallscope/dic/region"
	"spallscope/strain"
	"spallscope/subset"
)

// Frame and opening names that hold CSV's own characters — a quote, a
// comma, a line break — are written quoted (RFC 4180, by encoding/csv)
// and read back as they were; before, an unquoted '"' in zones.csv made
// the report's reader fail.
func TestZonesCSVHostileNames(t *testing.T) {
	g := dic.Grid{X0: 10, Y0: 10, Step: 10, Cols: 12, Rows: 12}
	ref := &dic.Field{Grid: g}
	sf := &strain.Field{Grid: g}
	for i := 0; i < g.Len(); i++ {
		x, y := g.Pos(i)
		ref.Points = append(ref.Points, dic.Point{X: x, Y: y, Status: subset.Converged})
		p := strain.Point{X: x, Y: y, Valid: true}
		if c, r := i%g.Cols, i/g.Cols; c >= 8 && c <= 10 && r >= 5 && r <= 7 {
			p.Exx = 0.01 // a patch of 9 points: one zone
		}
		sf.Points = append(sf.Points, p)
	}
	open := region.Circle(40, 70, 15)
	f, err := strain.NewFinder(strain.FinderConfig{Indicators: []strain.Indicator{strain.MaxPrincipal},
		Sectors: strain.Sectors{Openings: []strain.Opening{{Name: "x", Shape: open}}}}, ref, strain.Baseline{})
	if err != nil {
		t.Fatal(err)
	}
	frame := `f"1,a` + "\nb"
	if _, err := f.Add(strain.Frame{Index: 0, Name: frame, Strain: sf, Disp: ref}); err != nil {
		t.Fatal(err)
	}
	if len(f.Zones()) != 1 {
		t.Fatalf("%d zones, want the one patch", len(f.Zones()))
	}
	dir := t.TempDir()
	opening := `west "big", one`
	if err := WriteZones(filepath.Join(dir, ZonesCSV), f, func(int) string { return opening }); err != nil {
		t.Fatal(err)
	}
	if err := WriteZoneCells(filepath.Join(dir, ZoneCellsCSV), f); err != nil {
		t.Fatal(err)
	}
	zs, err := ReadZones(dir)
	if err != nil {
		t.Fatal(err)
	}
	if len(zs) != 1 || zs[0].Frame != frame || zs[0].Opening != opening || len(zs[0].Cells) != 9 {
		t.Errorf("read back %+v; want frame %q, opening %q, 9 cells", zs, frame, opening)
	}
}

package main

import (
	"os"
	"path/filepath"
	"strings"
	"testing"

	"spallscope/dic"
	"spallscope/dic/runfolder"
	"spallscope/subset"
)

// The command exports a two-frame run folder to the formats asked for and
// says where; bad fields and a missing folder are refused.
func TestExportCommand(t *testing.T) {
	dir := t.TempDir()
	g := dic.Grid{X0: 4, Y0: 4, Step: 2, Cols: 3, Rows: 2}
	names := []string{"a_01", "a_02"}
	for k, name := range names {
		f := &dic.Field{Name: name, Grid: g}
		for i := 0; i < g.Len(); i++ {
			x, y := g.Pos(i)
			p := dic.Point{X: x, Y: y, Status: subset.Converged, ZNCC: 0.98}
			p.P[subset.PU] = float64(k)
			f.Points = append(f.Points, p)
		}
		if err := runfolder.WriteField(runfolder.FieldPath(dir, name), f, 0); err != nil {
			t.Fatal(err)
		}
	}
	if err := runfolder.SetSection(dir, "track", runfolder.TrackRecord{Frames: names, Times: []float64{0, 2}}); err != nil {
		t.Fatal(err)
	}

	out, err := run(t, "export", dir, "--npy", "--fields", "u,v", "--scale", "0.1")
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(out, "exported 2 frames (u,v; lengths in mm, times from camera)") || !strings.Contains(out, filepath.Join(dir, "npy", "index.json")) || strings.Contains(out, "VTK:") {
		t.Errorf("summary:\n%s", out)
	}
	for _, f := range []string{"u.npy", "v.npy", "x.npy", "times.npy", "index.json"} {
		if _, err := os.Stat(filepath.Join(dir, "npy", f)); err != nil {
			t.Error(err)
		}
	}
	if _, err := os.Stat(filepath.Join(dir, "vtk")); err == nil {
		t.Error("--npy alone wrote the vtk folder")
	}

	out, err = run(t, "export", dir)
	if err != nil || !strings.Contains(out, filepath.Join(dir, "vtk", "series.pvd")) || !strings.Contains(out, "u,v,zncc,status;") {
		t.Errorf("default export: %v\n%s", err, out)
	}

	if _, err := run(t, "export", dir, "--fields", "u,bogus"); err == nil || !strings.Contains(err.Error(), `unknown field "bogus"`) {
		t.Errorf("bad field: %v", err)
	}
	if _, err := run(t, "export", dir, "--fields", ""); err == nil || !strings.Contains(err.Error(), "no fields named") {
		t.Errorf("empty --fields: %v", err)
	}
	if _, err := run(t, "export", filepath.Join(dir, "nope")); err == nil || !strings.Contains(err.Error(), "nope") {
		t.Errorf("missing run folder: %v", err)
	}
}

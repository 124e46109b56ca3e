package main

import (
	"bytes"
	"errors"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"syscall"
	"testing"

	"spallscope/dic/runfolder"
)

// builtBinary builds the spallscope command into a temporary folder once
// per test that needs a real process to signal.
func builtBinary(t *testing.T) string {
	t.Helper()
	goTool, err := exec.LookPath("go")
	if err != nil {
		t.Skip("no go tool to build the binary:", err)
	}
	bin := filepath.Join(t.TempDir(), "spallscope")
	build := exec.Command(goTool, "build", "-o", bin, ".")
	if out, err := build.CombinedOutput(); err != nil {
		t.Fatalf("go build: %v\n%s", err, out)
	}
	return bin
}

// An interrupt (Ctrl-C) or a terminate signal sent to the built binary in
// the middle of tracking stops it at a frame boundary: it exits with 128
// plus the signal's number (the shells' convention, common practice, no
// source), says how to resume, leaves no temporary file and no lock, and
// keeps the finished fields; the same command then resumes after them and
// ends with the outputs of an uninterrupted run, byte for byte.
func TestIntegrationSignalStopsAndResumes(t *testing.T) {
	bin := builtBinary(t)
	cfg := bandTest(t, "")
	data, _ := os.ReadFile(cfg)
	// A finer step makes tracking slow enough for the signal to land in it.
	os.WriteFile(cfg, []byte(strings.Replace(string(data), "step: 5", "step: 3", 1)), 0o644)
	whole := filepath.Join(t.TempDir(), "whole")
	if out, err := exec.Command(bin, "run", cfg, "--out", whole).CombinedOutput(); err != nil {
		t.Fatalf("uninterrupted run: %v\n%s", err, out)
	}
	for _, c := range []struct {
		sig  syscall.Signal
		code int
	}{{syscall.SIGINT, 130}, {syscall.SIGTERM, 143}} {
		cut := filepath.Join(t.TempDir(), "cut")
		child := exec.Command(bin, "run", cfg, "--out", cut)
		var stderr bytes.Buffer
		child.Stderr = &stderr
		if err := child.Start(); err != nil {
			t.Fatal(err)
		}
		waitForFields(cut, 3)
		child.Process.Signal(c.sig)
		err := child.Wait()
		var exit *exec.ExitError
		if !errors.As(err, &exit) || exit.ExitCode() != c.code {
			t.Fatalf("%v: exit %v, want status %d; stderr:\n%s", c.sig, err, c.code, stderr.String())
		}
		msg := stderr.String()
		for _, want := range []string{"stopping at the next frame boundary", "stopped (", "run the same command again to resume"} {
			if !strings.Contains(msg, want) {
				t.Errorf("%v: stderr lacks %q:\n%s", c.sig, want, msg)
			}
		}
		files, _ := filepath.Glob(filepath.Join(cut, runfolder.FieldsDir, "*.csv"))
		if len(files) < 3 || len(files) >= 14 {
			t.Fatalf("%v: %d of 14 fields kept; the signal must land mid-tracking", c.sig, len(files))
		}
		if n, _ := runfolder.RemovePartials(cut); n != 0 {
			t.Errorf("%v: %d temporary files left", c.sig, n)
		}
		if _, err := os.Stat(filepath.Join(cut, runfolder.LockFile)); !os.IsNotExist(err) {
			t.Errorf("%v: lock left: %v", c.sig, err)
		}
		out, err := exec.Command(bin, "run", cfg, "--out", cut).Output()
		if err != nil {
			t.Fatalf("%v: resumed run: %v", c.sig, err)
		}
		if !strings.Contains(string(out), "resumed after") {
			t.Errorf("%v: second run did not resume: %s", c.sig, out)
		}
		sameOutputs(t, whole, cut, c.sig.String())
	}
}

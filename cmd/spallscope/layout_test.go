package main

import (
	"bufio"
	"bytes"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"slices"
	"strings"
	"testing"
)

// The layers of the project, lowest first. A package may import packages
// of a lower layer, or of its own layer (the lower packages of its own
// folder: Go refuses cycles). Nothing imports upward. The rule is the
// project's own (DEVELOPERS.md, "Layout"); this test is its guard.
var layers = []struct {
	name   string
	prefix string
}{
	{"subset", "spallscope/subset"},
	{"dic", "spallscope/dic"},
	{"strain", "spallscope/strain"},
	{"render", "spallscope/render"},
	{"job", "spallscope/cmd/spallscope/internal"},
	{"cmd", "spallscope/cmd/spallscope"},
}

// layerOf returns the index of a project package's layer (-1: not ours).
func layerOf(pkg string) int {
	best, at := -1, 0
	for i, l := range layers {
		if (pkg == l.prefix || strings.HasPrefix(pkg, l.prefix+"/")) && len(l.prefix) > at {
			best, at = i, len(l.prefix)
		}
	}
	return best
}

// projectImports lists every project package with the project packages it
// imports (tests excluded), from go list at the module root.
func projectImports(t *testing.T) map[string][]string {
	t.Helper()
	cmd := exec.Command("go", "list", "-f", "{{.ImportPath}}{{range .Imports}} {{.}}{{end}}", "./...")
	cmd.Dir = filepath.Join("..", "..")
	var stderr bytes.Buffer
	cmd.Stderr = &stderr
	out, err := cmd.Output()
	if err != nil {
		t.Fatalf("go list: %v\n%s", err, stderr.String())
	}
	deps := map[string][]string{}
	sc := bufio.NewScanner(bytes.NewReader(out))
	for sc.Scan() {
		f := strings.Fields(sc.Text())
		if len(f) == 0 {
			continue
		}
		var own []string
		for _, imp := range f[1:] {
			if layerOf(imp) >= 0 {
				own = append(own, imp)
			}
		}
		deps[f[0]] = own
	}
	return deps
}

// Every import points down the layers: subset < dic < strain < render <
// the job (cmd/spallscope/internal) < cmd.
func TestImportsPointDown(t *testing.T) {
	for pkg, imps := range projectImports(t) {
		lp := layerOf(pkg)
		if lp < 0 {
			t.Errorf("package %s is in no layer: put it under one of subset, dic, strain, render, cmd/spallscope/internal", pkg)
			continue
		}
		for _, imp := range imps {
			if li := layerOf(imp); li > lp {
				t.Errorf("%s (layer %s) imports %s (layer %s): imports must point down", pkg, layers[lp].name, imp, layers[li].name)
			}
		}
	}
}

// DEVELOPERS.md lists each package's project imports; the list is checked
// against go list so that it cannot go stale.
func TestDevelopersImportListIsCurrent(t *testing.T) {
	data, err := os.ReadFile(filepath.Join("..", "..", "DEVELOPERS.md"))
	if err != nil {
		t.Fatal(err)
	}
	const start, end = "<!-- imports: checked by cmd/spallscope/layout_test.go -->\n```\n", "```"
	i := bytes.Index(data, []byte(start))
	if i < 0 {
		t.Fatalf("DEVELOPERS.md has no import list (a block after %q); the current one:\n%s", strings.TrimSpace(start), importList(projectImports(t)))
	}
	block := data[i+len(start):]
	block = block[:bytes.Index(block, []byte(end))]
	documented := map[string]string{}
	for _, line := range strings.Split(strings.TrimSpace(string(block)), "\n") {
		pkg, imps, _ := strings.Cut(line, ":")
		documented[strings.TrimSpace(pkg)] = strings.Join(strings.Fields(imps), " ")
	}
	deps := projectImports(t)
	got := map[string]string{}
	for pkg, imps := range deps {
		var short []string
		for _, i := range imps {
			short = append(short, strings.TrimPrefix(i, "spallscope/"))
		}
		got[strings.TrimPrefix(pkg, "spallscope/")] = strings.Join(short, " ")
	}
	stale := false
	for pkg, imps := range got {
		if d, ok := documented[pkg]; !ok || d != imps {
			stale = true
			t.Errorf("DEVELOPERS.md: %s imports %q, listed as %q", pkg, imps, d)
		}
	}
	for pkg := range documented {
		if _, ok := got[pkg]; !ok {
			stale = true
			t.Errorf("DEVELOPERS.md lists %s, which is not a package", pkg)
		}
	}
	if stale {
		t.Logf("the current list:\n%s", importList(deps))
	}
}

// importList formats the project imports as DEVELOPERS.md lists them: one
// line per package, lowest layer first, paths without the module prefix.
func importList(deps map[string][]string) string {
	short := func(p string) string { return strings.TrimPrefix(p, "spallscope/") }
	var pkgs []string
	for p := range deps {
		pkgs = append(pkgs, p)
	}
	slices.SortFunc(pkgs, func(a, b string) int {
		if la, lb := layerOf(a), layerOf(b); la != lb {
			return la - lb
		}
		return strings.Compare(a, b)
	})
	var b strings.Builder
	for _, p := range pkgs {
		var imps []string
		for _, i := range deps[p] {
			imps = append(imps, short(i))
		}
		fmt.Fprintf(&b, "%s: %s\n", short(p), strings.Join(imps, " "))
	}
	return b.String()
}

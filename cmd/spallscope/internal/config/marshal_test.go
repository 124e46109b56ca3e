package config

import (
	"os"
	"path/filepath"
	"reflect"
	"testing"
)

// Marshal's output reads back as the same test: the commented example
// config of the repository (every key set), round-tripped.
func TestMarshalReadsBack(t *testing.T) {
	want, err := Read(filepath.Join("..", "..", "..", "..", "testdata", "example_test.yaml"))
	if err != nil {
		t.Fatal(err)
	}
	data, err := Marshal(want)
	if err != nil {
		t.Fatal(err)
	}
	path := filepath.Join(t.TempDir(), "again.yaml")
	if err := os.WriteFile(path, data, 0o644); err != nil {
		t.Fatal(err)
	}
	got, err := Read(path)
	if err != nil {
		t.Fatalf("%v\n%s", err, data)
	}
	got.Dir, got.Path = want.Dir, want.Path
	if !reflect.DeepEqual(got, want) {
		t.Errorf("round trip differs:\n got %+v\nwant %+v\nYAML:\n%s", got, want, data)
	}
}

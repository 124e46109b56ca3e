package runfolder

import (
	"io/fs"
	"os"
	"path/filepath"
	"strings"
)

// partialMark is in the name of every temporary file WriteAtomic writes.
const partialMark = ".partial-"

// RemovePartials removes the temporary files that WriteAtomic leaves
// behind when its process is killed in the middle of a write, from dir
// and its subfolders, and returns how many it removed. Only files named
// as WriteAtomic names them (".<name>.partial-<random>") are touched.
func RemovePartials(dir string) (int, error) {
	n := 0
	err := filepath.WalkDir(dir, func(path string, d fs.DirEntry, err error) error {
		if err != nil {
			return err
		}
		if !d.IsDir() && isPartial(d.Name()) {
			if err := os.Remove(path); err != nil {
				return err
			}
			n++
		}
		return nil
	})
	return n, err
}

// isPartial reports whether a file name is one WriteAtomic gives its
// temporary files (".<name>.partial-<random>").
func isPartial(name string) bool {
	return strings.HasPrefix(name, ".") && strings.Contains(name, partialMark)
}

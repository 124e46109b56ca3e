package runfolder

import (
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"time"
)

// FolderSection is the run.json section that marks a folder as a run
// folder of this tool: only in such a folder (or a new, empty one) does
// a run delete or overwrite files, and then only its own.
const FolderSection = "folder"

// FolderRecord is the content of the FolderSection.
type FolderRecord struct {
	Tool    string `json:"tool"`
	Created string `json:"created"`
}

// ErrForeignFolder is wrapped by Claim's error for a folder that holds
// files and is not a run folder.
var ErrForeignFolder = errors.New("not a run folder")

// Claim makes dir a run folder for tool: it creates dir when missing and
// marks it (run.json's FolderSection). An existing folder is accepted when
// it is empty or already a run folder — one with the mark, or one written
// before the mark existed, whose run.json has a stages or track section.
// Any other folder with files in it is refused, so that a mistyped --out
// never loses the files of a folder the tool did not make. The lock and
// WriteAtomic's temporaries do not count as files: the frame parts of one
// test claim its folder at the same time on several nodes, and one may
// look while another is writing the mark (seen on a real Slurm: the
// folder held only ".run.json.partial-…" and was refused).
func Claim(dir, tool string) error {
	entries, err := os.ReadDir(dir)
	entries = slices.DeleteFunc(entries, func(e fs.DirEntry) bool { return e.Name() == LockFile || isPartial(e.Name()) })
	switch {
	case errors.Is(err, fs.ErrNotExist):
		if err := os.MkdirAll(dir, 0o755); err != nil {
			return err
		}
	case err != nil:
		return err
	case len(entries) > 0 && !IsRunFolder(dir):
		return fmt.Errorf("%s holds files (%s) and is not a run folder of this tool (no %s with its mark): %w; choose an empty or new folder",
			dir, entryList(entries), ManifestFile, ErrForeignFolder)
	}
	var rec FolderRecord
	if Section(dir, FolderSection, &rec) == nil {
		return nil
	}
	return SetSection(dir, FolderSection, FolderRecord{Tool: tool, Created: time.Now().UTC().Format(time.RFC3339)})
}

// IsRunFolder reports whether dir's run.json marks it as a run folder (or
// is one from before the mark: it has a stages or track section).
func IsRunFolder(dir string) bool {
	var v any
	for _, s := range []string{FolderSection, "stages", "track"} {
		if Section(dir, s, &v) == nil {
			return true
		}
	}
	return false
}

// entryList names up to three of a folder's entries for a message.
func entryList(entries []fs.DirEntry) string {
	var names []string
	for i, e := range entries {
		if i == 3 {
			names = append(names, fmt.Sprintf("and %d more", len(entries)-3))
			break
		}
		names = append(names, fmt.Sprintf("%q", filepath.Base(e.Name())))
	}
	return strings.Join(names, ", ")
}

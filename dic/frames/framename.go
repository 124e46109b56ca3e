package frames

import (
	"fmt"
	"strings"
	"unicode"
)

// checkedFileSequence is the sequence of still images at paths, once
// their frame names are checked. A frame's name (its file name without
// the extension) names its files in a run folder (fields/<name>.csv,
// strain/<name>.csv, overlays) and its rows in CSV files, so two frames
// may not share one — img_001.png and img_001.tif in a folder, or
// a/x.png and b/x.png in a list, would write one field file, the second
// over the first — not even in case alone (one file on a case-insensitive
// file system), and a name may not hold a control character (a newline
// would split a CSV row, an escape code drive the terminal).
func checkedFileSequence(paths []string) (Sequence, error) {
	s := newFileSequence(paths)
	first := map[string]int{}
	for i, name := range s.names {
		for _, r := range name {
			if unicode.IsControl(r) {
				return nil, fmt.Errorf("open sequence: frame %s: its name %q holds the control character %U; rename the file", paths[i], name, r)
			}
		}
		fold := strings.ToLower(name)
		if j, ok := first[fold]; ok {
			return nil, fmt.Errorf("open sequence: frames %s and %s both have the name %q (the file name without its extension), which names a frame's files in the run folder; rename one", paths[j], paths[i], name)
		}
		first[fold] = i
	}
	return s, nil
}

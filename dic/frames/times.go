package frames

import (
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"os"
	"strconv"
	"strings"
)

// FixedRate returns the times of n frames taken at fps frames per second,
// the first at start seconds.
func FixedRate(n int, fps, start float64) ([]float64, error) {
	if !(fps > 0) {
		return nil, fmt.Errorf("frame rate %g, expected a positive number of frames per second", fps)
	}
	t := make([]float64, n)
	for i := range t {
		t[i] = start + float64(i)/fps
	}
	return t, nil
}

// ReadTimes reads frame times from a CSV file with a header row naming a
// "frame" column and a "time_s" column (seconds). A frame cell is either the
// frame's name (file stem) or its zero-based index in the sequence. Lines
// starting with '#' are comments. Every frame of seq must be listed once,
// and times must not decrease along the sequence.
func ReadTimes(path string, seq Sequence) ([]float64, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, fmt.Errorf("frame times: %w", err)
	}
	defer f.Close()
	r := csv.NewReader(f)
	r.Comment = '#'
	r.FieldsPerRecord = -1
	r.TrimLeadingSpace = true
	header, err := r.Read()
	if err != nil {
		return nil, fmt.Errorf("frame times %s: reading header: %w", path, err)
	}
	fc, tc := -1, -1
	for i, h := range header {
		switch strings.ToLower(strings.TrimSpace(h)) {
		case "frame":
			fc = i
		case "time_s", "time":
			tc = i
		}
	}
	if fc < 0 || tc < 0 {
		return nil, fmt.Errorf("frame times %s: header %q must name a \"frame\" and a \"time_s\" column", path, strings.Join(header, ","))
	}
	index := make(map[string]int, seq.Len())
	for i := 0; i < seq.Len(); i++ {
		index[seq.Name(i)] = i
	}
	times := make([]float64, seq.Len())
	seen := make([]bool, seq.Len())
	for {
		rec, err := r.Read()
		if errors.Is(err, io.EOF) {
			break
		}
		line, _ := r.FieldPos(0)
		if err != nil {
			return nil, fmt.Errorf("frame times %s: %w", path, err)
		}
		if fc >= len(rec) || tc >= len(rec) {
			return nil, fmt.Errorf("frame times %s line %d: %d cells, expected at least %d", path, line, len(rec), max(fc, tc)+1)
		}
		key := strings.TrimSpace(rec[fc])
		i, ok := index[key]
		if !ok {
			n, err := strconv.Atoi(key)
			if err != nil || n < 0 || n >= seq.Len() {
				return nil, fmt.Errorf("frame times %s line %d: frame %q is neither a frame name nor an index 0..%d", path, line, key, seq.Len()-1)
			}
			i = n
		}
		t, err := strconv.ParseFloat(strings.TrimSpace(rec[tc]), 64)
		if err != nil {
			return nil, fmt.Errorf("frame times %s line %d: time %q is not a number of seconds", path, line, rec[tc])
		}
		if seen[i] {
			return nil, fmt.Errorf("frame times %s line %d: frame %s listed twice", path, line, seq.Name(i))
		}
		seen[i], times[i] = true, t
	}
	for i, ok := range seen {
		if !ok {
			return nil, fmt.Errorf("frame times %s: no time for frame %d (%s)", path, i, seq.Name(i))
		}
		if i > 0 && times[i] < times[i-1] {
			return nil, fmt.Errorf("frame times %s: time of frame %d (%s) is %g s, before the previous frame's %g s", path, i, seq.Name(i), times[i], times[i-1])
		}
	}
	return times, nil
}

// ModTimes returns each frame file's modification time in seconds after the
// first frame's. It fails for video, whose frames have no files. File times
// are only as good as the camera's clock and the copy that kept them.
func ModTimes(seq Sequence) ([]float64, error) {
	fs, ok := seq.(*fileSequence)
	if !ok {
		return nil, errors.New("frame times from file modification times need image files, not a video")
	}
	times := make([]float64, len(fs.paths))
	var t0 float64
	for i, p := range fs.paths {
		st, err := os.Stat(p)
		if err != nil {
			return nil, fmt.Errorf("frame times: frame %d: %w", i, err)
		}
		t := float64(st.ModTime().UnixNano()) / 1e9
		if i == 0 {
			t0 = t
		}
		times[i] = t - t0
	}
	return times, nil
}

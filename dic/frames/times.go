package frames

import (
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"math"
	"os"
	"strconv"
	"strings"

	"spallscope/dic/logtable"
)

// FixedRate returns the times of n frames taken at fps frames per second,
// the first at start seconds. It refuses a rate that is not a finite
// positive number, a start that is not finite, a negative n, and a rate
// so high for the start that consecutive times would round to the same
// float64 (a start of 1e9 s at 1e9 frames per second, say).
func FixedRate(n int, fps, start float64) ([]float64, error) {
	if !(fps > 0) || math.IsInf(fps, 0) {
		return nil, fmt.Errorf("frame rate %g, expected a finite positive number of frames per second", fps)
	}
	if math.IsNaN(start) || math.IsInf(start, 0) {
		return nil, fmt.Errorf("frame times: start %g s, expected a finite number of seconds", start)
	}
	if n < 0 {
		return nil, fmt.Errorf("frame times: %d frames, expected zero or more", n)
	}
	t := make([]float64, n)
	for i := range t {
		t[i] = start + float64(i)/fps
		if math.IsInf(t[i], 0) || (i > 0 && !(t[i] > t[i-1])) {
			return nil, fmt.Errorf("frame rate %g from a start at %g s: frames %d and %d get the same time %g s; expected a rate and start whose frame times differ",
				fps, start, i-1, i, t[i])
		}
	}
	return t, nil
}

// ReadTimes reads frame times from a CSV file with a header row naming a
// "frame" column and a "time_s" column (seconds). A frame cell is either the
// frame's name (file stem) or its zero-based index in the sequence. Lines
// starting with '#' are comments. Every frame of seq must be listed once
// with a finite time, and times must increase along the sequence: a time
// that is not finite, a frame listed twice, and a frame whose time is not
// after the previous frame's (a repeat or a step back) are errors naming
// the line, the frame and the times.
func ReadTimes(path string, seq Sequence) ([]float64, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, fmt.Errorf("frame times: %w", err)
	}
	defer f.Close()
	r := csv.NewReader(logtable.LimitLines(f, logtable.MaxLine))
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
		return nil, fmt.Errorf("frame times %s: header %s must name a \"frame\" and a \"time_s\" column", path, logtable.Excerpt(strings.Join(header, ",")))
	}
	index := make(map[string]int, seq.Len())
	for i := 0; i < seq.Len(); i++ {
		index[seq.Name(i)] = i
	}
	times := make([]float64, seq.Len())
	lines := make([]int, seq.Len()) // line of each frame's time, 0 while unseen
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
				return nil, fmt.Errorf("frame times %s line %d: frame %s is neither a frame name nor an index 0..%d", path, line, logtable.Excerpt(key), seq.Len()-1)
			}
			i = n
		}
		cell := strings.TrimSpace(rec[tc])
		t, ok := logtable.ParseNumber(cell)
		if !ok {
			return nil, fmt.Errorf("frame times %s line %d: time of frame %s: %w (seconds)", path, line, seq.Name(i), logtable.CellProblem(cell, false))
		}
		if lines[i] != 0 {
			return nil, fmt.Errorf("frame times %s line %d: frame %s listed twice (first on line %d)", path, line, seq.Name(i), lines[i])
		}
		lines[i], times[i] = line, t
	}
	for i, line := range lines {
		if line == 0 {
			return nil, fmt.Errorf("frame times %s: no time for frame %d (%s)", path, i, seq.Name(i))
		}
		if i > 0 && !(times[i] > times[i-1]) {
			how := "before"
			if times[i] == times[i-1] {
				how = "the same as"
			}
			return nil, fmt.Errorf("frame times %s line %d: time of frame %d (%s) is %g s, %s the previous frame's %g s (%s, line %d); expected times that increase along the sequence",
				path, line, i, seq.Name(i), times[i], how, times[i-1], seq.Name(i-1), lines[i-1])
		}
	}
	return times, nil
}

// ModTimes returns each frame file's modification time in seconds after the
// first frame's. It fails for video, whose frames have no files, and when
// a file is not modified after the one before it in the sequence. File times
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
		if i > 0 && !(times[i] > times[i-1]) {
			return nil, fmt.Errorf("frame times from file modification times: %s is not modified after %s (%+.3f s); the files were likely copied without their times: give a frame rate or a times CSV instead",
				p, fs.paths[i-1], times[i]-times[i-1])
		}
	}
	return times, nil
}

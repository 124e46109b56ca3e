package config

import "fmt"

// Times says when each frame was taken: give one of FPS, CSV, MTime or
// EXIF (none: a video's own rate, else unknown).
type Times struct {
	FPS   float64 `yaml:"fps"`
	CSV   string  `yaml:"csv"`
	MTime bool    `yaml:"mtime"`
	// EXIF takes each photo's capture time from its EXIF tags
	// (DateTimeOriginal, SubSecTimeOriginal, OffsetTimeOriginal).
	EXIF bool `yaml:"exif"`
}

// check checks the frame times; prefix is the section's key ("times", or
// "faces[1].times").
func (t Times) check(prefix string) error {
	var p Problems
	n := 0
	for _, set := range []bool{t.FPS != 0, t.CSV != "", t.MTime, t.EXIF} {
		if set {
			n++
		}
	}
	if n > 1 {
		p.add(fmt.Errorf("%s: give one of fps, csv, mtime and exif", prefix))
	}
	p.add(checkBounds(bound{key(prefix, "fps"), t.FPS, t.FPS == 0 || (t.FPS > 0 && finite(t.FPS)), "a finite positive rate in frames per second"}))
	return p.err()
}

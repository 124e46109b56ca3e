package config

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

package config

// Times says when each frame was taken: give one of FPS, CSV or MTime
// (none: a video's own rate, else unknown).
type Times struct {
	FPS   float64 `yaml:"fps"`
	CSV   string  `yaml:"csv"`
	MTime bool    `yaml:"mtime"`
}

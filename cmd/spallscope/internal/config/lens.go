package config

// Camera holds the keys that describe the camera rather than the test
// (inline in Test and Face: they are top-level keys of a test or a face).
type Camera struct {
	// Lens is a lens file written by `spallscope calibrate` for this
	// camera and lens at this focus (empty: a perfect lens). With a lens,
	// tracked displacements are corrected for its distortion and the
	// fields are in undistorted px (see package lens).
	Lens string `yaml:"lens"`
}

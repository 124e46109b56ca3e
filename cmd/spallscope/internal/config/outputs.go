package config

// Outputs says what to produce beyond fields, strain, zones and onsets.
// Unset switches take their defaults: overlays and the report on, video,
// VTK and NPY off.
type Outputs struct {
	Overlays *bool  `yaml:"overlays"`
	Video    *bool  `yaml:"video"`
	Report   *bool  `yaml:"report"`
	VTK      *bool  `yaml:"vtk"`
	NPY      *bool  `yaml:"npy"`
	Field    string `yaml:"field"` // overlay quantity, default e1
}

func on(b *bool, def bool) bool {
	if b == nil {
		return def
	}
	return *b
}

// WantOverlays reports whether overlays are wanted (default yes).
func (o Outputs) WantOverlays() bool { return on(o.Overlays, true) }

// WantVideo reports whether a video is wanted (default no).
func (o Outputs) WantVideo() bool { return on(o.Video, false) }

// WantReport reports whether the HTML report is wanted (default yes).
func (o Outputs) WantReport() bool { return on(o.Report, true) }

// WantVTK reports whether VTK files are wanted (default no).
func (o Outputs) WantVTK() bool { return on(o.VTK, false) }

// WantNPY reports whether NumPy arrays are wanted (default no).
func (o Outputs) WantNPY() bool { return on(o.NPY, false) }

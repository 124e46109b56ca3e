package strainfile

import (
	"spallscope/dic"
	"spallscope/strain"
)

// StrainRecord is the run.json section written by the strain stage.
type StrainRecord struct {
	Window  int            `json:"window_points"`
	Order   int            `json:"fit_order"`
	Measure strain.Measure `json:"measure"`
	Step    int            `json:"step_px"`
	Subset  int            `json:"subset_px"`
	VSG     int            `json:"vsg_px"`
	VSGmm   float64        `json:"vsg_mm,omitempty"`
	MMPerPx dic.Scale      `json:"mm_per_px,omitempty"`
	Frames  []string       `json:"frames"`
	Seconds float64        `json:"seconds"`
}

// ResolutionRecord is the run.json section that states the measurement
// resolution with the settings that produced it (the reporting items of
// the iDICs Good Practices Guide, 2018).
type ResolutionRecord struct {
	strain.Resolution
	StaticFrames  []string `json:"static_frame_names"`
	Subset        int      `json:"subset_px"`
	Step          int      `json:"step_px"`
	Window        int      `json:"strain_window_points"`
	VSG           int      `json:"vsg_px"`
	VSGmm         float64  `json:"vsg_mm,omitempty"`
	UMM           float64  `json:"u_mm,omitempty"`
	Interpolation string   `json:"interpolation"`
	ShapeFunction string   `json:"shape_function"`
	Measure       string   `json:"measure"`
}

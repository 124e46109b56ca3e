package strainfile

import (
	"spallscope/strain"
)

// TimelineRecord is the run.json section of every frame's time and
// nominal stress (written by the zones stage).
type TimelineRecord struct {
	Frames []string  `json:"frames"`
	Times  []float64 `json:"times_s"`
	Stress []float64 `json:"stress_MPa"`
	InSpan []bool    `json:"in_load_log"`
}

// OnsetReport is the content of onset.json.
type OnsetReport struct {
	Tool       string            `json:"tool"`
	Peak       PeakRecord        `json:"peak"`
	Openings   []OpeningRecord   `json:"openings"`
	Onsets     []OnsetRecord     `json:"onsets"`
	Settings   ZoneSettings      `json:"settings"`
	Resolution *ResolutionRecord `json:"resolution,omitempty"`
	// DetectionLimits say, per strain indicator, the smallest fracture the
	// run could see at all.
	DetectionLimits []DetectionLimit `json:"detection_limits,omitempty"`
	Cautions        []string         `json:"cautions"`
}

// DetectionLimit is the smallest localized strain, and the smallest crack
// opening, that one strain indicator could detect in the run: the
// indicator's noise over the calibration frames times the threshold
// factor K (at least strain.MinFloor) — below it the threshold of every
// frame lies above the fracture — and, for a displacement jump across one
// virtual strain gauge of side VSG (which averages to jump/VSG), that
// strain times the VSG.
type DetectionLimit struct {
	Indicator strain.Indicator `json:"indicator"`
	Noise     float64          `json:"noise"`
	K         float64          `json:"k_mad"`
	Strain    float64          `json:"strain"`
	VSG       int              `json:"vsg_px"`
	OpeningPx float64          `json:"crack_opening_px"`
	OpeningMM float64          `json:"crack_opening_mm,omitempty"`
}

// PeakRecord is the peak nominal stress of the test.
type PeakRecord struct {
	Stress float64 `json:"stress_MPa"`
	Time   float64 `json:"time_s"`
	Frame  string  `json:"frame"`
}

// OpeningRecord names an opening.
type OpeningRecord struct {
	Index int    `json:"index"`
	Name  string `json:"name"`
}

// OnsetRecord is one onset with its opening's name and its context.
type OnsetRecord struct {
	strain.Onset
	OpeningName string          `json:"opening"`
	Context     *strain.Context `json:"context,omitempty"`
}

// ZoneSettings records how zones were found.
type ZoneSettings struct {
	Indicators     []strain.Indicator `json:"indicators"`
	Thresholds     strain.Thresholds  `json:"thresholds"`
	Persistence    int                `json:"persistence_frames"`
	CalibrateBelow float64            `json:"calibrate_below_fraction_of_peak"`
	CalibFrames    int                `json:"calibration_frames"`
	K              float64            `json:"k_lateral"`
	UCS            float64            `json:"ucs_MPa,omitempty"`
	// EventJoinPx is the distance in px within which two onsets at one
	// opening whose intervals share a frame are one event (the VSG;
	// strain.JoinEvents), 0 when the finder did not know it.
	EventJoinPx int `json:"event_join_px"`
}

// Cautions are printed with every onset report.
var Cautions = []string{
	"Compression tests of brittle specimens can fail violently; onset times are no warning system for people near a loaded specimen.",
	"Onsets are measured events with the stated resolution, not design values.",
	"Support and excavation design belong to licensed engineers under local codes.",
}

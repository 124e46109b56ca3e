package demo

// The demo rock's strength and the lateral stress ratio of its loading,
// invented with the demo specimen.
const (
	UCS = 60.0 // MPa
	K   = 0.25
)

// ModelMPa is the load level of the demo's model file (the elastic Kirsch
// solution), held against the front face's measurement.
const ModelMPa = 8.0

// The faces' names in the test config.
const (
	FrontFace = "front"
	TwinFace  = "twin"
)

// File and folder names of a demo folder.
const (
	ConfigFile = "demo.yaml"
	FrontDir   = "synth" // the front face's photos, load log, AE hits and model
	TwinDir    = "twin"  // the twin-opening block's photos
	TruthCSV   = "feature_truth.csv"
	RunDir     = "run"
	AEFile     = "ae_hits.csv"
	ModelFile  = "model.csv"
)

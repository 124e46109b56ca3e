// Package strainfile owns the run-folder files of strain's results: the
// strain fields strain/<frame>.csv, zones.csv, zone_cells.csv and
// noise_scale.csv (the factor by which the zones stage raised each point's
// bar), written with encoding/csv and read with errors that name the file
// and line, and the records of onset.json and of run.json's strain,
// resolution and timeline sections, with the cautions printed beside
// every onset.
//
// render and the job read these records; the stages that compute them are
// in cmd/spallscope/internal/stage.
package strainfile

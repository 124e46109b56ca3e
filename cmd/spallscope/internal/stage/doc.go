// Package stage runs one stage of the pipeline over a run folder — track,
// strain, zones — reading the previous stage's files and writing its own,
// so that a stage can be run alone from the command line or as part of a
// whole test by package job. It holds no policy: what to skip, resume or
// rerun is job's decision.
package stage

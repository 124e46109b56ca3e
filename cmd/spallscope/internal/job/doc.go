// Package job does the whole job for one test config: it opens the
// photos, builds the mask, and runs the stages — track, strain, zones and
// the outputs — into a run folder, skipping what is already done with the
// same inputs and settings and resuming an interrupted tracking run. It
// also runs a test with several faces, one run folder per face, and one
// frame part of a test's tracking for a cluster task, and campaigns of
// tests with their summary.
//
// The stages are rows of one table (pipeline.go): a name, a prepare step
// that opens and parses what the stage needs and returns what decides its
// output, a run step, and the stage's outputs in the run folder. Every
// stage is prepared before the first one runs, so a typo in a late
// input (a load log, an AE log, a model file) fails in seconds, not after
// hours of tracking. Each stage's fingerprint hashes its inputs with the
// fingerprint of the stage before it and is stored in run.json: a stage
// whose fingerprint is unchanged and whose outputs are complete is
// skipped; a changed fingerprint reruns that stage and every stage after
// it, and nothing before it.
//
// A run folder is claimed before anything is written (a folder of the
// user's with files in it is refused and left untouched) and locked while
// a process writes it. When the run's context ends (Ctrl-C, a terminate
// signal) the run stops at the next frame boundary with a Stopped error;
// every file is whole, and running again resumes.
package job

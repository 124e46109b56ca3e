// Package job does the whole job for one test config: it opens the
// photos, builds the mask, and runs the stages — track, strain, zones and
// the outputs — into a run folder, skipping what is already done with the
// same inputs and settings and resuming an interrupted tracking run. It
// also runs a test with several faces, one run folder per face, and one
// frame part of a test's tracking for a cluster task, and campaigns of
// tests with their summary.
//
// Each stage has a fingerprint of everything that decides its output
// (the tool's version, inputs, settings, and the fingerprint of the stage
// before it), stored in run.json. A stage whose fingerprint is unchanged and whose outputs are
// complete is skipped; a changed fingerprint reruns that stage and every
// stage after it, and nothing before it.
package job

// Package demo builds spallscope's own demo test with the synthetic
// speckle lab — a mortar-analogue block with one circular opening, filmed
// from two sides, with a load log, an acoustic-emission record and a model
// file, all invented for the demo — and checks the run's measurement
// against the exact field the photos were rendered from.
package demo

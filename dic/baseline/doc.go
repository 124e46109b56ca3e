// Package baseline measures how spallscope's subset correlation compares,
// in accuracy and speed, with general-purpose motion estimators from OpenCV
// used as baselines: pyramidal Lucas–Kanade optical flow, Farneback dense
// optical flow, phase correlation and normalised template matching with a
// parabolic peak fit.
//
// Every method measures the same points of the same synthetic frames
// (package synth), whose displacement is known exactly by construction, so
// each error is a true error and not a disagreement between methods.
//
// The package is a yardstick, not part of the measuring pipeline: it holds
// only what is needed to run a method on a Case and score it.
package baseline

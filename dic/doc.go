// Package dic tracks a grid of subsets through a photo sequence: the
// whole-field part of digital image correlation. It places points of
// interest over a masked region, finds seed points by an integer ZNCC
// search, propagates subpixel IC-GN solutions over the grid by
// reliability-guided DIC (Pan 2009), and keeps results in the reference's
// coordinates with either a fixed or an automatically updated reference.
//
// The per-point mathematics is in package subset; image files are in
// dic/frames, shapes and masks in dic/region, run-folder files in
// dic/runfolder and the synthetic lab in dic/synth.
package dic

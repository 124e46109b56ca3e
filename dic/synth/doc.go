// Package synth is a synthetic speckle lab: it renders speckle patterns and
// deformed frames under prescribed displacement fields whose exact ground
// truth (u, v and the displacement gradient at any point) is known, with a
// matching load log. It is the reference for every accuracy test of the
// correlation and strain stages, and lets users check their settings before
// a test.
//
// Deformed frames are rendered exactly, without interpolating a reference
// bitmap: a pattern is a sum of analytic Gaussian ink spots, and each pixel
// of a deformed frame is integrated over its area (Gauss–Legendre
// quadrature) at the material points that the inverse of the displacement
// map sends it to. Translations can also be rendered by the Fourier shift
// theorem.
//
// Coordinates are pixels of the reference image, origin at the centre of the
// top-left pixel, x to the right and y down. Stresses are in MPa, and the
// sign convention is tension positive; far-field loads are given as
// compressive magnitudes, as test frames report them.
package synth

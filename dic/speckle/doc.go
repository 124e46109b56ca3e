// Package speckle judges a speckle-painted face from one photo (and,
// optionally, a second photo of the same still face) before a test is run:
// exposure and clipping, contrast, the mean intensity gradient, the speckle
// size, the camera noise, and the displacement noise that subsets of each
// size can be expected to show.
//
// Definitions, with their sources:
//
//   - Mean intensity gradient (MIG): the mean over the image of the
//     gradient modulus |∇I| (Pan, Lu & Xie 2010, "Mean intensity gradient:
//     an effective global parameter for quality assessment of the speckle
//     patterns used in digital image correlation", Optics and Lasers in
//     Engineering 48(4):469–477). The gradient is the 3×3 Sobel operator
//     scaled by 1/8, so that it returns the slope of a linear ramp exactly;
//     the paper also uses a Sobel-type operator (from memory, not checked).
//     Border pixels, which have no full 3×3 neighbourhood, are left out.
//   - SSSIG: the sum of squared subset intensity gradients, the smaller of
//     its x and y sums, with the gradient of the B-spline interpolant at
//     the pixel centres (Pan et al. 2008, Optics Express 16(10):7037–7048),
//     exactly as subset.SSSIG computes it.
//   - Predicted displacement noise σ_u = √2·σ/√SSSIG for image noise σ in
//     both images (Pan et al. 2008; Wang, Sutton, Bruck & Schreier 2009,
//     "Quantitative error assessment in pattern matching", Strain
//     45(2):160–178), the median over a grid of subsets of each size.
//   - Speckle size: twice the correlation radius, the lag at which the
//     normalised autocorrelation of the image falls to 1/2, averaged over
//     the x and y axes (see correlationRadius). Characterising a pattern
//     by the width of its autocorrelation peak follows e.g. Bossuyt 2013,
//     "Optimized patterns for digital image correlation" (SEM Annual
//     Conference 2012 proceedings, vol. 3), whose abstract speaks of an
//     "autocorrelation peak sharpness radius" (his exact definition not
//     checked); the 1/2 level is our choice. Lecompte et al. 2006 (Optics
//     and Lasers in Engineering 44(11)) size speckles by morphology instead
//     (from memory). For Gaussian spots exp(−r²/R²) at low coverage the
//     autocorrelation is exp(−r²/2R²) and the speckle size is
//     2√(2 ln 2)·R ≈ 2.35 R, about the visible spot diameter; the
//     synthetic lab's flat-topped ink spots at 50 % coverage measure
//     2.6–2.8 R, as the exact model of that pattern predicts (see the
//     tests).
//   - Noise from a static pair: two photos of the same still face differ
//     by noise only, so σ = std(I1 − I2)/√2 (common practice, no source).
package speckle

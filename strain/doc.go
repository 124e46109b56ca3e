// Package strain turns displacement fields into strain fields and says how
// far to trust them: pointwise least-squares differentiation over a strain
// window (Pan et al. 2009), the strain measures and their principal values,
// the virtual strain gauge size, and the noise floor measured on static
// frames — and then finds where spalling or notching begins: each point's
// elastic baseline fitted on the calibration frames (baseline.go), the
// inelastic indicators (indicator.go), the localized zones of a frame and
// their sectors around the openings (zone.go, sector.go, geometry.go),
// zones followed from frame to frame and their onsets (finder.go,
// onset.go), and the Kirsch boundary-stress context of an onset
// (context.go).
//
// Sign convention: tension positive, compression negative. Shear exy is the
// tensor shear, half the engineering shear γxy; gamma_max is the
// engineering maximum shear e1 − e2. Positions and directions are in
// reference pixels, x right and y down, so a principal angle of +30° turns
// from +x towards +y (clockwise on screen).
package strain

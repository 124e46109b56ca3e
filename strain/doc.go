// Package strain turns displacement fields into strain fields and says how
// far to trust them: pointwise least-squares differentiation over a strain
// window (Pan et al. 2009), the strain measures and their principal values,
// the virtual strain gauge size, and the noise floor measured on static
// frames. Later stages find the localized zones where spalling or
// notching begins.
//
// Sign convention: tension positive, compression negative. Shear exy is the
// tensor shear, half the engineering shear γxy; gamma_max is the
// engineering maximum shear e1 − e2. Positions and directions are in
// reference pixels, x right and y down, so a principal angle of +30° turns
// from +x towards +y (clockwise on screen).
package strain

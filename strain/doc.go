// Package strain turns displacement fields into strain fields (pointwise
// least squares over a strain window), reports their noise floor, and finds
// the localized zones where spalling or notching begins and when.
package strain

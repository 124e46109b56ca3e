// Package similarity fits the rigid-body motion and the apparent isotropic
// magnification of a frame to a tracked field, and takes a magnification
// out of a field.
//
// A face that moves by w towards a camera at stand-off Z grows in the
// photo by Z/(Z − w) about the principal point: an apparent uniform strain
// of about w/Z in every direction (Sutton, Yan, Tiwari, Schreier and
// Orteu 2008, Optics and Lasers in Engineering 46, 746–757). A rigid,
// unloaded plate in view beside the specimen shows that magnification and
// nothing else; without one, the far field of the specimen shows it added
// to the specimen's own mean strain.
package similarity

package similarity

import (
	"fmt"

	"spallscope/dic"
	"spallscope/subset"
)

// Compensate takes the apparent magnification of a compensation plate out
// of a field that holds both the specimen and the plate: inPlate says
// which grid points are the plate's. It fits the plate's similarity
// (Fit), demagnifies the specimen's points about (cx, cy) by the plate's
// magnification (Demagnify) and returns them with the plate's points
// masked (the plate is no part of the specimen), with the plate's motion.
// It fails, naming the frame, when the plate has too few measured points.
func Compensate(f *dic.Field, inPlate func(x, y int) bool, cx, cy float64) (*dic.Field, Motion, error) {
	m, err := Fit(f, inPlate)
	if err != nil {
		return nil, m, fmt.Errorf("compensation plate: %w (is the plate in view, lit and speckled in every frame?)", err)
	}
	out := Demagnify(f, m.Magnification, cx, cy)
	for i := range out.Points {
		p := &out.Points[i]
		if inPlate(p.X, p.Y) {
			p.Status = subset.Masked
		}
	}
	return out, m, nil
}

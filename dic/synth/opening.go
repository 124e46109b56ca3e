package synth

import "spallscope/dic/region"

// Opening is an elliptical region of the face in reference pixels (a circle
// when Rx = Ry): an excavation in the specimen, rendered untextured, or a
// region where spalled material exposes fresh rock.
type Opening = region.Ellipse

// Circle returns a circular opening.
func Circle(cx, cy, r float64) Opening { return region.Circle(cx, cy, r) }

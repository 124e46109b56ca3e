package job

import (
	"fmt"

	"spallscope/cmd/spallscope/internal/stage"
	"spallscope/dic/lens"
)

// undistortOpenings puts the zone stage's openings, given as shapes on the
// photos, into the undistorted pixels of fields corrected for lens m, so
// that sectors and the Kirsch context sit where the openings are in the
// fields.
func undistortOpenings(st *stage.ZoneStage, m *lens.Model) error {
	for i, o := range st.Finder.Sectors.Openings {
		s, err := m.UndistortShape(o.Shape)
		if err != nil {
			return fmt.Errorf("openings[%d] through the lens: %w", i, err)
		}
		st.Finder.Sectors.Openings[i].Shape = s
	}
	return nil
}

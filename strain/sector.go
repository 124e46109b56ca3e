package strain

import "spallscope/dic/sector"

// Sector names the part of the rock around an opening (crown, invert,
// sidewalls, pillar; see package sector, whose rule the synthetic lab's
// truth uses too).
type Sector = sector.Sector

// The sectors, as package sector names them.
const (
	Crown         = sector.Crown
	Invert        = sector.Invert
	LeftSidewall  = sector.LeftSidewall
	RightSidewall = sector.RightSidewall
	Pillar        = sector.Pillar
	// Other is rock beyond the reach of every opening.
	Other = sector.Other
)

// Opening is an excavation in the specimen face, in reference px.
type Opening = sector.Opening

// Place is where a point lies: opening, sector and, in a pillar, the
// pillar's wall of that opening (sector.Place).
type Place = sector.Place

// Sectors assigns grid points to openings and sectors by the rule of
// sector.Layout (its fields and defaults): nearest opening wall within
// reach, crown/invert/sidewalls by direction, and the pillar between two
// openings — inside the convex hull of their equivalent circles, outside
// both.
type Sectors sector.Layout

// Effective returns the sectors with defaults in their zero fields (load
// axis 90°, crown half-angle 45°, reach 1), as they are applied.
func (s Sectors) Effective() Sectors { return Sectors(sector.Layout(s).Effective()) }

// Validate reports settings that cannot be used.
func (s Sectors) Validate() error { return sector.Layout(s).Validate() }

// Classify returns the opening (index into Openings, −1 if none) and the
// sector of reference point (x, y).
func (s Sectors) Classify(x, y float64) (int, Sector) { return sector.Layout(s).Classify(x, y) }

// Locate returns the place of reference point (x, y), with the pillar's
// wall for a pillar point.
func (s Sectors) Locate(x, y float64) Place { return sector.Layout(s).Locate(x, y) }

// LocateCell returns the place of the point (x, y) of a grid with spacing
// step px, the pillar reaching half a step beyond its outer tangents
// (sector.Layout.LocateCell): the rule for grid points and zones.
func (s Sectors) LocateCell(x, y, step float64) Place {
	return sector.Layout(s).LocateCell(x, y, step)
}

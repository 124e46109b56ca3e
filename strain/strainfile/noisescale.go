package strainfile

import (
	"bufio"
	"encoding/csv"
	"fmt"
	"math"
	"slices"
	"strconv"
	"strings"

	"spallscope/dic"
	"spallscope/dic/runfolder"
	"spallscope/strain"
)

// NoiseScaleCSV is the zones stage's record of the factor by which it
// raised each strain indicator's bar at each grid point (strain.Finder's
// NoiseScale: the point's noise over the calibration frames relative to
// the face's, at least 1), so that a truth scored against the run can
// apply the bar the run applied.
const NoiseScaleCSV = "noise_scale.csv"

// NoiseScaleHeader is the header of noise_scale.csv: the indicator, the
// grid point's row-major index and position (px), and its factor.
const NoiseScaleHeader = "indicator,point,x,y,scale"

// WriteNoiseScale writes each indicator's per-point factor on grid g (one
// row a point and indicator, indicators in strain.Indicators' order,
// values to the last digit, so that a reader applies exactly the run's
// bar), atomically. An error when a scale is not one value a grid point.
func WriteNoiseScale(path string, g dic.Grid, scale map[strain.Indicator][]float64) error {
	for ind, s := range scale {
		if len(s) != g.Len() {
			return fmt.Errorf("%s: %d noise scales of %s for the grid's %d points, expected one a point", path, len(s), ind, g.Len())
		}
	}
	return runfolder.WriteAtomic(path, func(w *bufio.Writer) error {
		cw := csv.NewWriter(w)
		cw.Write(strings.Split(NoiseScaleHeader, ","))
		for _, ind := range strain.Indicators {
			s, ok := scale[ind]
			if !ok {
				continue
			}
			for i, v := range s {
				x, y := g.Pos(i)
				cw.Write([]string{string(ind), strconv.Itoa(i), strconv.Itoa(x), strconv.Itoa(y), strconv.FormatFloat(v, 'g', -1, 64)})
			}
		}
		cw.Flush()
		return cw.Error()
	})
}

// ReadNoiseScale reads noise_scale.csv of a run on grid g. Every
// indicator it lists must be a strain indicator with one row for every
// grid point, at that point's position (a file of another grid is
// refused), and a finite factor of at least 1; errors name the file, the
// line and what was expected.
func ReadNoiseScale(path string, g dic.Grid) (map[strain.Indicator][]float64, error) {
	rows, err := runfolder.ReadCSV(path, NoiseScaleHeader, false)
	if err != nil {
		return nil, err
	}
	out := map[strain.Indicator][]float64{}
	seen := map[strain.Indicator][]bool{}
	for _, r := range rows {
		ind := strain.Indicator(r.Cells[0])
		if ind == strain.Decorrelation || !slices.Contains(strain.Indicators, ind) {
			return nil, fmt.Errorf("%s line %d: indicator %q, expected e1, e_eq or gamma_max", path, r.Line, r.Cells[0])
		}
		i, err := strconv.Atoi(r.Cells[1])
		if err != nil || i < 0 || i >= g.Len() {
			return nil, fmt.Errorf("%s line %d: point %q, expected a grid index 0 to %d", path, r.Line, r.Cells[1], g.Len()-1)
		}
		x, y := g.Pos(i)
		if r.Cells[2] != strconv.Itoa(x) || r.Cells[3] != strconv.Itoa(y) {
			return nil, fmt.Errorf("%s line %d: point %d at (%s, %s), expected the run's grid position (%d, %d)", path, r.Line, i, r.Cells[2], r.Cells[3], x, y)
		}
		v, err := strconv.ParseFloat(r.Cells[4], 64)
		if err != nil || math.IsNaN(v) || math.IsInf(v, 0) || v < 1 {
			return nil, fmt.Errorf("%s line %d: scale %q, expected a number of at least 1", path, r.Line, r.Cells[4])
		}
		if out[ind] == nil {
			out[ind], seen[ind] = make([]float64, g.Len()), make([]bool, g.Len())
		}
		if seen[ind][i] {
			return nil, fmt.Errorf("%s line %d: a second row for %s at point %d", path, r.Line, ind, i)
		}
		out[ind][i], seen[ind][i] = v, true
	}
	for _, ind := range strain.Indicators {
		for i, ok := range seen[ind] {
			if !ok {
				return nil, fmt.Errorf("%s: no row for %s at point %d, expected one for each of the grid's %d points", path, ind, i, g.Len())
			}
		}
	}
	return out, nil
}

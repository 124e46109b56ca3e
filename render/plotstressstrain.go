package render

import (
	"bufio"
	"errors"
	"fmt"
	"io/fs"
	"math"
	"path/filepath"
	"strconv"

	"gonum.org/v1/plot/vg/draw"

	"spallscope/dic/runfolder"
	"spallscope/strain/strainfile"
)

// VirtualGaugesCSV is the file, in the plots folder, of the virtual
// extensometer's and gauge's readings frame by frame.
const VirtualGaugesCSV = "virtual_gauges.csv"

// virtualReadings are the virtual extensometer's and gauge's readings of
// every frame (NaN where they read nothing), tension positive.
type virtualReadings struct {
	Extensometer Extensometer
	Gauge        Gauge
	Ext          []float64
	Mean         []float64
	MeanPoints   []int
	// HasStrain is false when the run has no strain files: the gauge then
	// reads nothing.
	HasStrain bool
}

// readVirtualGauges reads every frame's field (and strain, when the run
// has them) and takes the readings of the extensometer and gauge of opt,
// placing defaults on the reference field when they are not given.
func readVirtualGauges(r *runRecords, opt PlotOptions) (*virtualReadings, error) {
	if len(r.Axis.Names) == 0 {
		return nil, nil
	}
	ref, err := runfolder.ReadField(runfolder.FieldPath(r.Dir, r.Axis.Names[0]))
	if errors.Is(err, fs.ErrNotExist) {
		return nil, nil
	}
	if err != nil {
		return nil, err
	}
	v := &virtualReadings{Extensometer: opt.Extensometer, Gauge: opt.Gauge, HasStrain: true}
	if v.Extensometer.IsZero() {
		v.Extensometer = DefaultExtensometer(ref)
	}
	if v.Gauge.IsZero() {
		comp := v.Gauge.Component
		v.Gauge = DefaultGauge(ref)
		if comp != "" {
			v.Gauge.Component = comp
		}
	}
	if _, _, err := v.Extensometer.Ends(ref.Grid); err != nil {
		return nil, err
	}
	if _, err := v.Gauge.Points(ref.Grid); err != nil {
		return nil, err
	}
	for _, name := range r.Axis.Names {
		f, err := runfolder.ReadField(runfolder.FieldPath(r.Dir, name))
		if err != nil {
			return nil, err
		}
		e, _, err := v.Extensometer.Strain(f)
		if err != nil {
			return nil, fmt.Errorf("frame %s: %w", name, err)
		}
		v.Ext = append(v.Ext, e)
		mean, n := math.NaN(), 0
		if v.HasStrain {
			sf, err := strainfile.ReadStrain(strainfile.StrainPath(r.Dir, name))
			switch {
			case errors.Is(err, fs.ErrNotExist):
				v.HasStrain = false
			case err != nil:
				return nil, err
			default:
				if mean, n, err = v.Gauge.Mean(sf); err != nil {
					return nil, fmt.Errorf("frame %s: %w", name, err)
				}
			}
		}
		v.Mean, v.MeanPoints = append(v.Mean, mean), append(v.MeanPoints, n)
	}
	return v, writeVirtualGauges(r, v)
}

// writeVirtualGauges writes the readings to plots/virtual_gauges.csv:
// frame, time (s, empty when unknown), nominal stress (MPa, empty when
// unknown), extensometer strain, gauge mean and the gauge points that
// read, strains dimensionless and tension positive as in the strain files.
func writeVirtualGauges(r *runRecords, v *virtualReadings) error {
	path := filepath.Join(r.plotRoot(), PlotsDir, VirtualGaugesCSV)
	if err := mkdirPlots(r.plotRoot()); err != nil {
		return err
	}
	num := func(x float64) string {
		if !plotFinite(x) {
			return ""
		}
		return strconv.FormatFloat(x, 'g', 8, 64)
	}
	return runfolder.WriteAtomic(path, func(w *bufio.Writer) error {
		fmt.Fprintf(w, "# extensometer %s; gauge %s\n", v.Extensometer, v.Gauge)
		w.WriteString("frame,time_s,stress_MPa,extensometer,gauge_mean,gauge_points\n")
		for k, name := range r.Axis.Names {
			t := math.NaN()
			if r.Axis.Timed {
				t = r.Axis.X[k]
			}
			fmt.Fprintf(w, "%s,%s,%s,%s,%s,%d\n", name, num(t), num(r.Axis.Stress[k]), num(v.Ext[k]), num(v.Mean[k]), v.MeanPoints[k])
		}
		return nil
	})
}

// plotStressStrain draws the nominal stress against the virtual
// extensometer's and gauge's strains, compression positive as rock
// mechanics plots it (shortening to the right). Without frame stresses it
// draws the strains against time (or frame) instead.
func plotStressStrain(r *runRecords, v *virtualReadings) (Figure, bool, error) {
	if v == nil {
		return Figure{}, false, nil
	}
	neg := func(xs []float64) []float64 {
		out := make([]float64, len(xs))
		for i, x := range xs {
			out[i] = -1e6 * x
		}
		return out
	}
	ext, gauge := neg(v.Ext), neg(v.Mean)
	extName := "extensometer " + v.Extensometer.String()
	gaugeName := "gauge " + v.Gauge.String()
	var fig Figure
	var err error
	if r.Axis.HasStress() {
		p := newPlot("Stress against virtual extensometer and gauge", "strain, µε (compression positive)", "nominal stress, MPa")
		exy, gxy := finiteXYs(ext, r.Axis.Stress), finiteXYs(gauge, r.Axis.Stress)
		if len(exy) == 0 && len(gxy) == 0 {
			return Figure{}, false, nil
		}
		if xy := exy; len(xy) > 0 {
			if err := addSeries(p, xy, plotColour(0), draw.CircleGlyph{}, false, extName); err != nil {
				return Figure{}, false, fmt.Errorf("stress–strain plot: %w", err)
			}
		}
		if xy := gxy; len(xy) > 0 {
			if err := addSeries(p, xy, plotColour(2), draw.BoxGlyph{}, true, gaugeName); err != nil {
				return Figure{}, false, fmt.Errorf("stress–strain plot: %w", err)
			}
		}
		p.Y.Min = math.Min(p.Y.Min, 0)
		caption := fmt.Sprintf("Nominal stress against the strain of a virtual extensometer %s (change of the distance between its two grid points over their reference distance) and the mean %s of a virtual gauge over %s, compression positive; readings in %s/%s.",
			v.Extensometer, v.Gauge.component(), v.Gauge.Rect(), PlotsDir, VirtualGaugesCSV)
		fig, err = writeFigure(r.plotRoot(), "stress_strain", "Stress against virtual extensometer and gauge", caption, p.Draw)
	} else {
		p := newPlot("Virtual extensometer and gauge", r.Axis.Label(), "strain, µε (compression positive)")
		exy, gxy := finiteXYs(r.Axis.X, ext), finiteXYs(r.Axis.X, gauge)
		if len(exy) == 0 && len(gxy) == 0 {
			return Figure{}, false, nil
		}
		if xy := exy; len(xy) > 0 {
			if err := addSeries(p, xy, plotColour(0), draw.CircleGlyph{}, false, extName); err != nil {
				return Figure{}, false, fmt.Errorf("virtual gauge plot: %w", err)
			}
		}
		if xy := gxy; len(xy) > 0 {
			if err := addSeries(p, xy, plotColour(2), draw.BoxGlyph{}, true, gaugeName); err != nil {
				return Figure{}, false, fmt.Errorf("virtual gauge plot: %w", err)
			}
		}
		caption := fmt.Sprintf("Strain of a virtual extensometer %s and mean %s of a virtual gauge over %s, compression positive (the run has no frame stresses to plot them against); readings in %s/%s.",
			v.Extensometer, v.Gauge.component(), v.Gauge.Rect(), PlotsDir, VirtualGaugesCSV)
		fig, err = writeFigure(r.plotRoot(), "virtual_gauges", "Virtual extensometer and gauge", caption, p.Draw)
	}
	return fig, err == nil, err
}

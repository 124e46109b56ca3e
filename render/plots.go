package render

// PlotOptions place the virtual instruments of the plots; zero values take
// the defaults of DefaultExtensometer and DefaultGauge.
type PlotOptions struct {
	Extensometer Extensometer
	Gauge        Gauge
}

// WritePlots draws every plot the run folder dir has data for into
// dir/plots/, each as PNG and SVG, and returns them in report order:
//
//   - stress_time: nominal stress against time with the onsets by sector
//     and class, their 95 % intervals and triggers, and the peak (needs a
//     load log or frame stresses);
//   - onset_histories: per onset, its zone's indicator history with the
//     threshold, the back-dated onset, its interval and the trigger
//     (needs onset.json with histories);
//   - zones_area, zones_peak: area and peak strain of the largest zones,
//     frame by frame (needs zones.csv);
//   - sectors_peak: the largest zone peak per sector, frame by frame;
//   - stress_strain (or virtual_gauges without stresses): a virtual
//     extensometer and a virtual strain gauge (needs the fields; the gauge
//     needs the strain files), whose readings go to plots/virtual_gauges.csv;
//   - noise_floor: the resolution per quantity (needs static frames);
//   - magnification: each frame's apparent magnification, from the
//     compensation plate or the far field (needs run.json's motion).
//
// A plot whose data the run lacks is left out; an unreadable file is an
// error naming it.
func WritePlots(dir string, opt PlotOptions) ([]Figure, error) {
	r, err := readRunRecords(dir)
	if err != nil {
		return nil, err
	}
	figs, _, err := writeRunPlots(r, opt)
	return figs, err
}

// writeRunPlots draws the plots of r and returns them with the virtual
// gauges' readings (nil without fields).
func writeRunPlots(r *runRecords, opt PlotOptions) ([]Figure, *virtualReadings, error) {
	var figs []Figure
	add := func(f Figure, ok bool, err error) error {
		if ok {
			figs = append(figs, f)
		}
		return err
	}
	for _, draw := range []func(*runRecords) (Figure, bool, error){plotStressTime, plotOnsetHistories, plotStressAE, plotZoneAreas, plotZonePeaks, plotSectorHistories} {
		if err := add(draw(r)); err != nil {
			return nil, nil, err
		}
	}
	v, err := readVirtualGauges(r, opt)
	if err != nil {
		return nil, nil, err
	}
	if err := add(plotStressStrain(r, v)); err != nil {
		return nil, nil, err
	}
	if err := add(plotNoiseFloor(r)); err != nil {
		return nil, nil, err
	}
	if err := add(plotMagnification(r)); err != nil {
		return nil, nil, err
	}
	return figs, v, nil
}

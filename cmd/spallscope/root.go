package main

import "github.com/spf13/cobra"

func newRoot() *cobra.Command {
	root := &cobra.Command{
		Use:   "spallscope",
		Short: "Strain fields and fracture onset from photos of speckled rock specimens",
		Long: `spallscope turns the photos of a compression test on a speckle-painted
specimen into displacement and strain fields, overlays and the time, place
and stress at which fracturing around openings began.

Measured fields are test results, not design values; support design belongs
to licensed engineers under local codes.`,
		Version:       version,
		SilenceUsage:  true,
		SilenceErrors: true,
	}
	root.AddCommand(newSynthCmd(), newInspectCmd(), newCalibrateCmd(), newTrackCmd(), newStrainCmd(), newZonesCmd(), newRunCmd(), newBatchCmd(), newClusterCmd(), newExportCmd(), newRenderCmd(), newReportCmd(), newCompareCmd(), newPatternCmd(), newBenchCmd(), newDemoCmd())
	return root
}

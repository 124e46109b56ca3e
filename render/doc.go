// Package render draws what a lab puts in its test report: strain overlays
// on the photos, colour bars, videos, plots and the HTML report.
//
// Overlays: a field on its measurement grid (GridValues) is sampled at the
// photo's pixels — bilinearly inside cells whose four corners are measured,
// up to half a step around the measured points at the edges, never inside
// openings (interp*.go) — coloured through a perceptually uniform map
// (viridis for magnitudes, Moreland's cool to warm for signed quantities,
// colormap*.go) between limits that are by default robust percentiles of
// the whole sequence (limits.go), and blended into the gray photo (Overlay,
// overlay.go). A side panel carries the colour bar, unit, limits, the
// frame's time and nominal stress, a scale bar and the legend of zone
// outlines and onset badges (annotate*.go). Run draws every frame of a run
// folder and the video (video.go).
//
// Plots and report: WritePlots draws the run's histories with gonum/plot
// into RUN/plots/ as PNG and SVG (plot*.go): nominal stress with the
// onsets, their 95 % intervals as shaded boxes and their triggers, each
// onset's indicator history (small multiples with the threshold, the
// back-dated onset, its interval and the trigger), zone areas and peaks,
// the largest peak per sector, stress against a virtual extensometer and
// gauge (Extensometer, Gauge) and the noise floor. WriteReport writes
// RUN/report.html through html/template (report*.go, page*.go,
// templates/): cautions, job, settings and resolution, the detection limit
// in words, onsets (one line each: onset, interval, trigger) with the
// Kirsch boundary-stress comparison below them, a frame slider over
// RUN/overlays/*.png starting at the first onset, and the plots.
// WriteFacesPage writes the page of a test with several faces: their
// onsets on the load log's clock, the timeline (WriteTimeline) and the
// face reports side by side. The page's style and few lines of
// script are inline; images are referenced by paths relative to the page
// (keep it with the run folder) or, with Embed, carried as data URIs in the
// one file. It loads nothing from the network.
//
// Drawing conventions: reference pixels, x right, y down; strain tension
// positive (the stress–strain plot alone shows compression positive, as
// rock mechanics plots it, and says so on its axis). Overlays show what was measured and how it is drawn, nothing
// more.
package render

// Package render draws what a lab puts in its test report: strain overlays
// on the photos, colour bars, videos, plots and the HTML report.
package render

// Package plots draws the pictures of an analysis as PNG files with
// gonum/plot: histograms with the preload window, safety-factor histograms,
// reliability curves and comparison overlays. It takes plain result structs
// and knows nothing of the joint model.
package plots

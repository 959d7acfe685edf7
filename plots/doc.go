// Package plots draws the pictures of an analysis as PNG files with
// gonum/plot: histograms with the preload window, safety-factor histograms
// and their lower tails on a log scale (exceedance), reliability curves
// and comparison overlays. It takes plain result structs and knows nothing
// of the joint model.
//
// A failure mode looks the same in every picture: take its colour, dash
// and marker from [ModeStyle] with the mode's key (set Key on a [Curve],
// [Group], [Marker], [HistSpec] or [ExceedanceSpec]). [PNG] lays out any
// plot: it wraps a long title, and draws the legend beside or below the
// axes, never over the data.
package plots

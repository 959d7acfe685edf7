// Package rng holds the random streams of the tool: the derivation of one
// PCG stream per unit of work from the run's seed, and the variates read
// straight from a stream (ziggurat standard normals, open-interval
// uniforms, a table-driven exponential for lognormal draws).
package rng

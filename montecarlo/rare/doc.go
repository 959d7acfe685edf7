// Package rare holds rare-event estimators in standard-normal space that
// stay right for series systems: design points, importance sampling from a
// defensive mixture at every component's design point, and subset
// simulation.
package rare

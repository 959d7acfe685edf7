// Package montecarlo samples the uncertain inputs of a joint, evaluates the
// deterministic model once per sample, and estimates the probability of each
// failure mode with confidence bounds.
//
// # Reproducibility
//
// Samples come in chunks of fixed size. Chunk i draws from its own PCG stream
// whose two seed words are a SplitMix64 hash of (seed, i), so the same seed
// gives bit-identical results for any number of workers.
//
// # Distributions
//
// [Dist] wraps gonum's stat/distuv for moments, CDF and quantiles; samples are
// drawn by transforming one standard normal or one uniform variate so that the
// hot loop calls no interface and allocates nothing, and so that a Gaussian
// copula can correlate any pair of inputs.
package montecarlo

package rng

import "math/rand/v2"

// StreamSeed hashes (seed, stream) into the two PCG seed words with
// SplitMix64 (Steele, Lea & Flood, OOPSLA 2014), so that neighbouring
// streams and seeds give unrelated sequences. NewPCG takes its two words as
// the raw state, so raw (seed, stream) pairs would give related streams.
//
// Every random draw of the tool comes from a stream named by the run's seed
// and an index of the unit of work (a chunk of samples, a level of subset
// simulation, …), never by the worker that happens to run it: results are
// the same for any number of workers. The derivation is part of the
// reproducibility contract; changing it changes every seeded result.
func StreamSeed(seed, stream uint64) (uint64, uint64) {
	a := splitmix(seed ^ splitmix(stream+0x632be59bd9b4e019))
	return a, splitmix(a ^ 0xd1b54a32d192ed03)
}

// Seed seeds p as stream number stream of the run with the given seed.
func Seed(p *rand.PCG, seed, stream uint64) { p.Seed(StreamSeed(seed, stream)) }

// Derive returns the seed of a family of streams set apart from the chunk
// streams of the same run (for example the pilot, or a stage of an
// estimator), by hashing the run's seed with a purpose tag.
func Derive(seed, purpose uint64) uint64 {
	return splitmix(seed ^ splitmix(purpose^0x9e6c63d0676a9a99))
}

func splitmix(x uint64) uint64 {
	x += 0x9e3779b97f4a7c15
	x = (x ^ (x >> 30)) * 0xbf58476d1ce4e5b9
	x = (x ^ (x >> 27)) * 0x94d049bb133111eb
	return x ^ (x >> 31)
}

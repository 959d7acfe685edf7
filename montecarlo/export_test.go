package montecarlo

import (
	"testing"

	"boltrisk/model"
)

// BenchChunks lets the external benchmarks (which may load scenarios) time
// one worker on chunks of p, binning one chunk in stride.
func BenchChunks(b *testing.B, p *Problem, modes []model.Mode, stride int64) {
	benchChunks(b, p, modes, stride)
}

// BinStride is binStride for the external benchmarks.
func BinStride(samples int64) int64 { return binStride(samples) }

package montecarlo

// Coordinate describes coordinate i of a sample row: the input's path, its
// bolt (−1 for a shared input or a shared part) and whether it is the
// shared part of a per-bolt input (a normal, not an input value).
func (k *Kernel) Coordinate(i int) (path string, bolt int, part bool) { return k.coordinate(i) }

// BlockLen is the number of rows a crude pass draws at once (part of the
// reproducibility contract): a driver that draws blocks of this length
// from the chunk streams sees the samples of a crude run.
func (k *Kernel) BlockLen() int { return blockLen(k.Dim()) }

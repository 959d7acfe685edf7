package rare

import (
	"fmt"
	"runtime"
	"slices"
)

// Problem is a limit-state problem in standard-normal space: Dim independent
// standard-normal coordinates u and Components limit states g_c(u);
// component c fails when g_c(u) ≤ 0.
type Problem struct {
	Dim        int     // number of independent standard-normal coordinates
	Components int     // number of component limit states g_c(u)
	Events     []Event // events to estimate, each a union of components; the union of all components ([AnyEvent]) is always estimated as well, after them
	// Support[c] lists the coordinates g_c depends on (nil or empty = all);
	// design-point searches differentiate only those. Optional.
	Support [][]int
	// Symmetry describes exchangeable blocks of coordinates (a joint of
	// identical bolts). Optional; it is trusted, not checked by evaluation.
	Symmetry *Symmetry
	// NewEvaluator returns an evaluator for one worker goroutine; it is
	// called once per worker.
	NewEvaluator func() Evaluator
}

// Event is a union of components: it occurs when any of them fails.
type Event struct {
	Name       string
	Components []int
}

// Evaluator evaluates the component limit states.
type Evaluator interface {
	// Eval evaluates every component at n points: u holds n rows of Dim
	// coordinates, g receives n rows of Components values. A point outside
	// the model's domain has NaN in every component (it is counted as
	// invalid, never as failed).
	Eval(u []float64, n int, g []float64)
}

// Symmetry describes exchangeable coordinate blocks: coordinates
// [0, Shared) are common to all blocks; Count blocks of Block coordinates
// follow, block b holding [Shared + b·Block, Shared + (b+1)·Block).
// Map[b][c] is the component that component c becomes when block 0 and
// block b are swapped (Map[0][c] = c), so that
//
//	g_{Map[b][c]}(swap_b(u)) = g_c(u).
type Symmetry struct {
	Shared, Block, Count int
	Map                  [][]int
}

// AnyEvent is the name of the union of all components. Its result comes
// last, after the results of Problem.Events.
const AnyEvent = "any"

// Validate reports the first inconsistency of p, naming the field.
func (p *Problem) Validate() error {
	if p == nil {
		return fmt.Errorf("rare: Problem is nil")
	}
	if p.Dim < 1 {
		return fmt.Errorf("rare: Problem.Dim is %d; it must be at least 1", p.Dim)
	}
	if p.Components < 1 {
		return fmt.Errorf("rare: Problem.Components is %d; it must be at least 1", p.Components)
	}
	if p.NewEvaluator == nil {
		return fmt.Errorf("rare: Problem.NewEvaluator is nil; it must return one Evaluator per worker")
	}
	names := map[string]bool{}
	for i, e := range p.Events {
		if e.Name == "" {
			return fmt.Errorf("rare: Problem.Events[%d].Name is empty", i)
		}
		if e.Name == AnyEvent {
			return fmt.Errorf("rare: Problem.Events[%d].Name is %q, which is reserved for the union of all components", i, e.Name)
		}
		if names[e.Name] {
			return fmt.Errorf("rare: Problem.Events[%d].Name %q is used twice", i, e.Name)
		}
		names[e.Name] = true
		if len(e.Components) == 0 {
			return fmt.Errorf("rare: Problem.Events[%d] (%q) lists no components", i, e.Name)
		}
		seen := map[int]bool{}
		for _, c := range e.Components {
			if c < 0 || c >= p.Components {
				return fmt.Errorf("rare: Problem.Events[%d] (%q) lists component %d; components are 0…%d", i, e.Name, c, p.Components-1)
			}
			if seen[c] {
				return fmt.Errorf("rare: Problem.Events[%d] (%q) lists component %d twice", i, e.Name, c)
			}
			seen[c] = true
		}
	}
	if len(p.Support) != 0 && len(p.Support) != p.Components {
		return fmt.Errorf("rare: Problem.Support has %d entries; it must be empty or have one per component (%d)", len(p.Support), p.Components)
	}
	for c, s := range p.Support {
		seen := map[int]bool{}
		for _, i := range s {
			if i < 0 || i >= p.Dim {
				return fmt.Errorf("rare: Problem.Support[%d] lists coordinate %d; coordinates are 0…%d", c, i, p.Dim-1)
			}
			if seen[i] {
				return fmt.Errorf("rare: Problem.Support[%d] lists coordinate %d twice", c, i)
			}
			seen[i] = true
		}
	}
	if s := p.Symmetry; s != nil {
		if s.Shared < 0 || s.Block < 1 || s.Count < 2 {
			return fmt.Errorf("rare: Problem.Symmetry has Shared %d, Block %d, Count %d; it needs Shared ≥ 0, Block ≥ 1, Count ≥ 2", s.Shared, s.Block, s.Count)
		}
		if s.Shared+s.Block*s.Count != p.Dim {
			return fmt.Errorf("rare: Problem.Symmetry covers %d coordinates (Shared + Block·Count); Problem.Dim is %d", s.Shared+s.Block*s.Count, p.Dim)
		}
		if len(s.Map) != s.Count {
			return fmt.Errorf("rare: Problem.Symmetry.Map has %d rows; it needs one per block (%d)", len(s.Map), s.Count)
		}
		for b, m := range s.Map {
			if len(m) != p.Components {
				return fmt.Errorf("rare: Problem.Symmetry.Map[%d] has %d entries; it needs one per component (%d)", b, len(m), p.Components)
			}
			for c, d := range m {
				if d < 0 || d >= p.Components {
					return fmt.Errorf("rare: Problem.Symmetry.Map[%d][%d] is %d; components are 0…%d", b, c, d, p.Components-1)
				}
				if b == 0 && d != c {
					return fmt.Errorf("rare: Problem.Symmetry.Map[0][%d] is %d; Map[0] must be the identity", c, d)
				}
				if m[d] != c {
					return fmt.Errorf("rare: Problem.Symmetry.Map[%d] is not a swap: component %d maps to %d, which maps to %d", b, c, d, m[d])
				}
			}
		}
		if _, err := symmetryPlan(p); err != nil {
			return err
		}
	}
	return nil
}

// target is one estimated event: a listed event or the union of all.
type target struct {
	name  string
	comps []int
	// same is the index of an earlier target with the same component set
	// (−1 if none): subset simulation runs it once.
	same int
}

// targets returns the listed events followed by the union of all components.
func (p *Problem) targets() []target {
	ts := make([]target, 0, len(p.Events)+1)
	for _, e := range p.Events {
		ts = append(ts, target{name: e.Name, comps: slices.Clone(e.Components), same: -1})
	}
	all := make([]int, p.Components)
	for c := range all {
		all[c] = c
	}
	ts = append(ts, target{name: AnyEvent, comps: all, same: -1})
	for i := range ts {
		si := slices.Sorted(slices.Values(ts[i].comps))
		for j := range i {
			if slices.Equal(si, slices.Sorted(slices.Values(ts[j].comps))) {
				ts[i].same = j
				break
			}
		}
	}
	return ts
}

// support returns the coordinates g_c depends on.
func (p *Problem) support(c int) []int {
	if c < len(p.Support) && len(p.Support[c]) > 0 {
		return p.Support[c]
	}
	all := make([]int, p.Dim)
	for i := range all {
		all[i] = i
	}
	return all
}

// symmetryPlan returns, for each component, the component whose design
// point is searched and the block b whose swap with block 0 maps it there
// (−1, −1 for a searched component itself: entry [c] = {c, 0}).
func symmetryPlan(p *Problem) ([][2]int, error) {
	plan := make([][2]int, p.Components)
	for c := range plan {
		plan[c] = [2]int{-1, -1}
	}
	s := p.Symmetry
	if s == nil {
		for c := range plan {
			plan[c] = [2]int{c, 0}
		}
		return plan, nil
	}
	for c := range p.Components {
		if plan[c][0] >= 0 {
			continue
		}
		orbit := map[int]bool{}
		for b := range s.Count {
			orbit[s.Map[b][c]] = true
		}
		// A shared component is invariant; a component of one block has an
		// orbit of one component per block. (With Count = 2 a component of
		// block 1 also qualifies; swapping with block 1 maps it just as well.)
		if len(orbit) != 1 && len(orbit) != s.Count {
			continue // a component of block b > 0: reached from block 0's
		}
		plan[c] = [2]int{c, 0}
		for b := 1; b < s.Count; b++ {
			if d := s.Map[b][c]; d != c && plan[d][0] < 0 {
				plan[d] = [2]int{c, b}
			}
		}
	}
	for c := range plan {
		if plan[c][0] < 0 {
			return nil, fmt.Errorf("rare: Problem.Symmetry.Map: component %d is neither shared (mapped to itself by every swap) nor the image of a block-0 component", c)
		}
	}
	return plan, nil
}

// swapBlocks writes into dst the point u with blocks 0 and b exchanged.
func (s *Symmetry) swapBlocks(dst, u []float64, b int) {
	copy(dst, u)
	if b == 0 {
		return
	}
	o0, ob := s.Shared, s.Shared+b*s.Block
	for i := range s.Block {
		dst[o0+i], dst[ob+i] = u[ob+i], u[o0+i]
	}
}

// workers returns the number of worker goroutines for a setting of n.
func workers(n int) int {
	if n > 0 {
		return n
	}
	return runtime.GOMAXPROCS(0)
}

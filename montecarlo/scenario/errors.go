package scenario

import (
	"fmt"
	"sort"
	"strings"
)

// Error is a scenario problem, located as precisely as the input allows.
type Error struct {
	File  string
	Line  int
	Field string
	Value string
	Msg   string
}

func (e *Error) Error() string {
	var b strings.Builder
	if e.File != "" {
		b.WriteString(e.File)
		if e.Line > 0 {
			fmt.Fprintf(&b, ":%d", e.Line)
		}
		b.WriteString(": ")
	} else if e.Line > 0 {
		fmt.Fprintf(&b, "line %d: ", e.Line)
	}
	if e.Field != "" {
		b.WriteString(e.Field)
		if e.Value != "" {
			fmt.Fprintf(&b, " = %q", e.Value)
		}
		b.WriteString(": ")
	}
	b.WriteString(e.Msg)
	return b.String()
}

// suggest returns " (did you mean "x"?)" for the nearest candidate within
// a small edit distance, or "" when none is close.
func suggest(s string, candidates []string) string {
	best, bestD := "", 1<<30
	for _, c := range candidates {
		d := editDistance(strings.ToLower(s), strings.ToLower(c))
		if d < bestD {
			best, bestD = c, d
		}
	}
	limit := 2
	if len(s) > 8 {
		limit = 3
	}
	if best != "" && bestD <= limit {
		return fmt.Sprintf(" (did you mean %q?)", best)
	}
	return ""
}

// editDistance is the Levenshtein distance between a and b.
func editDistance(a, b string) int {
	ra, rb := []rune(a), []rune(b)
	prev := make([]int, len(rb)+1)
	cur := make([]int, len(rb)+1)
	for j := range prev {
		prev[j] = j
	}
	for i := 1; i <= len(ra); i++ {
		cur[0] = i
		for j := 1; j <= len(rb); j++ {
			cost := 1
			if ra[i-1] == rb[j-1] {
				cost = 0
			}
			cur[j] = min(prev[j]+1, cur[j-1]+1, prev[j-1]+cost)
		}
		prev, cur = cur, prev
	}
	return prev[len(rb)]
}

func joinOr(s []string) string {
	s = append([]string(nil), s...)
	sort.Strings(s)
	if len(s) <= 1 {
		return strings.Join(s, "")
	}
	return strings.Join(s[:len(s)-1], ", ") + " or " + s[len(s)-1]
}

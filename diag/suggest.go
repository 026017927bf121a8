package diag

// Distance returns the Levenshtein edit distance between a and b, counted
// in bytes, or max+1 as soon as it must exceed max (so that comparing one
// name against a million stays cheap).
func Distance(a, b string, max int) int {
	if d := len(a) - len(b); d > max || -d > max {
		return max + 1
	}
	// Rows on the stack for names of ordinary length: a floating net is
	// compared against every net of the design, so this is a hot loop.
	var rows [2][48]int
	prev, cur := rows[0][:], rows[1][:]
	if len(b)+1 <= len(rows[0]) {
		prev, cur = prev[:len(b)+1], cur[:len(b)+1]
	} else {
		prev, cur = make([]int, len(b)+1), make([]int, len(b)+1)
	}
	for j := range prev {
		prev[j] = j
	}
	for i := 1; i <= len(a); i++ {
		cur[0] = i
		best := cur[0]
		for j := 1; j <= len(b); j++ {
			cost := 1
			if a[i-1] == b[j-1] {
				cost = 0
			}
			cur[j] = min(prev[j]+1, cur[j-1]+1, prev[j-1]+cost)
			best = min(best, cur[j])
		}
		if best > max {
			return max + 1
		}
		prev, cur = cur, prev
	}
	return prev[len(b)]
}

// Suggest returns the candidate closest to name within a small edit
// distance (1 for short names, 2 from five bytes on), or "" when none is
// close. Ties go to the candidate first in byte order, so that the answer
// does not depend on the order of the candidates (nets listed in the
// order a design's statements name them, say). name itself is never
// suggested.
func Suggest(name string, candidates []string) string {
	max := 1
	if len(name) >= 5 {
		max = 2
	}
	if len(name) < 2 {
		return ""
	}
	best, bestD := "", max+1
	for _, c := range candidates {
		if c == name {
			continue
		}
		if d := Distance(name, c, max); d < bestD || d == bestD && c < best {
			best, bestD = c, d
		}
	}
	return best
}

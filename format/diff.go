package format

import (
	"bytes"
	"fmt"
	"strings"
)

// maxDiffCells bounds the table of the longest-common-subsequence diff
// (lines of one side times lines of the other, after the common head and
// tail are set aside). Past it the changed middle is shown as removed and
// added as a whole, which is still a correct diff, only a longer one.
const maxDiffCells = 4 << 20

// Diff returns a unified diff (three lines of context) that turns a into
// b, with name in the headers, or nil when they are equal.
func Diff(name string, a, b []byte) []byte {
	if bytes.Equal(a, b) {
		return nil
	}
	x, y := splitLines(a), splitLines(b)
	ops := editScript(x, y)
	var out bytes.Buffer
	fmt.Fprintf(&out, "--- %s (as written)\n+++ %s (formatted)\n", name, name)
	const context = 3
	for i := 0; i < len(ops); {
		if ops[i].op == ' ' {
			i++
			continue
		}
		// A hunk: from context lines before the change to context lines
		// after the last change that is at most 2*context lines further.
		start := max(i-context, 0)
		end := i
		for j := i; j < len(ops); j++ {
			if ops[j].op != ' ' {
				end = j + 1
			} else if j-end >= 2*context {
				break
			}
		}
		end = min(end+context, len(ops))
		la, lb := ops[start].a, ops[start].b
		na, nb := 0, 0
		for _, o := range ops[start:end] {
			if o.op != '+' {
				na++
			}
			if o.op != '-' {
				nb++
			}
		}
		fmt.Fprintf(&out, "@@ -%s +%s @@\n", hunkRange(la, na), hunkRange(lb, nb))
		for _, o := range ops[start:end] {
			out.WriteByte(o.op)
			out.WriteString(o.text)
			out.WriteByte('\n')
		}
		i = end
	}
	return out.Bytes()
}

func hunkRange(start, n int) string {
	if n == 0 {
		return fmt.Sprintf("%d,0", start)
	}
	return fmt.Sprintf("%d,%d", start+1, n)
}

// edit is one line of an edit script: ' ' kept, '-' removed, '+' added;
// a and b count the lines of each side before it.
type edit struct {
	op   byte
	text string
	a, b int
}

func splitLines(s []byte) []string {
	if len(s) == 0 {
		return nil
	}
	l := strings.Split(string(s), "\n")
	if l[len(l)-1] == "" {
		l = l[:len(l)-1]
	}
	return l
}

// editScript returns the lines of x and y as kept, removed and added,
// keeping a longest common subsequence when the table for it is small
// enough.
func editScript(x, y []string) []edit {
	var ops []edit
	ia, ib := 0, 0
	keep := func() { ops = append(ops, edit{' ', x[ia], ia, ib}); ia++; ib++ }
	del := func() { ops = append(ops, edit{'-', x[ia], ia, ib}); ia++ }
	add := func() { ops = append(ops, edit{'+', y[ib], ia, ib}); ib++ }
	head := 0
	for head < len(x) && head < len(y) && x[head] == y[head] {
		head++
	}
	tail := 0
	for tail < len(x)-head && tail < len(y)-head && x[len(x)-1-tail] == y[len(y)-1-tail] {
		tail++
	}
	for range head {
		keep()
	}
	mx, my := x[head:len(x)-tail], y[head:len(y)-tail]
	n, m := len(mx), len(my)
	if n*m <= maxDiffCells {
		// lcs[i][j]: the longest common subsequence of mx[i:] and my[j:].
		lcs := make([]int32, (n+1)*(m+1))
		at := func(i, j int) int32 { return lcs[i*(m+1)+j] }
		for i := n - 1; i >= 0; i-- {
			for j := m - 1; j >= 0; j-- {
				v := max(at(i+1, j), at(i, j+1))
				if mx[i] == my[j] {
					v = at(i+1, j+1) + 1
				}
				lcs[i*(m+1)+j] = v
			}
		}
		i, j := 0, 0
		for i < n && j < m {
			switch {
			case mx[i] == my[j]:
				keep()
				i, j = i+1, j+1
			case at(i+1, j) >= at(i, j+1):
				del()
				i++
			default:
				add()
				j++
			}
		}
		for ; i < n; i++ {
			del()
		}
		for ; j < m; j++ {
			add()
		}
	} else {
		for range n {
			del()
		}
		for range m {
			add()
		}
	}
	for range tail {
		keep()
	}
	return ops
}

package config

import "strings"

// keyLines finds the line of every key in a TOML text, as dotted keys
// ("rules.floating-net"), and of every table header ("rules"). The TOML
// library reports positions only for syntax and type errors; this scan
// gives the checks made after decoding a line to point at. It understands
// table headers, bare and quoted keys, dotted keys and multi-line arrays,
// which is all nodal.toml needs; a key it cannot place gets its table's
// line (see lineOf).
func keyLines(src []byte) map[string]int {
	out := map[string]int{}
	table := ""
	depth := 0 // open brackets of a multi-line array
	for i, line := range strings.Split(string(src), "\n") {
		n := i + 1
		s := strings.TrimSpace(line)
		if depth > 0 {
			depth += bracketDelta(s)
			continue
		}
		if s == "" || s[0] == '#' {
			continue
		}
		if s[0] == '[' {
			end := strings.LastIndex(s, "]")
			if end < 0 {
				continue
			}
			table = joinKey(parseKey(strings.Trim(s[:end+1], "[]")))
			if _, ok := out[table]; !ok {
				out[table] = n
			}
			continue
		}
		eq := keyEnd(s)
		if eq < 0 {
			continue
		}
		key := joinKey(parseKey(s[:eq]))
		if table != "" {
			key = table + "." + key
		}
		if _, ok := out[key]; !ok {
			out[key] = n
		}
		depth = bracketDelta(s[eq+1:])
	}
	return out
}

// lineOf returns the line of key, or of the nearest table that holds it,
// or 0.
func lineOf(lines map[string]int, key string) int {
	for {
		if n, ok := lines[key]; ok {
			return n
		}
		i := strings.LastIndex(key, ".")
		if i < 0 {
			return 0
		}
		key = key[:i]
	}
}

// keyEnd returns the index of the "=" that ends the key part of s, outside
// quotes, or -1.
func keyEnd(s string) int {
	var q byte
	for i := 0; i < len(s); i++ {
		c := s[i]
		switch {
		case q != 0:
			if c == q {
				q = 0
			}
		case c == '"' || c == '\'':
			q = c
		case c == '=':
			return i
		}
	}
	return -1
}

// parseKey splits a dotted key, removing quotes and blanks.
func parseKey(s string) []string {
	var parts []string
	var cur strings.Builder
	var q byte
	for i := 0; i < len(s); i++ {
		c := s[i]
		switch {
		case q != 0:
			if c == q {
				q = 0
			} else {
				cur.WriteByte(c)
			}
		case c == '"' || c == '\'':
			q = c
		case c == '.':
			parts = append(parts, strings.TrimSpace(cur.String()))
			cur.Reset()
		case c == ' ' || c == '\t':
		default:
			cur.WriteByte(c)
		}
	}
	return append(parts, strings.TrimSpace(cur.String()))
}

func joinKey(p []string) string { return strings.Join(p, ".") }

// bracketDelta counts [ minus ] outside strings and comments.
func bracketDelta(s string) int {
	d := 0
	var q byte
	for i := 0; i < len(s); i++ {
		c := s[i]
		switch {
		case q != 0:
			if c == q {
				q = 0
			}
		case c == '"' || c == '\'':
			q = c
		case c == '#':
			return d
		case c == '[':
			d++
		case c == ']':
			d--
		}
	}
	return d
}

package main

// includelines.go: the lines of staged .nodal files that may hold an
// include, found by one "git grep" over the index, so that a hook in a
// repository of thousands of designs follows includes without reading
// every file.

import (
	"bufio"
	"bytes"
	"errors"
	"fmt"
	"io"
	"os/exec"
	"strings"
)

// stagedIncludeLines returns, for every staged .nodal file with a line
// that contains "include", those lines (each ending in a newline), keyed
// by repository path. check.Includes reads them as it reads a whole file.
func stagedIncludeLines(root string) (map[string][]byte, error) {
	cmd := exec.Command("git", "-c", "grep.lineNumber=false", "-c", "grep.column=false",
		"grep", "--cached", "--full-name", "--no-color", "-I", "-z", "-F", "-e", "include", "--", "*.nodal")
	cmd.Dir = root
	var stderr bytes.Buffer
	cmd.Stderr = &stderr
	out, err := cmd.Output()
	var exit *exec.ExitError
	if errors.As(err, &exit) && exit.ExitCode() == 1 && stderr.Len() == 0 {
		return map[string][]byte{}, nil // no line matches
	}
	if err != nil {
		msg := strings.TrimSpace(stderr.String())
		if msg == "" {
			msg = err.Error()
		}
		return nil, fmt.Errorf("git grep: %s", msg)
	}
	return parseGrepZ(out)
}

// parseGrepZ reads "path\x00line\n" records.
func parseGrepZ(out []byte) (map[string][]byte, error) {
	lines := map[string][]byte{}
	r := bufio.NewReader(bytes.NewReader(out))
	for {
		p, err := r.ReadString(0)
		if err == io.EOF && p == "" {
			return lines, nil
		}
		if err != nil {
			return nil, fmt.Errorf("git grep: unexpected output")
		}
		line, err := r.ReadBytes('\n')
		if err != nil && err != io.EOF {
			return nil, err
		}
		if len(line) == 0 || line[len(line)-1] != '\n' {
			line = append(line, '\n')
		}
		p = p[:len(p)-1]
		lines[p] = append(lines[p], line...)
	}
}

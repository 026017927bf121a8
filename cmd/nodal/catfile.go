package main

// catfile.go: one "git cat-file --batch" process that reads objects by
// name, shared by the staged check (names ":path") and nodal diff (blob
// ids), so that however many files are read, git is started once.

import (
	"bufio"
	"errors"
	"fmt"
	"io"
	"os/exec"
	"strconv"
	"strings"
	"sync"

	"nodal/input"
)

// errNoObject is returned by catFile.read for a name git does not find
// ("missing" or "ambiguous"); errNotBlob for an object that is no file.
var (
	errNoObject = errors.New("no such object")
	errNotBlob  = errors.New("not a file")
)

// catFile reads objects through one git cat-file --batch process; it is
// safe for concurrent use.
type catFile struct {
	mu  sync.Mutex
	cmd *exec.Cmd
	in  io.WriteCloser
	out *bufio.Reader
}

func openCatFile(root string) (*catFile, error) {
	cmd := exec.Command("git", "cat-file", "--batch")
	cmd.Dir = root
	in, err := cmd.StdinPipe()
	if err != nil {
		return nil, err
	}
	out, err := cmd.StdoutPipe()
	if err != nil {
		return nil, err
	}
	if err := cmd.Start(); err != nil {
		return nil, fmt.Errorf("git cat-file: %w", err)
	}
	return &catFile{cmd: cmd, in: in, out: bufio.NewReaderSize(out, 1<<16)}, nil
}

// read returns the content of the blob git finds under name (an object id,
// or ":path" for the index), errNoObject or errNotBlob, or a
// *input.TooLargeError when it is larger than max. The name must hold no
// newline: the batch protocol is one name a line.
func (c *catFile) read(name string, max int64) ([]byte, error) {
	c.mu.Lock()
	defer c.mu.Unlock()
	if _, err := fmt.Fprintf(c.in, "%s\n", name); err != nil {
		return nil, fmt.Errorf("git cat-file: %w", err)
	}
	header, err := c.out.ReadString('\n')
	if err != nil {
		return nil, fmt.Errorf("git cat-file: %w", err)
	}
	// "<name> missing" (or "ambiguous") repeats the name asked for, which
	// may hold spaces; a found object's line is "<id> <type> <size>".
	h := strings.TrimSuffix(header, "\n")
	if strings.HasSuffix(h, " missing") || strings.HasSuffix(h, " ambiguous") {
		return nil, errNoObject
	}
	fields := strings.Fields(h)
	if len(fields) != 3 {
		return nil, fmt.Errorf("git cat-file: unexpected answer %q", h)
	}
	size, err := strconv.ParseInt(fields[2], 10, 64)
	if err != nil || size < 0 {
		return nil, fmt.Errorf("git cat-file: bad header %q", h)
	}
	if fields[1] != "blob" || size > max {
		// Skipped unread, so the next answer starts where it should.
		if _, err := io.CopyN(io.Discard, c.out, size+1); err != nil {
			return nil, fmt.Errorf("git cat-file: %w", err)
		}
		if fields[1] != "blob" {
			return nil, errNotBlob
		}
		return nil, &input.TooLargeError{Size: size, Limit: max}
	}
	buf := make([]byte, size+1) // content and its trailing newline
	if _, err := io.ReadFull(c.out, buf); err != nil {
		return nil, fmt.Errorf("git cat-file: %w", err)
	}
	return buf[:size], nil
}

func (c *catFile) Close() error {
	c.in.Close()
	return c.cmd.Wait()
}

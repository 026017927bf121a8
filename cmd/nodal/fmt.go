package main

import (
	"bytes"
	"errors"
	"fmt"
	flag "github.com/spf13/pflag"
	"io"
	"os"
	"path/filepath"

	"nodal/format"
)

const fmtUsage = `Usage: nodal fmt [flags] [PATH ...]

Lays out .nodal files in the canonical form: consecutive part statements
aligned in columns, one space elsewhere, comments kept where they are,
blank lines kept but not doubled, quantities kept as written. Only the
blanks between tokens change, so the design means exactly what it meant.
A line that does not parse is kept as written.

Without flags the formatted text is printed. Folders are searched for
*.nodal files as "nodal check" does (default: the current folder); "-"
formats standard input.

  -w        rewrite the files that change, in place
  --check   print a diff of what would change and exit 1 if anything would

Exit status: 0 done (with --check: nothing to change), 1 a file would
change (--check only), 2 usage or I/O trouble.

Flags:
`

// maxFormatBytes bounds a file nodal fmt reads: the formatter holds the
// text, its layout and, for --check, a diff.
const maxFormatBytes = 256 << 20

func cmdFmt(args []string, stdin io.Reader, stdout, stderr io.Writer) int {
	fl := flag.NewFlagSet("fmt", flag.ContinueOnError)
	fl.SetOutput(stderr)
	write := fl.BoolP("w", "w", false, "rewrite the files that change, in place")
	checkOnly := fl.Bool("check", false, "print a diff and exit 1 when a file is not formatted")
	if status, done := parseFlags(fl, args, fmtUsage, stdout, stderr); done {
		return status
	}
	if *write && *checkOnly {
		return usageErr(stderr, "fmt: -w and --check do not go together")
	}
	paths := fl.Args()
	if len(paths) == 0 {
		paths = []string{"."}
	}
	files, _, status := collect(paths, stderr)
	if *write && contains(files, "-") {
		return usageErr(stderr, "fmt: -w cannot rewrite standard input")
	}
	changed := false
	for _, name := range files {
		var src []byte
		var err error
		if name == "-" {
			src, err = io.ReadAll(io.LimitReader(stdin, maxFormatBytes+1))
			if err == nil && len(src) > maxFormatBytes {
				err = fmt.Errorf("standard input is larger than %d MB", maxFormatBytes>>20)
			}
			name = "<stdin>"
		} else {
			src, err = readRegular(name)
		}
		if err != nil {
			fmt.Fprintf(stderr, "nodal: %v\n", err)
			status = 2
			continue
		}
		out := format.Source(src)
		switch {
		case *checkOnly:
			if d := format.Diff(name, src, out); d != nil {
				changed = true
				stdout.Write(d)
			}
		case *write:
			if bytes.Equal(src, out) {
				continue
			}
			if err := writeAtomic(name, out); err != nil {
				fmt.Fprintf(stderr, "nodal: %v\n", err)
				status = 2
			}
		default:
			stdout.Write(out)
		}
	}
	if status == 0 && changed {
		status = 1
	}
	return status
}

// readRegular reads a regular file of at most maxFormatBytes; a link, a
// device or a pipe is refused.
func readRegular(name string) ([]byte, error) {
	info, err := os.Lstat(name)
	if err != nil {
		return nil, err
	}
	if !info.Mode().IsRegular() {
		return nil, fmt.Errorf("%s: not a regular file", name)
	}
	if info.Size() > maxFormatBytes {
		return nil, fmt.Errorf("%s: larger than %d MB", name, maxFormatBytes>>20)
	}
	f, err := os.Open(name)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	src, err := io.ReadAll(io.LimitReader(f, maxFormatBytes+1))
	if err == nil && len(src) > maxFormatBytes {
		err = fmt.Errorf("%s: larger than %d MB", name, maxFormatBytes>>20)
	}
	return src, err
}

// writeAtomic replaces the regular file name with data: a temporary file
// in the same folder is written, synced and given name's mode, then
// renamed over name. A crash or a full disk leaves either the old file or
// the new one, never a part of either.
func writeAtomic(name string, data []byte) (err error) {
	info, err := os.Lstat(name)
	if err != nil {
		return err
	}
	if !info.Mode().IsRegular() {
		return fmt.Errorf("%s: not a regular file", name)
	}
	dir := filepath.Dir(name)
	tmp, err := os.CreateTemp(dir, "."+filepath.Base(name)+".*.tmp")
	if err != nil {
		return err
	}
	defer func() {
		if err != nil {
			tmp.Close()
			os.Remove(tmp.Name())
		}
	}()
	if _, err = tmp.Write(data); err != nil {
		return err
	}
	if err = tmp.Chmod(info.Mode().Perm()); err != nil {
		return err
	}
	if err = tmp.Sync(); err != nil {
		return err
	}
	if err = tmp.Close(); err != nil {
		return err
	}
	if err = os.Rename(tmp.Name(), name); err != nil {
		return err
	}
	// Make the rename itself durable; a folder that cannot be synced
	// still holds the new file.
	if d, derr := os.Open(dir); derr == nil {
		if serr := d.Sync(); serr != nil && !errors.Is(serr, os.ErrInvalid) {
			d.Close()
			return nil
		}
		d.Close()
	}
	return nil
}

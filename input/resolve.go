package input

// resolve.go: follow a path's symbolic links one component at a time.

import (
	"errors"
	"io/fs"
	"os"
	"path/filepath"
	"strings"
	"syscall"
)

// resolve follows every symbolic link in the clean absolute path abs, one
// component at a time, the way the operating system would. It returns the
// resolved path and whether it exists. When a component is missing, the
// result is the resolved part followed by the rest as written, so that a
// caller can still tell whether the path leads outside a root: a dangling
// link to an outside path resolves outside, the same as a live one.
func resolve(abs string) (string, bool, error) {
	vol := filepath.VolumeName(abs)
	sep := string(filepath.Separator)
	top := vol + sep
	done := top
	rest := split(abs[len(vol):])
	links := 0
	for len(rest) > 0 {
		c := rest[0]
		rest = rest[1:]
		switch c {
		case "", ".":
			continue
		case "..":
			done = filepath.Dir(done)
			continue
		}
		next := filepath.Join(done, c)
		info, err := os.Lstat(next)
		if err != nil {
			if errors.Is(err, fs.ErrNotExist) || errors.Is(err, syscall.ENOTDIR) {
				return filepath.Join(append([]string{next}, rest...)...), false, nil
			}
			return "", false, err
		}
		if info.Mode()&fs.ModeSymlink == 0 {
			done = next
			continue
		}
		links++
		if links > maxLinks {
			return "", false, errors.New("too many levels of symbolic links")
		}
		target, err := os.Readlink(next)
		if err != nil {
			return "", false, err
		}
		if filepath.IsAbs(target) {
			tv := filepath.VolumeName(target)
			done = tv + sep
			target = target[len(tv):]
		}
		rest = append(split(target), rest...)
	}
	return done, true, nil
}

func split(p string) []string {
	return strings.FieldsFunc(p, func(r rune) bool { return r == '/' || r == filepath.Separator })
}

// openNoWait opens a file for reading without waiting for a writer should
// it be a pipe.
func openNoWait(path string) (*os.File, error) {
	return os.OpenFile(path, os.O_RDONLY|syscall.O_NONBLOCK, 0)
}

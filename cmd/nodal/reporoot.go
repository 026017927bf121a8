package main

// reporoot.go: the top level of the work tree found without starting git,
// where the layout leaves no doubt, so that a check of one file does not
// wait for a process to be told what the folders already say. Anything
// out of the ordinary is left to git.

import (
	"errors"
	"io/fs"
	"os"
	"path/filepath"
	"strings"
	"syscall"
)

// errNoRepository says that no folder from the current one up holds a .git
// entry and git's environment points nowhere else: git would find no work
// tree either.
var errNoRepository = errors.New("not inside a git repository")

// gitEnv lists the environment variables that change where git finds the
// repository or its work tree; with any of them set, git is asked.
var gitEnv = []string{"GIT_DIR", "GIT_WORK_TREE", "GIT_COMMON_DIR", "GIT_CEILING_DIRECTORIES", "GIT_DISCOVERY_ACROSS_FILESYSTEM", "GIT_CONFIG_PARAMETERS", "GIT_CONFIG_COUNT"}

// worktreeRoot returns what gitRoot(".") returns: the top level of the work
// tree holding the current folder, with its links resolved as git names
// it, and the current folder's path inside it. It walks up from the
// current folder for .git. A plain .git folder of the current user, whose
// config moves or removes no work tree, settles it, and so does the .git
// file of a work tree added by "git worktree add" to such a repository; no .git at all, with
// no git variable set, is errNoRepository; everything else (a submodule's
// .git file, a config with core.worktree, bare or
// includes, another owner, an unreadable folder) is asked of git.
func worktreeRoot() (root, prefix string, err error) {
	if lay, ok, none := fastRoot(); ok {
		return lay.root, lay.prefix, nil
	} else if none {
		return "", "", errNoRepository
	}
	return gitRoot(".")
}

// gitLayout is where fastRoot found the work tree and its repository.
type gitLayout struct {
	root   string // the work tree's top level, links resolved
	prefix string // the current folder's path inside it ("" or "sub/dir/")
	gitDir string // the folder of the work tree's own files: its index
	common string // the repository's folder: its config
}

// fastRoot finds the root without git: ok when found for certain, none
// when there is certainly no work tree; neither when git must decide.
func fastRoot() (lay gitLayout, ok, none bool) {
	for _, v := range gitEnv {
		if _, set := os.LookupEnv(v); set {
			return lay, false, false
		}
	}
	cwd, err := os.Getwd()
	if err != nil {
		return lay, false, false
	}
	// git walks up the physical path of the current folder.
	real, err := filepath.EvalSymlinks(cwd)
	if err != nil {
		return lay, false, false
	}
	for _, c := range strings.Split(filepath.ToSlash(real), "/") {
		if c == ".git" {
			return lay, false, false // inside a repository's own folder: no work tree there
		}
	}
	for d := real; ; {
		dotgit := filepath.Join(d, ".git")
		info, err := os.Lstat(dotgit)
		switch {
		case err == nil:
			lay.gitDir, lay.common = dotgit, dotgit
			if !plainGitDir(dotgit, info) {
				var linked bool
				if lay.gitDir, lay.common, linked = linkedWorktree(dotgit, info); !linked {
					return gitLayout{}, false, false
				}
			}
			rel, err := filepath.Rel(d, real)
			if err != nil {
				return gitLayout{}, false, false
			}
			if rel != "." {
				lay.prefix = filepath.ToSlash(rel) + "/"
			}
			lay.root = d
			return lay, true, false
		case !errors.Is(err, fs.ErrNotExist):
			return lay, false, false
		}
		up := filepath.Dir(d)
		if up == d {
			return lay, false, true
		}
		d = up
	}
}

// plainGitDir reports whether .git at p is an ordinary repository folder
// whose work tree is the folder holding it: a folder (not a link or a
// gitfile) owned by the current user, with HEAD, objects and refs, and a
// config that sets no work tree, no bare flag and includes no other file.
func plainGitDir(p string, info fs.FileInfo) bool {
	if !info.IsDir() {
		return false
	}
	if st, ok := info.Sys().(*syscall.Stat_t); !ok || int(st.Uid) != os.Getuid() {
		return false
	}
	for _, name := range []string{"HEAD", "objects", "refs"} {
		if _, err := os.Lstat(filepath.Join(p, name)); err != nil {
			return false
		}
	}
	cfg, err := os.ReadFile(filepath.Join(p, "config"))
	if err != nil || len(cfg) > 1<<20 {
		return false
	}
	c := strings.ToLower(string(cfg))
	for _, word := range []string{"worktree", "bare", "include"} {
		if strings.Contains(c, word) && !(word == "bare" && onlyFalse(c, "bare")) {
			return false
		}
	}
	return true
}

// onlyFalse reports whether every line of a lower-cased config that
// names key is "key = false", as git init writes "bare = false".
func onlyFalse(c, key string) bool {
	for _, line := range strings.Split(c, "\n") {
		if !strings.Contains(line, key) {
			continue
		}
		if strings.Join(strings.Fields(line), "") != key+"=false" {
			return false
		}
	}
	return true
}

// linkedWorktree reports whether .git at p is the file "git worktree add"
// writes: a regular file of one "gitdir:" line naming a folder of the
// repository's worktrees with HEAD and a commondir leading to a plain
// repository folder (plainGitDir). The work tree is then the folder
// holding the file. A submodule's .git file names a folder without
// commondir and is left to git. It returns the work tree's git folder
// (gitdir) and the repository's (common).
func linkedWorktree(p string, info fs.FileInfo) (gitdir, common string, ok bool) {
	if !info.Mode().IsRegular() || info.Size() > 4096 {
		return "", "", false
	}
	b, err := os.ReadFile(p)
	if err != nil {
		return "", "", false
	}
	line, ok := strings.CutPrefix(strings.TrimRight(string(b), "\n"), "gitdir: ")
	if !ok || line == "" || strings.ContainsAny(line, "\n\r") {
		return "", "", false
	}
	gd := filepath.FromSlash(line)
	if !filepath.IsAbs(gd) {
		gd = filepath.Join(filepath.Dir(p), gd)
	}
	if filepath.Base(filepath.Dir(gd)) != "worktrees" {
		return "", "", false
	}
	if _, err := os.Lstat(filepath.Join(gd, "HEAD")); err != nil {
		return "", "", false
	}
	cd, err := os.ReadFile(filepath.Join(gd, "commondir"))
	if err != nil || len(cd) > 4096 {
		return "", "", false
	}
	common = filepath.FromSlash(strings.TrimRight(string(cd), "\n"))
	if common == "" || strings.ContainsAny(common, "\n\r") {
		return "", "", false
	}
	if !filepath.IsAbs(common) {
		common = filepath.Join(gd, common)
	}
	ci, err := os.Lstat(common)
	if err != nil || !plainGitDir(common, ci) {
		return "", "", false
	}
	return gd, common, true
}

package lsp

import (
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strings"
	"testing"
)

// luaBlock is the Neovim set-up in docs/editors.md: the test runs it as
// written.
var luaBlock = regexp.MustCompile("(?s)```lua\n(.*?)```")

const probe = `local ok = vim.wait(20000, function() return #vim.diagnostic.get(0) > 0 end, 50)
local lines = { vim.bo.filetype, tostring(ok) }
for _, d in ipairs(vim.diagnostic.get(0)) do
  table.insert(lines, string.format('%d:%d:%d:%s:%s', d.lnum, d.col, d.severity, tostring(d.source), d.message))
end
-- Hover on R1 (line 4, byte 9) and formatting, through Neovim's client.
vim.api.nvim_win_set_cursor(0, { 4, 9 })
local hover = vim.lsp.buf_request_sync(0, 'textDocument/hover', vim.lsp.util.make_position_params(), 10000)
for _, r in pairs(hover or {}) do
  if r.result then table.insert(lines, 'hover:' .. r.result.contents.value:gsub('\n', ' ')) end
end
vim.api.nvim_buf_set_lines(0, 2, 3, false, { 'source V1 (vin,gnd) 5 V rated 100 mA' })
vim.lsp.buf.formatting_sync(nil, 10000)
table.insert(lines, 'formatted:' .. vim.api.nvim_buf_get_lines(0, 2, 3, false)[1])
vim.fn.writefile(lines, os.getenv('OUT'))
vim.cmd('qa!')
`

// TestNeovim drives the real Neovim, headless, with the set-up of
// docs/editors.md: it opens a design with a floating net and must
// receive the finding from "nodal lsp" through Neovim's own client.
func TestNeovim(t *testing.T) {
	nvim, err := exec.LookPath("nvim")
	if err != nil {
		t.Skip("nvim is not installed (apt-get install neovim); the end-to-end test with Neovim's LSP client is skipped")
	}
	doc, err := os.ReadFile("../docs/editors.md")
	if err != nil {
		t.Fatal(err)
	}
	m := luaBlock.FindSubmatch(doc)
	if m == nil {
		t.Fatal("docs/editors.md has no lua block for Neovim")
	}
	dir := t.TempDir()
	bin := filepath.Join(dir, "bin")
	build := exec.Command("go", "build", "-o", filepath.Join(bin, "nodal"), "nodal/cmd/nodal")
	if out, err := build.CombinedOutput(); err != nil {
		t.Fatalf("go build: %v\n%s", err, out)
	}
	work := filepath.Join(dir, "work")
	os.MkdirAll(filepath.Join(work, ".git"), 0o755)
	os.WriteFile(filepath.Join(work, "init.lua"), m[1], 0o644)
	os.WriteFile(filepath.Join(work, "probe.lua"), []byte(probe), 0o644)
	os.WriteFile(filepath.Join(work, "pad.nodal"), []byte(floating), 0o644)
	rtp, _ := filepath.Abs("../editors/vim")
	out := filepath.Join(dir, "out")
	cmd := exec.Command(nvim, "--headless", "-u", "init.lua", "-i", "NONE", "-n", "--cmd", "set rtp^="+rtp, "pad.nodal", "-c", "luafile probe.lua")
	cmd.Dir = work
	cmd.Env = append(os.Environ(), "OUT="+out, "PATH="+bin+string(os.PathListSeparator)+os.Getenv("PATH"),
		"HOME="+dir, "XDG_CONFIG_HOME="+dir, "XDG_DATA_HOME="+dir, "XDG_STATE_HOME="+dir, "XDG_CACHE_HOME="+dir)
	if b, err := cmd.CombinedOutput(); err != nil {
		t.Fatalf("nvim: %v\n%s", err, b)
	}
	b, err := os.ReadFile(out)
	if err != nil {
		t.Fatal(err)
	}
	lines := strings.Split(strings.TrimSpace(string(b)), "\n")
	if len(lines) < 3 || lines[0] != "nodal" || lines[1] != "true" {
		t.Fatalf("Neovim saw file type, diagnostics: %q", lines)
	}
	// Line 5 of the file (4 from 0), "probe" at byte 18; severity 2 is a
	// warning in Neovim's numbering.
	want := "4:18:2:nodal:net probe touches only one pin"
	if !strings.HasPrefix(lines[2], want) {
		t.Errorf("diagnostic %q, want %q…", lines[2], want)
	}
	all := strings.Join(lines, "\n")
	// R1: 5 V across 1 kΩ is 5 mA and 25 mW (Ohm's law).
	if !strings.Contains(all, "hover:**R1**") || !strings.Contains(all, "25\\.0 mW") {
		t.Errorf("no hover on R1 through Neovim:\n%s", all)
	}
	if lines[len(lines)-1] != "formatted:source   V1 (vin, gnd)   5 V   rated 100 mA" {
		t.Errorf("formatting through Neovim:\n%s", all)
	}
}

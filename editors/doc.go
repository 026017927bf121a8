// Package editors holds nodal's editor support files and their tests; it
// has no Go code of its own.
//
// # Vim and Neovim
//
// vim/ is a runtime package: ftdetect (*.nodal is file type nodal),
// syntax (highlighting groups named nodal*, linked to the standard
// groups), ftplugin (comments, two-space indentation, the compiler) and
// compiler (makeprg runs "nodal check" on the file; errorformat keeps each
// finding's severity and drops every other line, such as the summary).
//
// # TextMate grammar
//
// textmate/nodal.tmLanguage.json is a grammar of plain match rules, for
// editors that read TextMate grammars. Its regular expressions keep to
// what Oniguruma and Go's RE2 read alike, so the tests apply it here.
//
// # Tests
//
// The Vim tests run the real Vim and Neovim headless when they are
// installed and skip with a message otherwise; .ci/run installs them
// where it can. docs/editors.md shows the set-ups.
package editors

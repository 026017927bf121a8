package review

// escape.go: user text — file, part and net names, messages that quote
// them — made safe for the forms the comparison is written in. Text
// output keeps one finding on one line with control characters escaped
// (output.LineSafe, output.PathSafe); Markdown puts every piece of user
// text in a code span, where no HTML, link, image, emphasis or @mention
// is recognised (output.MarkdownCode).

import "nodal/output"

// oneLine is output.LineSafe: s on one line, control characters escaped.
func oneLine(s string) string { return output.LineSafe(s) }

// pathSafe is output.PathSafe, for a file name at the start of a line.
func pathSafe(name string) string { return output.PathSafe(name) }

// code returns s as a Markdown code span fit for a table cell, as the
// rest of nodal's Markdown writes user text (output.MarkdownCode).
func code(s string) string { return output.MarkdownCode(s) }

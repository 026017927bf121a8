package output

import (
	"bufio"
	"fmt"
	"io"
	"strconv"

	"github.com/fatih/color"

	"nodal/diag"
)

// writeText writes one GNU line per finding:
//
//	file:line:col: severity: message [rule]
//
// The file name and the message are shown with TextSafe, so a finding is
// always exactly one line.
func writeText(w io.Writer, r *Report, opt Options) error {
	bw := bufio.NewWriter(w)
	for i := range r.Findings {
		f := &r.Findings[i]
		bw.WriteString(position(PathSafe(f.File), f.Line, f.Column))
		bw.WriteString(": ")
		sev := f.Severity.String()
		if opt.Color {
			sev = severityColor(f.Severity).Sprint(sev)
		}
		bw.WriteString(sev)
		bw.WriteString(": ")
		bw.WriteString(TextSafe(f.Message))
		if f.Rule != "" {
			fmt.Fprintf(bw, " [%s]", f.Rule)
		}
		bw.WriteByte('\n')
	}
	return bw.Flush()
}

// position is diag.Position's String form: "file:line:col", or the file
// alone when no line is known.
func position(file string, line, col int) string {
	if file == "" {
		file = "-"
	}
	if line <= 0 {
		return file
	}
	return file + ":" + strconv.Itoa(line) + ":" + strconv.Itoa(col)
}

func severityColor(s diag.Severity) *color.Color {
	c := color.New(color.FgCyan)
	switch s {
	case diag.Error:
		c = color.New(color.FgRed, color.Bold)
	case diag.Warning:
		c = color.New(color.FgYellow)
	}
	c.EnableColor()
	return c
}

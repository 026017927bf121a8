package review

// sarif.go: the comparison as a SARIF 2.1.0 log whose results carry
// baselineState (§3.27.24): the later revision's findings as new,
// unchanged or updated, and the earlier revision's fixed findings as
// absent, with their positions in the earlier revision.

import (
	"io"

	"nodal/output"
)

// WriteSARIF writes the findings of every changed or added design as one
// SARIF log, in the form "nodal check --format sarif" writes, with
// baselineState on each result and the same partialFingerprints.
func (c *Comparison) WriteSARIF(w io.Writer, opt output.Options) error {
	rep := &output.Report{Source: c.Sources, BaseSource: c.BaseSources}
	for i := range c.Designs {
		d := &c.Designs[i]
		if d.Status != Removed {
			rep.Files++
		}
		for _, fc := range d.Findings {
			rep.Findings = append(rep.Findings, fc.Finding)
		}
	}
	return output.Write(w, "sarif", rep, opt)
}

package circuit

import (
	"strings"

	"nodal/diag"
	"nodal/grammar"
	"nodal/units"
)

// Fixes the builder attaches to its findings, for editors to offer: the
// kind's unit after a number written without one, and M where "meg" was
// written for mega.

// reportFix is report with the edits that would resolve the finding.
func (b *builder) reportFix(fixes []diag.Fix, code Code, pos, end diag.Pos, format string, args ...any) {
	b.fixes = fixes
	b.report(code, pos, end, format, args...)
}

// unitFix writes the unit of dim after a bare number that ends at end.
func unitFix(end diag.Pos, dim units.Dim) []diag.Fix {
	if dim == units.None || !end.IsValid() {
		return nil
	}
	sym := dim.Symbol()
	return []diag.Fix{{Message: "write the unit: " + sym, Edits: []diag.Edit{{Pos: end, End: end, NewText: " " + sym}}}}
}

// megFix replaces "meg" inside a number written with it glued on
// ("1meg", "2.2megohm"): M for mega, and the unit of dim when none
// follows.
func (b *builder) megFix(v *grammar.Value, dim units.Dim) []diag.Fix {
	if v.Num == "" || dim == units.None {
		return nil
	}
	i := strings.Index(strings.ToLower(v.Num), "meg")
	if i < 0 {
		return nil
	}
	num, ok := v.NumStart(b.srcs[b.file])
	if !ok {
		return nil
	}
	from := b.pos(num + grammar.Offset(i))
	to := b.pos(num + grammar.Offset(len(v.Num)))
	rest := v.Num[i+3:]
	text := "M" + rest
	if rest == "" && v.Unit == "" {
		text = " M" + dim.Symbol()
	}
	return []diag.Fix{{Message: "write M for mega", Edits: []diag.Edit{{Pos: from, End: to, NewText: text}}}}
}

// megWordFix replaces a "meg" word written after a bare number ("1 meg",
// "1 megohm") with M and the unit of dim.
func (b *builder) megWordFix(pt *grammar.Part, dim units.Dim) []diag.Fix {
	w := unitWord(pt)
	if dim == units.None || !strings.HasPrefix(strings.ToLower(w), "meg") {
		return nil
	}
	from, to := b.attrSpan(pt.Attrs[0])
	rest := w[3:]
	if rest == "" {
		rest = dim.Symbol()
	}
	return []diag.Fix{{Message: "write M for mega", Edits: []diag.Edit{{Pos: from, End: to, NewText: "M" + rest}}}}
}

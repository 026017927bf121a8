package circuit

// scopeeval.go: expressions and parameter names evaluated in the scope of
// the statement being elaborated (package-level Eval does the arithmetic).

import (
	"fmt"

	"nodal/diag"
	"nodal/grammar"
	"nodal/units"
)

// eval evaluates an expression value in the current scope.
func (b *builder) eval(v *grammar.Value) (units.Quantity, error) {
	sc := b.sc
	look := func(name string) (units.Quantity, bool) { return units.Quantity{}, false }
	if sc != nil && sc.blk != nil && sc.blk.parIndex != nil {
		look = func(name string) (units.Quantity, bool) {
			j, ok := sc.blk.parIndex[name]
			if !ok {
				return units.Quantity{}, false
			}
			if j >= len(sc.env) || !sc.env[j].set {
				panic(unboundParam{})
			}
			return sc.env[j].q, true
		}
	}
	q, err := evalGuarded(v, look)
	if err == nil {
		return q, nil
	}
	ee, ok := err.(*ExprError)
	if !ok {
		return q, err
	}
	if ee.Code == CodeUnknownParam {
		if sc == nil || sc.blk == nil || sc.blk.isTop {
			ee.Msg += "; only a block's statements can use parameters"
		} else {
			names := make([]string, len(sc.blk.params))
			for i := range sc.blk.params {
				names[i] = sc.blk.params[i].name
			}
			if s := diag.Suggest(ee.Name, names); s != "" {
				ee.Msg += fmt.Sprintf(" in block %s; did you mean %s?", sc.blk.name, s)
			} else {
				ee.Msg += fmt.Sprintf(" in block %s; its parameters are %s", sc.blk.name, paramList(sc.blk))
			}
		}
	}
	if ee.Code != NoCode && v.Expr != nil {
		ee.Msg = b.exprText(v) + ": " + ee.Msg
	}
	return q, ee
}

// unboundParam stops an evaluation that uses a parameter whose own value
// was already reported as wrong.
type unboundParam struct{}

func evalGuarded(v *grammar.Value, look Lookup) (q units.Quantity, err error) {
	defer func() {
		if r := recover(); r != nil {
			if _, ok := r.(unboundParam); !ok {
				panic(r)
			}
			err = &ExprError{}
		}
	}()
	return EvalValue(v, look)
}

// exprText quotes an expression value as written, from its opening
// parenthesis to the one that closes it: "((12 V - vdrop) / i)".
func (b *builder) exprText(v *grammar.Value) string {
	if t, ok := v.ExprSource(b.srcs[b.file]); ok {
		return t
	}
	return "(…)"
}

package circuit

import (
	"fmt"
	"math"

	"nodal/grammar"
	"nodal/units"
)

// ExprError is an expression that cannot be evaluated. Code is the rule it
// is reported under: CodeParamUnit for units that do not fit together,
// CodeBadValue for a division by zero or a result too large to represent,
// CodeUnknownParam for a name that is not a parameter in scope; NoCode
// when the trouble has been reported already.
type ExprError struct {
	Code Code
	Msg  string
	Pos  grammar.Offset // the offending part of the expression
	Name string
}

func (e *ExprError) Error() string { return e.Msg }

// Lookup finds the value of a parameter by name.
type Lookup func(name string) (units.Quantity, bool)

// Eval evaluates an expression with units checked: sums need operands of one
// dimension, products and quotients combine dimensions (a voltage divided by
// a current is a resistance). A percentage is a plain number that remembers
// it was written with %: it may be added to a percentage, or multiplied or
// divided by a plain number.
func Eval(e *grammar.Expr, look Lookup) (units.Quantity, error) {
	q, err := evalExpr(e, look)
	if err != nil {
		return q, err
	}
	if math.IsInf(q.Value, 0) || math.IsNaN(q.Value) {
		return q, &ExprError{Code: CodeBadValue, Msg: "the result is too large to represent", Pos: e.Start()}
	}
	return q, nil
}

// EvalValue evaluates a value that names a parameter (rtop) or holds an
// expression ((2 * rtop)); other values are read by the builder itself.
func EvalValue(v *grammar.Value, look Lookup) (units.Quantity, error) {
	if v.Param != nil {
		return evalRef(v.Param, look)
	}
	return Eval(v.Expr, look)
}

func evalExpr(e *grammar.Expr, look Lookup) (units.Quantity, error) {
	acc, err := evalTerm(e.First, look)
	if err != nil {
		return acc, err
	}
	for _, ot := range e.Rest {
		r, err := evalTerm(ot.Term, look)
		if err != nil {
			return r, err
		}
		if acc.Dim != r.Dim || acc.Percent != r.Percent {
			verb := "add"
			if ot.Op == "-" {
				verb = "subtract"
			}
			return acc, &ExprError{Code: CodeParamUnit, Pos: ot.Term.Start(),
				Msg: fmt.Sprintf("cannot %s a %s (%s) and a %s (%s)", verb, noun(acc), acc, noun(r), r)}
		}
		if ot.Op == "+" {
			acc.Value += r.Value
		} else {
			acc.Value -= r.Value
		}
	}
	return acc, nil
}

func evalTerm(t *grammar.Term, look Lookup) (units.Quantity, error) {
	acc, err := evalFactor(t.First, look)
	if err != nil {
		return acc, err
	}
	for _, of := range t.Rest {
		r, err := evalFactor(of.Factor, look)
		if err != nil {
			return r, err
		}
		if acc.Percent && r.Percent && of.Op == "*" {
			return acc, &ExprError{Code: CodeParamUnit, Pos: of.Factor.Start(),
				Msg: fmt.Sprintf("cannot multiply two percentages (%s × %s); write one of them as a plain number", acc, r)}
		}
		if (acc.Percent || r.Percent) && (acc.Dim != units.None || r.Dim != units.None) {
			return acc, &ExprError{Code: CodeParamUnit, Pos: of.Factor.Start(),
				Msg: fmt.Sprintf("a percentage combines only with plain numbers, not with %s (%s)", noun(pick(acc, r)), pick(acc, r))}
		}
		if of.Op == "*" {
			acc.Value *= r.Value
			acc.Dim = acc.Dim.Mul(r.Dim)
			acc.Percent = acc.Percent != r.Percent
			continue
		}
		if r.Value == 0 {
			return acc, &ExprError{Code: CodeBadValue, Pos: of.Factor.Start(),
				Msg: fmt.Sprintf("division by zero: the divisor is %s", r)}
		}
		acc.Value /= r.Value
		acc.Dim = acc.Dim.Div(r.Dim)
		acc.Percent = acc.Percent && !r.Percent
	}
	return acc, nil
}

func pick(a, b units.Quantity) units.Quantity {
	if a.Dim != units.None {
		return a
	}
	return b
}

func evalFactor(f *grammar.Factor, look Lookup) (units.Quantity, error) {
	switch {
	case f.Neg != nil:
		q, err := evalFactor(f.Neg, look)
		q.Value = -q.Value
		return q, err
	case f.Sub != nil:
		return evalExpr(f.Sub, look)
	case f.Param != nil:
		return evalRef(f.Param, look)
	case f.Code != "":
		q, ok := units.ParseCode(f.Code)
		if !ok {
			return q, &ExprError{Code: CodeBadValue, Pos: f.Start(), Msg: fmt.Sprintf("%q is not a resistor code", f.Code)}
		}
		return q, nil
	}
	q, err := units.Parse(f.Num, f.Unit)
	if err != nil {
		code := CodeParamUnit
		if ue, ok := err.(*units.Error); ok && ue.Range {
			code = CodeBadValue // a value out of range, whatever its unit
		}
		return q, &ExprError{Code: code, Pos: f.Start(), Msg: err.Error()}
	}
	return q, nil
}

func evalRef(r *grammar.Ref, look Lookup) (units.Quantity, error) {
	if look != nil {
		if q, ok := look(r.Text); ok {
			return q, nil
		}
	}
	return units.Quantity{}, &ExprError{Code: CodeUnknownParam, Pos: r.Start(), Name: r.Text,
		Msg: fmt.Sprintf("no parameter named %s", r.Text)}
}

// noun names a quantity's dimension for a message.
func noun(q units.Quantity) string {
	if q.Percent {
		return "percentage"
	}
	return q.Dim.Noun()
}

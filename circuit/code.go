package circuit

// code.go: the kinds of finding that elaboration makes.

// Code names the rule a finding made while building belongs to. Each code
// is the id of one registered rule (package rules hands findings on by
// code, and a test there fails for a code no rule claims), so a finding
// cannot be filed under a misspelt rule id.
type Code uint8

// The codes of elaboration. NoCode marks a finding that has been reported
// already (an evaluation error about a parameter whose own value is
// wrong) or one made by a rule rather than by the builder.
const (
	NoCode Code = iota
	CodeSyntax
	CodeUnknownKind
	CodePinCount
	CodeMissingValue
	CodeUnitMismatch
	CodeBadValue
	CodeBadAttribute
	CodeDuplicateName
	CodeExtraGround
	CodeNoGround
	CodeUnknownBlock
	CodeBlockPin
	CodeUnusedBlock
	CodeRecursiveBlock
	CodeUnknownParam
	CodeMissingParam
	CodeParamUnit
	CodeExpansionLimit
	CodeBadInclude
	CodeFloatingNet // a block pin that nothing inside the block touches
	NumCodes
)

var codeIDs = [NumCodes]string{
	CodeSyntax:         "syntax",
	CodeUnknownKind:    "unknown-kind",
	CodePinCount:       "pin-count",
	CodeMissingValue:   "missing-value",
	CodeUnitMismatch:   "unit-mismatch",
	CodeBadValue:       "bad-value",
	CodeBadAttribute:   "bad-attribute",
	CodeDuplicateName:  "duplicate-name",
	CodeExtraGround:    "extra-ground",
	CodeNoGround:       "no-ground",
	CodeUnknownBlock:   "unknown-block",
	CodeBlockPin:       "block-pin",
	CodeUnusedBlock:    "unused-block",
	CodeRecursiveBlock: "recursive-block",
	CodeUnknownParam:   "unknown-param",
	CodeMissingParam:   "missing-param",
	CodeParamUnit:      "param-unit",
	CodeExpansionLimit: "expansion-limit",
	CodeBadInclude:     "bad-include",
	CodeFloatingNet:    "floating-net",
}

// String returns the rule id of c, or "" for NoCode and codes out of
// range.
func (c Code) String() string {
	if c < NumCodes {
		return codeIDs[c]
	}
	return ""
}

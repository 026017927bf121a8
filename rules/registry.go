package rules

import "sort"

// All lists every rule that reports findings, in the order `nodal rules`
// prints them.
var All = []*Analyzer{
	Syntax, UnknownKind, PinCount, MissingValue, UnitMismatch, BadValue,
	BadAttribute, DuplicateName, ExtraGround, NoGround,
	UnknownBlock, BlockPin, UnusedBlock, RecursiveBlock, UnknownParam,
	MissingParam, ParamUnit, ExpansionLimit, BadInclude,
	FloatingNet, NoDCPath, SourceLoop, CurrentCutset, ShortedPart, CaseClash,
	AcceptReason, StaleAccept, BadAccept,
	SolveFailed, NoConvergence, StarvedLoad, Dropout, CurrentLimit, InputRange, Backfed, IllConditioned,
	OverPower, OverCurrent, OverVoltage, ReverseVoltage, OverTemperature, CornerOverRating, NearRating, CornersNotJudged, UnratedParts,
}

// Lookup returns the rule with the given id, or nil.
func Lookup(name string) *Analyzer {
	for _, a := range All {
		if a.Name == name {
			return a
		}
	}
	return nil
}

// Names returns every rule id, sorted.
func Names() []string {
	s := make([]string, len(All))
	for i, a := range All {
		s[i] = a.Name
	}
	sort.Strings(s)
	return s
}

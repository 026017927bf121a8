// Package bench holds the stage benchmarks of nodal: parse, elaborate,
// topology, rules, output and the whole check, each over generated designs
// of 10 k, 100 k and 1 M parts. Run them with
//
//	go test ./internal/bench -run '^$' -bench . -benchmem -count 5
//
// See BENCHMARKS.md for the figures and how they were measured.
package bench

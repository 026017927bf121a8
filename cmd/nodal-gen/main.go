// Command nodal-gen writes large synthetic designs in the nodal language,
// for benchmarks and trials at scale. Every design is made up, determined
// by its flags, and checks clean.
//
//	nodal-gen mesh -k 1000 -supplies 4 -loads 2000 > mesh.nodal   # segments rated 1 W; -rated 0 for none
//	nodal-gen mesh -k 700 -matrix g.mtx -rhs b.mtx > mesh.nodal
//	nodal-gen ladder -n 500000 > ladder.nodal
//	nodal-gen random -parts 1000000 -seed 7 > random.nodal
//	nodal-gen blocks -n 250000 > chain.nodal
package main

import (
	"flag"
	"fmt"
	"io"
	"os"

	"nodal/internal/gen"
)

const usage = `Usage: nodal-gen KIND [flags] > design.nodal

Kinds:
  mesh     K×K resistor mesh with corner supplies and spread current loads
  ladder   N-rung resistor ladder fed by one source
  random   random well-posed network of about -parts parts
  blocks   chain of -n instances of one block (hierarchy)

Run "nodal-gen KIND -h" for a kind's flags.
`

func main() { os.Exit(run(os.Args[1:], os.Stdout, os.Stderr)) }

func run(args []string, stdout, stderr io.Writer) int {
	if len(args) == 0 {
		fmt.Fprint(stderr, usage)
		return 2
	}
	fl := flag.NewFlagSet(args[0], flag.ContinueOnError)
	fl.SetOutput(stderr)
	seed := fl.Uint64("seed", 1, "seed for the random choices")
	var err error
	switch args[0] {
	case "mesh":
		k := fl.Int("k", 100, "nets per side")
		parts := fl.Int("parts", 0, "choose K for about this many parts (overrides -k)")
		sup := fl.Int("supplies", 4, "supply pads at the corners (1-4)")
		loads := fl.Int("loads", 0, "current sinks (default K)")
		meshRated := fl.Float64("rated", 1, "power rating of every segment in W, as on a real mesh (0: none)")
		matrix := fl.String("matrix", "", "also write the nodal matrix (Matrix Market) to this file")
		rhs := fl.String("rhs", "", "with -matrix: write the right-hand side here")
		if fl.Parse(args[1:]) != nil {
			return 2
		}
		if *parts > 0 {
			*k = gen.MeshSide(*parts)
		}
		m := &gen.Mesh{K: *k, Supplies: *sup, Loads: *loads, Rated: *meshRated, Seed: *seed}
		if *matrix != "" {
			if *rhs == "" {
				fmt.Fprintln(stderr, "nodal-gen: -matrix needs -rhs")
				return 2
			}
			if err := writeSystem(m, *matrix, *rhs); err != nil {
				fmt.Fprintln(stderr, "nodal-gen:", err)
				return 1
			}
		}
		err = m.Write(stdout)
	case "ladder":
		n := fl.Int("n", 1000, "rungs")
		if fl.Parse(args[1:]) != nil {
			return 2
		}
		err = (&gen.Ladder{N: *n, Seed: *seed}).Write(stdout)
	case "blocks":
		n := fl.Int("n", 1000, "block instances")
		if fl.Parse(args[1:]) != nil {
			return 2
		}
		err = (&gen.Blocks{N: *n, Seed: *seed}).Write(stdout)
	case "random":
		parts := fl.Int("parts", 1000, "about this many parts")
		tol := fl.Float64("tol", 0, "give every resistor and source this tolerance in percent")
		rated := fl.Float64("rated", 0, "give every resistor this power rating in W")
		if fl.Parse(args[1:]) != nil {
			return 2
		}
		err = (&gen.Random{Parts: *parts, Seed: *seed, Tol: *tol / 100, Rated: *rated}).Write(stdout)
	default:
		fmt.Fprintf(stderr, "nodal-gen: unknown kind %q\n\n%s", args[0], usage)
		return 2
	}
	if err != nil {
		fmt.Fprintln(stderr, "nodal-gen:", err)
		return 1
	}
	return 0
}

func writeSystem(m *gen.Mesh, matrix, rhs string) error {
	fm, err := os.Create(matrix)
	if err != nil {
		return err
	}
	defer fm.Close()
	fr, err := os.Create(rhs)
	if err != nil {
		return err
	}
	defer fr.Close()
	if err := m.WriteSystem(fm, fr); err != nil {
		return err
	}
	if err := fm.Close(); err != nil {
		return err
	}
	return fr.Close()
}

#!/usr/bin/env python3
"""Solve a mesh's nodal equations with SciPy's general sparse direct solver.

Reads the matrix and right-hand side that `nodal-gen mesh -matrix G -rhs B`
wrote (Matrix Market), converts the matrix to CSC, and times
scipy.sparse.linalg.spsolve alone (the bare solve, without reading the
files). Prints one line: unknowns, nonzeros, read seconds, solve seconds,
and the relative residual |G v - b| / |b|.
"""
import sys
import time

import numpy as np
import scipy
import scipy.io
import scipy.sparse.linalg


def main(matrix, rhs):
    t0 = time.perf_counter()
    g = scipy.io.mmread(matrix).tocsc()
    b = np.asarray(scipy.io.mmread(rhs)).ravel()
    t1 = time.perf_counter()
    v = scipy.sparse.linalg.spsolve(g, b)
    t2 = time.perf_counter()
    res = np.linalg.norm(g @ v - b) / np.linalg.norm(b)
    print(f"scipy {scipy.__version__} unknowns {g.shape[0]} nonzeros {g.nnz} "
          f"read_s {t1 - t0:.3f} solve_s {t2 - t1:.3f} residual {res:.3e} "
          f"vmin {v.min():.6f} vmax {v.max():.6f}")


if __name__ == "__main__":
    main(sys.argv[1], sys.argv[2])

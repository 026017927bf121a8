/*
 * Solves a mesh's nodal equations with CHOLMOD's supernodal Cholesky
 * factorisation (SuiteSparse), single-threaded, AMD ordering only, and
 * times its three bare steps: analyse (ordering and symbolic
 * factorisation), factorise and solve. Reading the files is not timed.
 *
 * Input: the matrix and right-hand side that
 *   nodal-gen mesh -matrix G -rhs B
 * writes (Matrix Market; the matrix with both triangles, symmetric
 * positive definite). Output: one line of figures,
 *   cholmod VERSION unknowns N nonzeros NNZ read_s R analyse_s A
 *   factorise_s F solve_s S total_s T cpu_s C residual E vmin V vmax W
 *   supernodal 1
 * where total_s = A + F + S (wall), cpu_s is the processor time of the
 * same three steps, and residual is |G v - b| / |b|.
 *
 * Built by scripts/cholmod-compare.sh against Debian's libsuitesparse-dev.
 */
#include <stdio.h>
#include <stdlib.h>
#include <time.h>

#include <suitesparse/cholmod.h>

static double now(void) {
    struct timespec ts;
    clock_gettime(CLOCK_MONOTONIC, &ts);
    return ts.tv_sec + ts.tv_nsec * 1e-9;
}

static double cpu(void) {
    struct timespec ts;
    clock_gettime(CLOCK_PROCESS_CPUTIME_ID, &ts);
    return ts.tv_sec + ts.tv_nsec * 1e-9;
}

static void die(const char *what) {
    fprintf(stderr, "cholmod_mesh: %s\n", what);
    exit(2);
}

int main(int argc, char **argv) {
    if (argc != 3) {
        fprintf(stderr, "usage: cholmod_mesh MATRIX.mtx RHS.mtx\n");
        return 2;
    }
    cholmod_common c;
    cholmod_start(&c);
    /* AMD alone: no METIS, no trying of several orderings. */
    c.nmethods = 1;
    c.method[0].ordering = CHOLMOD_AMD;
    c.postorder = 1;
    c.supernodal = CHOLMOD_SUPERNODAL;
    c.final_ll = 0;

    double t0 = now();
    FILE *f = fopen(argv[1], "r");
    if (!f) die("cannot open the matrix");
    cholmod_sparse *g = cholmod_read_sparse(f, &c);
    fclose(f);
    if (!g) die("cannot read the matrix");
    f = fopen(argv[2], "r");
    if (!f) die("cannot open the right-hand side");
    cholmod_dense *b = cholmod_read_dense(f, &c);
    fclose(f);
    if (!b) die("cannot read the right-hand side");
    /* The file holds both triangles ("general"); CHOLMOD factorises a
       symmetric matrix stored by its upper triangle. */
    cholmod_sparse *a = g;
    if (g->stype == 0) {
        a = cholmod_copy(g, 1, 1, &c);
        if (!a) die("cannot take the upper triangle");
    }
    double t1 = now(), c1 = cpu();

    cholmod_factor *l = cholmod_analyze(a, &c);
    if (!l) die("analyse failed");
    double t2 = now();
    if (!cholmod_factorize(a, l, &c) || c.status != CHOLMOD_OK) die("factorise failed (not positive definite?)");
    double t3 = now();
    cholmod_dense *v = cholmod_solve(CHOLMOD_A, l, b, &c);
    if (!v) die("solve failed");
    double t4 = now(), c4 = cpu();

    /* |G v - b| / |b|, and the range of the solution. */
    cholmod_dense *r = cholmod_copy_dense(b, &c);
    double minus1[2] = {-1, 0}, one[2] = {1, 0};
    cholmod_sdmult(a, 0, minus1, one, v, r, &c);
    double res = cholmod_norm_dense(r, 2, &c) / cholmod_norm_dense(b, 2, &c);
    double *x = v->x, vmin = x[0], vmax = x[0];
    for (size_t i = 1; i < v->nrow; i++) {
        if (x[i] < vmin) vmin = x[i];
        if (x[i] > vmax) vmax = x[i];
    }
    printf("cholmod %d.%d.%d unknowns %zu nonzeros %zu read_s %.3f analyse_s %.3f factorise_s %.3f solve_s %.3f total_s %.3f cpu_s %.3f residual %.3e vmin %.6f vmax %.6f supernodal %d\n",
           CHOLMOD_MAIN_VERSION, CHOLMOD_SUB_VERSION, CHOLMOD_SUBSUB_VERSION,
           g->nrow, cholmod_nnz(g, &c), t1 - t0, t2 - t1, t3 - t2, t4 - t3, t4 - t1, c4 - c1,
           res, vmin, vmax, l->is_super);

    cholmod_free_dense(&r, &c);
    cholmod_free_dense(&v, &c);
    cholmod_free_factor(&l, &c);
    if (a != g) cholmod_free_sparse(&a, &c);
    cholmod_free_sparse(&g, &c);
    cholmod_free_dense(&b, &c);
    cholmod_finish(&c);
    return 0;
}

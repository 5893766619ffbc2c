/*
 * Benchmark helper: builds the same decision diagram as src/logic/compile.ts with the BuDDy C
 * library (Debian libbdd-dev), so bench/logic.bench.ts can compare construction times.
 *
 * It reads the plain-text dump written by the benchmark (format below), replays the same
 * operations in the same order (OR/AND folded from the operand with the deepest root upward,
 * k-out-of-n by the threshold recursion with ite), REPS times (default 1), and prints one JSON
 * line with the median timings, the node count of the top and its exact probability (a
 * cross-check of ours).
 *
 * Dump format, one item per line:
 *   vars N                 number of variables; BuDDy variable i is our level i
 *   nodes M                node-table hint (our node count), so neither side garbage-collects;
 *                          0 = start small, collect and grow as BuDDy normally does
 *   p P0 P1 ... P(N-1)     probability per level
 *   gates G
 *   gate OP K NIN REF...   in build order; OP = or|and|atleast|not, REF = vL (level L),
 *                          gJ (the J-th gate line), c0 / c1 (constants)
 *   top J
 *
 * Build: gcc -O2 -o build build.c -lbdd        Run: ./build DUMP [REPS]
 */
#include <bdd.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <time.h>

static double now_ms(void) {
  struct timespec t;
  clock_gettime(CLOCK_MONOTONIC, &t);
  return t.tv_sec * 1e3 + t.tv_nsec / 1e6;
}

static void quiet_gc(int pre, bddGbcStat *s) {
  (void)pre;
  (void)s;
}

typedef struct {
  char op[16];
  int k;
  int nin;
  int *ins; /* encoded: level >= 0 -> var; -1 - j -> gate j; -1000000000 / -1000000001 -> false / true */
} GateLine;

#define CONST_FALSE (-1000000000)
#define CONST_TRUE (-1000000001)

static BDD *gate_root;
static int nvars;

static BDD ref_bdd(int r) {
  if (r == CONST_FALSE) return bddfalse;
  if (r == CONST_TRUE) return bddtrue;
  if (r >= 0) return bdd_ithvar(r);
  return gate_root[-1 - r];
}

static int level_of(BDD b) {
  if (b == bddfalse || b == bddtrue) return nvars;
  return bdd_var2level(bdd_var(b));
}

/* Operands topmost first; stable, like BddManager.topmostFirst. */
static BDD *sorted_ops;
static int cmp_level(const void *a, const void *b) {
  int ia = *(const int *)a, ib = *(const int *)b;
  int d = level_of(sorted_ops[ia]) - level_of(sorted_ops[ib]);
  return d ? d : ia - ib;
}

static BDD build_gate(GateLine *g) {
  int n = g->nin;
  BDD *ops = malloc(sizeof(BDD) * n);
  int *idx = malloc(sizeof(int) * n);
  for (int i = 0; i < n; i++) {
    ops[i] = ref_bdd(g->ins[i]);
    idx[i] = i;
  }
  BDD result;
  if (strcmp(g->op, "not") == 0) {
    result = bdd_addref(bdd_not(ops[0]));
  } else {
    sorted_ops = ops;
    qsort(idx, n, sizeof(int), cmp_level);
    int k = g->k;
    if (strcmp(g->op, "or") == 0) k = 1;
    if (strcmp(g->op, "and") == 0) k = n;
    if (k == 1 || k == n) {
      int isor = k == 1;
      BDD acc = bdd_addref(isor ? bddfalse : bddtrue);
      for (int i = n - 1; i >= 0; i--) {
        BDD x = ops[idx[i]];
        BDD next = bdd_addref(isor ? bdd_or(x, acc) : bdd_and(x, acc));
        bdd_delref(acc);
        acc = next;
      }
      result = acc;
    } else {
      BDD *t = malloc(sizeof(BDD) * (k + 1));
      t[0] = bdd_addref(bddtrue);
      for (int j = 1; j <= k; j++) t[j] = bdd_addref(bddfalse);
      for (int i = n - 1; i >= 0; i--) {
        BDD x = ops[idx[i]];
        for (int j = k; j >= 1; j--) {
          BDD nt = bdd_addref(bdd_ite(x, t[j - 1], t[j]));
          bdd_delref(t[j]);
          t[j] = nt;
        }
      }
      result = t[k];
      for (int j = 0; j < k; j++) bdd_delref(t[j]);
      free(t);
    }
  }
  free(ops);
  free(idx);
  return result;
}

static int cmp_double(const void *a, const void *b) {
  double x = *(const double *)a, y = *(const double *)b;
  return x < y ? -1 : x > y;
}

static double *prob;
static double *memo;
static char *done;

static double probability(BDD b) {
  if (b == bddfalse) return 0.0;
  if (b == bddtrue) return 1.0;
  if (done[b]) return memo[b];
  double pv = prob[bdd_var2level(bdd_var(b))];
  double v = pv * probability(bdd_high(b)) + (1.0 - pv) * probability(bdd_low(b));
  done[b] = 1;
  memo[b] = v;
  return v;
}

int main(int argc, char **argv) {
  if (argc < 2) {
    fprintf(stderr, "usage: build DUMP [REPS]\n");
    return 2;
  }
  FILE *f = fopen(argv[1], "r");
  if (!f) {
    perror(argv[1]);
    return 2;
  }
  int hint = 0, ngates = 0, top = -1;
  if (fscanf(f, " vars %d nodes %d p", &nvars, &hint) != 2) return 3;
  prob = malloc(sizeof(double) * (nvars + 1));
  for (int i = 0; i < nvars; i++)
    if (fscanf(f, "%lf", &prob[i]) != 1) return 3;
  if (fscanf(f, " gates %d", &ngates) != 1) return 3;
  GateLine *gates = calloc(ngates, sizeof(GateLine));
  char ref[64];
  for (int g = 0; g < ngates; g++) {
    if (fscanf(f, " gate %15s %d %d", gates[g].op, &gates[g].k, &gates[g].nin) != 3) return 3;
    gates[g].ins = malloc(sizeof(int) * gates[g].nin);
    for (int i = 0; i < gates[g].nin; i++) {
      if (fscanf(f, "%63s", ref) != 1) return 3;
      if (ref[0] == 'v') gates[g].ins[i] = atoi(ref + 1);
      else if (ref[0] == 'g') gates[g].ins[i] = -1 - atoi(ref + 1);
      else gates[g].ins[i] = ref[1] == '1' ? CONST_TRUE : CONST_FALSE;
    }
  }
  if (fscanf(f, " top %d", &top) != 1) return 3;
  fclose(f);

  int reps = argc > 2 ? atoi(argv[2]) : 1;
  if (reps < 1) reps = 1;
  double *init_ms = malloc(sizeof(double) * reps), *build_ms = malloc(sizeof(double) * reps);
  gate_root = malloc(sizeof(BDD) * ngates);
  double P = 0;
  int top_nodes = 0;
  bddStat st;
  for (int rep = 0; rep < reps; rep++) {
    double t0 = now_ms();
    /* Room for every node we made, plus slack, so BuDDy need not collect or resize either. */
    int table = hint + hint / 4 + 100000;
    bdd_init(table, table / 4 > 10000 ? table / 4 : 10000);
    /* A hint of 0 asks for BuDDy as it is normally used: a small table that it collects and
       grows (by up to 4M nodes at a time) as the build needs. */
    bdd_setmaxincrease(hint > 0 ? 0 : 1 << 22);
    bdd_gbc_hook(quiet_gc);
    bdd_setvarnum(nvars > 0 ? nvars : 1);
    double t1 = now_ms();
    for (int g = 0; g < ngates; g++) gate_root[g] = build_gate(&gates[g]);
    double t2 = now_ms();
    init_ms[rep] = t1 - t0;
    build_ms[rep] = t2 - t1;
    if (rep == reps - 1) {
      BDD root = gate_root[top];
      int alloc = bdd_getallocnum();
      memo = malloc(sizeof(double) * alloc);
      done = calloc(alloc, 1);
      P = probability(root);
      top_nodes = bdd_nodecount(root);
      bdd_stats(&st);
    }
    bdd_done();
  }
  qsort(init_ms, reps, sizeof(double), cmp_double);
  qsort(build_ms, reps, sizeof(double), cmp_double);
  printf("{\"init_ms\": %.3f, \"build_ms\": %.3f, \"top_nodes\": %d, \"probability\": %.17g, \"gc\": %d, \"produced\": %ld, \"reps\": %d}\n",
         init_ms[reps / 2], build_ms[reps / 2], top_nodes, P, st.gbcnum, st.produced, reps);
  return 0;
}

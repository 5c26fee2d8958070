/*
 * Plain C reference for the exact FCFM evaluator (bench only; compiled by bench/evaluate.ts with
 * gcc -O2 into a temporary folder). The straightforward implementation: per connected component,
 * enumerate the independent sets (graph without self-loops) as 64-bit masks, sort them (every subset
 * then comes before its supersets), find a set's index with an open-addressing hash table (key and
 * index side by side, Fibonacci hashing, load at most 1/2), and apply the recursions stated in
 * src/exact/component.ts:
 *   Ψ(∅) = 1,  Ψ(A) = Σ_{i∈A} λ_i Ψ(A∖i) / (μ(A) − r(A))
 *   T(A) = [1 + Σ_{k addable} λ_k/μ(A∪k) · T(A∪k)] / (1 − r(A)/μ(A))   (no divisor for ∅)
 *   L_k  = (1/Z) Σ_{B∋k} λ_k/μ(B) (Ψ(B∖k) + [k∉S] Ψ(B)) T(B)
 *   matched at once = 1 − (1/Z) Σ_{A∩N(k)=∅} Ψ(A)
 *   M(i→j) = λ_i (1/Z) Σ_{B∩N(i)=∅, B∪j∈I} Ψ(B) λ_j/μ(B∪j) T(B∪j)
 *
 * Input (text): n m, then n rates, then m pairs "a b" (a = b: self-compatible class).
 * Output: one JSON line {sets, seconds, backlogTotal, empty, backlog[], immediate[], matchRates[]}.
 * Exit 2 when the design is unstable (some μ(A) <= r(A)).
 */
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <time.h>

#include "design.h"

typedef uint64_t u64;

static int cmp_u64(const void *a, const void *b) {
  u64 x = *(const u64 *)a, y = *(const u64 *)b;
  return x < y ? -1 : x > y;
}

/* ---- independent sets of one component ---- */
static u64 *sets;
static size_t nsets, capsets;
static u64 con[64]; /* N(k) without self-loop, plus k itself: classes that cannot wait with k */
static int nc;

static void push_set(u64 m) {
  if (nsets == capsets) {
    capsets = capsets ? capsets * 2 : 1024;
    sets = realloc(sets, capsets * sizeof(u64));
    if (!sets) { fprintf(stderr, "out of memory\n"); exit(1); }
  }
  sets[nsets++] = m;
}

static void enumerate(u64 set, u64 blocked, int from) {
  push_set(set);
  for (int k = from; k < nc; k++)
    if (!((blocked >> k) & 1)) enumerate(set | (1ULL << k), blocked | con[k], k + 1);
}

/* ---- hash table mask -> index ---- */
typedef struct { u64 key; int64_t val; } entry;
static entry *ht;
static u64 hmask;
static int hshift;

static inline u64 hslot(u64 key) { return (key * 0x9E3779B97F4A7C15ULL) >> hshift; }

static void hbuild(void) {
  int bits = 1;
  while ((1ULL << bits) < 2 * nsets) bits++;
  u64 size = 1ULL << bits;
  hmask = size - 1;
  hshift = 64 - bits;
  ht = malloc(size * sizeof(entry));
  if (!ht) { fprintf(stderr, "out of memory\n"); exit(1); }
  memset(ht, 0xff, size * sizeof(entry));
  for (size_t s = 0; s < nsets; s++) {
    u64 h = hslot(sets[s]);
    while (ht[h].key != ~0ULL) h = (h + 1) & hmask;
    ht[h].key = sets[s];
    ht[h].val = (int64_t)s;
  }
}

static inline int32_t hfind(u64 key) {
  u64 h = hslot(key);
  while (ht[h].key != key) h = (h + 1) & hmask;
  return ht[h].val;
}

int main(int argc, char **argv) {
  if (argc < 2) { fprintf(stderr, "usage: exact FILE\n"); return 1; }
  int n, m;
  double *rate;
  int *ea, *eb;
  if (read_design(argv[1], &n, &m, &rate, &ea, &eb)) return 1;

  struct timespec t0, t1;
  clock_gettime(CLOCK_MONOTONIC, &t0);

  /* adjacency lists and connected components */
  char *adj = calloc((size_t)n * n, 1);
  char *loopc = calloc(n, 1);
  for (int e = 0; e < m; e++) {
    if (ea[e] == eb[e]) loopc[ea[e]] = 1;
    else adj[ea[e] * n + eb[e]] = adj[eb[e] * n + ea[e]] = 1;
  }
  int *comp = malloc(n * sizeof(int)), *queue = malloc(n * sizeof(int));
  for (int k = 0; k < n; k++) comp[k] = -1;
  int ncomp = 0;
  for (int k = 0; k < n; k++) {
    if (comp[k] >= 0) continue;
    int qh = 0, qt = 0;
    queue[qt++] = k;
    comp[k] = ncomp;
    while (qh < qt) {
      int x = queue[qh++];
      for (int y = 0; y < n; y++) if (adj[x * n + y] && comp[y] < 0) { comp[y] = ncomp; queue[qt++] = y; }
    }
    ncomp++;
  }

  double *backlog = calloc(n, sizeof(double)), *immediate = calloc(n, sizeof(double));
  double *matchRates = calloc(m, sizeof(double));
  double empty = 1;
  size_t total = 0;
  int *members = malloc(n * sizeof(int)), *local = malloc(n * sizeof(int));
  for (int c = 0; c < ncomp; c++) {
    nc = 0;
    for (int k = 0; k < n; k++) if (comp[k] == c) { local[k] = nc; members[nc++] = k; }
    if (nc > 64) { fprintf(stderr, "component of more than 64 classes\n"); return 1; }
    u64 nb[64]; /* N(k), k itself when self-compatible */
    double lam[64];
    int self[64];
    for (int a = 0; a < nc; a++) {
      nb[a] = 0;
      lam[a] = rate[members[a]];
      self[a] = loopc[members[a]];
      for (int b = 0; b < nc; b++) if (adj[members[a] * n + members[b]]) nb[a] |= 1ULL << b;
      con[a] = nb[a] | (1ULL << a);
      if (self[a]) nb[a] |= 1ULL << a;
    }
    u64 all = nc == 64 ? ~0ULL : (1ULL << nc) - 1;

    nsets = 0;
    enumerate(0, 0, 0);
    qsort(sets, nsets, sizeof(u64), cmp_u64);
    hbuild();
    size_t N = nsets;
    total += N;
    double *mu = malloc(N * sizeof(double)), *rr = malloc(N * sizeof(double));
    double *psi = malloc(N * sizeof(double)), *T = malloc(N * sizeof(double));
    u64 *nbr = malloc(N * sizeof(u64));
    for (size_t s = 0; s < N; s++) {
      u64 A = sets[s], NA = 0;
      double r = 0;
      for (u64 x = A; x; x &= x - 1) {
        int i = __builtin_ctzll(x);
        NA |= nb[i];
        if (!self[i]) r += lam[i];
      }
      double mm = 0;
      for (u64 x = NA; x; x &= x - 1) mm += lam[__builtin_ctzll(x)];
      mu[s] = mm;
      rr[s] = r;
      nbr[s] = NA;
    }
    /* prefix sums, subsets first */
    psi[0] = 1;
    for (size_t s = 1; s < N; s++) {
      u64 A = sets[s];
      double sum = 0;
      for (u64 x = A; x; x &= x - 1) {
        int i = __builtin_ctzll(x);
        sum += lam[i] * psi[hfind(A & ~(1ULL << i))];
      }
      double den = mu[s] - rr[s];
      if (!(den > 1e-12)) { printf("{\"unstable\":true}\n"); return 2; }
      psi[s] = sum / den;
    }
    /* tail sums, supersets first, with the metrics */
    double bl[64] = {0}, nomatch[64] = {0}, flow[64][64];
    memset(flow, 0, sizeof flow);
    for (size_t s = N; s-- > 0;) {
      u64 A = sets[s], NA = nbr[s];
      u64 addable = all & ~(A | NA);
      double acc = 0;
      for (u64 x = addable; x; x &= x - 1) {
        int k = __builtin_ctzll(x);
        int32_t q = hfind(A | (1ULL << k));
        double fk = lam[k] * T[q] / mu[q];
        acc += fk;
        double v = psi[s] * fk;
        bl[k] += v;
        for (u64 y = nb[k] & ~NA; y; y &= y - 1) {
          int i = __builtin_ctzll(y);
          flow[i][k] += lam[i] * v;
        }
      }
      if (s == 0) T[s] = 1 + acc;
      else {
        T[s] = (1 + acc) / (1 - rr[s] / mu[s]);
        double rep = psi[s] * T[s] / mu[s];
        for (u64 x = A; x; x &= x - 1) {
          int i = __builtin_ctzll(x);
          if (!self[i]) bl[i] += lam[i] * rep;
        }
      }
      for (u64 x = all & ~NA; x; x &= x - 1) nomatch[__builtin_ctzll(x)] += psi[s];
    }
    double Z = T[0];
    empty /= Z;
    for (int a = 0; a < nc; a++) {
      backlog[members[a]] = bl[a] / Z;
      immediate[members[a]] = 1 - nomatch[a] / Z;
    }
    for (int e = 0; e < m; e++) {
      if (comp[ea[e]] != c) continue;
      int a = local[ea[e]], b = local[eb[e]];
      matchRates[e] = a == b ? flow[a][a] / Z : (flow[a][b] + flow[b][a]) / Z;
    }
    free(mu); free(rr); free(psi); free(T); free(nbr); free(ht);
  }
  clock_gettime(CLOCK_MONOTONIC, &t1);
  double seconds = (t1.tv_sec - t0.tv_sec) + 1e-9 * (t1.tv_nsec - t0.tv_nsec);
  double bt = 0;
  for (int k = 0; k < n; k++) bt += backlog[k];
  printf("{\"sets\":%zu,\"seconds\":%.6f,\"backlogTotal\":%.17g,\"empty\":%.17g,\"backlog\":[", total, seconds, bt, empty);
  for (int k = 0; k < n; k++) printf("%s%.17g", k ? "," : "", backlog[k]);
  printf("],\"immediate\":[");
  for (int k = 0; k < n; k++) printf("%s%.17g", k ? "," : "", immediate[k]);
  printf("],\"matchRates\":[");
  for (int e = 0; e < m; e++) printf("%s%.17g", e ? "," : "", matchRates[e]);
  printf("]}\n");
  return 0;
}

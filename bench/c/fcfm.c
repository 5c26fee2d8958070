/*
 * Plain C reference for the FCFM simulator (bench only; compiled by bench/simulate.ts with gcc -O2
 * into a temporary folder). The same model as edgewise's patient engine: the class of each arrival
 * drawn with an alias table from a xoshiro128** stream, one FIFO queue (growable ring of arrival
 * indices) per class, and an arrival takes the oldest waiting item among its compatible classes, or
 * waits. Counted: arrivals and matches per class, matches per compatibility, the waits (in
 * arrivals) and the integral of every queue length over the arrival clock.
 *
 * Input (text): n m, then n rates, then m pairs "a b" (a = b: self-compatible class).
 * Usage: fcfm FILE ARRIVALS SEED. Output: one JSON line {arrivals, seconds, cpuSeconds (of the loop), backlog[], matches, meanWaitOfWaiting}.
 */
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <time.h>

#include "design.h"

static uint32_t s[4];
static inline uint32_t rotl(uint32_t x, int k) { return (x << k) | (x >> (32 - k)); }
static inline uint32_t next(void) {
  uint32_t result = rotl(s[1] * 5, 7) * 9, t = s[1] << 9;
  s[2] ^= s[0];
  s[3] ^= s[1];
  s[1] ^= s[2];
  s[0] ^= s[3];
  s[2] ^= t;
  s[3] = rotl(s[3], 11);
  return result;
}

typedef struct {
  int64_t *buf;
  int64_t cap, head, count;
} ring;

static void push(ring *q, int64_t v) {
  if (q->count == q->cap) {
    int64_t cap = q->cap ? 2 * q->cap : 64;
    int64_t *b = malloc(cap * sizeof(int64_t));
    for (int64_t i = 0; i < q->count; i++) b[i] = q->buf[(q->head + i) & (q->cap - 1)];
    free(q->buf);
    q->buf = b;
    q->cap = cap;
    q->head = 0;
  }
  q->buf[(q->head + q->count) & (q->cap - 1)] = v;
  q->count++;
}

int main(int argc, char **argv) {
  if (argc < 4) { fprintf(stderr, "usage: fcfm FILE ARRIVALS SEED\n"); return 1; }
  int n, m;
  double *rate;
  int *ea, *eb;
  if (read_design(argv[1], &n, &m, &rate, &ea, &eb)) return 1;
  double total = 0;
  for (int k = 0; k < n; k++) total += rate[k];
  int64_t arrivals = atoll(argv[2]);
  uint64_t seed = strtoull(argv[3], 0, 10);
  for (int i = 0; i < 4; i++) { seed = seed * 6364136223846793005ULL + 1442695040888963407ULL; s[i] = (uint32_t)(seed >> 32) | 1; }

  /* candidate lists: partner class and edge, per class */
  int *start = calloc(n + 1, sizeof(int)), *nbr = malloc(2 * m * sizeof(int)), *edge = malloc(2 * m * sizeof(int));
  for (int e = 0; e < m; e++) { start[ea[e] + 1]++; if (ea[e] != eb[e]) start[eb[e] + 1]++; }
  for (int k = 0; k < n; k++) start[k + 1] += start[k];
  int *fill = malloc(n * sizeof(int));
  memcpy(fill, start, n * sizeof(int));
  for (int e = 0; e < m; e++) {
    nbr[fill[ea[e]]] = eb[e]; edge[fill[ea[e]]++] = e;
    if (ea[e] != eb[e]) { nbr[fill[eb[e]]] = ea[e]; edge[fill[eb[e]]++] = e; }
  }
  /* alias table (Vose) */
  double *keep = malloc(n * sizeof(double)), *scaled = malloc(n * sizeof(double));
  int *alias = malloc(n * sizeof(int)), *small = malloc(n * sizeof(int)), *large = malloc(n * sizeof(int));
  int ns = 0, nl = 0;
  for (int k = 0; k < n; k++) {
    scaled[k] = rate[k] * n / total;
    alias[k] = k;
    if (scaled[k] < 1) small[ns++] = k; else large[nl++] = k;
  }
  while (ns > 0 && nl > 0) {
    int a = small[--ns], l = large[nl - 1];
    keep[a] = scaled[a];
    alias[a] = l;
    scaled[l] += scaled[a] - 1;
    if (scaled[l] < 1) { nl--; small[ns++] = l; }
  }
  while (nl > 0) keep[large[--nl]] = 1;
  while (ns > 0) keep[small[--ns]] = 1;

  ring *q = calloc(n, sizeof(ring));
  int64_t *arrived = calloc(n, sizeof(int64_t)), *matched = calloc(m, sizeof(int64_t)), *served = calloc(n, sizeof(int64_t));
  double *waitSum = calloc(n, sizeof(double)), *area = calloc(n, sizeof(double));
  int64_t *last = calloc(n, sizeof(int64_t));

  struct timespec t0, t1, c0, c1;
  clock_gettime(CLOCK_MONOTONIC, &t0);
  clock_gettime(CLOCK_PROCESS_CPUTIME_ID, &c0);
  for (int64_t t = 0; t < arrivals; t++) {
    double x = next() * (double)n * 2.3283064365386963e-10;
    int k = (int)x;
    if (x - k >= keep[k]) k = alias[k];
    arrived[k]++;
    int best = -1, bp = -1;
    int64_t bt = INT64_MAX;
    for (int p = start[k]; p < start[k + 1]; p++) {
      ring *c = &q[nbr[p]];
      if (c->count > 0 && c->buf[c->head] < bt) { bt = c->buf[c->head]; best = nbr[p]; bp = p; }
    }
    if (best < 0) {
      area[k] += (double)q[k].count * (t - last[k]);
      last[k] = t;
      push(&q[k], t);
    } else {
      ring *c = &q[best];
      area[best] += (double)c->count * (t - last[best]);
      last[best] = t;
      c->head = (c->head + 1) & (c->cap - 1);
      c->count--;
      matched[edge[bp]]++;
      served[best]++;
      waitSum[best] += (double)(t - bt);
    }
  }
  clock_gettime(CLOCK_PROCESS_CPUTIME_ID, &c1);
  clock_gettime(CLOCK_MONOTONIC, &t1);
  double seconds = (t1.tv_sec - t0.tv_sec) + 1e-9 * (t1.tv_nsec - t0.tv_nsec);
  double cpu = (c1.tv_sec - c0.tv_sec) + 1e-9 * (c1.tv_nsec - c0.tv_nsec);
  printf("{\"arrivals\":%lld,\"seconds\":%.6f,\"cpuSeconds\":%.6f,\"backlog\":[", (long long)arrivals, seconds, cpu);
  for (int k = 0; k < n; k++) printf("%s%.9g", k ? "," : "", (area[k] + (double)q[k].count * (arrivals - last[k])) / arrivals);
  int64_t matches = 0, waited = 0;
  double waits = 0;
  for (int e = 0; e < m; e++) matches += matched[e];
  for (int k = 0; k < n; k++) { waited += served[k]; waits += waitSum[k]; }
  /* mean wait of an item that waited, in time units (one arrival lasts 1/Λ on average) */
  printf("],\"matches\":%lld,\"meanWaitOfWaiting\":%.9g}\n", (long long)matches, waited ? waits / waited / total : 0.0);
  return 0;
}

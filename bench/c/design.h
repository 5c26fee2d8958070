/* Reads the design file of the bench's C references: "n m", n rates, m pairs "a b" (a = b: a
 * self-compatible class). Returns 0 on success. */
#include <stdio.h>
#include <stdlib.h>

static int read_design(const char *path, int *n, int *m, double **rate, int **ea, int **eb) {
  FILE *f = fopen(path, "r");
  if (!f) { perror(path); return 1; }
  if (fscanf(f, "%d %d", n, m) != 2) return 1;
  *rate = malloc(*n * sizeof(double));
  *ea = malloc(*m * sizeof(int));
  *eb = malloc(*m * sizeof(int));
  for (int k = 0; k < *n; k++) if (fscanf(f, "%lf", &(*rate)[k]) != 1) return 1;
  for (int e = 0; e < *m; e++) if (fscanf(f, "%d %d", &(*ea)[e], &(*eb)[e]) != 2) return 1;
  fclose(f);
  return 0;
}

/* Hand-optimised C of the logistic-type case: 32 points side by side (the compiler vectorises the
 * lane loops), |f'| multiplied into a running product renormalised with frexp every 16 steps so that
 * logarithms are rare; the same period test. Usage: logistic_fast POINTS [THREADS] */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <pthread.h>

#define L 32
#define MAXP 64
static long points; static int threads;
static double sums[64];

static int period(const double *w, int count) {
  for (int p = 1; 2 * p <= count; p++) {
    int ok = 1;
    for (int i = count - 1; i >= p && ok; i--) {
      double a = w[i], b = w[i - p];
      if (!(fabs(a - b) <= 1e-9 * (1 + fmax(fabs(a), fabs(b))))) ok = 0;
    }
    if (ok) return p;
  }
  return 0;
}

static void *work(void *arg) {
  long id = (long)arg, first = points * id / threads, last = points * (id + 1) / threads;
  double sum = 0;
  static __thread double w[L][2 * MAXP];
  for (long k0 = first; k0 < last; k0 += L) {
    double r[L], x[L], prod[L], logs[L];
    int n = (int)((last - k0) < L ? (last - k0) : L);
    for (int j = 0; j < L; j++) { long k = k0 + (j < n ? j : 0); r[j] = 2.5 + 1.5 * (double)k / (double)(points - 1); x[j] = 0.3; prod[j] = 1; logs[j] = 0; }
    for (int i = 0; i < 1000; i++)
      for (int j = 0; j < L; j++) x[j] = r[j] * x[j] * (1 - x[j]);
    for (int i = 0; i < 1000; i += 16) {
      int steps = 1000 - i < 16 ? 1000 - i : 16;
      for (int s = 0; s < steps; s++) {
        for (int j = 0; j < L; j++) { prod[j] *= fabs(r[j] * (1 - 2 * x[j])); x[j] = r[j] * x[j] * (1 - x[j]); }
        int idx = i + s - (1000 - 2 * MAXP);
        if (idx >= 0) for (int j = 0; j < L; j++) w[j][idx] = x[j];
      }
      for (int j = 0; j < L; j++) { int e; double m = frexp(prod[j], &e); logs[j] += log(m) + e * M_LN2; prod[j] = 1; }
    }
    for (int j = 0; j < n; j++) sum += logs[j] / 1000 + period(w[j], 2 * MAXP);
  }
  sums[id] = sum;
  return NULL;
}

int main(int argc, char **argv) {
  points = atol(argv[1]); threads = argc > 2 ? atoi(argv[2]) : 1;
  pthread_t t[64];
  for (long i = 0; i < threads; i++) pthread_create(&t[i], NULL, work, (void *)i);
  double total = 0;
  for (int i = 0; i < threads; i++) { pthread_join(t[i], NULL); total += sums[i]; }
  printf("checksum %.6g\n", total);
  return 0;
}

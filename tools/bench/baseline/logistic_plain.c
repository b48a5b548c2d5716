/* Straightforward C of the logistic-type benchmark case, the same per-point computation as Sweeps:
 * transient 1000, measure 1000 with ln|f'| every step, period test on the last 2*64 states.
 * Usage: logistic_plain POINTS [THREADS]   (points spread over r in [2.5, 4], x0 = 0.3) */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <pthread.h>

#define MAXP 64
static long points; static int threads;
static double sums[64];

static int period(const double *w, int count) {
  for (int p = 1; 2 * p <= count; p++) {
    int ok = 1;
    for (int i = count - 1; i >= p && ok; i--) {
      double a = w[i], b = w[i - p];
      double scale = 1 + fmax(fabs(a), fabs(b));
      if (!(fabs(a - b) <= 1e-9 * scale)) ok = 0;
    }
    if (ok) return p;
  }
  return 0;
}

static void *work(void *arg) {
  long id = (long)arg;
  double w[2 * MAXP], sum = 0;
  for (long k = points * id / threads; k < points * (id + 1) / threads; k++) {
    double r = 2.5 + 1.5 * (double)k / (double)(points - 1), x = 0.3, lyap = 0;
    int escaped = 0;
    for (int i = 0; i < 1000; i++) { x = r * x * (1 - x); if (!(fabs(x) <= 1e12)) { escaped = 1; break; } }
    if (escaped) continue;
    for (int i = 0; i < 1000; i++) {
      lyap += log(fabs(r * (1 - 2 * x)));
      x = r * x * (1 - x);
      if (i >= 1000 - 2 * MAXP) w[i - (1000 - 2 * MAXP)] = x;
    }
    sum += lyap / 1000 + period(w, 2 * MAXP);
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

/* Straightforward C of the Hénon-type benchmark case, the same per-point computation as Sweeps:
 * transient 1000, measure 1000 with the tangent map on two vectors re-orthonormalised (Gram-Schmidt)
 * every step and ln of both norms every step, period test on the last 2*64 states.
 * Usage: henon_plain POINTS [THREADS]   (a 1000 x 1000 grid over a in [0.8, 1.4], b in [0.1, 0.3]) */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <pthread.h>

#define MAXP 64
static long points; static int threads;
static double sums[64];

static int period(const double *w, int count) { /* w: count states of (x, y) */
  for (int p = 1; 2 * p <= count; p++) {
    int ok = 1;
    for (int i = count - 1; i >= p && ok; i--)
      for (int j = 0; j < 2 && ok; j++) {
        double a = w[2 * i + j], b = w[2 * (i - p) + j];
        if (!(fabs(a - b) <= 1e-9 * (1 + fmax(fabs(a), fabs(b))))) ok = 0;
      }
    if (ok) return p;
  }
  return 0;
}

static void *work(void *arg) {
  long id = (long)arg;
  double w[4 * MAXP], sum = 0;
  long side = (long)sqrt((double)points);
  for (long k = points * id / threads; k < points * (id + 1) / threads; k++) {
    double a = 0.8 + 0.6 * (double)(k / side) / (double)(side - 1);
    double b = 0.1 + 0.2 * (double)(k % side) / (double)(side - 1);
    double x = 0.1, y = 0.1, l1 = 0, l2 = 0;
    int escaped = 0;
    for (int i = 0; i < 1000; i++) {
      double nx = 1 - a * x * x + y; y = b * x; x = nx;
      if (!(fabs(x) <= 1e12 && fabs(y) <= 1e12)) { escaped = 1; break; }
    }
    if (escaped) continue;
    double u0 = 1, u1 = 0, v0 = 0, v1 = 1;
    for (int i = 0; i < 1000; i++) {
      double j00 = -2 * a * x, j01 = 1, j10 = b, j11 = 0;
      double p0 = j00 * u0 + j01 * u1, p1 = j10 * u0 + j11 * u1;
      double q0 = j00 * v0 + j01 * v1, q1 = j10 * v0 + j11 * v1;
      double n1 = sqrt(p0 * p0 + p1 * p1); p0 /= n1; p1 /= n1;
      double d = p0 * q0 + p1 * q1; q0 -= d * p0; q1 -= d * p1;
      double n2 = sqrt(q0 * q0 + q1 * q1); q0 /= n2; q1 /= n2;
      l1 += log(n1); l2 += log(n2);
      u0 = p0; u1 = p1; v0 = q0; v1 = q1;
      double nx = 1 - a * x * x + y; y = b * x; x = nx;
      if (!(fabs(x) <= 1e12)) { escaped = 1; break; }
      if (i >= 1000 - 2 * MAXP) { int s = i - (1000 - 2 * MAXP); w[2 * s] = x; w[2 * s + 1] = y; }
    }
    if (escaped) continue;
    sum += l1 / 1000 + l2 / 1000 + period(w, 2 * MAXP);
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

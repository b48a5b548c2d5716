/* Straightforward C of the Lorenz-type case: RK4 dt = 0.01 on state + 3 tangent vectors (exact
 * Jacobian), transient 20 + measure 200, Gram-Schmidt every 10 steps. Usage: lorenz_plain POINTS [THREADS] */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <pthread.h>

static long points; static int threads;
static double sums[64];

static void rhs(const double *y, double *dy, double rho) {
  const double s = 10, b = 8.0 / 3;
  double x = y[0], v = y[1], z = y[2];
  dy[0] = s * (v - x); dy[1] = x * (rho - z) - v; dy[2] = x * v - b * z;
  for (int c = 0; c < 3; c++) {
    const double *q = y + 3 + 3 * c; double *dq = dy + 3 + 3 * c;
    dq[0] = -s * q[0] + s * q[1];
    dq[1] = (rho - z) * q[0] - q[1] - x * q[2];
    dq[2] = v * q[0] + x * q[1] - b * q[2];
  }
}

static void rk4(double *y, int n, double h, double rho) {
  double k1[12], k2[12], k3[12], k4[12], t[12];
  rhs(y, k1, rho); for (int i = 0; i < n; i++) t[i] = y[i] + 0.5 * h * k1[i];
  rhs(t, k2, rho); for (int i = 0; i < n; i++) t[i] = y[i] + 0.5 * h * k2[i];
  rhs(t, k3, rho); for (int i = 0; i < n; i++) t[i] = y[i] + h * k3[i];
  rhs(t, k4, rho); for (int i = 0; i < n; i++) y[i] += h / 6 * (k1[i] + 2 * k2[i] + 2 * k3[i] + k4[i]);
}

static void *work(void *arg) {
  long id = (long)arg; double sum = 0;
  for (long k = points * id / threads; k < points * (id + 1) / threads; k++) {
    double rho = 20 + 20.0 * (double)k / (double)(points - 1);
    double y[12] = {1, 1, 1, 1, 0, 0, 0, 1, 0, 0, 0, 1}, l[3] = {0, 0, 0};
    for (int i = 0; i < 2000; i++) rk4(y, 3, 0.01, rho);
    for (int i = 1; i <= 20000; i++) {
      rk4(y, 12, 0.01, rho);
      if (i % 10 == 0) {
        for (int c = 0; c < 3; c++) {
          double *q = y + 3 + 3 * c;
          for (int p = 0; p < c; p++) { double *b = y + 3 + 3 * p, d = q[0] * b[0] + q[1] * b[1] + q[2] * b[2]; for (int j = 0; j < 3; j++) q[j] -= d * b[j]; }
          double nrm = sqrt(q[0] * q[0] + q[1] * q[1] + q[2] * q[2]); l[c] += log(nrm); for (int j = 0; j < 3; j++) q[j] /= nrm;
        }
      }
    }
    sum += l[0] / 200 + l[1] / 200 + l[2] / 200;
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

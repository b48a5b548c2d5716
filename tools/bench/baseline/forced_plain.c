/* Straightforward C of the forced-oscillator benchmark case (configs/bench/forced-dopri5.toml), the same
 * per-point computation as Sweeps: x' = v, v' = -delta v - x - x^3 + gamma cos(w t), delta = 0.3, w = 1.2;
 * Dormand-Prince 5(4) with first-same-as-last stages, rtol 1e-9, atol 1e-12, the error norm
 * max |err_i| / (atol + rtol max(|y_i|, |y_new_i|)) over every component, step factor
 * 0.9 err^-1/5 within [0.2, 5], first step 0.01, largest 1; steps end on every forcing period (the
 * stroboscopic samples) and on the middle of the measurement. Transient 200 on the state alone, then
 * measure 400 on the state and two tangent vectors (exact Jacobian), Gram-Schmidt every 0.1 time units,
 * period test on the last 2*16 samples. Usage: forced_plain POINTS [THREADS] (gamma over [0.05, 2]). */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <pthread.h>

#define MAXP 16
static long points; static int threads;
static double sums[64];
static const double delta = 0.3, omega = 1.2;

static void rhs(double t, const double *y, double *dy, int n, double gamma) {
  double x = y[0], v = y[1];
  dy[0] = v;
  dy[1] = -delta * v - x - x * x * x + gamma * cos(omega * t);
  for (int c = 2; c < n; c += 2) {
    dy[c] = y[c + 1];
    dy[c + 1] = (-1 - 3 * x * x) * y[c] - delta * y[c + 1];
  }
}

typedef struct { double h, k1[6]; int fresh; } stepper;

/* One accepted step from t towards limit; returns 0 if the step size collapses. */
static int dopri(stepper *s, double *y, int n, double *t, double limit, double gamma) {
  static const double c2 = 1.0 / 5, c3 = 3.0 / 10, c4 = 4.0 / 5, c5 = 8.0 / 9;
  static const double a21 = 1.0 / 5, a31 = 3.0 / 40, a32 = 9.0 / 40, a41 = 44.0 / 45, a42 = -56.0 / 15, a43 = 32.0 / 9;
  static const double a51 = 19372.0 / 6561, a52 = -25360.0 / 2187, a53 = 64448.0 / 6561, a54 = -212.0 / 729;
  static const double a61 = 9017.0 / 3168, a62 = -355.0 / 33, a63 = 46732.0 / 5247, a64 = 49.0 / 176, a65 = -5103.0 / 18656;
  static const double a71 = 35.0 / 384, a73 = 500.0 / 1113, a74 = 125.0 / 192, a75 = -2187.0 / 6784, a76 = 11.0 / 84;
  static const double e1 = 71.0 / 57600, e3 = -71.0 / 16695, e4 = 71.0 / 1920, e5 = -17253.0 / 339200, e6 = 22.0 / 525, e7 = -1.0 / 40;
  double k2[6], k3[6], k4[6], k5[6], k6[6], k7[6], st[6], nx[6];
  if (!s->fresh) { rhs(*t, y, s->k1, n, gamma); s->fresh = 1; }
  for (;;) {
    double h = fmin(s->h, limit - *t);
    if (h < 1e-12 && limit - *t > 1e-12) return 0;
    double *k1 = s->k1;
    for (int i = 0; i < n; i++) st[i] = y[i] + h * a21 * k1[i];
    rhs(*t + c2 * h, st, k2, n, gamma);
    for (int i = 0; i < n; i++) st[i] = y[i] + h * (a31 * k1[i] + a32 * k2[i]);
    rhs(*t + c3 * h, st, k3, n, gamma);
    for (int i = 0; i < n; i++) st[i] = y[i] + h * (a41 * k1[i] + a42 * k2[i] + a43 * k3[i]);
    rhs(*t + c4 * h, st, k4, n, gamma);
    for (int i = 0; i < n; i++) st[i] = y[i] + h * (a51 * k1[i] + a52 * k2[i] + a53 * k3[i] + a54 * k4[i]);
    rhs(*t + c5 * h, st, k5, n, gamma);
    for (int i = 0; i < n; i++) st[i] = y[i] + h * (a61 * k1[i] + a62 * k2[i] + a63 * k3[i] + a64 * k4[i] + a65 * k5[i]);
    rhs(*t + h, st, k6, n, gamma);
    for (int i = 0; i < n; i++) nx[i] = y[i] + h * (a71 * k1[i] + a73 * k3[i] + a74 * k4[i] + a75 * k5[i] + a76 * k6[i]);
    rhs(*t + h, nx, k7, n, gamma);
    double err = 0;
    for (int i = 0; i < n; i++) {
      double e = h * (e1 * k1[i] + e3 * k3[i] + e4 * k4[i] + e5 * k5[i] + e6 * k6[i] + e7 * k7[i]);
      double sc = 1e-12 + 1e-9 * fmax(fabs(y[i]), fabs(nx[i]));
      err = fmax(err, fabs(e) / sc);
    }
    if (err <= 1) {
      *t = h == limit - *t ? limit : *t + h;
      for (int i = 0; i < n; i++) { y[i] = nx[i]; k1[i] = k7[i]; }
      s->h = fmin(1.0, h * (err == 0 ? 5 : fmin(5, 0.9 * pow(err, -0.2))));
      return 1;
    }
    s->h = h * fmax(0.2, 0.9 * pow(err, -0.2));
  }
}

static int period(const double *w, int count) { /* w: count states of (x, v) */
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
  long id = (long)arg; double sum = 0, T = 2 * M_PI / omega, w[4 * MAXP];
  for (long k = points * id / threads; k < points * (id + 1) / threads; k++) {
    double gamma = 0.05 + 1.95 * (double)k / (double)(points - 1);
    double y[6] = {0, 0, 0, 0, 0, 0}, t = 0, l[2] = {0, 0};
    stepper s = {0.01, {0}, 0};
    int ok = 1;
    while (t < 200 && ok) ok = dopri(&s, y, 2, &t, 200, gamma);
    y[2] = 1; y[3] = 0; y[4] = 0; y[5] = 1; s.fresh = 0;
    double start = t, end = t + 400, half = t + 200, lastQr = t, strobe = floor(t / T + 1e-9) + 1;
    int halfDone = 0, count = 0;
    while (t < end && ok) {
      double limit = fmin(end, strobe * T);
      if (!halfDone && t < half) limit = fmin(limit, half);
      ok = dopri(&s, y, 6, &t, limit, gamma);
      if (t == strobe * T) { int slot = count++ % (2 * MAXP); w[2 * slot] = y[0]; w[2 * slot + 1] = y[1]; strobe++; }
      int reached = !halfDone && t >= half;
      if (t - lastQr >= 0.1 || reached || t >= end) {
        double *q0 = y + 2, *q1 = y + 4;
        double n0 = sqrt(q0[0] * q0[0] + q0[1] * q0[1]); q0[0] /= n0; q0[1] /= n0;
        double d = q0[0] * q1[0] + q0[1] * q1[1]; q1[0] -= d * q0[0]; q1[1] -= d * q0[1];
        double n1 = sqrt(q1[0] * q1[0] + q1[1] * q1[1]); q1[0] /= n1; q1[1] /= n1;
        l[0] += log(n0); l[1] += log(n1); lastQr = t; s.fresh = 0;
      }
      if (reached) halfDone = 1;
    }
    double ordered[4 * MAXP]; int stored = count < 2 * MAXP ? count : 2 * MAXP;
    for (int i = 0; i < stored; i++) { int slot = (count - stored + i) % (2 * MAXP); ordered[2 * i] = w[2 * slot]; ordered[2 * i + 1] = w[2 * slot + 1]; }
    sum += l[0] / (end - start) + l[1] / (end - start) + period(ordered, stored);
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

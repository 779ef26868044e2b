/* Reference Biot-Savart kernel in C, for testdata/bench/compare_numpy.py:
 * the same closed form as the numpy and Loopwise versions (field of a
 * straight segment, B = mu0/4pi (r1 x r2)(|r1|+|r2|)/(|r1||r2|(|r1||r2| +
 * r1.r2))), structure-of-arrays inputs, the inner loop over segments
 * vectorised by the compiler (OpenMP SIMD reduction), points shared among
 * threads. Built by the script with the system C compiler when one is
 * present (cc -O3 -march=native -fno-math-errno -fopenmp: without
 * -fno-math-errno GCC 12 leaves the loop scalar, as sqrt may set errno);
 * never part of the Go build.
 *
 *   bs SEGMENTS POINTS OUT REPEATS      (files as for ../kernel)
 *
 * Prints the best wall time in seconds of REPEATS runs. */
#include <math.h>
#include <omp.h>
#include <stdio.h>
#include <stdlib.h>

static double *readf(const char *path, long *n) {
    FILE *f = fopen(path, "rb");
    if (!f) { perror(path); exit(1); }
    fseek(f, 0, SEEK_END);
    long bytes = ftell(f);
    fseek(f, 0, SEEK_SET);
    double *d = malloc(bytes);
    if (fread(d, 1, bytes, f) != (size_t)bytes) { perror(path); exit(1); }
    fclose(f);
    *n = bytes / 8;
    return d;
}

int main(int argc, char **argv) {
    if (argc != 5) { fprintf(stderr, "usage: bs SEGMENTS POINTS OUT REPEATS\n"); return 1; }
    long ns, np_;
    double *s = readf(argv[1], &ns), *p = readf(argv[2], &np_);
    long n = ns / 6, m = np_ / 3;
    int reps = atoi(argv[4]);
    double *ax = malloc(n * 8), *ay = malloc(n * 8), *az = malloc(n * 8);
    double *bx = malloc(n * 8), *by = malloc(n * 8), *bz = malloc(n * 8);
    for (long k = 0; k < n; k++) {
        ax[k] = s[6 * k]; ay[k] = s[6 * k + 1]; az[k] = s[6 * k + 2];
        bx[k] = s[6 * k + 3]; by[k] = s[6 * k + 4]; bz[k] = s[6 * k + 5];
    }
    double *out = malloc(m * 3 * 8);
    const double c = 1.25663706212e-6 / (4 * M_PI);
    double best = 1e300;
    for (int r = 0; r < reps; r++) {
        double t0 = omp_get_wtime();
#pragma omp parallel for schedule(static)
        for (long i = 0; i < m; i++) {
            double px = p[3 * i], py = p[3 * i + 1], pz = p[3 * i + 2];
            double sx = 0, sy = 0, sz = 0;
#pragma omp simd reduction(+ : sx, sy, sz)
            for (long k = 0; k < n; k++) {
                double r1x = ax[k] - px, r1y = ay[k] - py, r1z = az[k] - pz;
                double r2x = bx[k] - px, r2y = by[k] - py, r2z = bz[k] - pz;
                double n1 = sqrt(r1x * r1x + r1y * r1y + r1z * r1z);
                double n2 = sqrt(r2x * r2x + r2y * r2y + r2z * r2z);
                double dot = r1x * r2x + r1y * r2y + r1z * r2z;
                double f = (n1 + n2) / (n1 * n2 * (n1 * n2 + dot));
                sx += f * (r1y * r2z - r1z * r2y);
                sy += f * (r1z * r2x - r1x * r2z);
                sz += f * (r1x * r2y - r1y * r2x);
            }
            out[3 * i] = c * sx; out[3 * i + 1] = c * sy; out[3 * i + 2] = c * sz;
        }
        double t = omp_get_wtime() - t0;
        if (t < best) best = t;
    }
    FILE *f = fopen(argv[3], "wb");
    fwrite(out, 8, m * 3, f);
    fclose(f);
    printf("%.6f\n", best);
    return 0;
}

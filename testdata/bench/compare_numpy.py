#!/usr/bin/env python3
"""Time the Biot-Savart sum of many straight segments at many points three
ways on the same inputs in one run, interleaved: the best vectorised numpy
formulation we could write, Loopwise's kernel (builtins/em.Fields), and a C
reference kernel (testdata/bench/ckernel/bs.c, compiled with the system C
compiler at -O3 -march=native -fno-math-errno with OpenMP SIMD, when one
is present). It
checks that all three agree and prints interactions per second and ratios,
each the median of RUNS interleaved runs.

Needs Debian's numpy:  apt-get install python3-numpy   (and gcc for the C kernel)
Run from the repository root:
    /usr/bin/python3 testdata/bench/compare_numpy.py [N=M ...] [--runs 5]
(default sizes 2000 and 10000: N segments at M = N points).

The numpy formulation: the closed-form field of a finite straight segment,
B = mu0/4pi (r1 x r2)(|r1|+|r2|)/(|r1||r2|(|r1||r2| + r1.r2)), on separate
x, y, z component arrays (no 3-vector temporaries, no np.cross), broadcast
over a block of points against a chunk of segments sized to stay in cache,
every intermediate written into a preallocated buffer with out=, no Python
loop over single points or segments.
"""
import os
import shutil
import statistics
import subprocess
import sys
import tempfile
import time

import numpy as np

MU0_4PI = 1.25663706212e-6 / (4 * np.pi)


def coil_segments(n):
    """A helical coil polygonised into n segments: 10 per turn, radius 20 mm,
    pitch 0.5 mm per turn, along z."""
    t = np.arange(n + 1) * (2 * np.pi / 10)
    pts = np.stack([0.02 * np.cos(t), 0.02 * np.sin(t), 0.0005 * t / (2 * np.pi)], axis=1)
    return np.concatenate([pts[:-1], pts[1:]], axis=1)


def field_points(m):
    """m points on a plane grid beside and inside the coil (x-z plane, y = 3 mm)."""
    k = int(np.ceil(np.sqrt(m)))
    x, z = np.meshgrid(np.linspace(-0.05, 0.05, k), np.linspace(-0.1, 0.6, k))
    pts = np.stack([x.ravel(), np.full(x.size, 0.003), z.ravel()], axis=1)
    return np.ascontiguousarray(pts[:m])


def numpy_field(segs, pts, pblock=8, schunk=4096):
    ax, ay, az = (np.ascontiguousarray(segs[:, k]) for k in range(3))
    bx, by, bz = (np.ascontiguousarray(segs[:, k]) for k in range(3, 6))
    out = np.zeros_like(pts)
    P, S = pblock, min(schunk, len(segs))
    buf = {k: np.empty((P, S)) for k in
           ("r1x", "r1y", "r1z", "r2x", "r2y", "r2z", "n1", "n2", "d", "t", "f")}
    for i in range(0, len(pts), P):
        p = pts[i:i + P]
        q = len(p)
        px, py, pz = p[:, 0:1], p[:, 1:2], p[:, 2:3]
        for j in range(0, len(segs), S):
            s = min(S, len(segs) - j)
            v = {k: b[:q, :s] for k, b in buf.items()}
            sl = slice(j, j + s)
            np.subtract(ax[None, sl], px, out=v["r1x"])
            np.subtract(ay[None, sl], py, out=v["r1y"])
            np.subtract(az[None, sl], pz, out=v["r1z"])
            np.subtract(bx[None, sl], px, out=v["r2x"])
            np.subtract(by[None, sl], py, out=v["r2y"])
            np.subtract(bz[None, sl], pz, out=v["r2z"])
            r1x, r1y, r1z, r2x, r2y, r2z = (v[k] for k in ("r1x", "r1y", "r1z", "r2x", "r2y", "r2z"))
            n1, n2, d, t, f = v["n1"], v["n2"], v["d"], v["t"], v["f"]
            np.multiply(r1x, r1x, out=n1); np.multiply(r1y, r1y, out=t); n1 += t
            np.multiply(r1z, r1z, out=t); n1 += t; np.sqrt(n1, out=n1)
            np.multiply(r2x, r2x, out=n2); np.multiply(r2y, r2y, out=t); n2 += t
            np.multiply(r2z, r2z, out=t); n2 += t; np.sqrt(n2, out=n2)
            np.multiply(r1x, r2x, out=d); np.multiply(r1y, r2y, out=t); d += t
            np.multiply(r1z, r2z, out=t); d += t
            np.multiply(n1, n2, out=t)           # t = n1 n2
            d += t                               # d = n1 n2 + r1.r2
            d *= t                               # d = n1 n2 (n1 n2 + r1.r2)
            np.add(n1, n2, out=f)
            f /= d
            # (r1 x r2) . weights, summed over the segment chunk
            np.multiply(r1y, r2z, out=t); np.multiply(r1z, r2y, out=d); t -= d; t *= f
            out[i:i + q, 0] += t.sum(axis=1)
            np.multiply(r1z, r2x, out=t); np.multiply(r1x, r2z, out=d); t -= d; t *= f
            out[i:i + q, 1] += t.sum(axis=1)
            np.multiply(r1x, r2y, out=t); np.multiply(r1y, r2x, out=d); t -= d; t *= f
            out[i:i + q, 2] += t.sum(axis=1)
    out *= MU0_4PI
    return out


def run_exe(args):
    res = subprocess.run(args, check=True, capture_output=True, text=True)
    return float(res.stdout.strip())


def compare(n, runs, tmp, go_exe, c_exe):
    segs, pts = coil_segments(n), field_points(n)
    sp, pp = os.path.join(tmp, f"segs{n}.bin"), os.path.join(tmp, f"pts{n}.bin")
    gop, cop = os.path.join(tmp, f"go{n}.bin"), os.path.join(tmp, f"c{n}.bin")
    segs.astype('<f8').tofile(sp)
    pts.astype('<f8').tofile(pp)
    times = {"numpy": [], "Loopwise": [], "C": []}
    ref = None
    for _ in range(runs):  # interleaved: one run of each in turn
        t0 = time.perf_counter()
        ref = numpy_field(segs, pts)
        times["numpy"].append(time.perf_counter() - t0)
        times["Loopwise"].append(run_exe([go_exe, sp, pp, gop, "1"]))
        if c_exe:
            times["C"].append(run_exe([c_exe, sp, pp, cop, "1"]))
    scale = np.linalg.norm(ref, axis=1).max()
    got = np.fromfile(gop, dtype='<f8').reshape(-1, 3)
    devs = {"Loopwise": np.abs(got - ref).max() / scale}
    if c_exe:
        devs["C"] = np.abs(np.fromfile(cop, dtype='<f8').reshape(-1, 3) - ref).max() / scale
    pairs = float(n) * n
    med = {k: statistics.median(v) for k, v in times.items() if v}
    print(f"\nN = M = {n} ({pairs:.2e} interactions), median of {runs} interleaved runs, {os.cpu_count()} CPUs")
    print(f"{'':10s} {'time [s]':>10s} {'interactions/s':>15s} {'vs numpy':>9s}")
    for k in ("numpy", "Loopwise", "C"):
        if k in med:
            print(f"{k:10s} {med[k]:10.4f} {pairs / med[k]:15.3e} {med['numpy'] / med[k]:8.2f}x")
    if "C" in med:
        print(f"Loopwise / C reference (fraction of the limit): {med['C'] / med['Loopwise']:.3f}")
    for k, d in devs.items():
        print(f"largest deviation of {k} from numpy / max |B|: {d:.2e}")
    if max(devs.values()) > 1e-10:
        print("FAIL: the kernels disagree")
        sys.exit(1)


def main():
    args = sys.argv[1:]
    runs = 5
    if "--runs" in args:
        k = args.index("--runs")
        runs = int(args[k + 1])
        del args[k:k + 2]
    sizes = [int(a) for a in args] or [2000, 10000]
    with tempfile.TemporaryDirectory() as tmp:
        go_exe = os.path.join(tmp, "kernel")
        subprocess.run(["go", "build", "-o", go_exe, "./testdata/bench/kernel"], check=True)
        c_exe = None
        cc = shutil.which("cc") or shutil.which("gcc")
        if cc:
            c_exe = os.path.join(tmp, "bs")
            try:
                # -fno-math-errno: without it GCC keeps sqrt a call that may
                # set errno and leaves the loop scalar ("control flow in
                # loop"), whatever the omp simd pragma says. It changes no
                # result: the square roots here are of sums of squares.
                subprocess.run([cc, "-O3", "-march=native", "-fno-math-errno", "-fopenmp", "-o", c_exe,
                                "testdata/bench/ckernel/bs.c", "-lm"], check=True)
            except subprocess.CalledProcessError:
                print("no C reference: the C compiler failed")
                c_exe = None
        else:
            print("no C reference: no C compiler found")
        for n in sizes:
            compare(n, runs, tmp, go_exe, c_exe)


if __name__ == "__main__":
    main()

#!/usr/bin/env python3
"""Time the Biot-Savart sum of many straight segments at many points in
vectorized numpy and in Loopwise's kernel (builtins/em.Fields), on the same
inputs in one run; check that they agree and print the speed ratio.

Needs Debian's numpy:  apt-get install python3-numpy
Run from the repository root:  /usr/bin/python3 testdata/bench/compare_numpy.py [segments] [points]
(defaults 10000 and 10000).

The numpy version is written the way a physicist would: the closed-form
field of a finite straight segment, B = mu0/4pi (r1 x r2)(|r1|+|r2|) /
(|r1||r2|(|r1||r2| + r1.r2)), broadcast over all segments for a block of
points at a time (blocks keep the temporaries to ~100 MB).
"""
import os
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
    return pts[:m]


def numpy_field(segs, pts, block=400):
    a, b = segs[:, 0:3], segs[:, 3:6]
    out = np.empty_like(pts)
    for i in range(0, len(pts), block):
        p = pts[i:i + block, None, :]
        r1 = a[None, :, :] - p
        r2 = b[None, :, :] - p
        n1 = np.linalg.norm(r1, axis=2)
        n2 = np.linalg.norm(r2, axis=2)
        dot = np.einsum('ijk,ijk->ij', r1, r2)
        f = MU0_4PI * (n1 + n2) / (n1 * n2 * (n1 * n2 + dot))
        out[i:i + block] = np.einsum('ij,ijk->ik', f, np.cross(r1, r2))
    return out


def main():
    n = int(sys.argv[1]) if len(sys.argv) > 1 else 10000
    m = int(sys.argv[2]) if len(sys.argv) > 2 else 10000
    segs, pts = coil_segments(n), field_points(m)
    with tempfile.TemporaryDirectory() as tmp:
        sp, pp, op = (os.path.join(tmp, f) for f in ("segs.bin", "pts.bin", "out.bin"))
        segs.astype('<f8').tofile(sp)
        pts.astype('<f8').tofile(pp)
        exe = os.path.join(tmp, "kernel")
        subprocess.run(["go", "build", "-o", exe, "./testdata/bench/kernel"], check=True)

        best_np = float("inf")
        for _ in range(2):
            t0 = time.perf_counter()
            ref = numpy_field(segs, pts)
            best_np = min(best_np, time.perf_counter() - t0)

        res = subprocess.run([exe, sp, pp, op, "3"], check=True, capture_output=True, text=True)
        best_go = float(res.stdout.strip())
        got = np.fromfile(op, dtype='<f8').reshape(-1, 3)

    scale = np.linalg.norm(ref, axis=1).max()
    dev = np.abs(got - ref).max() / scale
    print(f"{n} segments x {m} points ({n * m:.2e} pairs), {os.cpu_count()} CPUs")
    print(f"numpy (vectorized, best of 2):   {best_np:8.3f} s")
    print(f"Loopwise kernel (best of 3):     {best_go:8.3f} s")
    print(f"largest deviation / max |B|:     {dev:.2e}")
    print(f"ratio numpy / Loopwise:          {best_np / best_go:.1f}x")
    if dev > 1e-10:
        print("FAIL: the two disagree")
        sys.exit(1)


if __name__ == "__main__":
    main()

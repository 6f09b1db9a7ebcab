#!/usr/bin/env python3
"""Straightforward NumPy implementations of the benchmark jobs, for speed ratios only.

Same cases as SynthesisBench.java:
  grid64  1 m cube, k <= 32*pi/L (indices <= 32 per axis), E on a 64^3 cell-centred grid, via
          einsum over the separable sin/cos factors (BLAS-backed tensordot), amplitudes drawn per sample;
  grid64-io  the same, writing each sample's E to one raw float32 .npy file;
  points  1 x 1.3 x 1.7 m box, k <= 64.5 rad/m (about 2e4 modes), E at 1000 points, as one
          BLAS matrix product U (3P x M) @ amplitudes (M x S).
Usage: python3 numpy_reference.py CASE SAMPLES REPEATS   (prints median samples/s)
       REPEATS = 0 runs the job once, untimed, for timing the whole process from outside.
"""
import sys, time
import numpy as np

HBAR = 6.62607015e-34 / (2 * np.pi)
EPS0 = 8.8541878128e-12
C = 299792458.0


def box_modes(a, b, d, kmax):
    L, M, N = (int(np.floor(kmax * s / np.pi)) for s in (a, b, d))
    l, m, n = np.meshgrid(np.arange(L + 1), np.arange(M + 1), np.arange(N + 1), indexing="ij")
    l, m, n = l.ravel(), m.ravel(), n.ravel()
    kx, ky, kz = l * np.pi / a, m * np.pi / b, n * np.pi / d
    k = np.sqrt(kx**2 + ky**2 + kz**2)
    zeros = (l == 0).astype(int) + (m == 0) + (n == 0)
    keep = (zeros <= 1) & (k <= kmax) & (k > 0)
    l, m, n, kx, ky, kz, k, zeros = (v[keep] for v in (l, m, n, kx, ky, kz, k, zeros))
    pol = []
    # one-zero modes: e along the zero index's axis, N = 2
    one = zeros == 1
    e1 = np.stack([(l == 0), (m == 0), (n == 0)], axis=1)[one].astype(float) * 2.0
    pol.append((l[one], m[one], n[one], k[one], e1))
    full = zeros == 0
    kr = np.hypot(kx[full], ky[full])
    te = np.stack([-ky[full] / kr, kx[full] / kr, 0 * kr], axis=1) * np.sqrt(8)
    tm = np.stack([-kx[full] * kz[full] / (kr * k[full]), -ky[full] * kz[full] / (kr * k[full]), kr / k[full]], axis=1) * np.sqrt(8)
    pol.append((l[full], m[full], n[full], k[full], te))
    pol.append((l[full], m[full], n[full], k[full], tm))
    cat = lambda i: np.concatenate([p[i] for p in pol])
    return cat(0), cat(1), cat(2), cat(3), cat(4), (L, M, N)


def grid64_io(samples, rng, path="/tmp/stillfield-bench-grid64.npy"):
    """grid64 with every sample's E written to one raw .npy file (float32), as a user would."""
    out = np.lib.format.open_memmap(path, mode="w+", dtype=np.float32, shape=(samples, 3, 64, 64, 64))
    modes = None
    for s in range(samples):
        modes, npts, field = grid64(1, rng, keep=True)
        out[s] = field
    out.flush()
    del out
    return modes, npts


def grid64(samples, rng, keep=False):
    a = b = d = 1.0
    l, m, n, k, e, (L, M, N) = box_modes(a, b, d, 32 * np.pi * (1 + 1e-12))
    V = a * b * d
    sigma = np.sqrt(HBAR * C * k / (2 * EPS0 * V))
    x = (np.arange(64) + 0.5) / 64
    idx = np.arange(L + 1)
    S = np.sin(np.pi * np.outer(x, idx))
    Cc = np.cos(np.pi * np.outer(x, idx))
    out = np.empty((3, 64, 64, 64))
    for _ in range(samples):
        amp = sigma * rng.standard_normal(len(k))
        for comp, pattern in enumerate(("css", "scs", "ssc")):
            c = np.zeros((L + 1, M + 1, N + 1))
            np.add.at(c, (l, m, n), amp * e[:, comp])
            f = [Cc if p == "c" else S for p in pattern]
            out[comp] = np.einsum("lmn,il,jm,kn->ijk", c, f[0], f[1], f[2], optimize=True)
    if keep:
        return len(k), 64**3, out
    return len(k), 64**3


def points(samples, rng):
    a, b, d = 1.0, 1.3, 1.7
    l, m, n, k, e, _ = box_modes(a, b, d, 64.5)
    V = a * b * d
    sigma = np.sqrt(HBAR * C * k / (2 * EPS0 * V))
    P = 1000
    pts = rng.random((P, 3)) * np.array([a, b, d])
    tx = np.pi * np.outer(pts[:, 0], l / a)
    ty = np.pi * np.outer(pts[:, 1], m / b)
    tz = np.pi * np.outer(pts[:, 2], n / d)
    U = np.concatenate([
        e[:, 0] * np.cos(tx) * np.sin(ty) * np.sin(tz),
        e[:, 1] * np.sin(tx) * np.cos(ty) * np.sin(tz),
        e[:, 2] * np.sin(tx) * np.sin(ty) * np.cos(tz)])
    amps = sigma[:, None] * rng.standard_normal((len(k), samples))
    E = U @ amps
    return len(k), P


def main():
    case = sys.argv[1] if len(sys.argv) > 1 else "grid64"
    samples = int(sys.argv[2]) if len(sys.argv) > 2 else 20
    repeats = int(sys.argv[3]) if len(sys.argv) > 3 else 5
    fn = {"grid64": grid64, "grid64-io": grid64_io, "points": points}[case]
    rng = np.random.default_rng(1)
    if repeats == 0:
        fn(samples, rng)
        return
    rates = []
    for r in range(repeats + 1):
        t0 = time.perf_counter()
        modes, npts = fn(samples, rng)
        sec = time.perf_counter() - t0
        if r > 0:
            rates.append(samples / sec)
    print(f"numpy {case} modes={modes} points={npts} samples={samples} median_samples_per_s={np.median(rates):.4g}")


if __name__ == "__main__":
    main()

#!/usr/bin/env python3
"""Side-by-side whole-process comparison of kgain with our NumPy peer (bench/numpy_peer.py).

Both analyse the linearised 2-D Euler case of bench/peer-euler2d.toml (C4 central differences,
classical RK4). For each task the two commands run alternately (kgain, peer, kgain, peer, ...)
after one warm-up pair; the table gives the median wall time of each, the median peer/kgain
ratio with its min and max over the pairs, and the peak resident memory of each process.

Tasks and agreement checks:
  radius  kgain's radius map vs `numpy_peer.py radius` on N x N (numpy.allclose, atol 1e-9);
  limit   kgain's Courant limit vs the closed form 2 sqrt(2) (|u| + c) / (M (|u + v| + c sqrt(2)))
          (M the largest C4 modified wavenumber, RK4's imaginary-axis limit 2 sqrt(2)) to 1e-9,
          and vs the peer's grid bisection: the peer's value must equal the same closed form
          restricted to the grid nodes (to 1e-9) and can only lie above kgain's exact value;
  growth  kgain's envelope max ||G^n||_2 (identity norm: scan.weights = [1, 1, 1, 1]) vs
          `numpy_peer.py growth` (relative 1e-9).

Peak memory: each command runs under GNU time (`/usr/bin/time -f %M -o FILE`), which reports the
peak resident set size of that process alone. Without /usr/bin/time the column says n/a: the
rusage Python can read itself is no substitute, because Linux carries the parent's peak RSS into
a child across fork and exec (a child's ru_maxrss from os.wait4 starts at compare.py's own RSS,
and getrusage(RUSAGE_CHILDREN).ru_maxrss is a maximum over all children, not a sum).
Wall times are taken around the wrapped command, so both sides carry GNU time's own start-up
(about a millisecond); the peer's include the Python start and the numpy import, as a user sees.

  whole   every analysis of kgain on N x N against the peer's radius-only map on the same grid
          (the headline target); radius maps compared to 1e-9.
  matrix  kgain alone: radius, limit, growth, dispersion and all four on N x N, 1 and 2 threads,
          median wall time, peak RSS and the size of the arrays written (no peer).

Usage: python3 bench/compare.py [--runs 5] [--points 513] [--limit-points 129]
                                [--growth-points 257] [--steps 100] [--threads 0]
                                [--only radius,limit,growth,whole,matrix|all]
Needs target/release/kgain (cargo build --release) and numpy; nothing outside the repository.
Exits 1 when any agreement check fails.
"""
import argparse
import json
import os
import statistics
import subprocess
import sys
import tempfile
import time

import numpy as np

ROOT = os.path.dirname(os.path.dirname(os.path.abspath(__file__)))
KGAIN = os.path.join(ROOT, "target", "release", "kgain")
PEER = os.path.join(ROOT, "bench", "numpy_peer.py")
CASE = os.path.join(ROOT, "bench", "peer-euler2d.toml")
TASKS = ("radius", "limit", "growth", "whole", "matrix")

# The case's physics, restated here so the closed forms do not depend on the peer's code.
VELOCITY = np.array([0.5, 0.2])
SOUND_SPEED = 1.0  # sqrt(gamma p / rho) with rho = 1, p = 1/gamma
RK4_IMAGINARY_LIMIT = 2.0 * np.sqrt(2.0)  # |R(iy)| <= 1 iff |y| <= 2 sqrt(2) (common practice)


def c4_wavenumber(theta):
    return (8.0 * np.sin(theta) - np.sin(2.0 * theta)) / 6.0


def c4_wavenumber_max():
    """Largest C4 modified wavenumber: k'(t) = (4 cos t - 2 cos^2 t + 1) / 3 = 0 at
    cos t = 1 - sqrt(3/2), so M = sin t (8 - 2 cos t) / 6."""
    cos_t = 1.0 - np.sqrt(1.5)
    return np.sqrt(1.0 - cos_t**2) * (8.0 - 2.0 * cos_t) / 6.0


def courant_limit(largest_frequency):
    """RK4 on a purely imaginary spectrum: dt |lambda| <= 2 sqrt(2) with dt = C h / (|u| + c), h = 1.
    `largest_frequency` is max |lambda| h; the eigenvalues of k_x A + k_y B are
    u.k (twice) and u.k +- c |k|, so it is max of |u.k| + c |k|."""
    return RK4_IMAGINARY_LIMIT * (np.linalg.norm(VELOCITY) + SOUND_SPEED) / largest_frequency


def closed_form_limit():
    m = c4_wavenumber_max()  # worst wavevector: k = (M, M), both components the sign of u and v
    return courant_limit(m * abs(VELOCITY.sum()) + SOUND_SPEED * m * np.sqrt(2.0))


def grid_limit(points):
    """The same closed form with the maximum taken over the grid nodes only."""
    k = c4_wavenumber(np.linspace(-np.pi, np.pi, points))
    kx, ky = k[:, None], k[None, :]
    freq = np.abs(VELOCITY[0] * kx + VELOCITY[1] * ky) + SOUND_SPEED * np.hypot(kx, ky)
    return courant_limit(freq.max())


GNU_TIME = "/usr/bin/time"


def timed(cmd):
    """Runs one command to completion; returns (seconds, peak RSS in MiB or None, stdout)."""
    with tempfile.TemporaryDirectory() as tmp:
        rss_file = os.path.join(tmp, "rss")
        wrapped = [GNU_TIME, "-f", "%M", "-o", rss_file, *cmd] if os.path.exists(GNU_TIME) else cmd
        t0 = time.perf_counter()
        proc = subprocess.run(wrapped, capture_output=True, text=True)
        seconds = time.perf_counter() - t0
        if proc.returncode != 0:
            sys.exit(f"command failed ({proc.returncode}): {' '.join(cmd)}\n{proc.stderr}")
        rss = None
        if wrapped is not cmd:
            with open(rss_file) as f:
                rss = int(f.read().split()[-1]) / 1024.0  # GNU time's %M is in KiB
        return seconds, rss, proc.stdout


def alternate(a, b, runs):
    """Warm-up pair, then `runs` alternating pairs. Returns per-command times, peaks, last stdout."""
    timed(a), timed(b)
    rows = {"kgain": ([], []), "peer": ([], [])}
    last = {}
    for _ in range(runs):
        for name, cmd in (("kgain", a), ("peer", b)):
            sec, rss, out = timed(cmd)
            rows[name][0].append(sec)
            rows[name][1].append(rss)
            last[name] = out
    return rows, last


def kgain_cmd(out, threads, *sets):
    cmd = [KGAIN, "run", CASE, "--out", out, "--force", "--quiet"]
    for s in sets:
        cmd += ["--set", s]
    return cmd + ([] if threads == 0 else ["--threads", str(threads)])


def peer_cmd(*args):
    return [sys.executable, PEER, *args]


def task_radius(a, tmp):
    n = a.points
    k = kgain_cmd(os.path.join(tmp, "rk"), a.threads, f"scan.points=[{n},{n}]", 'scan.analyses=["radius"]')
    p = peer_cmd("radius", "--points", str(n), "--out", os.path.join(tmp, "rp"))
    rows, _ = alternate(k, p, a.runs)
    ours = np.load(os.path.join(tmp, "rk", "radius.npy"))
    peer = np.load(os.path.join(tmp, "rp", "radius.npy"))
    same_shape = ours.shape == peer.shape
    diff = np.abs(ours - peer).max() if same_shape else np.inf
    ok = same_shape and np.allclose(ours, peer, rtol=0, atol=1e-9)
    return f"radius map {n}x{n}", rows, [(ok, f"maps agree (atol 1e-9): max diff {diff:.1e}")]


def task_limit(a, tmp):
    n = a.limit_points
    out = os.path.join(tmp, "lk")
    k = kgain_cmd(out, a.threads, f"scan.points=[{n},{n}]", 'scan.analyses=["limit"]')
    p = peer_cmd("limit", "--points", str(n))
    rows, last = alternate(k, p, a.runs)
    with open(os.path.join(out, "summary.json")) as f:
        got = json.load(f)["limit"]["courant_max"]
    peer = json.loads(last["peer"])["courant_max"]
    closed, on_grid = closed_form_limit(), grid_limit(n)
    both = got is not None and peer is not None
    nan = float("nan")
    checks = [
        (got is not None and abs(got - closed) <= 1e-9 * closed,
         f"kgain {number(got)} vs closed form {closed:.10f}: error {abs((got or nan) - closed):.1e}"),
        (peer is not None and abs(peer - on_grid) <= 1e-9 * on_grid,
         f"peer {number(peer)} vs closed form on the {n}^2 nodes {on_grid:.10f}:"
         f" error {abs((peer or nan) - on_grid):.1e}"),
        (both and peer >= got * (1 - 1e-9),
         f"peer's grid bisection lies above kgain's exact limit by {(peer - got) if both else nan:.1e}"
         " (the grid misses the worst wavevector)"),
    ]
    return f"Courant limit ({n}x{n} grid)", rows, checks


def task_growth(a, tmp):
    n, s = a.growth_points, a.steps
    k = kgain_cmd(os.path.join(tmp, "gk"), a.threads, f"scan.points=[{n},{n}]", f"scan.steps={s}",
                  'scan.analyses=["growth"]', "scan.weights=[1,1,1,1]")
    p = peer_cmd("growth", "--points", str(n), "--steps", str(s), "--out", os.path.join(tmp, "gp"))
    rows, _ = alternate(k, p, a.runs)
    ours = np.load(os.path.join(tmp, "gk", "growth.npy"))
    peer = np.load(os.path.join(tmp, "gp", "growth.npy"))
    same_shape = ours.shape == peer.shape
    rel = (np.abs(ours - peer) / np.maximum(np.abs(peer), 1e-300)).max() if same_shape else np.inf
    ok = same_shape and rel <= 1e-9
    return (f"growth envelope {n}x{n}, {s} steps", rows,
            [(ok, f"envelopes agree (rel 1e-9): max rel diff {rel:.1e}, peak {ours.max():.6f}")])


def task_whole(a, tmp):
    """The issue's headline target: every analysis of kgain on N x N against the peer's radius-only
    map on the same grid (both whole processes)."""
    n = a.points
    k = kgain_cmd(os.path.join(tmp, "wk"), a.threads, f"scan.points=[{n},{n}]")
    p = peer_cmd("radius", "--points", str(n), "--out", os.path.join(tmp, "wp"))
    rows, _ = alternate(k, p, a.runs)
    ours = np.load(os.path.join(tmp, "wk", "radius.npy"))
    peer = np.load(os.path.join(tmp, "wp", "radius.npy"))
    ok = ours.shape == peer.shape and np.allclose(ours, peer, rtol=0, atol=1e-9)
    return f"all four analyses {n}x{n} vs peer radius", rows, [(ok, "radius maps of the two runs agree (atol 1e-9)")]


def analysis_matrix(a, tmp):
    """kgain alone: each analysis and all four on N x N, 1 and 2 threads; median wall time and
    peak RSS of `runs` runs, plus the size of the arrays written."""
    n = a.points
    print(f"\nkgain alone on the {n}x{n} peer case: median of {a.runs} runs, peak RSS (GNU time %M)")
    head = f"{'analyses':<12} {'1 thread s':>11} {'2 threads s':>12} {'speed-up':>9} {'RSS MiB (2 thr)':>16} {'arrays MiB':>11}"
    print(head)
    print("-" * len(head))
    for name in ("radius", "limit", "growth", "dispersion", "all"):
        sets = [f"scan.points=[{n},{n}]"]
        if name != "all":
            sets.append(f'scan.analyses=["{name}"]')
        med = {}
        out = os.path.join(tmp, f"m-{name}")
        for threads in (1, 2):
            runs = [timed(kgain_cmd(out, threads, *sets)) for _ in range(a.runs)]
            med[threads] = (statistics.median(r[0] for r in runs), max(r[1] or 0 for r in runs))
        arrays = sum(os.path.getsize(os.path.join(out, f)) for f in os.listdir(out) if f.endswith(".npy"))
        print(f"{name:<12} {med[1][0]:11.3f} {med[2][0]:12.3f} {med[1][0] / med[2][0]:8.2f}x"
              f" {med[2][1]:16.1f} {arrays / 2**20:11.1f}")
    return []


def mib(peaks):
    return "n/a" if None in peaks else f"{max(peaks):.1f}"


def number(x):
    return "none" if x is None else f"{x:.10f}"


def report(results, runs):
    head = (f"{'task':<34} {'kgain s':>9} {'peer s':>9} {'peer/kgain':>11} {'(min-max)':>14}"
            f" {'kgain MiB':>10} {'peer MiB':>9}")
    source = "GNU time %M" if os.path.exists(GNU_TIME) else "n/a: /usr/bin/time not found"
    print(f"\nmedian of {runs} alternating runs (after one warm-up pair); peak RSS of each process ({source})")
    print(head)
    print("-" * len(head))
    for name, rows, _ in results:
        tk, rk = rows["kgain"]
        tp, rp = rows["peer"]
        ratios = sorted(y / x for x, y in zip(tk, tp))
        print(f"{name:<34} {statistics.median(tk):9.3f} {statistics.median(tp):9.3f}"
              f" {statistics.median(ratios):10.1f}x {f'{ratios[0]:.1f}-{ratios[-1]:.1f}x':>14}"
              f" {mib(rk):>10} {mib(rp):>9}")
    print()
    failed = 0
    for name, _, checks in results:
        for ok, what in checks:
            failed += not ok
            print(f"{'ok  ' if ok else 'FAIL'} {name}: {what}")
    return failed


def parse():
    ap = argparse.ArgumentParser(description="kgain vs bench/numpy_peer.py, whole processes side by side")
    ap.add_argument("--runs", type=int, default=5, help="alternating pairs per task (default 5)")
    ap.add_argument("--points", type=int, default=513, help="radius map grid per axis (default 513)")
    ap.add_argument("--limit-points", type=int, default=129, help="Courant limit grid per axis (default 129)")
    ap.add_argument("--growth-points", type=int, default=257, help="growth envelope grid per axis (default 257)")
    ap.add_argument("--steps", type=int, default=100, help="growth envelope horizon (default 100)")
    ap.add_argument("--threads", type=int, default=0, help="kgain threads (0: all cores)")
    ap.add_argument("--only", default="all",
                    help="comma-separated subset of radius,limit,growth,whole,matrix, or all")
    a = ap.parse_args()
    chosen = TASKS if a.only == "all" else tuple(t.strip() for t in a.only.split(",") if t.strip())
    unknown = [t for t in chosen if t not in TASKS]
    if unknown or not chosen:
        ap.error(f"--only: unknown task(s) {unknown}; choose from {','.join(TASKS)} or all")
    if a.runs < 1 or min(a.points, a.limit_points, a.growth_points) < 2 or a.steps < 0 or a.threads < 0:
        ap.error("--runs >= 1, grid points >= 2, --steps >= 0 and --threads >= 0 are required")
    a.tasks = [t for t in TASKS if t in chosen]
    return a


def main():
    a = parse()
    if not os.path.exists(KGAIN):
        sys.exit(f"build kgain first: {KGAIN} not found (cargo build --release)")
    run = {"radius": task_radius, "limit": task_limit, "growth": task_growth, "whole": task_whole}
    with tempfile.TemporaryDirectory() as tmp:
        results = []
        for t in a.tasks:
            if t == "matrix":
                continue
            print(f"running {t} ...", file=sys.stderr, flush=True)
            results.append(run[t](a, tmp))
        failed = report(results, a.runs)
        if "matrix" in a.tasks:
            analysis_matrix(a, tmp)
    sys.exit(1 if failed else 0)


if __name__ == "__main__":
    main()

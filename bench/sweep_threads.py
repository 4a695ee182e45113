#!/usr/bin/env python3
"""Benchmark: a sweep of 100 small 2-D cases with kgain on 1 and on 2 threads.

`kgain sweep cases/tunnel-euler-mach.toml --vary model.mach=0:0.9:10
--vary model.flow_angle_deg=0:45:10 --set scan.points=[33,33]` (100 linearised
Euler cases, C4 + RK4, 33 x 33 wavevectors each, the default figures: radius,
limit and growth per case) as whole processes, one warm-up run each, then
alternating runs; prints the median wall time per thread count and the
speed-up, and checks that every array is byte-identical across thread counts.

Usage: python3 bench/sweep_threads.py [--runs 5] [--points 33] [--values 10]
Needs a release build (cargo build --release); the comparison is byte for byte,
so no Python package is needed.
"""
import argparse
import os
import statistics
import subprocess
import sys
import tempfile
import time

ROOT = os.path.dirname(os.path.dirname(os.path.abspath(__file__)))
KGAIN = os.path.join(ROOT, "target", "release", "kgain")
CASE = os.path.join(ROOT, "cases", "tunnel-euler-mach.toml")


def sweep(out, threads, a):
    cmd = [KGAIN, "sweep", CASE, "--vary", f"model.mach=0:0.9:{a.values}",
           "--vary", f"model.flow_angle_deg=0:45:{a.values}",
           "--set", f"scan.points=[{a.points},{a.points}]",
           "--threads", str(threads), "--out", out, "--force", "--quiet"]
    t0 = time.perf_counter()
    proc = subprocess.run(cmd, capture_output=True, text=True)
    seconds = time.perf_counter() - t0
    if proc.returncode != 0:
        sys.exit(f"kgain sweep failed ({proc.returncode}): {proc.stderr}")
    return seconds


def main():
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--runs", type=int, default=5)
    ap.add_argument("--points", type=int, default=33)
    ap.add_argument("--values", type=int, default=10, help="values per key (combinations = values^2)")
    a = ap.parse_args()
    if not os.path.exists(KGAIN):
        sys.exit(f"build kgain first: {KGAIN} not found (cargo build --release)")
    with tempfile.TemporaryDirectory() as tmp:
        outs = {t: os.path.join(tmp, f"t{t}") for t in (1, 2)}
        for t in (1, 2):
            sweep(outs[t], t, a)
        times = {1: [], 2: []}
        for _ in range(a.runs):
            for t in (1, 2):
                times[t].append(sweep(outs[t], t, a))
        same = all(
            open(os.path.join(outs[1], f), "rb").read() == open(os.path.join(outs[2], f), "rb").read()
            for f in sorted(os.listdir(outs[1])) if f.endswith(".npy") or f == "sweep.csv")
    m1, m2 = statistics.median(times[1]), statistics.median(times[2])
    n = a.values ** 2
    print(f"sweep of {n} cases ({a.points}x{a.points} each), median of {a.runs} alternating runs")
    print(f"  1 thread : {m1:.3f} s ({1000 * m1 / n:.1f} ms per case)")
    print(f"  2 threads: {m2:.3f} s")
    print(f"  speed-up : {m1 / m2:.2f}x (target >= 1.6x)")
    print(f"  {'ok  ' if same else 'FAIL'} arrays and table byte-identical on 1 and 2 threads")
    sys.exit(0 if same else 1)


if __name__ == "__main__":
    main()

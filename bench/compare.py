#!/usr/bin/env python3
"""Side-by-side whole-process timing of kgain against the NumPy peer script.

Runs each pair of commands alternately (A B A B ...) several times, reports the
median wall time of each and the ratio, and checks that the results agree:
  map:   kgain radius map vs `peer_sweep.py radius --points N` (numpy.allclose, atol 1e-9)
  limit: kgain Courant limit vs `peer_sweep.py limit --points 129` and the closed form.
Usage: python3 bench/compare.py [--runs 5] [--points 513]
Needs target/release/kgain (cargo build --release) and ../shared/bench/peer_sweep.py.
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
PEER = os.path.join(ROOT, "..", "shared", "bench", "peer_sweep.py")
CASE = os.path.join(ROOT, "bench", "peer-euler2d.toml")
CLOSED = 1.4999401157  # 2*sqrt(2) / (M (u + v + sqrt 2)) * (|u| + c), M = max C4 modified wavenumber


def timed(cmd):
    t0 = time.perf_counter()
    out = subprocess.run(cmd, check=True, capture_output=True, text=True).stdout
    return time.perf_counter() - t0, out


def pair(name, a, b, runs):
    ta, tb = [], []
    timed(a), timed(b)  # warm-up
    for _ in range(runs):
        ta.append(timed(a)[0])
        tb.append(timed(b)[0])
    ma, mb = statistics.median(ta), statistics.median(tb)
    ratios = sorted(y / x for x, y in zip(ta, tb))
    print(f"{name:<34} kgain {ma:8.3f} s   peer {mb:8.3f} s   peer/kgain median {statistics.median(ratios):7.1f}x"
          f"  (min {ratios[0]:.1f}x, max {ratios[-1]:.1f}x)")


def main():
    ap = argparse.ArgumentParser()
    ap.add_argument("--runs", type=int, default=5)
    ap.add_argument("--points", type=int, default=513)
    ap.add_argument("--threads", type=int, default=0, help="kgain threads (0: all cores)")
    a = ap.parse_args()
    thr = [] if a.threads == 0 else ["--threads", str(a.threads)]
    with tempfile.TemporaryDirectory() as tmp:
        kmap = [KGAIN, "run", CASE, "--out", os.path.join(tmp, "k"), "--force", "--quiet",
                "--set", f"scan.points=[{a.points},{a.points}]", "--set", 'scan.analyses=["radius"]'] + thr
        pmap = [sys.executable, PEER, "radius", "--points", str(a.points), "--out", os.path.join(tmp, "p")]
        pair(f"radius map {a.points}x{a.points}", kmap, pmap, a.runs)
        ours = np.load(os.path.join(tmp, "k", "radius.npy"))
        peer = np.load(os.path.join(tmp, "p", "radius.npy"))
        print(f"  maps agree to 1e-9: {np.allclose(ours, peer, rtol=0, atol=1e-9)} (max diff {np.abs(ours - peer).max():.1e})")
        klim = [KGAIN, "run", CASE, "--out", os.path.join(tmp, "l"), "--force", "--quiet",
                "--set", 'scan.analyses=["limit"]'] + thr
        plim = [sys.executable, PEER, "limit", "--points", "129"]
        pair("Courant limit (129x129 grid)", klim, plim, a.runs)
        s = json.load(open(os.path.join(tmp, "l", "summary.json")))
        got = s["limit"]["courant_max"]
        peer_val = json.loads(timed(plim)[1])["courant_max"]
        print(f"  kgain {got:.10f}  peer {peer_val:.10f}  closed form {CLOSED:.10f}"
              f"  (kgain error {abs(got - CLOSED):.1e}, peer error {abs(peer_val - CLOSED):.1e})")


if __name__ == "__main__":
    main()

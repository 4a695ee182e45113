#!/usr/bin/env python3
"""Do two kgain binaries produce the same outputs? (behaviour-preservation check)

Runs both binaries on every bundled case (cases/*.toml and bench/peer-euler2d.toml)
and compares the output folders: the same set of .npy files with the same shapes
and dtypes, every value equal to a relative tolerance (default 1e-14 of the
array's largest finite magnitude; NaN matches NaN, inf matches inf), and every
number and string in summary.json and manifest.json equal to the same
tolerance (keys that name the run itself — case_file, the file checksums — are
skipped).

Usage:
  python3 scripts/same_outputs.py OLD_KGAIN NEW_KGAIN [--rtol 1e-14] [--case NAME ...]
                                  [--set KEY=VALUE ...] [--keep DIR]
Typical use: build the previous commit in a git worktree, then
  python3 scripts/same_outputs.py ../old/target/release/kgain target/release/kgain
Exits 1 when anything differs, listing each difference.
"""
import argparse
import glob
import json
import math
import os
import subprocess
import sys
import tempfile

import numpy as np

ROOT = os.path.dirname(os.path.dirname(os.path.abspath(__file__)))
SKIP_KEYS = {"case_file"}


def run(binary, case, out, sets):
    cmd = [binary, "run", case, "--out", out, "--quiet", "--force"]
    for s in sets:
        cmd += ["--set", s]
    r = subprocess.run(cmd, capture_output=True, text=True)
    if r.returncode != 0:
        raise RuntimeError(f"{binary} on {case}: exit {r.returncode}: {r.stderr.strip()}")


def same_number(a, b, rtol, scale):
    if isinstance(a, bool) or isinstance(b, bool):
        return a == b
    if a is None or b is None:
        return a is b
    if math.isnan(a) or math.isnan(b):
        return math.isnan(a) and math.isnan(b)
    if math.isinf(a) or math.isinf(b):
        return a == b
    return abs(a - b) <= rtol * max(abs(a), abs(b), scale)


def compare_json(a, b, path, rtol, diffs):
    if isinstance(a, dict) and isinstance(b, dict):
        for k in sorted(set(a) | set(b)):
            if k in SKIP_KEYS:
                continue
            if k not in a or k not in b:
                diffs.append(f"{path}.{k}: only in {'new' if k in b else 'old'}")
                continue
            compare_json(a[k], b[k], f"{path}.{k}", rtol, diffs)
    elif isinstance(a, list) and isinstance(b, list):
        if len(a) != len(b):
            diffs.append(f"{path}: lengths {len(a)} vs {len(b)}")
            return
        for i, (x, y) in enumerate(zip(a, b)):
            compare_json(x, y, f"{path}[{i}]", rtol, diffs)
    elif isinstance(a, (int, float)) and isinstance(b, (int, float)) or a is None or b is None:
        if not same_number(a, b, rtol, 0.0):
            diffs.append(f"{path}: {a!r} vs {b!r}")
    elif a != b:
        diffs.append(f"{path}: {a!r} vs {b!r}")


def compare_arrays(old, new, rtol, diffs):
    fo = {os.path.basename(p) for p in glob.glob(os.path.join(old, "*.npy"))}
    fn = {os.path.basename(p) for p in glob.glob(os.path.join(new, "*.npy"))}
    for f in sorted(fo ^ fn):
        diffs.append(f"{f}: only in {'old' if f in fo else 'new'}")
    for f in sorted(fo & fn):
        a = np.load(os.path.join(old, f))
        b = np.load(os.path.join(new, f))
        if a.shape != b.shape or a.dtype != b.dtype:
            diffs.append(f"{f}: shape/dtype {a.shape} {a.dtype} vs {b.shape} {b.dtype}")
            continue
        if np.iscomplexobj(a):
            a, b = a.view(np.float64), b.view(np.float64)
        fin = np.isfinite(a) & np.isfinite(b)
        same_special = np.array_equal(np.isnan(a), np.isnan(b)) and np.array_equal(
            np.where(np.isinf(a), a, 0.0), np.where(np.isinf(b), b, 0.0))
        if not same_special:
            diffs.append(f"{f}: NaN/inf pattern differs")
        if fin.any():
            scale = max(np.abs(a[fin]).max(), np.abs(b[fin]).max(), 1e-300)
            err = np.abs(a[fin] - b[fin]).max() / scale
            if err > rtol:
                diffs.append(f"{f}: max relative difference {err:.2e}")


def main():
    ap = argparse.ArgumentParser(description=__doc__, formatter_class=argparse.RawDescriptionHelpFormatter)
    ap.add_argument("old")
    ap.add_argument("new")
    ap.add_argument("--rtol", type=float, default=1e-14)
    ap.add_argument("--case", action="append", default=[])
    ap.add_argument("--set", action="append", default=[])
    ap.add_argument("--keep")
    a = ap.parse_args()
    cases = sorted(glob.glob(os.path.join(ROOT, "cases", "*.toml"))) + [
        os.path.join(ROOT, "bench", "peer-euler2d.toml")]
    if a.case:
        cases = [c for c in cases if os.path.splitext(os.path.basename(c))[0] in a.case]
    tmp = a.keep or tempfile.mkdtemp()
    total = 0
    for case in cases:
        name = os.path.splitext(os.path.basename(case))[0]
        old, new = os.path.join(tmp, "old", name), os.path.join(tmp, "new", name)
        run(a.old, case, old, a.set)
        run(a.new, case, new, a.set)
        diffs = []
        compare_arrays(old, new, a.rtol, diffs)
        with open(os.path.join(old, "summary.json")) as f:
            so = json.load(f)
        with open(os.path.join(new, "summary.json")) as f:
            sn = json.load(f)
        compare_json(so, sn, "summary", a.rtol, diffs)
        with open(os.path.join(old, "manifest.json")) as f:
            mo = json.load(f)
        with open(os.path.join(new, "manifest.json")) as f:
            mn = json.load(f)
        for m in (mo, mn):
            m.pop("files", None)  # checksums of the files compared above
        compare_json(mo, mn, "manifest", a.rtol, diffs)
        print(f"{'same ' if not diffs else 'DIFF '} {name}")
        for d in diffs[:40]:
            print(f"      {d}")
        total += len(diffs)
    print("all outputs equal" if total == 0 else f"{total} difference(s)")
    sys.exit(1 if total else 0)


if __name__ == "__main__":
    main()

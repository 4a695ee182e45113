#!/usr/bin/env python3
"""Runs the README's xarray loader on the outputs of bundled cases.

The loader is the Python block after the `<!-- xarray-loader -->` marker in README.md, extracted
and executed as written, so the README cannot drift from what works. For each case (2-D, 3-D,
multistep with its computational modes, a linear user system, sampled L and G matrices, a probe
of an example program, and a `kgain sweep` folder over a numeric and a text key) it
runs kgain into a temporary folder, loads the folder into one xarray Dataset and checks that:
every array of the manifest is in the Dataset with its shape and dims; every dimension has a 1-D
coordinate of its own length; each dimension name stands for one length; units and long_name are
carried as attributes.

Usage: python3 scripts/xarray_check.py   (needs target/release/kgain, numpy and xarray)
Exits 1 on the first failed check.
"""
import json
import os
import pathlib
import re
import subprocess
import sys
import tempfile

ROOT = pathlib.Path(__file__).resolve().parent.parent
KGAIN = ROOT / "target" / "release" / "kgain"

# (case, extra --set overrides): small grids, every analysis the case asks for
CASES = [
    ("duct-acoustics.toml", ["scan.points=[33,33]"]),
    ("combustor-euler3d.toml", ["scan.points=[9,9,9]", "scan.directions=30"]),
    ("lake-rotating-waves.toml", ["scan.points=[17,17]", "scan.matrices=2"]),
    ("feedline-telegraph.toml", ["scan.points=[33]", "scan.matrices=2"]),
    ("river-sediment-growth.toml", ["scan.points=[33]", "scan.matrices=3"]),
    ("kiln-wall-heat.toml", ["scan.points=[17,17]"]),
    # a probe of a user's program (python3 + numpy): measured G, maps, frequencies
    ("../examples/probe/cgrid-shallow-water.probe.toml",
     ['scan.analyses=["radius", "growth", "dispersion"]']),
]


def loader():
    text = (ROOT / "README.md").read_text()
    match = re.search(r"<!-- xarray-loader -->\s*```python\n(.*?)```", text, re.S)
    if not match:
        sys.exit("xarray_check: no loader block after <!-- xarray-loader --> in README.md")
    scope = {}
    exec(compile(match.group(1), "README.md (xarray loader)", "exec"), scope)
    return scope["load"]


# a sweep folder too: its arrays have the varied keys as dims, their values as coords
SWEEP = ("tunnel-euler-mach.toml", ["--vary", "model.mach=0:0.9:3", "--vary", "time.method=rk4,ssprk3",
                                    "--set", "scan.points=[17,17]"])


def check(case, sets, load, tmp, command="run"):
    out = os.path.join(tmp, pathlib.Path(case).name.removesuffix(".toml") + "-" + command)
    cmd = [str(KGAIN), command, str(ROOT / "cases" / case), "--out", out, "--quiet"]
    for s in sets:
        cmd += [s] if command == "sweep" else ["--set", s]
    subprocess.run(cmd, check=True)
    arrays = json.loads(pathlib.Path(out, "manifest.json").read_text())["arrays"]
    ds = load(out)
    lengths = {}
    for name, a in arrays.items():
        var = ds[name]
        assert list(var.dims) == a["dims"], f"{case}: {name} dims {var.dims} vs {a['dims']}"
        assert list(var.shape) == a["shape"], f"{case}: {name} shape {var.shape} vs {a['shape']}"
        assert var.attrs.get("units") == a["units"] or name in ds.coords, f"{case}: {name} units"
        for dim, n in zip(a["dims"], a["shape"]):
            assert lengths.setdefault(dim, n) == n, f"{case}: dim {dim} has lengths {lengths[dim]} and {n}"
            assert dim in ds.coords, f"{case}: dim {dim} of {name} has no coordinate"
            assert ds.coords[dim].ndim == 1 and ds.coords[dim].size == n, f"{case}: coordinate {dim}"
    print(f"xarray_check: {case}: {len(arrays)} arrays, dims {sorted(lengths)}")


def main():
    if not KGAIN.exists():
        sys.exit("xarray_check: build kgain first (cargo build --release)")
    load = loader()
    with tempfile.TemporaryDirectory() as tmp:
        for case, sets in CASES:
            try:
                check(case, sets, load, tmp)
            except AssertionError as e:
                print(f"xarray_check: FAILED: {e}", file=sys.stderr)
                return 1
        try:
            check(*SWEEP, load, tmp, command="sweep")
        except AssertionError as e:
            print(f"xarray_check: FAILED (sweep): {e}", file=sys.stderr)
            return 1
    print("xarray_check: every folder loads as one labelled Dataset")
    return 0


if __name__ == "__main__":
    sys.exit(main())

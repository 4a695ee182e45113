#!/usr/bin/env python3
"""A plain NumPy Fourier (von Neumann) sweep of one scheme, written by hand: kgain's benchmark peer.

The scheme (the same case as bench/peer-euler2d.toml):
  * linearised 2-D Euler equations in primitive variables q = (rho, u, v, p) about the uniform
    state rho = 1, p = 1/gamma, gamma = 1.4 (sound speed c = sqrt(gamma p / rho) = 1) and
    velocity (U, V) = (0.5, 0.2):  q_t + A q_x + B q_y = 0 with
        A = [[U, rho, 0, 0], [0, U, 0, 1/rho], [0, 0, U, 0], [0, gamma p, 0, U]]
        B = [[V, 0, rho, 0], [0, V, 0, 0], [0, 0, V, 1/rho], [0, 0, gamma p, V]];
  * fourth-order central differences on both axes, spacing h = 1: the derivative of
    exp(i theta j) is i k(theta)/h exp(i theta j) with the modified wavenumber
        k(theta) = (8 sin(theta) - sin(2 theta)) / 6,
    so the spatial symbol is L(theta_x, theta_y) = -i (k(theta_x) A + k(theta_y) B) / h;
  * classical four-stage Runge-Kutta: G = I + Z + Z^2/2 + Z^3/6 + Z^4/24 with Z = dt L;
  * time step from the Courant number C: dt = C h / (|(U, V)| + c), the largest characteristic
    speed over all directions;
  * wavevector grid theta_d = -pi + 2 pi i / (N - 1), i = 0..N-1 (both ends included) per axis;
    maps are indexed [i_x, i_y].

G is built for the whole grid at once by broadcasting (stacked 4x4 matrices), eigenvalues come
from batched numpy.linalg.eigvals, spectral norms from numpy.linalg.norm(ord=2).

Usage (each prints one JSON line with its result and "seconds", the time spent inside):
  python3 bench/numpy_peer.py radius --points N [--courant C] --out DIR
      spectral radius of G at every node: DIR/radius.npy [N, N], DIR/theta_x.npy, DIR/theta_y.npy
  python3 bench/numpy_peer.py limit --points N
      largest stable Courant number on the grid: bisection over whole sweeps (40 steps from the
      bracket [0, 4]; stable means every |eigenvalue of G| <= 1 + 1e-12)
  python3 bench/numpy_peer.py growth --points N --steps S [--courant C] --out DIR
      transient-growth envelope max over the grid of ||G^n||_2 for n = 0..S in the identity
      norm, by batched matrix powers: DIR/growth.npy [S + 1]
"""
import argparse
import json
import os
import sys
import time

import numpy as np

GAMMA = 1.4
RHO = 1.0
PRESSURE = 1.0 / GAMMA
VELOCITY = (0.5, 0.2)
SPACING = 1.0
SOUND_SPEED = np.sqrt(GAMMA * PRESSURE / RHO)
REFERENCE_SPEED = np.hypot(*VELOCITY) + SOUND_SPEED

STABILITY_TOLERANCE = 1e-12
BISECTION_STEPS = 40
COURANT_BRACKET = (0.0, 4.0)


def flux_matrices():
    """The x and y flux Jacobians A, B of the linearised Euler equations (rho, u, v, p)."""
    u, v = VELOCITY
    gp = GAMMA * PRESSURE
    a = np.array([[u, RHO, 0, 0], [0, u, 0, 1 / RHO], [0, 0, u, 0], [0, gp, 0, u]], dtype=float)
    b = np.array([[v, 0, RHO, 0], [0, v, 0, 0], [0, 0, v, 1 / RHO], [0, 0, gp, v]], dtype=float)
    return a, b


def modified_wavenumber(theta):
    """Fourth-order central first derivative: (8 sin t - sin 2t) / 6."""
    return (8.0 * np.sin(theta) - np.sin(2.0 * theta)) / 6.0


def wavevector_axis(points):
    return np.linspace(-np.pi, np.pi, points)


def spatial_symbol(points):
    """L at every grid node, shape [N, N, 4, 4], indexed [i_x, i_y]."""
    a, b = flux_matrices()
    k = modified_wavenumber(wavevector_axis(points))
    kx = k[:, None, None, None]
    ky = k[None, :, None, None]
    return -1j * (kx * a + ky * b) / SPACING


def rk4_amplification(z):
    """I + Z + Z^2/2 + Z^3/6 + Z^4/24 for stacked matrices Z, by Horner's rule."""
    eye = np.eye(z.shape[-1])
    g = eye + z / 4.0
    for c in (3.0, 2.0, 1.0):
        g = eye + (z @ g) / c
    return g


def time_step(courant):
    return courant * SPACING / REFERENCE_SPEED


def amplification(points, courant):
    return rk4_amplification(time_step(courant) * spatial_symbol(points))


def radius_map(points, courant):
    return np.abs(np.linalg.eigvals(amplification(points, courant))).max(axis=-1)


def write_axes(out, points):
    theta = wavevector_axis(points)
    np.save(os.path.join(out, "theta_x.npy"), theta)
    np.save(os.path.join(out, "theta_y.npy"), theta)


def run_radius(args):
    os.makedirs(args.out, exist_ok=True)
    rho = radius_map(args.points, args.courant)
    np.save(os.path.join(args.out, "radius.npy"), rho)
    write_axes(args.out, args.points)
    return {"max_radius": float(rho.max())}


def run_limit(args):
    lo, hi = COURANT_BRACKET
    stable = lambda c: radius_map(args.points, c).max() <= 1.0 + STABILITY_TOLERANCE
    if stable(hi):
        return {"courant_max": None, "note": f"stable at the top of the bracket, Courant {hi}"}
    for _ in range(BISECTION_STEPS):
        mid = 0.5 * (lo + hi)
        if stable(mid):
            lo = mid
        else:
            hi = mid
    return {"courant_max": lo, "bracket_width": hi - lo}


def run_growth(args):
    os.makedirs(args.out, exist_ok=True)
    g = amplification(args.points, args.courant).reshape(-1, 4, 4)
    power = np.broadcast_to(np.eye(4, dtype=complex), g.shape).copy()
    envelope = np.empty(args.steps + 1)
    for n in range(args.steps + 1):
        envelope[n] = np.linalg.norm(power, ord=2, axis=(-2, -1)).max()
        if n < args.steps:
            power = power @ g
    np.save(os.path.join(args.out, "growth.npy"), envelope)
    write_axes(args.out, args.points)
    peak = int(envelope.argmax())
    return {"max_norm": float(envelope[peak]), "step": peak, "final_norm": float(envelope[-1])}


def positive_int(text):
    n = int(text)
    if n < 2:
        raise argparse.ArgumentTypeError(f"needs an integer >= 2, got {text}")
    return n


def parse(argv):
    ap = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    sub = ap.add_subparsers(dest="mode", required=True)
    r = sub.add_parser("radius", help="spectral radius map")
    r.add_argument("--points", type=positive_int, required=True)
    r.add_argument("--courant", type=float, default=1.0)
    r.add_argument("--out", required=True)
    lim = sub.add_parser("limit", help="largest stable Courant number by bisection")
    lim.add_argument("--points", type=positive_int, required=True)
    g = sub.add_parser("growth", help="transient-growth envelope max ||G^n||_2")
    g.add_argument("--points", type=positive_int, required=True)
    g.add_argument("--steps", type=int, required=True)
    g.add_argument("--courant", type=float, default=1.0)
    g.add_argument("--out", required=True)
    args = ap.parse_args(argv)
    if getattr(args, "courant", 1.0) <= 0 or not np.isfinite(getattr(args, "courant", 1.0)):
        ap.error("--courant must be a positive number")
    if getattr(args, "steps", 0) < 0:
        ap.error("--steps must be >= 0")
    return args


def main(argv=None):
    args = parse(argv)
    run = {"radius": run_radius, "limit": run_limit, "growth": run_growth}[args.mode]
    t0 = time.perf_counter()
    result = run(args)
    seconds = time.perf_counter() - t0
    record = {"mode": args.mode, "points": args.points}
    if hasattr(args, "courant"):
        record["courant"] = args.courant
    if hasattr(args, "steps"):
        record["steps"] = args.steps
    record.update(result)
    record["seconds"] = seconds
    print(json.dumps(record))
    return 0


if __name__ == "__main__":
    sys.exit(main())

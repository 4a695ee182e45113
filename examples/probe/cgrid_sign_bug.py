#!/usr/bin/env python3
"""The tidal-basin C-grid step of cgrid_shallow_water.py with a deliberate sign error.

Same basin, grid, exchange format and forward-backward order as cgrid_shallow_water.py, but the
pressure-gradient term of the v equation has the wrong sign:

    v+[i, j] = v[i, j] + dt * g * (h+[i, j+1] - h+[i, j]) / dy      (correct: minus)

The kind of slip made when a momentum equation is copied from x to y and edited by hand. Along y
the pair h, v then obeys h_t = -H v_y, v_t = +g h_y: elevation and velocity no longer exchange
energy as a wave, and a mode grows, for any dt > 0, wherever its y part dominates
(sin^2(theta_y/2)/dy^2 > sin^2(theta_x/2)/dx^2). Waves along x alone (theta_y = 0) are untouched
and oblique ones with a dominant x part keep |eigenvalue| = 1, so a one-dimensional test along x
would not catch it.

Usage: python3 cgrid_sign_bug.py INPUT.npy OUTPUT.npy DT
INPUT/OUTPUT: float64 arrays [3, N1, N2], variables in the order h, u, v (axis 1 is x, axis 2 is y).
"""
import sys

import numpy as np

GRAVITY = 9.81  # m/s^2
DEPTH = 20.0  # m
SPACING = (500.0, 500.0)  # m
VARIABLES = ("h", "u", "v")


def step(state, dt):
    h, u, v = state
    dx, dy = SPACING
    divergence = (u - np.roll(u, 1, axis=0)) / dx + (v - np.roll(v, 1, axis=1)) / dy
    h_new = h - dt * DEPTH * divergence
    u_new = u - dt * GRAVITY * (np.roll(h_new, -1, axis=0) - h_new) / dx
    # BUG (deliberate): "+" where the x equation above has "-"
    v_new = v + dt * GRAVITY * (np.roll(h_new, -1, axis=1) - h_new) / dy
    return np.stack([h_new, u_new, v_new])


def main(argv):
    if len(argv) != 4:
        sys.exit("usage: python3 cgrid_sign_bug.py INPUT.npy OUTPUT.npy DT")
    try:
        dt = float(argv[3])
        state = np.load(argv[1])
    except (OSError, ValueError) as err:
        sys.exit(f"cgrid_sign_bug.py: {err}")
    if not np.isfinite(dt) or dt <= 0:
        sys.exit(f"cgrid_sign_bug.py: DT must be a positive number, got {argv[3]}")
    if state.ndim != 3 or state.shape[0] != len(VARIABLES) or state.dtype != np.float64:
        sys.exit(f"cgrid_sign_bug.py: expected float64 [3, N1, N2], got {state.dtype} {state.shape}")
    with open(argv[2], "wb") as f:
        np.save(f, step(state, dt))


if __name__ == "__main__":
    main(sys.argv)

#!/usr/bin/env python3
"""One time step of linear shallow-water waves in a tidal basin on an Arakawa C-grid.

Scenario (invented): long waves in a tidal basin 20 m deep, meshed at 500 m, no rotation, no
mean current. Unknowns: surface elevation h at cell centres (i dx, j dy), velocity u on x-faces
((i + 1/2) dx, j dy) and v on y-faces (i dx, (j + 1/2) dy); array index (i, j) of every variable
names those positions. Forward-backward step: h first with the old u, v, then u, v with the new h:

    h+[i, j] = h[i, j] - dt * H * ( (u[i, j] - u[i-1, j]) / dx + (v[i, j] - v[i, j-1]) / dy )
    u+[i, j] = u[i, j] - dt * g * (h+[i+1, j] - h+[i, j]) / dx
    v+[i, j] = v[i, j] - dt * g * (h+[i, j+1] - h+[i, j]) / dy

with periodic wrap-around. Stable for sqrt(g H) dt sqrt(1/dx^2 + 1/dy^2) < 1 (det G = 1, and
|trace G| <= 2 at the shortest waves), i.e. dt < 25.2 s here.

Usage: python3 cgrid_shallow_water.py INPUT.npy OUTPUT.npy DT
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
    v_new = v - dt * GRAVITY * (np.roll(h_new, -1, axis=1) - h_new) / dy
    return np.stack([h_new, u_new, v_new])


def main(argv):
    if len(argv) != 4:
        sys.exit("usage: python3 cgrid_shallow_water.py INPUT.npy OUTPUT.npy DT")
    try:
        dt = float(argv[3])
        state = np.load(argv[1])
    except (OSError, ValueError) as err:
        sys.exit(f"cgrid_shallow_water.py: {err}")
    if not np.isfinite(dt) or dt <= 0:
        sys.exit(f"cgrid_shallow_water.py: DT must be a positive number, got {argv[3]}")
    if state.ndim != 3 or state.shape[0] != len(VARIABLES) or state.dtype != np.float64:
        sys.exit(f"cgrid_shallow_water.py: expected float64 [3, N1, N2], got {state.dtype} {state.shape}")
    with open(argv[2], "wb") as f:
        np.save(f, step(state, dt))


if __name__ == "__main__":
    main(sys.argv)

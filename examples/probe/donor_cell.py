#!/usr/bin/env python3
"""One time step of a pollutant-spill tracer in a shallow lagoon: 2-D donor-cell advection.

Scenario (invented): a dye-marked spill drifts with a steady current of (0.6, 0.3) m/s over a
periodic patch of lagoon meshed at 1 m. Scheme: first-order upwind (donor-cell) differences,
unsplit, forward Euler; for positive u, v

    q+[i, j] = q[i, j] - dt * ( u * (q[i, j] - q[i-1, j]) / dx  +  v * (q[i, j] - q[i, j-1]) / dy )

with periodic wrap-around. Stable for dt * (u/dx + v/dy) <= 1, i.e. dt <= 1/0.9 s here.

Usage: python3 donor_cell.py INPUT.npy OUTPUT.npy DT
INPUT/OUTPUT: float64 arrays [1, N1, N2] (one variable q; axis 1 is x, axis 2 is y).
"""
import sys

import numpy as np

VELOCITY = (0.6, 0.3)  # m/s, both positive: the donor cell is the one at i-1 (x) and j-1 (y)
SPACING = (1.0, 1.0)  # m
VARIABLES = ("q",)


def step(state, dt):
    (q,) = state
    u, v = VELOCITY
    dx, dy = SPACING
    back_x = (q - np.roll(q, 1, axis=0)) / dx  # (q[i] - q[i-1]) / dx
    back_y = (q - np.roll(q, 1, axis=1)) / dy  # (q[j] - q[j-1]) / dy
    return (q - dt * (u * back_x + v * back_y))[None]


def main(argv):
    if len(argv) != 4:
        sys.exit("usage: python3 donor_cell.py INPUT.npy OUTPUT.npy DT")
    try:
        dt = float(argv[3])
        state = np.load(argv[1])
    except (OSError, ValueError) as err:
        sys.exit(f"donor_cell.py: {err}")
    if not np.isfinite(dt) or dt <= 0:
        sys.exit(f"donor_cell.py: DT must be a positive number, got {argv[3]}")
    if state.ndim != 3 or state.shape[0] != len(VARIABLES) or state.dtype != np.float64:
        sys.exit(f"donor_cell.py: expected float64 [{len(VARIABLES)}, N1, N2], got {state.dtype} {state.shape}")
    with open(argv[2], "wb") as f:
        np.save(f, step(state, dt))


if __name__ == "__main__":
    main(sys.argv)

"""One time step of 2-D donor-cell (first-order upwind, forward Euler)
advection of a pollutant concentration q in the (invented) Millbrook settling
pond: a steady 0.8 m/s along-pond and 0.3 m/s cross-pond current on a 2 m grid,
periodic in both directions.

Usage: python3 donor_cell.py INPUT.npy OUTPUT.npy DT
The state has shape [1, NX, NY] (variable q), float64.
"""
import sys

import numpy as np

U, V = 0.8, 0.3  # m/s, both positive: upwind neighbours are i-1 and j-1
DX, DY = 2.0, 2.0  # m


def step(state, dt):
    q = state[0]
    nu_x, nu_y = U * dt / DX, V * dt / DY
    q_new = q - nu_x * (q - np.roll(q, 1, axis=0)) - nu_y * (q - np.roll(q, 1, axis=1))
    return q_new[np.newaxis]


if __name__ == "__main__":
    src, dst, dt = sys.argv[1], sys.argv[2], float(sys.argv[3])
    np.save(dst, step(np.load(src), dt))

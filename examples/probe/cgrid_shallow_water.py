"""One forward-backward time step of the linear shallow-water equations on a
C-grid for the (invented) Tarn Esk reservoir seiche model: 12 m deep, 250 m
cells, periodic. The depth h sits at cell centres, u on the x-faces (half a
cell along x), v on the y-faces (half a cell along y). Continuity first, then
both momentum equations with the new depth.

Usage: python3 cgrid_shallow_water.py INPUT.npy OUTPUT.npy DT
The state has shape [3, NX, NY] (variables h, u, v), float64.
"""
import sys

import numpy as np

G, DEPTH = 9.81, 12.0  # m/s^2, m
DX, DY = 250.0, 250.0  # m


def step(state, dt):
    h, u, v = state
    # u[i] is at x = i + 1/2: the divergence at centre i uses u[i] - u[i-1]
    div = (u - np.roll(u, 1, axis=0)) / DX + (v - np.roll(v, 1, axis=1)) / DY
    h_new = h - dt * DEPTH * div
    # the gradient at face i + 1/2 uses h[i+1] - h[i]
    u_new = u - dt * G * (np.roll(h_new, -1, axis=0) - h_new) / DX
    v_new = v - dt * G * (np.roll(h_new, -1, axis=1) - h_new) / DY
    return np.stack([h_new, u_new, v_new])


if __name__ == "__main__":
    src, dst, dt = sys.argv[1], sys.argv[2], float(sys.argv[3])
    np.save(dst, step(np.load(src), dt))

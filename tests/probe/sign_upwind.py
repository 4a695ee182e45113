"""Test fixture: a NONLINEAR step. A scalar u is carried at speed +1 or -1
according to the sign of u at each cell face (the mean of its two cells), first
order upwind, unit spacing. About a zero base, an impulse moves right and an
impulse of opposite sign moves left, so the step has no amplification matrix;
kgain's linearity check must say so.

Usage: python3 sign_upwind.py INPUT.npy OUTPUT.npy DT
"""
import sys

import numpy as np

src, dst, dt = sys.argv[1], sys.argv[2], float(sys.argv[3])
u = np.load(src)[0]
right = np.roll(u, -1, axis=0)
# flux through face i+1/2: +u[i] where the face value is >= 0, else -u[i+1]
flux = np.where(u + right >= 0.0, u, -right)
u_new = u - dt * (flux - np.roll(flux, 1, axis=0))
np.save(dst, u_new[np.newaxis])

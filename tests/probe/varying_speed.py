"""Test fixture: a linear step that is NOT translation-invariant. First-order
upwind advection whose speed grows along x (0.5 at the first cell, 1 at the
last), as in a channel that narrows: a variable coefficient. kgain's
translation check must say so.

Usage: python3 varying_speed.py INPUT.npy OUTPUT.npy DT
"""
import sys

import numpy as np

src, dst, dt = sys.argv[1], sys.argv[2], float(sys.argv[3])
q = np.load(src)[0]
n = q.shape[0]
speed = 0.5 + 0.5 * np.arange(n) / (n - 1)
q_new = q - dt * speed * (q - np.roll(q, 1, axis=0))
np.save(dst, q_new[np.newaxis])

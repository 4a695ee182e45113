"""Test fixture: 1-D first-order upwind advection at unit speed and unit spacing,
periodic: q_new[i] = q[i] - dt (q[i] - q[i-1])."""
import sys

import numpy as np

src, dst, dt = sys.argv[1], sys.argv[2], float(sys.argv[3])
q = np.load(src)[0]
np.save(dst, (q - dt * (q - np.roll(q, 1)))[np.newaxis])

"""Test fixture: a step program that writes its state with one cell too few."""
import sys

import numpy as np

src, dst = sys.argv[1], sys.argv[2]
np.save(dst, np.load(src)[:, :-1])

#!/usr/bin/env python3
"""Self-test of the example time-step programs in this folder against their Fourier symbols.

Each program is run as a black box (`python3 STEP.py INPUT.npy OUTPUT.npy DT`) on a small
periodic grid, and its answers are compared with an amplification matrix G(theta) evaluated
here, independently, from the discrete equations written in README.md:

  1. impulses: for each variable b, the response to a unit value of b at node (0, 0); the 2-D FFT
     of variable a of that response is G_ab at the grid wavevectors theta_d = 2 pi k_d / N_d
     (index convention: a field stored at index j is treated as exp(i theta j)). Staggered
     variables sit at (j + s) h, so the symbol in physical positions is
     exp(-i theta.s_a) G_ab exp(i theta.s_b); that is compared with the formula (to 1e-12,
     scaled by the size of G);
  2. a random state: the FFT of one step equals G (index convention) applied to the FFT of the
     state at every wavevector (to 1e-12, scaled by the size of the state's transform);
  3. the sign-bug program must differ from the correct C-grid symbol, and match the symbol of
     the bug it documents; its spectral radius exceeds 1 at a time step where the correct
     program's does not.

Prints one ok/FAIL line per check and a closing count; exits 1 on any failure.
Usage: python3 examples/probe/check_examples.py
"""
import os
import subprocess
import sys
import tempfile

import numpy as np

HERE = os.path.dirname(os.path.abspath(__file__))
GRID = (12, 9)  # unequal, one odd: a swapped axis or a lost Nyquist row shows up
TOLERANCE = 1e-12

# Parameters as stated at the top of each program.
LAGOON_VELOCITY, LAGOON_SPACING, LAGOON_DT = (0.6, 0.3), (1.0, 1.0), 0.8
BASIN_GRAVITY, BASIN_DEPTH, BASIN_SPACING, BASIN_DT = 9.81, 20.0, (500.0, 500.0), 15.0
CGRID_OFFSETS = [(0.0, 0.0), (0.5, 0.0), (0.0, 0.5)]  # h, u, v in cells

failures = []
passes = []


def check(ok, what):
    print(("ok   " if ok else "FAIL ") + what)
    (passes if ok else failures).append(what)


def wavevectors():
    """theta_x, theta_y on the grid, shape [N1, N2] each, in [-pi, pi)."""
    tx = 2 * np.pi * np.fft.fftfreq(GRID[0])
    ty = 2 * np.pi * np.fft.fftfreq(GRID[1])
    return np.meshgrid(tx, ty, indexing="ij")


def donor_cell_symbol(tx, ty, dt):
    """q+ = q - dt (u D-x q + v D-y q): the backward difference of exp(i theta j) is (1 - e^{-i theta})/h."""
    (u, v), (dx, dy) = LAGOON_VELOCITY, LAGOON_SPACING
    g = 1 - dt * u / dx * (1 - np.exp(-1j * tx)) - dt * v / dy * (1 - np.exp(-1j * ty))
    return g[..., None, None]


def cgrid_symbol(tx, ty, dt, v_gravity_sign=-1.0):
    """Forward-backward on the C-grid as the product of its two stages, in physical positions:
    staggered differences 2i sin(theta/2)/h; stage 1 updates h with the old u, v, stage 2 updates
    u, v with the new h. v_gravity_sign = +1 gives the documented sign bug."""
    g, depth, (dx, dy) = BASIN_GRAVITY, BASIN_DEPTH, BASIN_SPACING
    ddx = 2j * np.sin(tx / 2) / dx
    ddy = 2j * np.sin(ty / 2) / dy
    one, zero = np.ones_like(ddx), np.zeros_like(ddx)
    stage1 = np.stack([np.stack([one, -dt * depth * ddx, -dt * depth * ddy], -1),
                       np.stack([zero, one, zero], -1),
                       np.stack([zero, zero, one], -1)], -2)
    stage2 = np.stack([np.stack([one, zero, zero], -1),
                       np.stack([-dt * g * ddx, one, zero], -1),
                       np.stack([v_gravity_sign * dt * g * ddy, zero, one], -1)], -2)
    return stage2 @ stage1


def stagger_phases(tx, ty, offsets):
    """exp(i theta.s_a) per variable, shape [N1, N2, m]."""
    return np.stack([np.exp(1j * (tx * sx + ty * sy)) for sx, sy in offsets], -1)


def to_index_convention(g_phys, phases):
    return phases[..., :, None] * g_phys / phases[..., None, :]


def step(program, state, dt, tmp):
    src, dst = os.path.join(tmp, "in.npy"), os.path.join(tmp, "out.npy")
    np.save(src, state)
    subprocess.run([sys.executable, os.path.join(HERE, program), src, dst, repr(dt)], check=True)
    out = np.load(dst)
    if out.shape != state.shape or out.dtype != np.float64:
        raise ValueError(f"{program} wrote {out.dtype} {out.shape}, expected float64 {state.shape}")
    return out


def measured_symbol(program, m, dt, tmp):
    """G in the index convention from the FFT of impulse responses, shape [N1, N2, m, m]."""
    g = np.empty(GRID + (m, m), complex)
    for b in range(m):
        impulse = np.zeros((m,) + GRID)
        impulse[b, 0, 0] = 1.0
        response = step(program, impulse, dt, tmp)
        g[..., :, b] = np.moveaxis(np.fft.fft2(response, axes=(1, 2)), 0, -1)
    return g


def check_program(program, m, dt, symbol, offsets, tmp, rng):
    tx, ty = wavevectors()
    phases = stagger_phases(tx, ty, offsets)
    expected = symbol(tx, ty, dt)
    scale = max(1.0, np.abs(expected).max())
    measured = measured_symbol(program, m, dt, tmp)
    in_positions = phases.conj()[..., :, None] * measured * phases[..., None, :]
    err = np.abs(in_positions - expected).max()
    check(err <= TOLERANCE * scale,
          f"{program}: FFT of impulse responses equals the symbol on {GRID[0]}x{GRID[1]}, max diff {err:.1e}")
    state = rng.uniform(-1.0, 1.0, (m,) + GRID)
    after = np.fft.fft2(step(program, state, dt, tmp), axes=(1, 2))
    before = np.fft.fft2(state, axes=(1, 2))
    predicted = np.einsum("xyab,bxy->axy", to_index_convention(expected, phases), before)
    err = np.abs(after - predicted).max()
    check(err <= TOLERANCE * scale * np.abs(before).max(),
          f"{program}: one step of a random state equals G applied in Fourier space, max diff {err:.1e}")
    return measured, in_positions


def spectral_radius(g):
    return np.abs(np.linalg.eigvals(g)).max()


def main():
    rng = np.random.default_rng(20240611)
    tx, ty = wavevectors()
    with tempfile.TemporaryDirectory() as tmp:
        g, _ = check_program("donor_cell.py", 1, LAGOON_DT, donor_cell_symbol, [(0.0, 0.0)], tmp, rng)
        rho = spectral_radius(g)
        check(rho <= 1 + TOLERANCE, f"donor_cell.py: spectral radius {rho:.6f} <= 1 at dt = {LAGOON_DT} s")

        g, _ = check_program("cgrid_shallow_water.py", 3, BASIN_DT, cgrid_symbol, CGRID_OFFSETS, tmp, rng)
        rho_good = spectral_radius(g)
        check(rho_good <= 1 + 1e-9, f"cgrid_shallow_water.py: spectral radius {rho_good:.6f} <= 1 at dt = {BASIN_DT} s")

        buggy = lambda x, y, dt: cgrid_symbol(x, y, dt, v_gravity_sign=+1.0)
        _, bug_phys = check_program("cgrid_sign_bug.py", 3, BASIN_DT, buggy, CGRID_OFFSETS, tmp, rng)
        correct = cgrid_symbol(tx, ty, BASIN_DT)
        gap = np.abs(bug_phys - correct).max() / np.abs(correct).max()
        check(gap > 1e6 * TOLERANCE, f"cgrid_sign_bug.py: differs from the correct C-grid symbol, rel diff {gap:.1e}")
        rho_bug = spectral_radius(bug_phys)
        check(rho_bug > 1 + 1e-3, f"cgrid_sign_bug.py: spectral radius {rho_bug:.4f} > 1 where the correct step has {rho_good:.4f}")
        along_x = np.abs(bug_phys[:, 0] - correct[:, 0]).max()
        check(along_x <= TOLERANCE * np.abs(correct).max(),
              f"cgrid_sign_bug.py: identical to the correct step along x alone (theta_y = 0), max diff {along_x:.1e}")
    print(f"{len(passes)} passed, {len(failures)} failed")
    return 1 if failures else 0


if __name__ == "__main__":
    sys.exit(main())

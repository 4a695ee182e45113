//! The hot-loop kernels allocate nothing per call: a counting global allocator
//! (per thread, so the test harness's own threads do not interfere) watches
//! the in-place calls of every solver for m = 1..8 and, once the solver is
//! built, for m = 12 on the run-time-size path.

#[path = "support/mod.rs"]
mod support;

use kgain::linalg::nonnormal::{self, ConditionWorkspace};
use kgain::linalg::{EigSolver, LuSolver, SchurSolver, SvdSolver};
use num_complex::Complex64 as C64;
use std::alloc::{GlobalAlloc, Layout, System};
use std::cell::Cell;

struct Counting;

thread_local! {
    static ALLOCATIONS: Cell<usize> = const { Cell::new(0) };
}

// SAFETY: forwards to the system allocator unchanged; only counts.
unsafe impl GlobalAlloc for Counting {
    unsafe fn alloc(&self, layout: Layout) -> *mut u8 {
        let _ = ALLOCATIONS.try_with(|c| c.set(c.get() + 1));
        unsafe { System.alloc(layout) }
    }
    unsafe fn dealloc(&self, ptr: *mut u8, layout: Layout) {
        unsafe { System.dealloc(ptr, layout) }
    }
    unsafe fn realloc(&self, ptr: *mut u8, layout: Layout, new_size: usize) -> *mut u8 {
        let _ = ALLOCATIONS.try_with(|c| c.set(c.get() + 1));
        unsafe { System.realloc(ptr, layout, new_size) }
    }
}

#[global_allocator]
static GLOBAL: Counting = Counting;

fn allocations() -> usize {
    ALLOCATIONS.with(|c| c.get())
}

/// A fixed, non-normal test matrix with entries of mixed sign and phase.
fn sample(m: usize) -> Vec<C64> {
    (0..m * m)
        .map(|k| C64::new(((k * 7) % 11) as f64 - 5.0, ((k * 3) % 5) as f64 - 2.0))
        .collect()
}

#[test]
fn in_place_kernels_do_not_allocate_per_call() {
    // The counter sees an allocation of this thread.
    let start = allocations();
    let probe = std::hint::black_box(vec![0u8; 64]);
    assert!(allocations() > start && probe.len() == 64);
    for (m, hermitian) in (1..=8).chain([12]).flat_map(|m| [(m, false), (m, true)]) {
        // a non-normal matrix, and the Hermitian A + Aᴴ (a different path through QR)
        let a = match hermitian {
            false => sample(m),
            true => {
                let (a, ah) = (sample(m), support::kernels::adjoint(&sample(m), m));
                a.iter().zip(&ah).map(|(x, y)| x + y).collect()
            }
        };
        let mut eig = EigSolver::new(m);
        let mut schur = SchurSolver::new(m);
        let mut svd = SvdSolver::new(m);
        let mut lu = LuSolver::new(m);
        let mut cond = ConditionWorkspace::new(m);
        let mut values = vec![C64::new(0.0, 0.0); m];
        let mut vectors = vec![C64::new(0.0, 0.0); m * m];
        let mut t = vec![C64::new(0.0, 0.0); m * m];
        let mut q = vec![C64::new(0.0, 0.0); m * m];
        let mut u = vec![C64::new(0.0, 0.0); m * m];
        let mut v = vec![C64::new(0.0, 0.0); m * m];
        let mut sigma = vec![0.0; m];
        let mut b = vec![C64::new(1.0, -1.0); 2 * m];
        let mut y = vec![C64::new(0.0, 0.0); m * m];
        let mut x = vec![C64::new(0.0, 0.0); m];
        let before = allocations();
        for _ in 0..3 {
            eig.eigenvalues(&a, &mut values).expect("eigenvalues");
            eig.eigenvalues_and_vectors(&a, &mut values, &mut vectors)
                .expect("eigenvectors");
            schur.decompose(&a, &mut t, &mut q).expect("Schur form");
            svd.singular_values(&a, &mut sigma)
                .expect("singular values");
            svd.decompose(&a, &mut sigma, Some(&mut u), Some(&mut v))
                .expect("SVD");
            assert!(svd.norm2(&a).expect("norm2") >= svd.sigma_min(&a).expect("sigma_min"));
            lu.solve(&a, &mut b, 2).expect("LU solve");
            assert!(nonnormal::departure(&t, m) >= 0.0);
            nonnormal::triangular_eigenvectors(&t, m, &mut x, &mut y);
            assert!(nonnormal::eigvec_condition(&t, &mut cond).expect("condition") >= 1.0);
        }
        assert_eq!(
            allocations(),
            before,
            "m = {m} (Hermitian: {hermitian}): the kernels allocated"
        );
    }
}

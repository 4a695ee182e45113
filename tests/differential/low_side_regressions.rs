//! Named tests for seeds of the long run 6000–10999 where the engine's limit
//! lies more than 1e-6 below the reference's. In each, a check outside both
//! programs (first losses and closed forms in 40-digit mpmath arithmetic,
//! during triage) puts the truth within 1e-9 of the engine: the limit is
//! approached, not attained — at long waves (θ → 0) or at a face centre of
//! the box — and the reference reported a first loss at a finite wavevector
//! of the approach, which lies above the limit by construction. Each test
//! recomputes the closed form in f64 from the generated scheme, checks it
//! against the 40-digit truth, and asserts the engine within (1e-6 below,
//! 1e-9 above) of it.

use crate::scheme::{Mat, Method, Scheme};
use nalgebra::Matrix2;

/// The engine's limit within 1e-6 below `truth` and at most 1e-9 above it.
#[track_caller]
fn assert_near(what: &str, dt: f64, truth: f64) {
    assert!(
        dt <= truth * (1.0 + 1e-9) && dt >= truth * (1.0 - 1e-6),
        "{what}: engine {dt}, truth {truth}"
    );
}

/// The real eigenpairs (λ, l, r) of a 2×2 matrix with distinct real
/// eigenvalues, l·r = 1.
fn eigenpairs(b: &Matrix2<f64>) -> Vec<(f64, [f64; 2], [f64; 2])> {
    let (tr, det) = (b.trace(), b.determinant());
    let disc = 0.25 * tr * tr - det;
    assert!(disc > 0.0, "distinct real eigenvalues");
    [-1.0, 1.0]
        .iter()
        .map(|sign| {
            let lambda = 0.5 * tr + sign * disc.sqrt();
            // (B − λ)r = 0 and l(B − λ) = 0, from whichever row is larger
            let r = if (lambda - b[(0, 0)]).abs() + b[(0, 1)].abs()
                >= (lambda - b[(1, 1)]).abs() + b[(1, 0)].abs()
            {
                [b[(0, 1)], lambda - b[(0, 0)]]
            } else {
                [lambda - b[(1, 1)], b[(1, 0)]]
            };
            let l = if (lambda - b[(0, 0)]).abs() + b[(1, 0)].abs()
                >= (lambda - b[(1, 1)]).abs() + b[(0, 1)].abs()
            {
                [b[(1, 0)], lambda - b[(0, 0)]]
            } else {
                [lambda - b[(1, 1)], b[(0, 1)]]
            };
            let lr = l[0] * r[0] + l[1] * r[1];
            (lambda, [l[0] / lr, l[1] / lr], r)
        })
        .collect()
}

fn m2(a: &Mat) -> Matrix2<f64> {
    Matrix2::new(a[(0, 0)], a[(0, 1)], a[(1, 0)], a[(1, 1)])
}

fn project(l: &[f64; 2], x: &Matrix2<f64>, r: &[f64; 2]) -> f64 {
    (0..2)
        .map(|i| (0..2).map(|j| l[i] * x[(i, j)] * r[j]).sum::<f64>())
        .sum()
}

/// The long-wave limit of unsplit Lax–Wendroff on a 2×2 system along the unit
/// direction `n`: over the branches of B = Σ F_d n_d/h_d, the positive root of
/// ¼λ⁴Δt³ + βΔt + 2κ, β = 2 l·Q₄·r − 2λ l·C₃·r, C₃ = Σ F_d n_d³/(6h_d),
/// Q₄ = Σ F_d² n_d⁴/(24h_d²) + Σ_{d≠e} F_dF_e (n_d n_e³ + n_d³ n_e)/(12h_dh_e),
/// κ = −Σ σ s n_d⁴/(16h_d) for fourth-order dissipation −σ(s/h_d)sin⁴(θ_d/2)
/// (the |ζ|² − 1 = O(s⁴) balance; G of the reference's `amplification`
/// expanded by hand).
fn lax_wendroff_long_wave(s: &Scheme, n: &[f64]) -> f64 {
    let dims = s.dims();
    let h = &s.spacing;
    let f: Vec<Matrix2<f64>> = s.system.flux.iter().map(m2).collect();
    let mut b = Matrix2::zeros();
    let mut c3 = Matrix2::zeros();
    let mut q4 = Matrix2::zeros();
    for d in 0..dims {
        b += f[d] * (n[d] / h[d]);
        c3 += f[d] * (n[d].powi(3) / (6.0 * h[d]));
        q4 += f[d] * f[d] * (n[d].powi(4) / (24.0 * h[d] * h[d]));
        for e in (0..dims).filter(|e| *e != d) {
            q4 +=
                f[d] * f[e] * ((n[d] * n[e].powi(3) + n[d].powi(3) * n[e]) / (12.0 * h[d] * h[e]));
        }
    }
    let kappa = match s.dissipation {
        Some(dis) => {
            assert_eq!(dis.order, 4);
            -(0..dims)
                .map(|d| dis.strength * s.system.reference_speed * n[d].powi(4) / (16.0 * h[d]))
                .sum::<f64>()
        }
        None => 0.0,
    };
    eigenpairs(&b)
        .iter()
        .map(|(lambda, l, r)| {
            let alpha = 0.25 * lambda.powi(4);
            let beta = 2.0 * project(l, &q4, r) - 2.0 * lambda * project(l, &c3, r);
            let g = |t: f64| (alpha * t * t + beta) * t + 2.0 * kappa;
            assert!(kappa < 0.0 || beta < 0.0, "a root");
            let (mut lo, mut hi) = (0.0, 1.0);
            while g(hi) <= 0.0 {
                hi *= 2.0;
            }
            for _ in 0..200 {
                let mid = 0.5 * (lo + hi);
                if g(mid) <= 0.0 {
                    lo = mid;
                } else {
                    hi = mid;
                }
            }
            lo
        })
        .fold(f64::INFINITY, f64::min)
}

/// Seeds 6761, 7303 and 7872: unsplit Lax–Wendroff on 3-D 2×2 systems
/// (7872 with fourth-order dissipation σ = 0.0205). The limit is the long-wave
/// closed form of `lax_wendroff_long_wave` minimised over the sphere (numpy
/// screen and Nelder–Mead during triage): 0.43865194982404158768,
/// 0.084396757641345043560 and 0.23974063876967146260 along the directions
/// below; 40-digit first losses of G along them at s = 1.25e-3 … 7.8e-5
/// extrapolate (Richardson in s²) to the same 22 digits, and a scan of 1.3
/// million wavevectors over the box at that Δt finds ρ(G) − 1 ≤ 2.2e-16. The
/// reference's ladder missed the long waves (its bracket [0.4498, 0.4905] for
/// 6761) and it then measured the first loss at the engine's reported
/// wavevector, the smallest sample of the engine's long-wave approach at
/// |θ| ≈ 0.036 (0.43867808411 in 40 digits for 6761), which lies above the
/// limit: 6.0e-5, 3.6e-5 and 2.0e-5 above the truth. The engine is 1e-12
/// below it.
#[test]
fn lax_wendroff_long_wave_limits_below_the_engines_samples() {
    for (seed, truth, n) in [
        (
            6761,
            0.438_651_949_824_041_6,
            [
                -0.493_036_992_342_565_26,
                0.646_141_088_331_659_6,
                0.582_594_385_616_078_2,
            ],
        ),
        (
            7303,
            0.084_396_757_641_345_04,
            [
                -0.469_745_098_748_074_6,
                0.837_869_958_706_272_6,
                0.278_053_006_636_703_74,
            ],
        ),
        (
            7872,
            0.239_740_638_769_671_46,
            [
                -0.684_804_640_356_842_6,
                0.538_601_014_438_877_4,
                0.490_868_161_313_348_65,
            ],
        ),
    ] {
        let s = crate::generate::scheme(seed);
        assert!(matches!(s.method, Method::LaxWendroff), "seed {seed}");
        let closed = lax_wendroff_long_wave(&s, &n);
        assert!(
            (closed / truth - 1.0).abs() < 1e-11,
            "seed {seed}: closed form {closed}, 40-digit {truth}"
        );
        // the direction is the minimum: no direction of a 2° grid is lower
        for i in 1..90 {
            let polar = std::f64::consts::PI * f64::from(i) / 90.0;
            for j in 0..180 {
                let az = std::f64::consts::PI * f64::from(j) / 90.0;
                let m = [polar.sin() * az.cos(), polar.sin() * az.sin(), polar.cos()];
                let v = lax_wendroff_long_wave(&s, &m);
                assert!(v >= truth * (1.0 - 1e-12), "seed {seed}: {m:?} gives {v}");
            }
        }
        let e = crate::closed_forms::engine(&s);
        assert_near(&format!("seed {seed}"), e.dt_max, truth);
    }
}

/// Seed 8841: forward Euler on a 1-D 2×2 system, central differences (the
/// second-derivative stencil is unused: no diffusion) and second-order
/// dissipation −c sin²(θ/2), c = σs/h, σ = 1.22e-6. With q = sin²(θ/2) the
/// branches are μ = −iλ sin θ/h − cq, and forward Euler's first exit
/// −2 Re μ/|μ|² = 2c/(c²q + 4λ²(1 − q)/h²) increases with q (c ≪ 2|λ|/h):
/// the limit is its value at θ → 0, c h²/(2λ²) = σ s h/(2λ²) over the
/// branches, 1.3080633665138550e-7 (λ = −1.6678 = −s; 40-digit first exits
/// agree: 1.30806336654656e-7 at θ = 1e-5). The reference reported
/// 1.3081435e-7 at θ = 0.009, 6.1e-5 above (the exact first exit there is
/// 1.30808986e-7; its long-wave extrapolation did not converge).
#[test]
fn forward_euler_weak_second_order_dissipation_limit_is_at_long_waves() {
    let s = crate::generate::scheme(8841);
    let text = crate::render::case_text(&s);
    assert!(text.contains("method = \"euler\""), "{text}");
    assert!(s.first[0].is_central() && s.dims() == 1);
    assert!(s.system.diffusion[0].iter().all(|x| *x == 0.0));
    let dis = s.dissipation.expect("dissipation");
    assert_eq!(dis.order, 2);
    let h = s.spacing[0];
    let closed = s.system.flux_speeds[0]
        .iter()
        .map(|l| dis.strength * s.system.reference_speed * h / (2.0 * l * l))
        .fold(f64::INFINITY, f64::min);
    let truth = 1.308_063_366_513_855e-7;
    assert!((closed / truth - 1.0).abs() < 1e-12, "{closed}");
    let e = crate::closed_forms::engine(&s);
    assert_near("overall", e.dt_max, truth);
    for n in [[1.0], [-1.0]] {
        let dt = crate::closed_forms::engine_direction(&e, &n);
        assert_near(&format!("{n:?}"), dt, truth);
    }
}

/// Seed 8508: a two-stage explicit Runge–Kutta tableau (R(z) = 1 + z + βz²,
/// β = b₂a₂₁ = 0.35391) with Strang splitting on a 3-D 2×2 system, central
/// differences, sixth-order central diffusion. Along the y axis the x and z
/// pieces vanish and G = R(Δt L_y/2)². K_y = κ w wᵀ up to rounding (its other
/// eigenvalue is −5.6e-18 against κ = 0.17995), so at the face centre
/// θ_y = π, where sin θ_y = 0, L_y has a null eigenvalue; on its vector v
/// the branch near θ_y = π − δ is μ ≈ −iaδ − bδ² with a = vᵀF_yv/h and, by
/// second-order perturbation through the eigenvalue S(π)κ/h² of w (S the
/// diffusion stencil's symbol), b = (wᵀF_yv)²/(|S(π)|κ). With |R(iy)|² − 1 =
/// (1 − 2β)y² + … the approach is stable iff Δt/2 ≤ 2b/((1 − 2β)a²):
/// Δt = 0.2516525049331056. 40-digit first losses with K_y projected onto κ
/// (δ = 1e-2 … 1.6e-4, Richardson in δ²) give 0.25165250493310560; a scan of
/// the ray finds the first loss rising away from π. (With K_y exactly as
/// given, μ = +6.9e-17 at θ_y = π itself: growth beneath rounding, which both
/// programs take as neutral, as for the rank-one corners of
/// `rank_one_corner_reference_errors`.) The reference reported
/// 0.2516534526 at θ_y = ±3.13909, 3.8e-6 above; the engine is 1.6e-7 below.
#[test]
fn split_tableau_rank_one_diffusion_face_centre_limit() {
    let s = crate::generate::scheme(8508);
    let Method::Split {
        strang: true,
        inner,
    } = &s.method
    else {
        panic!("Strang splitting")
    };
    let Method::Tableau { a: ta, b: tb } = inner.as_ref() else {
        panic!("a tableau method")
    };
    assert!(tb.len() == 2 && (tb[0] + tb[1] - 1.0).abs() < 1e-15);
    assert!(s.first[1].is_central() && s.dims() == 3);
    let beta = tb[1] * ta[1][0];
    let k = s.system.diffusion[1].clone().symmetric_eigen();
    let (small, big) = match k.eigenvalues[0].abs() < k.eigenvalues[1].abs() {
        true => (0, 1),
        false => (1, 0),
    };
    let kappa = k.eigenvalues[big];
    assert!(
        k.eigenvalues[small].abs() < 1e-15 * kappa,
        "K_y is rank one"
    );
    let (v, w) = (k.eigenvectors.column(small), k.eigenvectors.column(big));
    let f = &s.system.flux[1];
    let h = s.spacing[1];
    let corner = s.second[1].symbol(std::f64::consts::PI).re;
    let a = (v.transpose() * f * v)[(0, 0)] / h;
    let b = (w.transpose() * f * v)[(0, 0)].powi(2) / (corner.abs() * kappa);
    let closed = 4.0 * b / ((1.0 - 2.0 * beta) * a * a);
    let truth = 0.251_652_504_933_105_6;
    assert!((closed / truth - 1.0).abs() < 1e-12, "{closed}");
    let e = crate::closed_forms::engine(&s);
    for n in [[0.0, 1.0, 0.0], [0.0, -1.0, 0.0]] {
        let dt = crate::closed_forms::engine_direction(&e, &n);
        assert_near(&format!("{n:?}"), dt, truth);
    }
}

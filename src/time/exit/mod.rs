//! First-exit radius r*(φ) of a stability region along the ray t·w, |w| = 1.
//!
//! One-step methods: along the ray, g(r) = |P(rw)|² − |Q(rw)|² is a real
//! polynomial in r with g(0) = 0. Its lowest non-vanishing coefficient decides the
//! behaviour next to the origin exactly (no tolerance: Heun on the imaginary axis
//! is unstable for every r > 0); its positive roots are the only places where
//! stability can change, so the intervals between them are classified by the sign
//! of g at their midpoints.
//!
//! Linear multistep methods: a root ζ of Σ(α_j − zβ_j)ζ^j crosses the unit circle
//! only where z lies on the boundary locus z(ω) = ρ(e^{iω})/σ(e^{iω}). The crossings
//! of the ray with the locus (sign changes of Im(w̄ ρ σ̄) in ω, bisected to full
//! precision, plus the extremes of any stretch of locus lying along the ray, as for
//! leapfrog on the imaginary axis) split the ray into intervals, each classified by
//! the root condition at its midpoint.
//!
//! The one-step exits are in the submodule `one_step`, the multistep ones in
//! `multistep`; both end by classifying the intervals between their break
//! points ([`classify`]).

mod multistep;
mod one_step;

pub(super) use multistep::{multistep, taylor_shift};
pub(super) use one_step::{one_step, one_step_near, one_step_stable_through};

/// Walks the sorted break points; returns the first one after which the ray is
/// unstable. Beyond the last break the verdict is constant, so it is taken at
/// max(2·last, 1), clear of the origin where rounding blurs every test.
fn classify(breaks: &[f64], stable: impl Fn(f64) -> bool) -> f64 {
    let mut prev = 0.0;
    for &b in breaks {
        if b <= prev {
            continue;
        }
        if !stable(0.5 * (prev + b)) {
            return prev;
        }
        prev = b;
    }
    let probe = (2.0 * prev).max(1.0);
    if stable(probe) {
        f64::INFINITY
    } else {
        prev
    }
}

#[cfg(test)]
mod tests {
    use crate::time::methods::builtin;
    use num_complex::Complex64 as C64;

    /// The exit radius of a built-in method along the direction of `w`
    /// (shared with the submodules' tests).
    pub(super) fn exit(name: &str, w: C64) -> f64 {
        builtin(name).unwrap().exit_radius(w / w.norm())
    }

    #[test]
    fn adams_bashforth_2_reaches_minus_one_on_the_negative_real_axis() {
        // AB2 boundary locus at ζ = −1: z = (1 + 1)/(−1.5 − 0.5) = −1 (closed form)
        let r = exit("ab2", C64::new(-1.0, 0.0));
        assert!((r - 1.0).abs() < 1e-12, "{r}");
        let r = exit("ab2", C64::new(-1.0, 1e-12));
        assert!((r - 1.0).abs() < 1e-9, "{r}");
    }

    #[test]
    fn adams_bashforth_3_reaches_six_elevenths_on_the_negative_real_axis() {
        // AB3: the real-axis interval of absolute stability is [−6/11, 0] (closed
        // form from the boundary locus at ζ = −1: z = −2/(5/12 + 16/12 + 23/12))
        let r = exit("ab3", C64::new(-1.0, 0.0));
        assert!((r - 6.0 / 11.0).abs() < 1e-12, "{r}");
    }

    #[test]
    fn adams_bashforth_2_near_the_imaginary_axis_has_a_small_positive_exit() {
        // next to the axis the locus z(ω) ≈ iω − ω⁴/4 ... crosses the ray
        // t·(−δ + i) at ω ≈ (4δ)^{1/3}, far inside the first uniform locus cell
        for delta in [1e-6, 1e-9, 1e-12, 1e-15] {
            let r = exit("ab2", C64::new(-delta, 1.0));
            let want = (4.0 * delta).powf(1.0 / 3.0);
            assert!(r > 0.5 * want && r < 2.0 * want, "δ {delta}: {r} vs {want}");
        }
        assert_eq!(exit("ab2", C64::new(0.0, 1.0)), 0.0);
    }

    #[test]
    fn heun_a_hair_left_of_the_imaginary_axis_exits_at_the_cube_root() {
        // |1 + z + z²/2|² − 1 = 2x + y⁴/4 + O(xy², x²) for z = x + iy, so along
        // r·(−δ + i) the first exit is at r³ ≈ 8δ (closed form). δ = 2.4e-16 puts
        // the roots of g far below the companion matrix's rounding unless the
        // variable is scaled first.
        for delta in [2.4e-16, 4.2e-15, 1e-12] {
            let r = exit("heun", C64::new(-delta, 1.0));
            let expected = (8.0 * delta).cbrt();
            assert!(
                (r / expected - 1.0).abs() < 1e-3,
                "δ {delta}: {r} vs {expected}"
            );
        }
    }

    #[test]
    fn leapfrog_is_unstable_on_the_negative_real_axis_and_neutral_on_the_imaginary() {
        assert_eq!(exit("leapfrog", C64::new(-1.0, 0.0)), 0.0);
        let r = exit("leapfrog", C64::new(0.0, 1.0));
        assert!((r - 1.0).abs() < 1e-12, "{r}");
    }

    #[test]
    fn adams_bashforth_3_keeps_a_stretch_of_the_imaginary_axis() {
        // AB3 is stable on the imaginary axis up to |z| = 0.7236 (value quoted
        // from memory; it is where the boundary locus re-crosses the axis, and
        // we check that crossing in closed form: Re z(ω) = 0 there)
        let r = exit("ab3", C64::new(0.0, 1.0));
        assert!(r > 0.72 && r < 0.73, "{r}");
        let ms = match &builtin("ab3").unwrap().scheme {
            crate::time::Scheme::Multistep(ms) => ms.clone(),
            _ => unreachable!(),
        };
        let eval = |c: &[f64], z: C64| c.iter().rev().fold(C64::new(0.0, 0.0), |a, x| a * z + x);
        // find ω with Im z(ω) = r on the upper half of the locus and check Re z ≈ 0
        let z_of = |om: f64| {
            let zeta = C64::from_polar(1.0, om);
            eval(&ms.alpha, zeta) / eval(&ms.beta, zeta)
        };
        let best = (1..20000)
            .map(|k| z_of(std::f64::consts::PI * k as f64 / 20000.0))
            .filter(|z| z.re.abs() < 1e-3)
            .map(|z| (z.im - r).abs())
            .fold(f64::INFINITY, f64::min);
        assert!(best < 1e-3, "{best}");
    }

    #[test]
    fn bdf2_is_stable_along_every_ray_into_the_left_half_plane() {
        // BDF2 is A-stable (Dahlquist's second barrier: the only A-stable linear
        // multistep methods are of order ≤ 2, BDF2 and the trapezoidal rule
        // among them), so no ray with Re w ≤ 0 ever leaves its region
        for delta in [0.0, 1e-12, 1e-8, 1e-4, 1e-2, 0.5] {
            for sign in [1.0, -1.0] {
                let r = exit("bdf2", C64::new(-delta, sign));
                assert!(r.is_infinite(), "δ {delta}, sign {sign}: {r}");
            }
        }
        assert!(exit("bdf2", C64::new(-1.0, 0.0)).is_infinite());
    }
}

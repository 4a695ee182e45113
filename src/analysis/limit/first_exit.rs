//! First-exit times t*(μ) = r*(arg μ)/|μ| of the operator's eigenvalues from the
//! time method's stability region (README: The largest stable time step); for
//! second-order-in-time methods, whose variable is z = Δt²μ, t* = √(r*/|μ|)
//! ([`Method::dt_of_radius`]).
//!
//! The eigenvalues come from [`crate::operator::Spectrum`], which puts them on the
//! imaginary axis only where L has no real part by construction (so that
//! roundoff cannot push a neutral scheme off its region's boundary, while real
//! dissipation, however weak, is kept). The two imaginary directions are
//! computed once; other directions come from a lazily
//! filled table used only for screening (its lower envelope never exceeds the
//! exact value except inside an unresolved lobe), and exact values for the
//! candidates that survive screening. The table also seeds the exact values of
//! one-step methods: Newton's method from the neighbouring entries, accepted
//! only with certificates on both sides of the root ([`Method::exit_radius_near`];
//! the full polynomial root computation otherwise), and [`ExitTimes::at_least`]
//! certifies without any root that a mode's exit is no earlier than a given
//! time.

use crate::time::Method;
use num_complex::Complex64 as C64;
use std::f64::consts::PI;
use std::sync::OnceLock;

const TABLE: usize = 4096;
/// Angle from the imaginary axis below which a multistep exit is not resolved
/// ([`ExitTimes::resolved`]).
const NEAR_AXIS: f64 = 1e-12;

/// First-exit radii of one method, with its snapping tolerance.
pub struct ExitTimes<'m> {
    method: &'m Method,
    up: f64,
    down: f64,
    table: Vec<OnceLock<f64>>,
}

/// Where an eigenvalue points.
enum Dir {
    Zero,
    Up,
    Down,
    General(C64),
}

impl<'m> ExitTimes<'m> {
    /// For `method`. The eigenvalues it is given come from
    /// [`crate::operator::Spectrum`]: exactly zero where neutral, with a real part
    /// of exactly zero where on the imaginary axis.
    pub fn new(method: &'m Method) -> Self {
        Self {
            method,
            up: method.exit_radius(C64::new(0.0, 1.0)),
            down: method.exit_radius(C64::new(0.0, -1.0)),
            table: (0..=TABLE).map(|_| OnceLock::new()).collect(),
        }
    }

    /// The method.
    pub fn method(&self) -> &Method {
        self.method
    }

    fn dir(&self, mu: C64) -> Dir {
        let r = mu.norm();
        if r == 0.0 {
            Dir::Zero
        } else if mu.re == 0.0 {
            if mu.im > 0.0 {
                Dir::Up
            } else {
                Dir::Down
            }
        } else {
            Dir::General(mu / r)
        }
    }

    fn table_at(&self, i: usize) -> f64 {
        *self.table[i].get_or_init(|| {
            let phi = -PI + 2.0 * PI * i as f64 / TABLE as f64;
            self.method.exit_radius(C64::from_polar(1.0, phi))
        })
    }

    /// The Δt at which s(Δt)·μ reaches radius r.
    fn time(&self, r: f64, mu: C64) -> f64 {
        self.method.dt_of_radius(r, mu.norm())
    }

    /// Exact first-exit time of μ.
    pub fn exact(&self, mu: C64) -> f64 {
        match self.dir(mu) {
            Dir::Zero => f64::INFINITY,
            Dir::Up => self.time(self.up, mu),
            Dir::Down => self.time(self.down, mu),
            Dir::General(w) if !self.method.takes_exit_guesses() => {
                self.time(self.method.exit_radius(w), mu)
            }
            Dir::General(w) => {
                // warm starts: the table's exits at the neighbouring angles,
                // interpolated and each alone, and the exit along the half of
                // the imaginary axis the eigenvalue is next to (the exit moves
                // fast with the angle there: RK4's from 2.37 to 2√2 within a
                // table step)
                let x = (w.arg() + PI) / (2.0 * PI) * TABLE as f64;
                let i = (x.floor() as usize).min(TABLE - 1);
                let (lo, hi) = (self.table_at(i), self.table_at(i + 1));
                let axis = if w.im >= 0.0 { self.up } else { self.down };
                let guesses = [lo + (hi - lo) * (x - i as f64), axis, lo, hi];
                self.time(self.method.exit_radius_near(w, &guesses), mu)
            }
        }
    }

    /// Whether the exact first-exit time of μ is certified to be at least `t`
    /// without computing it ([`Method::stable_through`], with a margin of a few
    /// units of rounding so that the exact value would not come out below `t`
    /// either). `false` says nothing.
    pub fn at_least(&self, mu: C64, t: f64) -> bool {
        match self.dir(mu) {
            Dir::Zero => true,
            Dir::Up | Dir::Down => self.exact(mu) >= t,
            Dir::General(w) => {
                let r = self.method.step_variable(t) * mu.norm() * (1.0 + 8.0 * f64::EPSILON);
                self.method.stable_through(w, r)
            }
        }
    }

    /// Whether the exact first exit of μ is resolved by double precision. A
    /// linear multistep method's exit comes from the crossing of the ray with
    /// its boundary locus, which near z = 0 runs along the imaginary axis
    /// (AB2: Re z(ω) ∝ ω⁴); for a ray within an angle φ of the axis the
    /// crossing sits where that deviation equals φ, and rounding of the locus
    /// moves it by a relative (φ₀/φ)^{2/3} with φ₀ ≈ 1e-24 (measured on AB2:
    /// 2e-5 at φ = 2e-17, 17 % at φ = 2e-23). Below φ = `NEAR_AXIS` the exit
    /// is not resolved to 1e-7, and the long-wave closed form of the method's
    /// principal root is the better value. One-step methods solve for the exit
    /// exactly (the polynomial's linear coefficient 2 Re w keeps a tiny real
    /// part) and are always resolved, as are μ exactly on the axis.
    pub fn resolved(&self, mu: C64) -> bool {
        let locus_based = matches!(self.method.scheme, crate::time::Scheme::Multistep(_));
        !(locus_based && mu.re < 0.0 && -mu.re < NEAR_AXIS * mu.norm())
    }

    /// Screening value: exact on the imaginary axis, the lower envelope of the
    /// two neighbouring table entries elsewhere.
    pub fn estimate(&self, mu: C64) -> f64 {
        match self.dir(mu) {
            Dir::Zero => f64::INFINITY,
            Dir::Up => self.time(self.up, mu),
            Dir::Down => self.time(self.down, mu),
            Dir::General(w) => {
                let x = (w.arg() + PI) / (2.0 * PI) * TABLE as f64;
                let i = (x.floor() as usize).min(TABLE - 1);
                self.time(self.table_at(i).min(self.table_at(i + 1)), mu)
            }
        }
    }
}

/// The smallest first-exit time over a set of eigenvalues, and the modulus of the
/// eigenvalue that sets it (to rank wavevectors that are all unstable at once).
pub fn min_over_modes(eig: &[C64], f: impl Fn(C64) -> f64) -> (f64, f64) {
    let mut best = (f64::INFINITY, 0.0);
    for &mu in eig {
        let t = f(mu);
        let w = mu.norm();
        if t < best.0 || (t == best.0 && w > best.1) {
            best = (t, w);
        }
    }
    best
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::time::methods::builtin;

    /// The certificate never overstates: wherever `at_least(μ, t)` holds, the
    /// exact exit time of μ is at least t, for RK4 and the low-storage RK54
    /// over eigenvalues in every direction of the left half-plane and times
    /// from well below to just above the exit; and it holds for most times
    /// clearly below the exit (a certificate that never held would only be
    /// slow). Multistep methods give no certificate off the axis.
    #[test]
    fn at_least_never_overstates_the_exit() {
        for name in ["rk4", "lsrk54"] {
            let m = builtin(name).unwrap();
            let exits = ExitTimes::new(&m);
            let (mut held, mut clearly_below) = (0, 0);
            for k in 0..400 {
                let phi = PI / 2.0 + PI * (k as f64 + 0.5) / 400.0;
                let mu = C64::from_polar(3.0 + (k % 7) as f64, phi);
                let exact = exits.exact(mu);
                for f in [0.25, 0.5, 0.9, 0.99, 0.999999, 1.0, 1.000001, 1.5] {
                    let t = f * exact;
                    if exits.at_least(mu, t) {
                        held += 1;
                        assert!(
                            exact >= t,
                            "{name} φ {phi}: certified {t} above the exit {exact}"
                        );
                    }
                    if f <= 0.9 {
                        clearly_below += 1;
                    }
                }
            }
            assert!(
                held * 10 >= clearly_below * 9,
                "{name}: {held} of {clearly_below}"
            );
        }
        let ab2 = builtin("ab2").unwrap();
        let exits = ExitTimes::new(&ab2);
        assert!(!exits.at_least(C64::new(-1.0, 1.0), 1e-9));
    }

    /// A multistep exit 1e-20 rad off the imaginary axis is not resolved; one
    /// 1e-6 rad off, an eigenvalue exactly on the axis, and any one-step
    /// method's are.
    #[test]
    fn multistep_exits_next_to_the_axis_are_unresolved() {
        let ab2 = builtin("ab2").unwrap();
        let heun = builtin("heun").unwrap();
        let (ab2, heun) = (ExitTimes::new(&ab2), ExitTimes::new(&heun));
        let near = C64::new(-1e-20, 1.0);
        assert!(!ab2.resolved(near));
        assert!(ab2.resolved(C64::new(-1e-6, 1.0)));
        assert!(ab2.resolved(C64::new(0.0, 1.0)));
        assert!(heun.resolved(near));
    }
}

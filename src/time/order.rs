//! The order of a Runge–Kutta method from the Butcher order conditions: for
//! every rooted tree t with |t| ≤ 5 nodes (1 + 1 + 2 + 4 + 9 = 17 trees), the
//! elementary weight Φ(t) = bᵀ(…) must equal 1/γ(t) (Butcher, Numerical Methods
//! for Ordinary Differential Equations, Wiley 2008, ch. 3; Hairer, Nørsett &
//! Wanner, Solving ODEs I, sec. II.2). The conditions assume c = A·1.
//!
//! This is the order on nonlinear problems; on linear autonomous problems only
//! the "tall" trees b·A^{k−1}·1 = 1/k! matter, which is why a method can have a
//! higher linear order (see [`super::methods`], the order of R(z)).

use super::butcher::Tableau;

/// Largest order considered: the answer is "at least" this when all hold.
pub const MAX_ORDER: u32 = 5;

/// Default tolerance on |Φ(t) − 1/γ(t)|: published coefficients quoted as
/// ratios of 13-digit integers satisfy the conditions to about 1e-13.
pub const TOLERANCE: f64 = 1e-10;

/// One order condition: the tree's order, its name and Φ(t) − 1/γ(t).
#[derive(Debug, Clone, PartialEq)]
pub struct Residual {
    /// Number of nodes of the tree (the order it belongs to).
    pub order: u32,
    /// The condition in words, e.g. "b·c² = 1/3".
    pub condition: &'static str,
    /// Φ(t) − 1/γ(t).
    pub residual: f64,
}

fn dot(x: &[f64], y: &[f64]) -> f64 {
    x.iter().zip(y).map(|(a, b)| a * b).sum()
}

fn times(x: &[f64], y: &[f64]) -> Vec<f64> {
    x.iter().zip(y).map(|(a, b)| a * b).collect()
}

fn mat(a: &[Vec<f64>], x: &[f64]) -> Vec<f64> {
    a.iter().map(|row| dot(row, x)).collect()
}

/// The residuals of all 17 conditions of orders 1 to 5, in order.
pub fn residuals(t: &Tableau) -> Vec<Residual> {
    let (a, b) = (&t.a, &t.b);
    let c: Vec<f64> = a.iter().map(|r| r.iter().sum()).collect();
    let c2 = times(&c, &c);
    let c3 = times(&c2, &c);
    let c4 = times(&c3, &c);
    let ac = mat(a, &c);
    let ac2 = mat(a, &c2);
    let ac3 = mat(a, &c3);
    let a2c = mat(a, &ac);
    let a2c2 = mat(a, &ac2);
    let a3c = mat(a, &a2c);
    let a_cac = mat(a, &times(&c, &ac));
    let ones = vec![1.0; b.len()];
    let cond = |order, condition, phi: f64, gamma: f64| Residual {
        order,
        condition,
        residual: phi - 1.0 / gamma,
    };
    vec![
        cond(1, "b·1 = 1", dot(b, &ones), 1.0),
        cond(2, "b·c = 1/2", dot(b, &c), 2.0),
        cond(3, "b·c² = 1/3", dot(b, &c2), 3.0),
        cond(3, "b·Ac = 1/6", dot(b, &ac), 6.0),
        cond(4, "b·c³ = 1/4", dot(b, &c3), 4.0),
        cond(4, "b·(c∘Ac) = 1/8", dot(b, &times(&c, &ac)), 8.0),
        cond(4, "b·Ac² = 1/12", dot(b, &ac2), 12.0),
        cond(4, "b·A²c = 1/24", dot(b, &a2c), 24.0),
        cond(5, "b·c⁴ = 1/5", dot(b, &c4), 5.0),
        cond(5, "b·(c²∘Ac) = 1/10", dot(b, &times(&c2, &ac)), 10.0),
        cond(5, "b·(c∘Ac²) = 1/15", dot(b, &times(&c, &ac2)), 15.0),
        cond(5, "b·(c∘A²c) = 1/30", dot(b, &times(&c, &a2c)), 30.0),
        cond(5, "b·(Ac∘Ac) = 1/20", dot(b, &times(&ac, &ac)), 20.0),
        cond(5, "b·Ac³ = 1/20", dot(b, &ac3), 20.0),
        cond(5, "b·A(c∘Ac) = 1/40", dot(b, &a_cac), 40.0),
        cond(5, "b·A²c² = 1/60", dot(b, &a2c2), 60.0),
        cond(5, "b·A³c = 1/120", dot(b, &a3c), 120.0),
    ]
}

/// The largest p ≤ [`MAX_ORDER`] such that every condition of order ≤ p holds
/// to within `tol` (0 when even b·1 = 1 fails).
pub fn order_with(t: &Tableau, tol: f64) -> u32 {
    let r = residuals(t);
    (1..=MAX_ORDER)
        .take_while(|p| {
            r.iter()
                .filter(|x| x.order == *p)
                .all(|x| x.residual.abs() <= tol)
        })
        .last()
        .unwrap_or(0)
}

/// [`order_with`] at the default [`TOLERANCE`].
pub fn order(t: &Tableau) -> u32 {
    order_with(t, TOLERANCE)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn there_are_1_1_2_4_9_trees_of_orders_1_to_5() {
        let t = Tableau::new(vec![vec![0.0]], vec![1.0]);
        let r = residuals(&t);
        let count = |p| r.iter().filter(|x| x.order == p).count();
        assert_eq!(
            [count(1), count(2), count(3), count(4), count(5)],
            [1, 1, 2, 4, 9]
        );
    }

    #[test]
    fn classical_rk4_has_order_four_and_not_five() {
        let a = vec![
            vec![0.0, 0.0, 0.0, 0.0],
            vec![0.5, 0.0, 0.0, 0.0],
            vec![0.0, 0.5, 0.0, 0.0],
            vec![0.0, 0.0, 1.0, 0.0],
        ];
        let t = Tableau::new(a, vec![1.0 / 6.0, 1.0 / 3.0, 1.0 / 3.0, 1.0 / 6.0]);
        assert_eq!(order(&t), 4);
        // b·c⁴ = 1/6·0 + 1/3·1/16 + 1/3·1/16 + 1/6·1 = 5/24, not 1/5
        let r = residuals(&t);
        assert!((r[8].residual - (5.0 / 24.0 - 0.2)).abs() < 1e-15);
    }

    #[test]
    fn euler_and_midpoint_orders() {
        assert_eq!(order(&Tableau::new(vec![vec![0.0]], vec![1.0])), 1);
        let mid = Tableau::new(vec![vec![0.0, 0.0], vec![0.5, 0.0]], vec![0.0, 1.0]);
        assert_eq!(order(&mid), 2);
        assert_eq!(order(&Tableau::new(vec![vec![0.0]], vec![0.5])), 0);
    }
}

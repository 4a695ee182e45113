//! The memory pre-flight of `kgain run`: the analyses' estimate against the
//! memory this process may use, before anything is computed.

use kgain::analysis::Plan;
use kgain::error::InputError;
use kgain::problem::Problem;

/// Memory available to the process, from /proc/meminfo (24 GiB when unknown).
pub fn available() -> u64 {
    std::fs::read_to_string("/proc/meminfo")
        .ok()
        .and_then(|s| {
            s.lines()
                .find(|l| l.starts_with("MemAvailable:"))
                .and_then(|l| l.split_whitespace().nth(1))
                .and_then(|kb| kb.parse::<u64>().ok())
        })
        .map(|kb| kb * 1024)
        .unwrap_or(24 << 30)
}

/// Refuses a plan that would not fit in 80% of the available memory, naming
/// the key to change; otherwise returns the estimate in bytes.
pub fn check(problem: &Problem, plan: &Plan) -> Result<u128, InputError> {
    let need = plan.memory_estimate(problem);
    let avail = available();
    if need > avail as u128 * 4 / 5 {
        let nodes: u128 = plan.points.iter().map(|&n| n as u128).product();
        return Err(InputError::new(
            "scan.points",
            format!(
                "a scan of {nodes} wavevectors with these analyses needs about {:.1} GiB, more than the {:.1} GiB of memory available",
                need as f64 / (1u64 << 30) as f64,
                avail as f64 / (1u64 << 30) as f64
            ),
        )
        .hint("use fewer points per axis, or fewer analyses (scan.analyses)"));
    }
    Ok(need)
}

//! The memory pre-flight of `kgain run`: the analyses' estimate against the
//! memory this process may use, before anything is computed.
//!
//! The memory this process may use is the smallest of: the free memory of the
//! machine (`MemAvailable` in /proc/meminfo), the container's limit less what
//! it already uses (cgroup v2 `memory.max` − `memory.current`, or v1
//! `memory.limit_in_bytes` − `memory.usage_in_bytes`), and the address-space
//! limit (`ulimit -v`, RLIMIT_AS in /proc/self/limits) less the address space
//! already mapped and what each worker thread reserves.

use kgain::analysis::Plan;
use kgain::error::InputError;
use kgain::problem::Problem;

/// Address space each worker thread reserves beyond its resident memory: its
/// stack (2 MiB) and the allocator's per-thread arena (64 MiB on 64-bit glibc).
const THREAD_RESERVE: u64 = 66 << 20;

/// Which limit bounds the memory, and how much it leaves.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct Available {
    /// Bytes this process may still use.
    pub bytes: u64,
    /// Where the figure comes from.
    pub source: &'static str,
}

/// A `Key: value kB` line of a /proc file, in bytes.
fn proc_kb(text: &str, key: &str) -> Option<u64> {
    text.lines()
        .find(|l| l.starts_with(key))
        .and_then(|l| l.split_whitespace().nth(1))
        .and_then(|kb| kb.parse::<u64>().ok())
        .map(|kb| kb * 1024)
}

/// A file holding one number of bytes ("max" or an absurd v1 value: None).
fn read_bytes(path: &str) -> Option<u64> {
    let s = std::fs::read_to_string(path).ok()?;
    let v = s.trim().parse::<u64>().ok()?;
    (v < 1 << 60).then_some(v)
}

/// The soft RLIMIT_AS from a /proc/self/limits text (None when unlimited).
fn address_limit(limits: &str) -> Option<u64> {
    let line = limits
        .lines()
        .find(|l| l.starts_with("Max address space"))?;
    let soft = line["Max address space".len()..]
        .split_whitespace()
        .next()?;
    soft.parse::<u64>().ok()
}

/// The cgroup of this process (v2 unified path or the v1 memory controller's).
fn cgroup_paths() -> (Option<String>, Option<String>) {
    let text = std::fs::read_to_string("/proc/self/cgroup").unwrap_or_default();
    let (mut v2, mut v1) = (None, None);
    for line in text.lines() {
        let mut parts = line.splitn(3, ':');
        let (_, ctrl, path) = match (parts.next(), parts.next(), parts.next()) {
            (Some(a), Some(b), Some(c)) => (a, b, c),
            _ => continue,
        };
        if ctrl.is_empty() {
            v2 = Some(path.to_string());
        } else if ctrl.split(',').any(|c| c == "memory") {
            v1 = Some(path.to_string());
        }
    }
    (v2, v1)
}

/// The container's limit less its usage: the process's own cgroup first, then
/// the mount root (inside a container the cgroup path is often not mounted).
fn container_room() -> Option<u64> {
    let (v2, v1) = cgroup_paths();
    let room = |base: &str, limit: &str, usage: &str| {
        let lim = read_bytes(&format!("{base}/{limit}"))?;
        let used = read_bytes(&format!("{base}/{usage}")).unwrap_or(0);
        Some(lim.saturating_sub(used))
    };
    let mut best: Option<u64> = None;
    let mut offer = |v: Option<u64>| {
        if let Some(v) = v {
            best = Some(best.map_or(v, |b| b.min(v)));
        }
    };
    let v2_root = "/sys/fs/cgroup";
    if let Some(p) = v2 {
        offer(room(
            &format!("{v2_root}{p}"),
            "memory.max",
            "memory.current",
        ));
    }
    offer(room(v2_root, "memory.max", "memory.current"));
    let v1_root = "/sys/fs/cgroup/memory";
    if let Some(p) = v1 {
        offer(room(
            &format!("{v1_root}{p}"),
            "memory.limit_in_bytes",
            "memory.usage_in_bytes",
        ));
    }
    offer(room(
        v1_root,
        "memory.limit_in_bytes",
        "memory.usage_in_bytes",
    ));
    best
}

/// Memory this process may still use with `threads` workers: the smallest of
/// MemAvailable, the container's room and the address-space room (24 GiB when
/// none is known).
pub fn available(threads: usize) -> Available {
    let mut best: Option<Available> = None;
    let mut offer = |bytes: Option<u64>, source| {
        if let Some(b) = bytes {
            if best.is_none_or(|a| b < a.bytes) {
                best = Some(Available { bytes: b, source });
            }
        }
    };
    let meminfo = std::fs::read_to_string("/proc/meminfo").unwrap_or_default();
    offer(
        proc_kb(&meminfo, "MemAvailable:"),
        "free memory (MemAvailable)",
    );
    offer(container_room(), "container limit (cgroup memory limit)");
    let limits = std::fs::read_to_string("/proc/self/limits").unwrap_or_default();
    if let Some(limit) = address_limit(&limits) {
        let status = std::fs::read_to_string("/proc/self/status").unwrap_or_default();
        let mapped = proc_kb(&status, "VmSize:").unwrap_or(0);
        let reserve = THREAD_RESERVE * threads as u64;
        offer(
            Some(limit.saturating_sub(mapped).saturating_sub(reserve)),
            "address-space limit (ulimit -v)",
        );
    }
    best.unwrap_or(Available {
        bytes: 24 << 30,
        source: "assumed size (no limit readable)",
    })
}

/// Worker threads of a run without --threads: one per core.
pub fn default_threads() -> usize {
    std::thread::available_parallelism().map_or(1, |n| n.get())
}

/// Refuses a plan that would not fit in 80% of the available memory, naming
/// the key to change and the figures; otherwise returns the estimate in bytes.
pub fn check(problem: &Problem, plan: &Plan) -> Result<u128, InputError> {
    let threads = default_threads();
    let need = plan.memory_estimate(problem, threads);
    let avail = available(threads);
    if need > avail.bytes as u128 * 4 / 5 {
        let nodes: u128 = plan.points.iter().map(|&n| n as u128).product();
        let gib = |b: f64| b / (1u64 << 30) as f64;
        return Err(InputError::new(
            "scan.points",
            format!(
                "a scan of {nodes} wavevectors with these analyses needs about {:.2} GiB ({need} bytes), more than 80% of the {:.2} GiB ({} bytes) this process may use, set by the {}",
                gib(need as f64),
                gib(avail.bytes as f64),
                avail.bytes,
                avail.source
            ),
        )
        .hint("use fewer points per axis, or fewer analyses (scan.analyses), steps (scan.steps), directions (scan.directions) or matrices (scan.matrices)"));
    }
    Ok(need)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn reads_the_soft_address_space_limit() {
        let text = "Limit                     Soft Limit           Hard Limit           Units     \n\
                    Max address space         409600000            unlimited            bytes     \n";
        assert_eq!(address_limit(text), Some(409_600_000));
        let open =
            "Max address space         unlimited            unlimited            bytes     \n";
        assert_eq!(address_limit(open), None);
    }

    #[test]
    fn reads_kilobyte_lines() {
        let text = "MemTotal: 100 kB\nMemAvailable:   2048 kB\n";
        assert_eq!(proc_kb(text, "MemAvailable:"), Some(2048 * 1024));
        assert_eq!(proc_kb(text, "VmSize:"), None);
    }
}

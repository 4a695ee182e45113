//! Shards of a sweep and their merge. A shard folder holds `shard.json` (the
//! sweep's fingerprint, which slice this is, everything the merged output is
//! made from) and `shard.npy` (its combinations × figures, float64, so the
//! merge copies numbers bit for bit). [`merge`] refuses shards of different
//! sweeps and names the missing ones.

use super::plan::{Shard, SweepSpec};
use super::vary::{Axis, Level};
use ndarray::Array2;
use serde_json::{json, Value};
use std::path::{Path, PathBuf};

/// Everything a shard records.
#[derive(Debug, Clone, PartialEq)]
pub struct ShardData {
    /// The plan.
    pub spec: SweepSpec,
    /// Which slice.
    pub shard: Shard,
    /// The case's name.
    pub case_name: String,
    /// Where the case came from.
    pub case_source: String,
    /// The sweep's fingerprint.
    pub fingerprint: String,
    /// The case's own value of each varied key.
    pub case_values: Vec<Option<String>>,
    /// The pictures' subtitle.
    pub subtitle: String,
    /// This slice's combinations (in order), per figure.
    pub values: Vec<Vec<f64>>,
}

/// Why shards could not be read or merged (all exit 2: the user's folders).
#[derive(Debug, thiserror::Error)]
pub enum MergeError {
    /// A folder is not a readable shard.
    #[error("{path}: not a kgain sweep shard ({why})")]
    NotAShard {
        /// The folder.
        path: String,
        /// Why.
        why: String,
    },
    /// Shards of two different sweeps.
    #[error("{path}: belongs to a different sweep (fingerprint {theirs}, the first shard's is {ours}); merge only shards of one `kgain sweep` command")]
    Mismatch {
        /// The odd folder.
        path: String,
        /// Its fingerprint.
        theirs: String,
        /// The first shard's.
        ours: String,
    },
    /// The same slice twice.
    #[error("{path}: shard {index}/{count} is given twice (also {other})")]
    Duplicate {
        /// The second folder.
        path: String,
        /// The first.
        other: String,
        /// Its index.
        index: usize,
        /// Shard count.
        count: usize,
    },
    /// Slices missing.
    #[error("shards missing: {missing} of {count} (run them with --shard I/{count}, then merge all {count})")]
    Missing {
        /// The missing indices, comma separated.
        missing: String,
        /// Shard count.
        count: usize,
    },
    /// No folder given.
    #[error("give the shard folders to merge")]
    Nothing,
}

fn level_json(l: &Level) -> Value {
    match l {
        Level::Number(_, t) => json!({"number": t}),
        Level::Text(t) => json!({"text": t}),
    }
}

/// Writes a shard's files into `dir`; returns the manifest.
pub fn write_shard_into(dir: &Path, s: &ShardData) -> std::io::Result<Value> {
    let axes: Vec<Value> = s
        .spec
        .axes
        .iter()
        .map(|a| json!({"key": a.key, "levels": a.levels.iter().map(level_json).collect::<Vec<_>>()}))
        .collect();
    let range = s.shard.range(s.spec.len());
    let meta = json!({
        "format": "kgain sweep shard",
        "version": 1,
        "fingerprint": s.fingerprint,
        "shard": s.shard.index,
        "of": s.shard.count,
        "first": range.start,
        "count": range.len(),
        "combinations": s.spec.len(),
        "case": s.case_name,
        "case_file": s.case_source,
        "axes": axes,
        "figures": s.spec.figures,
        "case_values": s.case_values,
        "subtitle": s.subtitle,
    });
    let text = serde_json::to_string_pretty(&meta).map_err(std::io::Error::other)?;
    std::fs::write(dir.join("shard.json"), text + "\n")?;
    let rows = s.values.len();
    let cols = s.spec.figures.len();
    let flat: Vec<f64> = s.values.iter().flatten().copied().collect();
    let a = Array2::from_shape_vec((rows, cols), flat).map_err(std::io::Error::other)?;
    ndarray_npy::write_npy(dir.join("shard.npy"), &a).map_err(std::io::Error::other)?;
    Ok(json!({
        "format": "kgain sweep shard",
        "version": 1,
        "case": s.case_name,
        "fingerprint": s.fingerprint,
        "shard": format!("{}/{}", s.shard.index, s.shard.count),
    }))
}

/// Reads a shard folder.
pub fn read_shard(dir: &Path) -> Result<ShardData, MergeError> {
    let bad = |why: String| MergeError::NotAShard {
        path: dir.display().to_string(),
        why,
    };
    let bytes =
        std::fs::read(dir.join("shard.json")).map_err(|e| bad(format!("shard.json: {e}")))?;
    let m: Value = serde_json::from_slice(&bytes).map_err(|e| bad(format!("shard.json: {e}")))?;
    if m["format"] != "kgain sweep shard" || m["version"] != 1 {
        return Err(bad("shard.json is not a version-1 kgain sweep shard".into()));
    }
    let text = |v: &Value, what: &str| {
        v.as_str()
            .map(str::to_string)
            .ok_or_else(|| bad(format!("shard.json: {what} missing")))
    };
    let count_of = |k: &str| {
        m[k].as_u64()
            .map(|x| x as usize)
            .ok_or_else(|| bad(format!("shard.json: {k} missing")))
    };
    let mut axes = Vec::new();
    for a in m["axes"]
        .as_array()
        .ok_or_else(|| bad("shard.json: axes missing".into()))?
    {
        let key = text(&a["key"], "axis key")?;
        let mut levels = Vec::new();
        for l in a["levels"]
            .as_array()
            .ok_or_else(|| bad("shard.json: levels missing".into()))?
        {
            levels.push(if let Some(t) = l["number"].as_str() {
                let x = t
                    .parse::<f64>()
                    .map_err(|_| bad(format!("shard.json: '{t}' is not a number")))?;
                Level::Number(x, t.to_string())
            } else {
                Level::Text(text(&l["text"], "level")?)
            });
        }
        axes.push(Axis { key, levels });
    }
    let figures: Vec<String> = m["figures"]
        .as_array()
        .ok_or_else(|| bad("shard.json: figures missing".into()))?
        .iter()
        .map(|f| text(f, "figure"))
        .collect::<Result<_, _>>()?;
    let spec = SweepSpec::new(axes, figures).map_err(|e| bad(e.to_string()))?;
    let shard = Shard {
        index: count_of("shard")?,
        count: count_of("of")?,
    };
    if shard.index == 0 || shard.index > shard.count || count_of("combinations")? != spec.len() {
        return Err(bad("shard.json: inconsistent shard numbers".into()));
    }
    let range = shard.range(spec.len());
    let a: Array2<f64> =
        ndarray_npy::read_npy(dir.join("shard.npy")).map_err(|e| bad(format!("shard.npy: {e}")))?;
    if a.dim() != (range.len(), spec.figures.len()) || count_of("first")? != range.start {
        return Err(bad(
            "shard.npy does not hold this shard's combinations".into()
        ));
    }
    let values = a.rows().into_iter().map(|r| r.to_vec()).collect();
    let case_values = m["case_values"]
        .as_array()
        .ok_or_else(|| bad("shard.json: case_values missing".into()))?
        .iter()
        .map(|v| v.as_str().map(str::to_string))
        .collect::<Vec<_>>();
    if case_values.len() != spec.axes.len() {
        return Err(bad("shard.json: case_values do not match the axes".into()));
    }
    Ok(ShardData {
        spec,
        shard,
        case_name: text(&m["case"], "case")?,
        case_source: text(&m["case_file"], "case_file")?,
        fingerprint: text(&m["fingerprint"], "fingerprint")?,
        case_values,
        subtitle: text(&m["subtitle"], "subtitle")?,
        values,
    })
}

/// Joins the shards in `dirs` into the whole sweep: the first shard's record
/// with every combination's values.
pub fn merge(dirs: &[PathBuf]) -> Result<ShardData, MergeError> {
    let mut shards: Vec<(PathBuf, ShardData)> = Vec::new();
    for d in dirs {
        shards.push((d.clone(), read_shard(d)?));
    }
    let Some((_, first)) = shards.first() else {
        return Err(MergeError::Nothing);
    };
    let count = first.shard.count;
    for (path, s) in &shards[1..] {
        if s.fingerprint != first.fingerprint || s.shard.count != count || s.spec != first.spec {
            return Err(MergeError::Mismatch {
                path: path.display().to_string(),
                theirs: s.fingerprint.clone(),
                ours: first.fingerprint.clone(),
            });
        }
    }
    let mut by_index: Vec<Option<usize>> = vec![None; count];
    for (k, (path, s)) in shards.iter().enumerate() {
        let slot = &mut by_index[s.shard.index - 1];
        if let Some(other) = slot {
            return Err(MergeError::Duplicate {
                path: path.display().to_string(),
                other: shards[*other].0.display().to_string(),
                index: s.shard.index,
                count,
            });
        }
        *slot = Some(k);
    }
    let missing: Vec<String> = by_index
        .iter()
        .enumerate()
        .filter(|(_, s)| s.is_none())
        .map(|(i, _)| (i + 1).to_string())
        .collect();
    if !missing.is_empty() {
        return Err(MergeError::Missing {
            missing: missing.join(", "),
            count,
        });
    }
    let mut whole = first.clone();
    whole.values = by_index
        .iter()
        .flatten()
        .flat_map(|k| shards[*k].1.values.iter().cloned())
        .collect();
    whole.shard = Shard { index: 1, count: 1 };
    Ok(whole)
}

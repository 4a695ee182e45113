//! The NPY exporter: every array a section describes is written as a `.npy`
//! file (little-endian float64 or complex128, C order) straight from the
//! results' own memory, and described in the manifest — file, shape, dtype,
//! dims, coords (per dimension either the file holding its coordinates or the
//! coordinate values themselves: the labels of named things such as modes or
//! the axis names x, y, z; or {"arange": n} for the indices 0..n−1), units and
//! long_name (as in the CF
//! conventions), plus labels where an axis is a list of named things. A
//! dimension name stands for one length throughout a folder, so the arrays load
//! into one xarray Dataset. Files are written in parallel.

use super::ReportError;
use crate::destination::hashing::HashingFile;
use ndarray::{ArrayViewD, IxDyn};
use ndarray_npy::WriteNpyExt;
use num_complex::Complex64 as C64;
use rayon::prelude::*;
use serde_json::{json, Map, Value};
use std::borrow::Cow;
use std::path::Path;

/// The values of an array: real or complex, borrowed where the results hold
/// them in the right order, owned where they had to be flattened.
pub enum Data<'a> {
    /// float64.
    Real(Cow<'a, [f64]>),
    /// complex128.
    Complex(Cow<'a, [C64]>),
}

/// One array to write and describe.
pub struct Array<'a> {
    /// File stem and manifest key.
    pub name: String,
    /// Shape, C order.
    pub shape: Vec<usize>,
    /// The values.
    pub data: Data<'a>,
    /// Axis names and, per axis, the file holding its coordinates.
    pub dims: Vec<(&'static str, Option<String>)>,
    /// CF units.
    pub units: &'static str,
    /// CF long name.
    pub long_name: &'static str,
    /// Further manifest keys (labels, wavevector).
    pub extra: Vec<(&'static str, Value)>,
}

impl<'a> Array<'a> {
    /// A float64 array.
    pub fn real(
        name: &str,
        shape: &[usize],
        data: impl Into<Cow<'a, [f64]>>,
        dims: Vec<(&'static str, Option<String>)>,
        units: &'static str,
        long_name: &'static str,
    ) -> Self {
        Array {
            name: name.to_string(),
            shape: shape.to_vec(),
            data: Data::Real(data.into()),
            dims,
            units,
            long_name,
            extra: Vec::new(),
        }
    }

    /// A complex128 array.
    pub fn complex(
        name: &str,
        shape: &[usize],
        data: impl Into<Cow<'a, [C64]>>,
        dims: Vec<(&'static str, Option<String>)>,
        units: &'static str,
        long_name: &'static str,
    ) -> Self {
        Array {
            name: name.to_string(),
            shape: shape.to_vec(),
            data: Data::Complex(data.into()),
            dims,
            units,
            long_name,
            extra: Vec::new(),
        }
    }

    /// The same array with a further manifest key.
    pub fn with(mut self, key: &'static str, value: Value) -> Self {
        self.extra.push((key, value));
        self
    }

    fn entry(&self) -> Value {
        let dtype = match self.data {
            Data::Real(_) => "float64",
            Data::Complex(_) => "complex128",
        };
        let labels = self
            .extra
            .iter()
            .find(|(k, _)| *k == "labels")
            .and_then(|(_, v)| v.as_array());
        let coords: Map<String, Value> = self
            .dims
            .iter()
            .zip(&self.shape)
            .map(|((d, f), &n)| {
                let values = match (f, *d, labels) {
                    (Some(file), _, _) => Value::from(file.clone()),
                    (None, "axis", _) if n <= 3 => json!(["x", "y", "z"][..n]),
                    (None, dim, Some(l)) if LABELLED.contains(&dim) && l.len() == n => {
                        Value::from(l.clone())
                    }
                    // indices 0..n−1, written compactly (a growth horizon can be 10⁶ steps)
                    (None, _, _) => json!({ "arange": n }),
                };
                (d.to_string(), values)
            })
            .collect();
        let names: Vec<&str> = self.dims.iter().map(|(d, _)| *d).collect();
        let mut e = json!({
            "file": format!("{}.npy", self.name),
            "shape": self.shape,
            "dtype": dtype,
            "dims": names,
            "coords": coords,
            "units": self.units,
            "long_name": self.long_name,
        });
        for (k, v) in &self.extra {
            e[*k] = v.clone();
        }
        e
    }

    /// Writes the file; returns its name, size and SHA-256 (summed as written).
    fn write(&self, dir: &Path) -> Result<(String, u64, String), ReportError> {
        let file = format!("{}.npy", self.name);
        let path = dir.join(&file);
        let npy = |message: String| ReportError::Npy {
            path: path.display().to_string(),
            message,
        };
        let mut out = HashingFile::create(&path).map_err(|e| npy(e.to_string()))?;
        let shape = IxDyn(&self.shape);
        let written = match &self.data {
            Data::Real(v) => {
                ArrayViewD::from_shape(shape, v.as_ref()).map(|a| a.write_npy(&mut out))
            }
            Data::Complex(v) => {
                ArrayViewD::from_shape(shape, v.as_ref()).map(|a| a.write_npy(&mut out))
            }
        };
        written
            .map_err(|e| npy(e.to_string()))?
            .map_err(|e| npy(e.to_string()))?;
        let (size, sum) = out.finish().map_err(|e| npy(e.to_string()))?;
        Ok((file, size, sum))
    }
}

/// Dimensions whose coordinates are the array's labels (when as many).
const LABELLED: [&str; 4] = ["mode", "discrete_mode", "component", "stacked_component"];

/// An axis named `name` whose coordinates are in `file`.
pub fn axis(name: &'static str, file: &str) -> (&'static str, Option<String>) {
    (name, Some(file.to_string()))
}

/// An axis without a coordinate file (modes, components, ...): its coordinates
/// are written into the manifest.
pub fn plain(name: &'static str) -> (&'static str, Option<String>) {
    (name, None)
}

/// What [`write_all`] returns: the manifest's `arrays` object and, for its
/// `files` inventory, each file's size and SHA-256 as written.
pub struct Written {
    /// The `arrays` object.
    pub described: Map<String, Value>,
    /// `{file: {size, sha256}}`.
    pub sums: Map<String, Value>,
}

/// Writes every array into `dir` (in parallel).
pub fn write_all(dir: &Path, arrays: &[Array]) -> Result<Written, ReportError> {
    let sums: Vec<(String, u64, String)> = arrays
        .par_iter()
        .map(|a| a.write(dir))
        .collect::<Result<_, _>>()?;
    let files = sums
        .into_iter()
        .map(|(file, size, sum)| (file, json!({ "size": size, "sha256": sum })))
        .collect();
    let described = arrays.iter().map(|a| (a.name.clone(), a.entry())).collect();
    Ok(Written {
        described,
        sums: files,
    })
}

//! `method = "low-storage"` with `low_storage = { a = [..], b = [..] }`: a 2N
//! scheme by its coefficients, converted here to the Butcher tableau the
//! problem builder takes (so the method reports itself as a tableau). Its
//! errors name `time.low_storage`, never the tableau the user did not write.

use super::rational::values;
use super::raw::RawTime;
use crate::error::InputError;
use crate::problem::TableauSpec;
use crate::time::lowstorage::williamson;

/// The method name that asks for a low-storage scheme.
pub const METHOD: &str = "low-storage";

/// The tableau of the case's low-storage scheme, `None` when the case does
/// not ask for one.
pub fn tableau(t: &RawTime) -> Result<Option<TableauSpec>, InputError> {
    let ls = match (&t.low_storage, t.method == METHOD) {
        (None, false) => return Ok(None),
        (Some(_), false) => {
            return Err(InputError::new(
                "time.low_storage",
                format!("is only used with method = \"{METHOD}\""),
            ))
        }
        (None, true) => {
            return Err(InputError::new(
                "time.low_storage",
                format!("is required for method = \"{METHOD}\""),
            )
            .hint("e.g. low_storage = { a = [0, \"-5/9\", \"-153/128\"], b = [\"1/3\", \"15/16\", \"8/15\"] }"))
        }
        (Some(ls), true) => ls,
    };
    if t.tableau.is_some() {
        return Err(InputError::new(
            "time.tableau",
            format!("is not used with method = \"{METHOD}\" (give time.low_storage only)"),
        ));
    }
    let key = "time.low_storage";
    let tab = williamson(&values(&ls.a), &values(&ls.b))
        .map_err(|e| InputError::new(key, e.to_string()))?;
    // the same checks the tableau path makes, reported at this key
    tab.method(METHOD)
        .map_err(|e| InputError::new(key, e.to_string()))?;
    Ok(Some(TableauSpec {
        a: tab.a,
        b: tab.b,
        c: None,
    }))
}

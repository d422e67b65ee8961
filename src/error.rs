//! Input errors: bad input is an `Err` that names the value and where it was found.
//!
//! Failing to converge is *not* an error; it is a [`crate::Solution`] with an honest status.

use std::fmt;

/// A problem with what the caller supplied. `code` is stable and machine-readable
/// (the wasm bindings pass it to JavaScript as `error.code`); `message` is for people.
#[derive(Debug, Clone, PartialEq)]
pub struct InputError {
    pub code: &'static str,
    pub message: String,
    /// Character offset (0-based, in chars not bytes) into the text that was being read,
    /// when the error points at a place in an equation.
    pub position: Option<usize>,
}

impl InputError {
    pub fn new(code: &'static str, message: impl Into<String>) -> Self {
        InputError {
            code,
            message: message.into(),
            position: None,
        }
    }

    /// An error at a character position of the input text.
    pub fn at(code: &'static str, message: impl Into<String>, position: usize) -> Self {
        InputError {
            code,
            message: message.into(),
            position: Some(position),
        }
    }
}

impl fmt::Display for InputError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(&self.message)
    }
}

impl std::error::Error for InputError {}

/// Checks that `value` is finite, naming it as `what` in the error.
pub fn require_finite(value: f64, what: &str) -> Result<f64, InputError> {
    if value.is_finite() {
        Ok(value)
    } else {
        Err(InputError::new(
            "non-finite-input",
            format!("{what} must be a finite number, got {value}"),
        ))
    }
}

/// A finite range `[lo, hi]` with `lo < hi`, or an error naming the end at fault.
pub fn require_range(lo: f64, hi: f64) -> Result<(f64, f64), InputError> {
    require_finite(lo, "range lower end")?;
    require_finite(hi, "range upper end")?;
    if lo >= hi {
        return Err(InputError::new(
            "bad-range",
            format!("the range lower end {lo} must be below the upper end {hi}"),
        ));
    }
    Ok((lo, hi))
}

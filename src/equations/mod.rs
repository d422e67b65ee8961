//! The equation language: text in, compiled residuals and solutions out.
//!
//! - [`parse`]: our lexer and grammar check (positions, limits, `.5`), then meval's
//!   tokenizer and shunting-yard on a normalised text; [`caret`] for error display.
//! - [`functions`]: the table of functions and constants.
//! - [`program`]: meval's RPN compiled to a slot program with no name lookup or
//!   allocation per evaluation, walked by any [`program::Number`]; its point value is
//!   `meval::Expr::eval_with_context`'s except for integer powers (see
//!   [`functions::power`]).
//! - [`dual`]: [`Dual`], forward-mode derivatives of a program (over `f64`, or over
//!   intervals for slopes over a box).
//! - [`interval`]: [`Interval`], the enclosure of a program's values over a box,
//!   outward-rounded, with a flag for points where it is undefined.
//! - [`residual`]: [`Residual`], one equation's residual in its unknown as a point,
//!   interval, derivative or slope, with knowns that can stay variable.
//! - [`set`]: [`EquationSet`], equations plus `name := expr` definitions in dependency
//!   order, and [`EquationSet::residual_fn`] for sweeps.
//! - [`solve`]: [`solve_set`] for any variable(s), default guesses.
//! - [`sensitivity`]: derivatives of the unknowns by the implicit function theorem.
//!
//! The language itself is documented in the README, section "The equation language".
//!
//! ```
//! use tacit::equations::{solve_set, EquationSet, UnknownSpec};
//! let set = EquationSet::parse("y = 2*x + 1  # a line").unwrap();
//! let s = solve_set(&set, &[("y".into(), 7.0)], &[UnknownSpec::named("x")],
//!                   &Default::default(), false).unwrap();
//! assert_eq!(s.unknowns[0], ("x".to_string(), 3.0));
//! ```

pub mod dimensions;
pub mod dual;
pub mod functions;
pub mod interval;
pub mod parse;
pub mod program;
pub mod quantities;
pub mod residual;
pub mod sensitivity;
pub mod set;
pub mod solve;
pub mod system;

pub use dual::Dual;
pub use interval::Interval;
pub use parse::{caret, Expression, MAX_DEPTH, MAX_TEXT_BYTES};
pub use program::{Operand, Program};
pub use residual::Residual;
pub use sensitivity::Sensitivity;
pub use set::EquationSet;
pub use solve::{default_guesses, solve_set, BlockReport, SetSolution, UnknownSpec};
pub use system::{SystemOptions, SystemSolution};

//! Templates of one's own: a set of equations saved with its title, description,
//! variables (meaning, unit, value, bounds, guesses), validity notes and source, so that
//! a firm's own relations can be used again like the bundled ones.
//!
//! An own template is data, never code: it is read with serde (unknown fields refused,
//! every error naming its place, such as `templates[2].variables[0].unit`), and
//! [`OwnTemplate::check`] runs the same checks as any request (the equation text
//! through our parser, every unit through the unit table, the dimension check, bounds
//! and guesses). It is solved as an equation set of one's own through
//! [`OwnTemplate::problem_spec`]; nothing in it is ever executed.
//!
//! The exchange file is JSON of our own format:
//!
//! ```json
//! {"format": "tacit-own-templates", "version": 1, "templates": [ ... ]}
//! ```
//!
//! [`read_file`] refuses another format, a newer version, a duplicate id and any bad
//! template, naming it; [`write_file`] writes the same shape back.

use std::collections::{BTreeMap, HashSet};

use serde::{Deserialize, Serialize};

use crate::equations::quantities::VariableUnits;
use crate::equations::EquationSet;
use crate::error::InputError;
use crate::problem::spec::{self, BoundsInput, Quantity, UnknownObject};
use crate::problem::{ProblemSpec, UnknownInput, MAX_EQUATION_CHARS, MAX_NAME_CHARS};
use crate::units;

/// The `format` field of an exchange file.
pub const FORMAT: &str = "tacit-own-templates";
/// The version this build writes and the newest it reads.
pub const VERSION: u32 = 1;
/// Most templates in one file.
pub const MAX_TEMPLATES: usize = 500;
/// Most variables of one template.
pub const MAX_VARIABLES: usize = 200;
/// Longest description, validity note or source, in characters.
pub const MAX_NOTE_CHARS: usize = 20_000;
/// Longest id, in characters.
pub const MAX_ID_CHARS: usize = 64;

/// One template of one's own.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields, rename_all = "camelCase")]
pub struct OwnTemplate {
    /// Letters, digits, `.`, `-` and `_`; not the id of a bundled template.
    pub id: String,
    pub title: String,
    #[serde(default)]
    pub description: String,
    /// The equations in the language, `#` comments kept.
    pub equations: String,
    /// Every variable of the equations, in the order to show them.
    #[serde(deserialize_with = "spec::bounded::vec")]
    pub variables: Vec<OwnVariable>,
    /// The variable solved for by default (the first without a value when absent).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub unknown: Option<String>,
    /// Where the relation holds.
    #[serde(default)]
    pub validity: String,
    /// Where the relation comes from.
    #[serde(default)]
    pub source: String,
}

/// A variable of an own template. Value, bounds and guesses are in `unit`.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields, rename_all = "camelCase")]
pub struct OwnVariable {
    pub name: String,
    #[serde(default)]
    pub meaning: String,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub unit: Option<String>,
    /// The value it was saved with (used when it is a known).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub value: Option<f64>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub bounds: Option<BoundsInput>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub guesses: Option<(f64, f64)>,
}

/// An exchange file of own templates.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct OwnTemplateFile {
    pub format: String,
    pub version: u32,
    #[serde(deserialize_with = "spec::bounded::vec")]
    pub templates: Vec<OwnTemplate>,
}

fn bad(place: &str, message: impl std::fmt::Display) -> InputError {
    InputError::new("bad-own-template", format!("{place}: {message}"))
}

fn limit(text: &str, max: usize, place: &str) -> Result<(), InputError> {
    let n = text.chars().count();
    if n > max {
        return Err(bad(
            place,
            format!("has {n} characters; the limit is {max}"),
        ));
    }
    Ok(())
}

impl OwnTemplate {
    /// Checks every field; `place` names the template in errors (`templates[2]`).
    /// Errors have the code `bad-own-template` (or the code of the equation or unit
    /// error, with the place in the message) and never lose the rest of the input.
    pub fn check(&self, place: &str) -> Result<(), InputError> {
        let id = self.id.trim();
        if id.is_empty() {
            return Err(bad(
                &format!("{place}.id"),
                "is empty; give a short name such as my.pump-head",
            ));
        }
        limit(id, MAX_ID_CHARS, &format!("{place}.id"))?;
        if let Some(c) = id
            .chars()
            .find(|c| !(c.is_ascii_alphanumeric() || matches!(c, '.' | '-' | '_')))
        {
            return Err(bad(
                &format!("{place}.id"),
                format!("\"{id}\" contains {c:?}; use letters, digits, '.', '-' and '_'"),
            ));
        }
        if super::find(id).is_some() {
            return Err(bad(
                &format!("{place}.id"),
                format!(
                    "\"{id}\" is the id of a bundled template; choose another (such as my.{id})"
                ),
            ));
        }
        if self.title.trim().is_empty() {
            return Err(bad(&format!("{place}.title"), "is empty"));
        }
        limit(&self.title, MAX_NAME_CHARS, &format!("{place}.title"))?;
        for (field, text) in [
            ("description", &self.description),
            ("validity", &self.validity),
            ("source", &self.source),
        ] {
            limit(text, MAX_NOTE_CHARS, &format!("{place}.{field}"))?;
        }
        limit(
            &self.equations,
            MAX_EQUATION_CHARS,
            &format!("{place}.equations"),
        )?;
        let set = EquationSet::parse(&self.equations).map_err(|e| InputError {
            code: e.code,
            message: format!("{place}.equations: {}", e.message),
            position: e.position,
        })?;
        if self.variables.is_empty() {
            return Err(bad(&format!("{place}.variables"), "is empty"));
        }
        if self.variables.len() > MAX_VARIABLES {
            return Err(bad(
                &format!("{place}.variables"),
                format!(
                    "has {} entries; the limit is {MAX_VARIABLES}",
                    self.variables.len()
                ),
            ));
        }
        let in_text: Vec<String> = set.variables();
        let mut seen: HashSet<&str> = HashSet::new();
        let mut pairs: Vec<(String, String)> = Vec::new();
        for (i, v) in self.variables.iter().enumerate() {
            let vp = format!("{place}.variables[{i}]");
            limit(&v.name, MAX_NAME_CHARS, &format!("{vp}.name"))?;
            if !in_text.iter().any(|n| n == &v.name) {
                return Err(bad(
                    &format!("{vp}.name"),
                    format!("`{}` appears in no equation", v.name),
                ));
            }
            if !seen.insert(v.name.as_str()) {
                return Err(bad(
                    &format!("{vp}.name"),
                    format!("`{}` is listed twice", v.name),
                ));
            }
            limit(&v.meaning, MAX_NOTE_CHARS, &format!("{vp}.meaning"))?;
            if let Some(u) = &v.unit {
                limit(u, MAX_NAME_CHARS, &format!("{vp}.unit"))?;
                units::parse_unit(u)
                    .map_err(|e| InputError::new(e.code, format!("{vp}.unit: {}", e.message)))?;
                pairs.push((v.name.clone(), u.clone()));
            }
            if let Some(x) = v.value {
                if !x.is_finite() {
                    return Err(bad(
                        &format!("{vp}.value"),
                        format!("must be a finite number, got {x}"),
                    ));
                }
            }
            let b = spec::bounds(v.bounds, &format!("{vp}.bounds"))?;
            if let Some((a, c)) = v.guesses {
                if !(a.is_finite() && c.is_finite()) || a == c {
                    return Err(bad(
                        &format!("{vp}.guesses"),
                        format!("must be two different finite numbers, got [{a}, {c}]"),
                    ));
                }
                for g in [a, c] {
                    if !b.contains(g) {
                        return Err(bad(
                            &format!("{vp}.guesses"),
                            format!("{g} lies outside the bounds [{}, {}]", b.lo, b.hi),
                        ));
                    }
                }
            }
        }
        let missing: Vec<&str> = in_text
            .iter()
            .map(String::as_str)
            .filter(|n| !seen.contains(n))
            .collect();
        if !missing.is_empty() {
            return Err(bad(
                &format!("{place}.variables"),
                format!("lists no entry for {}", missing.join(", ")),
            ));
        }
        if let Some(u) = &self.unknown {
            if !seen.contains(u.as_str()) {
                return Err(bad(
                    &format!("{place}.unknown"),
                    format!("`{u}` is not one of the variables"),
                ));
            }
        }
        let named: Vec<&str> = self.variables.iter().map(|v| v.name.as_str()).collect();
        VariableUnits::new(&set, &pairs, &named).map_err(|e| InputError {
            code: e.code,
            message: format!("{place}.equations: {}", e.message),
            position: e.position,
        })?;
        Ok(())
    }

    /// The variable solved for by default: `unknown`, else the first without a value.
    pub fn default_unknown(&self) -> Option<&str> {
        self.unknown.as_deref().or_else(|| {
            self.variables
                .iter()
                .find(|v| v.value.is_none())
                .map(|v| v.name.as_str())
        })
    }

    /// The problem for `unknown` with the saved values of every other variable (each in
    /// its unit) and the unknown's bounds and guesses. A variable other than the unknown
    /// without a saved value is an error naming every such variable: nothing is filled
    /// in silently.
    pub fn problem_spec(&self, unknown: &str) -> Result<ProblemSpec, InputError> {
        let Some(u) = self.variables.iter().find(|v| v.name == unknown) else {
            return Err(InputError::new(
                "unknown-variable",
                format!("`{unknown}` is not a variable of own template {}", self.id),
            ));
        };
        let missing: Vec<&str> = self
            .variables
            .iter()
            .filter(|v| v.name != unknown && v.value.is_none())
            .map(|v| v.name.as_str())
            .collect();
        if !missing.is_empty() {
            return Err(InputError::new(
                "missing-value",
                format!(
                    "own template {} has no value for {}; give every known",
                    self.id,
                    missing.join(", ")
                ),
            ));
        }
        let knowns: BTreeMap<String, Quantity> = self
            .variables
            .iter()
            .filter(|v| v.name != unknown)
            .filter_map(|v| v.value.map(|x| (v.name.clone(), Quantity::Number(x))))
            .collect();
        let units: BTreeMap<String, String> = self
            .variables
            .iter()
            .filter_map(|v| v.unit.clone().map(|t| (v.name.clone(), t)))
            .collect();
        Ok(ProblemSpec {
            equations: Some(self.equations.clone()),
            knowns: Some(knowns),
            units: if units.is_empty() { None } else { Some(units) },
            unknowns: Some(vec![UnknownInput::Spec(UnknownObject {
                name: u.name.clone(),
                guesses: u.guesses,
                bounds: u.bounds,
                unit: None,
            })]),
            ..ProblemSpec::default()
        })
    }
}

/// Reads and checks an exchange file. Errors name the template and field.
pub fn read_file(text: &str) -> Result<Vec<OwnTemplate>, InputError> {
    let file: OwnTemplateFile = spec::from_json("the own-template file", text)?;
    check_file(&file)?;
    Ok(file.templates)
}

/// Checks a file already read (format, version, count, each template, unique ids).
pub fn check_file(file: &OwnTemplateFile) -> Result<(), InputError> {
    if file.format != FORMAT {
        return Err(bad(
            "format",
            format!(
                "is \"{}\"; a file of own templates says \"{FORMAT}\"",
                file.format
            ),
        ));
    }
    if file.version == 0 || file.version > VERSION {
        return Err(bad(
            "version",
            format!(
                "is {}; this build reads versions 1 to {VERSION} (a newer file needs a newer tacit)",
                file.version
            ),
        ));
    }
    if file.templates.len() > MAX_TEMPLATES {
        return Err(bad(
            "templates",
            format!(
                "has {} entries; the limit is {MAX_TEMPLATES}",
                file.templates.len()
            ),
        ));
    }
    let mut ids: HashSet<&str> = HashSet::new();
    for (i, t) in file.templates.iter().enumerate() {
        let place = format!("templates[{i}]");
        t.check(&place)?;
        if !ids.insert(t.id.trim()) {
            return Err(bad(
                &format!("{place}.id"),
                format!("\"{}\" is used twice in the file", t.id),
            ));
        }
    }
    Ok(())
}

/// Writes templates as an exchange file (pretty JSON), after checking them.
pub fn write_file(templates: &[OwnTemplate]) -> Result<String, InputError> {
    let file = OwnTemplateFile {
        format: FORMAT.to_string(),
        version: VERSION,
        templates: templates.to_vec(),
    };
    check_file(&file)?;
    serde_json::to_string_pretty(&file)
        .map_err(|e| InputError::new("internal", format!("writing the own-template file: {e}")))
}

//! What a caller gets back, typed: every x (root, other roots, bracket, history, scan,
//! sweep, certificate) in the unit the caller chose; SI values only under names that
//! say so (`rootSi`). Residuals are the equation's own (in SI where the equation has
//! units).

use std::collections::BTreeMap;

use serde::Serialize;

use crate::certificate::Certificate;
use crate::outcome::HistoryRow;
use crate::roots_in_range::RangeRoots;

/// A value of the unknown in the caller's unit, from SI, and a difference of two.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Conversion {
    /// SI per unit (1 with no unit).
    pub factor: f64,
    /// The SI value of the unit's zero (absolute temperatures).
    pub offset: f64,
}

impl Conversion {
    pub const NONE: Conversion = Conversion {
        factor: 1.0,
        offset: 0.0,
    };

    pub fn to_si(&self, v: f64) -> f64 {
        v * self.factor + self.offset
    }

    pub fn from_si(&self, v: f64) -> f64 {
        (v - self.offset) / self.factor
    }

    /// A difference (a step, a width) from SI.
    pub fn delta_from_si(&self, d: f64) -> f64 {
        d / self.factor
    }

    pub fn pair_from_si(&self, p: Option<(f64, f64)>) -> Option<[f64; 2]> {
        p.map(|(a, b)| {
            let (a, b) = (self.from_si(a), self.from_si(b));
            [a.min(b), a.max(b)]
        })
    }
}

/// The evidence of convergence ([`Certificate`]) with its x in the caller's unit.
#[derive(Debug, Clone, PartialEq, Serialize)]
#[serde(rename_all = "camelCase")]
pub struct CertificateReport {
    pub kind: &'static str,
    pub explanation: &'static str,
    pub residual: f64,
    pub bound: f64,
    pub bracket: Option<[f64; 2]>,
    pub width: f64,
    pub reference: Option<[f64; 2]>,
}

impl CertificateReport {
    /// A scalar certificate, x values converted with `c`.
    pub fn scalar(cert: &Certificate, c: &Conversion) -> CertificateReport {
        CertificateReport {
            kind: cert.kind.code(),
            explanation: cert.kind.explanation(),
            residual: cert.residual,
            bound: cert.bound,
            bracket: c.pair_from_si(cert.bracket),
            width: c.delta_from_si(cert.width),
            reference: cert.reference.map(|(x, f)| [c.from_si(x), f]),
        }
    }

    /// A system's certificate (no x of a single unknown to convert).
    pub fn system(cert: &Certificate) -> CertificateReport {
        CertificateReport {
            kind: cert.kind.code(),
            explanation: cert.kind.explanation(),
            residual: cert.residual,
            bound: cert.bound,
            bracket: None,
            width: cert.width,
            reference: cert.reference.map(|(d, f)| [d, f]),
        }
    }
}

/// One evaluation of a scalar solve, x in the caller's unit.
#[derive(Debug, Clone, PartialEq, Serialize)]
#[serde(rename_all = "camelCase")]
pub struct HistoryReport {
    pub k: usize,
    pub x: f64,
    pub fx: f64,
    pub step: f64,
    pub bracket: Option<[f64; 2]>,
    pub kind: &'static str,
}

impl HistoryReport {
    pub fn rows(rows: &[HistoryRow], c: &Conversion) -> Vec<HistoryReport> {
        rows.iter()
            .map(|r| HistoryReport {
                k: r.k,
                x: c.from_si(r.x),
                fx: r.fx,
                step: c.delta_from_si(r.step),
                bracket: c.pair_from_si(r.bracket),
                kind: r.kind.code(),
            })
            .collect()
    }
}

/// One evaluation of a system solve, x in the unknowns' units.
#[derive(Debug, Clone, PartialEq, Serialize)]
#[serde(rename_all = "camelCase")]
pub struct SystemHistoryReport {
    pub k: usize,
    pub x: Vec<f64>,
    pub residual_norm: f64,
    pub kind: &'static str,
}

#[derive(Debug, Clone, PartialEq, Serialize)]
#[serde(rename_all = "camelCase")]
pub struct SensitivityReport {
    pub unknown: String,
    pub input: String,
    /// d unknown / d input, in the unknown's unit per the input's unit.
    pub derivative: f64,
    /// (d unknown / unknown) / (d input / input).
    pub relative: f64,
}

#[derive(Debug, Clone, PartialEq, Serialize)]
#[serde(rename_all = "camelCase")]
pub struct BlockReport {
    pub unknowns: Vec<String>,
    pub equations: Vec<usize>,
    pub converged: bool,
    pub status: &'static str,
    pub evaluations: usize,
    pub iterations: usize,
    pub certificate: Option<CertificateReport>,
}

#[derive(Debug, Clone, PartialEq, Serialize)]
#[serde(rename_all = "camelCase")]
pub struct OtherRootReport {
    pub value: f64,
    pub label: Option<String>,
}

#[derive(Debug, Clone, PartialEq, Serialize)]
#[serde(rename_all = "camelCase")]
pub struct OutputReport {
    pub symbol: String,
    pub meaning: String,
    pub value: f64,
    pub unit: String,
}

/// The result of a solve.
#[derive(Debug, Clone, PartialEq, Default, Serialize)]
#[serde(rename_all = "camelCase")]
pub struct SolveReport {
    pub converged: bool,
    pub status: &'static str,
    /// The status in plain words, with what to try next.
    pub message: &'static str,
    /// The evidence, exactly when converged.
    pub certificate: Option<CertificateReport>,
    /// The unknown, when there is one.
    pub unknown: Option<String>,
    /// The one unknown's answer in `unit` (the last estimate when not converged).
    pub root: Option<f64>,
    /// The same as `root` (a template's answer).
    pub value: Option<f64>,
    /// The unit of `root`, `bracket`, `history[].x`, `otherRoots` (absent with no unit).
    pub unit: Option<String>,
    /// `root` in SI.
    pub root_si: Option<f64>,
    /// Every unknown in its unit.
    pub unknowns: BTreeMap<String, f64>,
    /// The unit of every name reported with one.
    pub units: BTreeMap<String, String>,
    /// Largest |residual| of the equations at the answer.
    pub residual: f64,
    /// Each equation's residual, in text order.
    pub residuals: Vec<f64>,
    pub evaluations: usize,
    pub iterations: usize,
    /// Evaluations made to check the claim of convergence.
    pub checks: usize,
    pub bracket: Option<[f64; 2]>,
    pub history: Vec<HistoryReport>,
    pub history_dropped: usize,
    pub system_history: Vec<SystemHistoryReport>,
    pub definitions: BTreeMap<String, f64>,
    pub sensitivities: Vec<SensitivityReport>,
    pub sensitivity_evaluations: usize,
    pub blocks: Vec<BlockReport>,
    /// A template's branch label of the answer.
    pub branch: Option<String>,
    /// A template's other roots, in `unit`, with their labels.
    pub other_roots: Vec<OtherRootReport>,
    pub scan_evaluations: usize,
    pub notes: Vec<String>,
    pub caution: Option<String>,
    pub outputs: Vec<OutputReport>,
}

/// One root found in a range.
#[derive(Debug, Clone, PartialEq, Serialize)]
#[serde(rename_all = "camelCase")]
pub struct RangeRootReport {
    pub x: f64,
    pub fx: f64,
    pub kind: &'static str,
    pub converged: bool,
    pub certificate: Option<CertificateReport>,
    /// The template's branch label, where it names one.
    pub label: Option<String>,
}

/// Every root in a range, with what the scan could not see.
#[derive(Debug, Clone, PartialEq, Serialize)]
#[serde(rename_all = "camelCase")]
pub struct RootsReport {
    pub unit: Option<String>,
    pub roots: Vec<RangeRootReport>,
    pub discontinuities: Vec<[f64; 2]>,
    pub evaluations: usize,
    pub samples: usize,
    pub spacing: f64,
    pub limits: String,
}

impl RootsReport {
    /// A range scan's findings with every x converted by `c`; `labels` name the
    /// converged roots in order (a template's branches), `unit` is the unit of x.
    pub fn from_scan(
        found: &RangeRoots,
        c: &Conversion,
        labels: Vec<Option<String>>,
        unit: Option<String>,
    ) -> RootsReport {
        let mut labels = labels.into_iter();
        let mut roots: Vec<RangeRootReport> = found
            .roots
            .iter()
            .map(|r| RangeRootReport {
                x: c.from_si(r.x),
                fx: r.fx,
                kind: r.kind.code(),
                converged: r.converged,
                certificate: r
                    .certificate
                    .as_ref()
                    .map(|k| CertificateReport::scalar(k, c)),
                label: if r.converged {
                    labels.next().flatten()
                } else {
                    None
                },
            })
            .collect();
        roots.sort_by(|p, q| p.x.total_cmp(&q.x));
        RootsReport {
            unit,
            roots,
            discontinuities: found
                .discontinuities
                .iter()
                .filter_map(|&d| c.pair_from_si(Some(d)))
                .collect(),
            evaluations: found.evaluations,
            samples: found.samples,
            spacing: c.delta_from_si(found.spacing).abs(),
            limits: found.limits.clone(),
        }
    }
}

/// f sampled over a range: `x` in the unknown's unit.
#[derive(Debug, Clone, PartialEq, Serialize)]
#[serde(rename_all = "camelCase")]
pub struct SampleReport {
    pub unit: Option<String>,
    pub x: Vec<f64>,
    pub f: Vec<f64>,
}

/// A sweep: per point the input (its unit), the root (the unknown's unit), status.
#[derive(Debug, Clone, PartialEq, Default, Serialize)]
#[serde(rename_all = "camelCase")]
pub struct SweepReport {
    /// The unknown solved at every point.
    pub unknown: Option<String>,
    pub input_name: String,
    pub input_unit: Option<String>,
    pub unit: Option<String>,
    pub input: Vec<f64>,
    pub root: Vec<f64>,
    pub status: Vec<&'static str>,
    pub converged: Vec<bool>,
    pub evaluations: Vec<usize>,
    pub total_evaluations: usize,
    /// Points done so far (equal to `input.len()`); the sweep is done when it equals
    /// `points`.
    pub done: usize,
    pub points: usize,
}

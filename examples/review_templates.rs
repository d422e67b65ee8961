//! Throwaway review: solve every template for every allowed unknown at its defaults.
use tacit::templates::{all, solve_template, TemplateRequest};

fn main() {
    for t in all() {
        println!("=== {} ({}) caution: {}", t.id, t.field, t.caution.is_some());
        for u in &t.unknowns {
            let v = t.variable(u).unwrap();
            let req = TemplateRequest::new(&t.id, u);
            match solve_template(&req) {
                Ok(s) => {
                    let rel = (s.value - v.value) / v.value.abs().max(1e-300);
                    println!(
                        "  {u} = {} {} (default {} rel {:.1e}) status {} evals {} other {:?}",
                        s.value,
                        s.unit,
                        v.value,
                        rel,
                        s.solution.status.code(),
                        s.solution.evaluations,
                        s.other_roots
                    );
                    for n in &s.notes {
                        println!("      note: {n}");
                    }
                    let outs: Vec<String> = s
                        .outputs
                        .iter()
                        .map(|o| format!("{}={:.6} {}", o.symbol, o.value, o.unit))
                        .collect();
                    println!("      outputs: {}", outs.join(", "));
                }
                Err(e) => println!("  {u}: ERROR {} {}", e.code, e.message),
            }
        }
    }
}

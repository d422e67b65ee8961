//! Counts of false claims of convergence over the adversarial families of
//! `tests/fixtures/adversarial.rs` (poles, jumps, NaN regions, asymptotes, underflow,
//! minima above zero, and a few ordinary roots as controls), through every method and
//! start, the ask–tell stepper and the range scan.
//!
//! Run with `cargo run --release --example trust_audit`. `tests/trust.rs` asserts the
//! count of wrong claims is zero.

#[path = "../tests/fixtures/adversarial.rs"]
mod adversarial;

fn main() {
    let mut shown = 0;
    let mut show = |what: &str| {
        if shown < 40 {
            println!("  wrong: {what}");
        }
        shown += 1;
    };
    let solves = adversarial::audit_solves(&mut show);
    let scans = adversarial::audit_range_scans(&mut show);
    println!(
        "solves (closure and stepper, every method and start): {} calls, {} converged, {} wrong",
        solves.calls, solves.converged, solves.wrong
    );
    println!(
        "range scans: {} scans, {} roots reported converged, {} wrong, {} true roots missed",
        scans.calls, scans.converged, scans.wrong, scans.missed
    );
}

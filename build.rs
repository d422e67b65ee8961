//! Writes the template catalogue into `OUT_DIR` for `include_str!`.
//!
//! For wasm32 the whitespace between JSON tokens is dropped (about 6 KB of the package); the
//! text inside strings is untouched, so the parsed catalogue is the same. Native builds keep
//! the file as written, so a parse error names the line an editor shows.

use std::{env, fs, path::Path};

const SOURCE: &str = "src/templates/catalogue.json";

/// `text` without the whitespace outside JSON strings.
pub fn compact_json(text: &str) -> String {
    let mut out = String::with_capacity(text.len());
    let mut in_string = false;
    let mut escaped = false;
    for c in text.chars() {
        if in_string {
            out.push(c);
            if escaped {
                escaped = false;
            } else if c == '\\' {
                escaped = true;
            } else if c == '"' {
                in_string = false;
            }
        } else if c == '"' {
            in_string = true;
            out.push(c);
        } else if !matches!(c, ' ' | '\n' | '\r' | '\t') {
            out.push(c);
        }
    }
    out
}

fn main() {
    println!("cargo:rerun-if-changed={SOURCE}");
    println!("cargo:rerun-if-changed=build.rs");
    let text = fs::read_to_string(SOURCE).unwrap_or_else(|e| panic!("{SOURCE}: {e}"));
    let wasm = env::var("CARGO_CFG_TARGET_ARCH").is_ok_and(|a| a == "wasm32");
    let text = if wasm { compact_json(&text) } else { text };
    let out = Path::new(&env::var("OUT_DIR").expect("cargo sets OUT_DIR")).join("catalogue.json");
    fs::write(&out, text).unwrap_or_else(|e| panic!("{}: {e}", out.display()));
}

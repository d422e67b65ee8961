//! The wasm build embeds the catalogue without the whitespace between JSON tokens (build.rs).
//! This checks that the compact text holds the same JSON value as the file.

#[allow(dead_code)]
#[path = "../build.rs"]
mod build_script;

use serde_json::Value;

#[test]
fn compact_catalogue_is_the_same_json() {
    let text = std::fs::read_to_string("src/templates/catalogue.json").unwrap();
    let compact = build_script::compact_json(&text);
    assert!(compact.len() < text.len(), "whitespace was removed");
    assert!(
        !compact.contains("\n"),
        "no line breaks remain outside strings"
    );
    let a: Value = serde_json::from_str(&text).unwrap();
    let b: Value = serde_json::from_str(&compact).unwrap();
    assert_eq!(a, b);
}

#[test]
fn compact_keeps_whitespace_and_escapes_inside_strings() {
    let text = "{ \"a b\" : [ 1 , \"x \\\" y\\\\\" ],\n \"c\": \"\\n \" }";
    assert_eq!(
        build_script::compact_json(text),
        "{\"a b\":[1,\"x \\\" y\\\\\"],\"c\":\"\\n \"}"
    );
}

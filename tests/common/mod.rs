//! Strategies shared by the property tests of the equation language.
// Each test crate that includes this module uses only some of it.
#![allow(dead_code)]

use proptest::prelude::*;
use tacit::equations::functions::{find, Arity, FUNCTIONS};

/// Random expressions over x, y, z with every operator and function of the language.
pub fn expression() -> impl Strategy<Value = String> {
    let leaf = prop_oneof![
        Just("x".to_string()),
        Just("y".to_string()),
        Just("z".to_string()),
        Just("pi".to_string()),
        Just("e".to_string()),
        (0u32..1000).prop_map(|n| format!("{n}")),
        (0u32..1000).prop_map(|n| format!(".{n}")),
        (1u32..100, -5i32..5).prop_map(|(m, k)| format!("{m}.5e{k}")),
    ];
    leaf.prop_recursive(6, 64, 6, |inner| {
        let binary = (
            inner.clone(),
            prop::sample::select(vec!["+", "-", "*", "/", "%", "^"]),
            inner.clone(),
        )
            .prop_map(|(a, op, b)| format!("{a} {op} {b}"));
        let paren = inner.clone().prop_map(|a| format!("({a})"));
        let unary = (prop::sample::select(vec!["-", "+"]), inner.clone())
            .prop_map(|(s, a)| format!("{s}{a}"));
        let call = (
            prop::sample::select(FUNCTIONS.iter().map(|f| f.name).collect::<Vec<_>>()),
            prop::collection::vec(inner, 1..5),
        )
            .prop_map(|(name, args)| {
                let f = find(name).unwrap();
                let n = match f.arity {
                    Arity::Exact(k) => k,
                    Arity::AtLeast(k) => k.max(args.len()),
                };
                let args: Vec<String> = args.iter().cycle().take(n).cloned().collect();
                format!("{name}({})", args.join(", "))
            });
        prop_oneof![binary, paren, unary, call]
    })
}

pub fn value() -> impl Strategy<Value = f64> {
    prop_oneof![
        -10.0f64..10.0,
        Just(0.0),
        Just(-0.0),
        Just(1.0),
        -1e6f64..1e6,
        (1e-300f64..1e-200),
    ]
}

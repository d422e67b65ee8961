#![cfg(target_arch = "wasm32")]
use wasm_bindgen_test::*;

#[wasm_bindgen_test]
fn smoke() {
    assert_eq!(tacit::api::convert_unit(1.0, "m", "mm").unwrap(), 1000.0);
}

//! The solver benchmark suite timed in the browser, to compare WebAssembly with native code:
//! `engine::suite::time_all` with the same solver settings as `cargo bench --bench solver`,
//! timed with `performance.now()`. Used by `web/tools/measure.mjs`.

use crate::api::err;
use engine::search::Solver;
use engine::suite;
use js_sys::{Function, Reflect};
use wasm_bindgen::prelude::*;

/// `performance.now()` of the page or worker, in milliseconds.
fn now() -> f64 {
    let perf = Reflect::get(&js_sys::global(), &"performance".into()).ok();
    let f = perf
        .as_ref()
        .and_then(|p| Reflect::get(p, &"now".into()).ok())
        .and_then(|f| f.dyn_into::<Function>().ok());
    match (perf, f) {
        (Some(p), Some(f)) => f.call0(&p).ok().and_then(|v| v.as_f64()).unwrap_or(0.0),
        _ => js_sys::Date::now(),
    }
}

/// Times every position of a suite file (the text of `engine/benches/suite.txt`); returns the
/// run as JSON: `{vcf, vct}` timings (`positions`, `median_ms`, `p95_ms`, `max_ms`,
/// `total_ms`, `nodes`) and the `mismatches` with the recorded verdicts.
#[wasm_bindgen(js_name = benchSuite)]
pub fn bench_suite(text: &str) -> Result<String, JsValue> {
    let cases = suite::parse(text).map_err(err)?;
    let run = suite::time_all(&cases, &mut Solver::default(), now);
    serde_json::to_string(&run).map_err(err)
}

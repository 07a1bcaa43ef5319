//! The Fivefold web app's Rust side.
//!
//! The page's scripts only forward events (a tap, a key, a button, a resize) and write out the
//! text they get back. Every rule, grade and sentence comes from the engine or from here:
//! [`trainer`] is the board handle (one per canvas: a puzzle being played or a position being
//! studied), [`api`] holds the plain functions (sets, share and result codes, ratings,
//! generation and solving for the worker), [`layout`] places the grid and [`render`] draws it;
//! [`bench`] times the solver's benchmark suite in the browser.
#![deny(missing_docs)]

pub mod api;
pub mod bench;
pub mod layout;
pub mod library;
pub mod render;
pub mod trainer;
pub mod words;

use wasm_bindgen::prelude::*;

/// Runs once when the module is initialised: panics are reported on the console.
#[wasm_bindgen(start)]
pub fn start() {
    console_error_panic_hook::set_once();
}

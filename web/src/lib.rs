//! The Fivefold web app's Rust side.
//!
//! The page's scripts only forward events (a tap, a key, a button, a resize) and write out the
//! text they get back. Every rule, grade and sentence comes from the engine (its board
//! controllers in `engine::trainer`, its sentences in `engine::words`): [`boards`] holds the
//! two board handles (a puzzle board and a study board, each a thin shell over an engine
//! controller and one canvas), [`api`] the plain functions (sets, share and result codes,
//! ratings), [`worker`] the worker's generation and solving, [`coach`] and [`classroom`] the
//! instructor's screen (links, the printable sheet, the class table), [`drill`] the choice of a drill's rating
//! band, [`games`] the player's own games (read, and checked move by move in the worker),
//! [`layout`] places the grid and [`render`] draws it, [`qr`] gives the modules of a QR
//! code; [`bench`] times the solver's benchmark suite in the browser. [`worker`],
//! [`classroom`], [`coach`], [`games`], [`qr`] and [`bench`] are in the workshop module only
//! (the `workshop` feature), which the worker, the instructor's screens and the code writers
//! load; the page starts without them.
#![deny(missing_docs)]

pub mod api;
#[cfg(feature = "workshop")]
pub mod bench;
pub mod boards;
#[cfg(feature = "workshop")]
pub mod classroom;
#[cfg(feature = "workshop")]
pub mod coach;
pub mod drill;
#[cfg(feature = "workshop")]
pub mod games;
pub mod layout;
pub mod library;
pub mod practice;
#[cfg(feature = "workshop")]
pub mod qr;
pub mod render;
mod surface;
#[cfg(feature = "workshop")]
pub mod worker;

use wasm_bindgen::prelude::*;

/// Runs once when the module is initialised: panics are reported on the console.
#[wasm_bindgen(start)]
pub fn start() {
    console_error_panic_hook::set_once();
}

//! The QR code of a text for the page's canvas: the module matrix of
//! `engine::formats::qr::encode` (level M, the smallest version that holds the text), which the
//! page draws with its quiet zone (the student's result code on the Tonight summary).

use engine::formats::qr;
use js_sys::{Object, Reflect, Uint8Array};
use wasm_bindgen::prelude::*;

use crate::api::err;

/// The QR code of `text` as `{version, size, quiet, dark}`: `size` modules a side, `dark` a
/// `Uint8Array` of `size * size` bytes row by row from the top left (1 dark, 0 light), `quiet`
/// the light border to draw around it in modules. A text too long for any QR code is refused
/// with a message.
#[wasm_bindgen(js_name = qrMatrix)]
pub fn qr_matrix(text: &str) -> Result<Object, JsValue> {
    let code = qr::encode(text).map_err(err)?;
    let dark: Vec<u8> = code.modules().iter().map(|&d| u8::from(d)).collect();
    let out = Object::new();
    Reflect::set(&out, &"version".into(), &code.version().into())?;
    Reflect::set(&out, &"size".into(), &(code.size() as u32).into())?;
    Reflect::set(&out, &"quiet".into(), &(qr::QUIET_ZONE as u32).into())?;
    Reflect::set(&out, &"dark".into(), &Uint8Array::from(dark.as_slice()))?;
    Ok(out)
}

//! Fivefold's QR code reader, for the camera scanner of the Coach screen (`web/scan.js`).
//!
//! It is its own small WebAssembly module, apart from the app's engine, so that the page a
//! student loads does not grow: `scan.js` fetches it only when scanning starts, and only in a
//! browser without a built-in QR detector (`BarcodeDetector`). The decoder is the `rqrr` crate
//! (pure Rust, no image libraries): it finds the code's finder patterns in a grey picture with
//! a local threshold, so a camera frame with uneven light still reads.
#![deny(missing_docs)]

use wasm_bindgen::prelude::*;

/// The largest picture read, in pixels (a 1920 x 1080 frame is 2.1 million); `scan.js` scales
/// frames down well below this before it asks.
pub const MAX_PIXELS: usize = 4_000_000;

/// The text of a QR code in a grey picture (`luma`: one byte per pixel, row by row from the
/// top left, 0 black, 255 white, `width * height` bytes), or nothing when no code reads: none
/// in view, blurred, cut off, or too damaged for its error correction. With several codes in
/// view, the first that reads. A buffer shorter than `width * height`, or a picture larger
/// than [`MAX_PIXELS`], reads as nothing.
#[wasm_bindgen]
pub fn decode(width: usize, height: usize, luma: &[u8]) -> Option<String> {
    let pixels = width.checked_mul(height)?;
    if pixels == 0 || pixels > MAX_PIXELS || luma.len() < pixels {
        return None;
    }
    let mut image =
        rqrr::PreparedImage::prepare_from_greyscale(width, height, |x, y| luma[y * width + x]);
    image
        .detect_grids()
        .iter()
        .find_map(|grid| grid.decode().ok().map(|(_, text)| text))
}

#[cfg(test)]
mod tests {
    use super::*;
    use engine::formats::result::{self, PuzzleResult, TimeBucket};
    use engine::puzzle::attempt::Attempt;
    use qrcodegen::{QrCode, QrCodeEcc, QrSegment};

    /// A real result code: a student's outcomes on a set of eight.
    fn result_code(name: &str) -> String {
        let puzzles = [
            PuzzleResult::new(Attempt::Clean, 0, TimeBucket::of_seconds(20)),
            PuzzleResult::new(Attempt::Helped, 2, TimeBucket::of_seconds(100)),
            PuzzleResult::new(Attempt::Failed, 1, TimeBucket::of_seconds(400)),
            PuzzleResult::new(Attempt::Clean, 0, TimeBucket::NotTimed),
            PuzzleResult::new(Attempt::Untried, 0, TimeBucket::NotTimed),
            PuzzleResult::new(Attempt::Clean, 3, TimeBucket::of_seconds(250)),
            PuzzleResult::new(Attempt::Failed, 0, TimeBucket::of_seconds(10)),
            PuzzleResult::new(Attempt::Helped, 1, TimeBucket::of_seconds(30)),
        ];
        result::encode(0x5eed_f00d, name, &puzzles).expect("a code")
    }

    /// The code as the app draws it: an alphanumeric segment at level M.
    fn qr_of(text: &str) -> QrCode {
        assert!(
            QrSegment::is_alphanumeric(text),
            "a result code is QR alphanumeric: {text}"
        );
        QrCode::encode_segments(&[QrSegment::make_alphanumeric(text)], QrCodeEcc::Medium).unwrap()
    }

    /// A grey picture `width` x `height` with `qr` drawn at `scale` pixels a module (not
    /// necessarily whole), its top left corner (quiet zone included) at `(left, top)`, dark
    /// modules `ink` and the rest `paper`, plus a fixed ripple of noise.
    fn picture(
        qr: &QrCode,
        width: usize,
        height: usize,
        at: (f64, f64),
        scale: f64,
        ink: u8,
        paper: u8,
    ) -> Vec<u8> {
        let quiet = 4.0;
        let mut luma = vec![paper; width * height];
        for y in 0..height {
            for x in 0..width {
                let mx = ((x as f64 - at.0) / scale - quiet).floor();
                let my = ((y as f64 - at.1) / scale - quiet).floor();
                let dark = mx >= 0.0 && my >= 0.0 && qr.get_module(mx as i32, my as i32);
                let base = if dark { ink } else { paper };
                let noise = ((x * 7 + y * 13) % 17) as i16 - 8;
                luma[y * width + x] = (base as i16 + noise).clamp(0, 255) as u8;
            }
        }
        luma
    }

    #[test]
    fn a_result_code_reads_back_from_a_clean_picture() {
        let code = result_code("Mira Okafor");
        let qr = qr_of(&code);
        let side = (qr.size() as usize + 8) * 4;
        let luma = picture(&qr, side, side, (0.0, 0.0), 4.0, 0, 255);
        assert_eq!(decode(side, side, &luma).as_deref(), Some(code.as_str()));
    }

    #[test]
    fn a_result_code_reads_back_from_a_camera_like_frame() {
        // Off-centre in a 640 x 480 frame, 5.3 pixels a module, grey ink on grey paper, noise.
        let code = result_code("Tomas Reyne");
        let qr = qr_of(&code);
        let luma = picture(&qr, 640, 480, (117.4, 61.8), 5.3, 60, 190);
        assert_eq!(decode(640, 480, &luma).as_deref(), Some(code.as_str()));
    }

    #[test]
    fn two_students_codes_read_apart() {
        let a = result_code("Mira Okafor");
        let b = result_code("Ines Halloran");
        assert_ne!(a, b);
        for code in [a, b] {
            let qr = qr_of(&code);
            let luma = picture(&qr, 400, 300, (40.0, 20.0), 6.0, 0, 255);
            assert_eq!(decode(400, 300, &luma), Some(code));
        }
    }

    #[test]
    fn no_code_in_view_reads_as_nothing() {
        let blank = vec![200u8; 320 * 240];
        assert_eq!(decode(320, 240, &blank), None);
        let stripes: Vec<u8> = (0..320 * 240)
            .map(|i| if (i % 320) / 8 % 2 == 0 { 0 } else { 255 })
            .collect();
        assert_eq!(decode(320, 240, &stripes), None);
    }

    #[test]
    fn a_damaged_code_reads_as_nothing_or_as_itself() {
        // Covering a third of the code is more than level M corrects: it must not read as
        // some other text.
        let code = result_code("Mira Okafor");
        let qr = qr_of(&code);
        let side = (qr.size() as usize + 8) * 4;
        let mut luma = picture(&qr, side, side, (0.0, 0.0), 4.0, 0, 255);
        for y in 16..side - 16 {
            for x in side / 3..side / 2 {
                luma[y * side + x] = 255 - luma[y * side + x];
            }
        }
        let read = decode(side, side, &luma);
        assert!(
            read.is_none() || read.as_deref() == Some(code.as_str()),
            "{read:?}"
        );
    }

    #[test]
    fn a_short_or_empty_buffer_reads_as_nothing() {
        assert_eq!(decode(100, 100, &[255; 99 * 100]), None);
        assert_eq!(decode(0, 0, &[]), None);
        assert_eq!(decode(usize::MAX, 2, &[0; 16]), None);
        assert_eq!(decode(3000, 3000, &vec![255; 9_000_000]), None);
    }
}

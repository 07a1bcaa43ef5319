//! The QR code of a share link (or of a bare share code or result code), as a matrix of
//! modules for the page's canvas and as SVG text for a file or a printed sheet.
//!
//! The encoder is the `qrcodegen` crate: about a thousand lines with no dependencies of its
//! own, complete (every version, every error-correction level, mixed segments) and careful
//! about the standard's mask choice, so it adds little to the page. The crates that wrap an
//! encoder with image output pull in image libraries the page does not need.
//!
//! A link is written as two segments: the address part (up to and including
//! [`share::FRAGMENT`](super::share::FRAGMENT)) in byte mode, since addresses have lower-case
//! letters, and the code in alphanumeric mode, which stores 2 characters in 11 bits instead of
//! 16; share codes of version 2 and result codes use only characters of that mode. The error
//! correction level is M (about 15 % of the code can be damaged or covered and it still reads),
//! and the version is the smallest that holds the text; [`Qr::version`] says which it was, so
//! a set builder can warn before a code gets too dense for a phone's camera.

use std::fmt;

use qrcodegen::{QrCode, QrCodeEcc, QrSegment, Version};

use super::share::FRAGMENT;

/// The light border a reader needs around the code, in modules (four, as the QR standard
/// asks; common practice).
pub const QUIET_ZONE: usize = 4;

/// A QR code: a square of dark and light modules.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Qr {
    version: u8,
    size: usize,
    /// Row by row from the top left; `true` is dark.
    dark: Vec<bool>,
}

/// Why a text could not be made into a QR code.
#[derive(Clone, Debug, PartialEq, Eq)]
pub enum QrError {
    /// The text does not fit the largest QR code (version 40) at level M.
    TooLong {
        /// The length of the text in bytes.
        bytes: usize,
    },
}

impl fmt::Display for QrError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            QrError::TooLong { bytes } => write!(
                f,
                "a text of {bytes} bytes does not fit in a QR code; share the set as a file \
                 instead"
            ),
        }
    }
}

impl std::error::Error for QrError {}

/// The segments of a text: the part up to and including the link's fragment marker as bytes,
/// the rest alphanumeric where it can be.
fn segments(text: &str) -> Vec<QrSegment> {
    let (address, code) = match text.rfind(FRAGMENT) {
        Some(at) => text.split_at(at + FRAGMENT.len()),
        None => ("", text),
    };
    let mut segs = Vec::new();
    if !address.is_empty() {
        segs.push(QrSegment::make_bytes(address.as_bytes()));
    }
    if QrSegment::is_alphanumeric(code) {
        segs.push(QrSegment::make_alphanumeric(code));
    } else {
        segs.push(QrSegment::make_bytes(code.as_bytes()));
    }
    segs
}

/// The QR code of a link made by [`share::link`](super::share::link), a bare share code or a
/// result code, at error correction level M in the smallest version that holds it.
pub fn encode(text: &str) -> Result<Qr, QrError> {
    let code = QrCode::encode_segments_advanced(
        &segments(text),
        QrCodeEcc::Medium,
        Version::MIN,
        Version::MAX,
        None,
        false,
    )
    .map_err(|_| QrError::TooLong { bytes: text.len() })?;
    let size = code.size() as usize;
    let dark = (0..size * size)
        .map(|i| code.get_module((i % size) as i32, (i / size) as i32))
        .collect();
    Ok(Qr {
        version: code.version().value(),
        size,
        dark,
    })
}

impl Qr {
    /// The QR version (1 to 40): the code is `17 + 4 * version` modules wide.
    pub fn version(&self) -> u8 {
        self.version
    }

    /// The width and height in modules, without the quiet zone.
    pub fn size(&self) -> usize {
        self.size
    }

    /// Whether the module at column `x`, row `y` (from the top left) is dark; outside the code
    /// (the quiet zone), light.
    pub fn is_dark(&self, x: usize, y: usize) -> bool {
        x < self.size && y < self.size && self.dark[y * self.size + x]
    }

    /// The modules row by row from the top left, `true` for dark: what the page's canvas draws.
    pub fn modules(&self) -> &[bool] {
        &self.dark
    }

    /// The code as an SVG image: the modules as one path of dark runs on a light square, with
    /// the quiet zone, one user unit per module, `size_mm` millimetres wide when printed.
    pub fn to_svg(&self, size_mm: u32) -> String {
        let side = self.size + 2 * QUIET_ZONE;
        let mut path = String::new();
        for y in 0..self.size {
            let mut x = 0;
            while x < self.size {
                if !self.is_dark(x, y) {
                    x += 1;
                    continue;
                }
                let start = x;
                while x < self.size && self.is_dark(x, y) {
                    x += 1;
                }
                path.push_str(&format!(
                    "M{},{}h{}v1h-{}z",
                    start + QUIET_ZONE,
                    y + QUIET_ZONE,
                    x - start,
                    x - start
                ));
            }
        }
        format!(
            "<svg xmlns=\"http://www.w3.org/2000/svg\" viewBox=\"0 0 {side} {side}\" \
             width=\"{size_mm}mm\" height=\"{size_mm}mm\" shape-rendering=\"crispEdges\">\
             <rect width=\"{side}\" height=\"{side}\" fill=\"#fff\"/>\
             <path fill=\"#000\" d=\"{path}\"/></svg>\n"
        )
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::formats::{setfile, share};

    /// Reads a QR code back with an independent decoder (the `rqrr` crate), from a bitmap of
    /// `scale` pixels per module with the quiet zone: the text, the version and the
    /// error-correction bits it reports.
    fn read_back(qr: &Qr, scale: usize) -> (String, usize, u16) {
        let side = (qr.size() + 2 * QUIET_ZONE) * scale;
        let mut image = rqrr::PreparedImage::prepare_from_greyscale(side, side, |x, y| {
            let (mx, my) = (x / scale, y / scale);
            let dark = mx >= QUIET_ZONE
                && my >= QUIET_ZONE
                && qr.is_dark(mx - QUIET_ZONE, my - QUIET_ZONE);
            if dark {
                0
            } else {
                255
            }
        });
        let grids = image.detect_grids();
        assert_eq!(grids.len(), 1, "one code in the picture");
        let (meta, text) = grids[0].decode().expect("the code reads");
        (text, meta.version.0, meta.ecc_level)
    }

    #[test]
    fn a_link_reads_back_with_its_version_and_level() {
        let text = "https://harbour-street.example/fivefold/#set=$0A1B2C/.:-";
        let qr = encode(text).unwrap();
        assert_eq!(qr.size(), 17 + 4 * qr.version() as usize);
        let (read, version, level) = read_back(&qr, 3);
        assert_eq!(read, text);
        assert_eq!(version, qr.version() as usize);
        // Level M is written as the two format bits 00 (ISO/IEC 18004, the format
        // information table; from memory).
        assert_eq!(level, 0);
    }

    /// Every set of the starter library, as a link in a QR code, read back by an independent
    /// decoder and opened again, is the same set.
    #[test]
    fn every_library_set_survives_a_qr_code() {
        let dir = concat!(env!("CARGO_MANIFEST_DIR"), "/../puzzles");
        let mut files: Vec<_> = std::fs::read_dir(dir)
            .unwrap()
            .map(|e| e.unwrap().path())
            .filter(|p| p.extension().is_some_and(|e| e == "json"))
            .collect();
        files.sort();
        assert!(files.len() >= 14, "{files:?}");
        for path in files {
            let set = setfile::parse(&std::fs::read_to_string(&path).unwrap()).unwrap();
            let url = share::link(
                "https://harbour-street.example/fivefold/",
                &share::encode(&set).unwrap(),
            );
            let qr = encode(&url).unwrap();
            let (read, _, _) = read_back(&qr, 2);
            assert_eq!(read, url, "{path:?}");
            // A code carries the generator block only when a version 2 code can hold it (not
            // for deep or unique-only generations; see share.rs).
            let mut want = set.clone();
            want.generator = want.generator.filter(|g| g.min_moves == 0 && !g.unique);
            assert_eq!(share::decode(&read).unwrap(), want, "{path:?}");
        }
    }

    #[test]
    fn the_svg_draws_every_dark_module_once() {
        let qr = encode("07QV-XBEY-2S6P").unwrap();
        let svg = qr.to_svg(40);
        assert!(svg.starts_with("<svg") && svg.contains("width=\"40mm\""));
        // Each run is "M{x},{y}h{n}v1h-{n}z"; the runs add up to the dark modules.
        let dark: usize = svg
            .split('M')
            .skip(1)
            .map(|run| {
                let n = run.split('h').nth(1).unwrap().trim_end_matches("v1");
                n.parse::<usize>().unwrap()
            })
            .sum();
        assert_eq!(dark, qr.modules().iter().filter(|&&d| d).count());
        let too_long = "A".repeat(5000);
        assert_eq!(encode(&too_long), Err(QrError::TooLong { bytes: 5000 }));
    }
}

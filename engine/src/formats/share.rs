//! Share codes: a whole puzzle set in a short text that fits in a link's fragment (so it never
//! reaches a server) or a QR code.
//!
//! Layout, version 1: a compact binary form of the set (below), compressed with DEFLATE, then a
//! CRC-32 of the compressed bytes, all in URL-safe base64 without padding. A damaged or
//! truncated code fails the checksum (or the decompression) and loads nothing.
//!
//! The binary form: the format version (1 byte); the title and the created date as
//! length-prefixed UTF-8; the puzzle count (LEB128); then per puzzle: the id (length-prefixed),
//! one byte of rule (2 bits), side to move (1 bit) and theme (3 bits), the board side, the rating
//! (2 bytes) and the length (1 byte), then the black stones, white stones, first moves and main
//! line as counted lists of points (one byte per point on boards up to 15x15, two above). The
//! decoded set goes through the set file's own checks, so a code can carry nothing a set file
//! could not.

use std::fmt;
use std::io::{Read, Write};

use base64::engine::general_purpose::URL_SAFE_NO_PAD;
use base64::Engine as _;

use super::setfile::{self, PuzzleSet};
use crate::geometry::Point;
use crate::puzzle::{Puzzle, Theme};
use crate::types::Rule;
use crate::types::Stone;

const VERSION: u8 = 1;

/// Why a share code could not be read.
#[derive(Clone, Debug, PartialEq, Eq)]
pub enum ShareError {
    /// Not a share code at all (wrong characters, far too short).
    NotACode,
    /// The checksum does not match: the code was damaged or cut short.
    Damaged,
    /// A code from a newer version of Fivefold.
    NewerVersion(u8),
    /// The code decodes, but the set in it is not valid.
    Invalid(String),
}

impl fmt::Display for ShareError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            ShareError::NotACode => f.write_str("this is not a Fivefold share code"),
            ShareError::Damaged => f.write_str(
                "this share code is damaged or cut short (its checksum does not match); \
                 nothing was loaded",
            ),
            ShareError::NewerVersion(v) => write!(
                f,
                "this share code was made by a newer version of Fivefold (code version {v}); \
                 update Fivefold to open it"
            ),
            ShareError::Invalid(m) => write!(f, "the set in this share code is not valid: {m}"),
        }
    }
}

impl std::error::Error for ShareError {}

fn put_len(out: &mut Vec<u8>, mut n: usize) {
    loop {
        let b = (n & 0x7f) as u8;
        n >>= 7;
        if n == 0 {
            out.push(b);
            return;
        }
        out.push(b | 0x80);
    }
}

fn put_str(out: &mut Vec<u8>, s: &str) {
    put_len(out, s.len());
    out.extend_from_slice(s.as_bytes());
}

fn put_points(out: &mut Vec<u8>, size: u8, pts: &[Point]) {
    put_len(out, pts.len());
    for p in pts {
        let i = p.y as u16 * size as u16 + p.x as u16;
        if size <= 15 {
            out.push(i as u8);
        } else {
            out.extend_from_slice(&i.to_le_bytes());
        }
    }
}

fn rule_bits(r: Rule) -> u8 {
    match r {
        Rule::Freestyle => 0,
        Rule::Standard => 1,
        Rule::Renju => 2,
    }
}

fn theme_bits(t: Theme) -> u8 {
    Theme::ALL.iter().position(|&x| x == t).unwrap_or(0) as u8
}

/// Encodes a set as a share code.
pub fn encode(set: &PuzzleSet) -> String {
    let mut raw = vec![VERSION];
    put_str(&mut raw, &set.title);
    put_str(&mut raw, &set.created);
    put_len(&mut raw, set.puzzles.len());
    for p in &set.puzzles {
        put_str(&mut raw, &p.id);
        raw.push(rule_bits(p.rule) | (p.to_move.index() as u8) << 2 | theme_bits(p.theme) << 3);
        raw.push(p.size);
        raw.extend_from_slice(&(p.rating.min(u16::MAX as u32) as u16).to_le_bytes());
        raw.push(p.length.min(255) as u8);
        for list in [&p.black, &p.white, &p.first_moves, &p.line] {
            put_points(&mut raw, p.size, list);
        }
    }
    let mut enc = flate2::write::DeflateEncoder::new(Vec::new(), flate2::Compression::best());
    enc.write_all(&raw).expect("writing to memory cannot fail");
    let mut packed = enc.finish().expect("writing to memory cannot fail");
    let crc = crc32fast::hash(&packed);
    packed.extend_from_slice(&crc.to_le_bytes());
    URL_SAFE_NO_PAD.encode(packed)
}

struct Reader<'a> {
    b: &'a [u8],
    at: usize,
}

impl Reader<'_> {
    fn byte(&mut self) -> Result<u8, ShareError> {
        let v = *self.b.get(self.at).ok_or(ShareError::Damaged)?;
        self.at += 1;
        Ok(v)
    }

    fn len(&mut self) -> Result<usize, ShareError> {
        let mut n = 0usize;
        for shift in (0..35).step_by(7) {
            let b = self.byte()?;
            n |= ((b & 0x7f) as usize) << shift;
            if b & 0x80 == 0 {
                return Ok(n);
            }
        }
        Err(ShareError::Damaged)
    }

    fn bytes(&mut self, n: usize) -> Result<&[u8], ShareError> {
        let end = self.at.checked_add(n).ok_or(ShareError::Damaged)?;
        let s = self.b.get(self.at..end).ok_or(ShareError::Damaged)?;
        self.at = end;
        Ok(s)
    }

    fn text(&mut self) -> Result<String, ShareError> {
        let n = self.len()?;
        if n > 4096 {
            return Err(ShareError::Damaged);
        }
        String::from_utf8(self.bytes(n)?.to_vec()).map_err(|_| ShareError::Damaged)
    }

    fn points(&mut self, size: u8) -> Result<Vec<Point>, ShareError> {
        let n = self.len()?;
        if n > 400 {
            return Err(ShareError::Damaged);
        }
        let mut out = Vec::with_capacity(n);
        for _ in 0..n {
            let i = if size <= 15 {
                self.byte()? as u16
            } else {
                let b = self.bytes(2)?;
                u16::from_le_bytes([b[0], b[1]])
            };
            let (x, y) = (i % size as u16, i / size as u16);
            if y >= size as u16 {
                return Err(ShareError::Invalid(format!(
                    "a point lies off the {size}x{size} board"
                )));
            }
            out.push(Point::new(x as u8, y as u8));
        }
        Ok(out)
    }
}

/// Decodes a share code. Surrounding white space is ignored; nothing else is forgiven.
pub fn decode(code: &str) -> Result<PuzzleSet, ShareError> {
    let code = code.trim();
    if code.len() < 8
        || !code
            .bytes()
            .all(|c| c.is_ascii_alphanumeric() || c == b'-' || c == b'_')
    {
        return Err(ShareError::NotACode);
    }
    let bytes = URL_SAFE_NO_PAD
        .decode(code)
        .map_err(|_| ShareError::Damaged)?;
    if bytes.len() < 5 {
        return Err(ShareError::Damaged);
    }
    let (packed, crc) = bytes.split_at(bytes.len() - 4);
    if crc32fast::hash(packed).to_le_bytes() != crc {
        return Err(ShareError::Damaged);
    }
    let mut raw = Vec::new();
    flate2::read::DeflateDecoder::new(packed)
        .take(4 << 20)
        .read_to_end(&mut raw)
        .map_err(|_| ShareError::Damaged)?;
    let mut r = Reader { b: &raw, at: 0 };
    let version = r.byte()?;
    if version > VERSION {
        return Err(ShareError::NewerVersion(version));
    }
    let title = r.text()?;
    let created = r.text()?;
    let n = r.len()?;
    if n > 5000 {
        return Err(ShareError::Damaged);
    }
    let mut puzzles = Vec::with_capacity(n);
    for _ in 0..n {
        let id = r.text()?;
        let bits = r.byte()?;
        let rule = match bits & 3 {
            0 => Rule::Freestyle,
            1 => Rule::Standard,
            2 => Rule::Renju,
            _ => return Err(ShareError::Invalid("unknown rule".into())),
        };
        let to_move = if bits >> 2 & 1 == 0 {
            Stone::Black
        } else {
            Stone::White
        };
        let theme = *Theme::ALL
            .get((bits >> 3) as usize)
            .ok_or_else(|| ShareError::Invalid("unknown theme".into()))?;
        let size = r.byte()?;
        if !(5..=19).contains(&size) {
            return Err(ShareError::Invalid(format!("board size {size}")));
        }
        let rb = r.bytes(2)?;
        let rating = u16::from_le_bytes([rb[0], rb[1]]) as u32;
        let length = r.byte()? as u16;
        let black = r.points(size)?;
        let white = r.points(size)?;
        let first_moves = r.points(size)?;
        let line = r.points(size)?;
        puzzles.push(Puzzle {
            id,
            rule,
            size,
            to_move,
            black,
            white,
            theme,
            first_moves,
            line,
            length,
            rating,
        });
    }
    if r.at != raw.len() {
        return Err(ShareError::Damaged);
    }
    let set = PuzzleSet {
        title,
        created,
        puzzles,
        generator: None,
    };
    // The set file's checks, for one set of rules about what a valid set is.
    setfile::parse(&setfile::to_json(&set)).map_err(|e| ShareError::Invalid(e.to_string()))
}

#[cfg(test)]
mod tests {
    use super::*;

    fn sample() -> PuzzleSet {
        let text = r#"{"format":"fivefold-set","version":1,"title":"Harbour Street, Thursday <b>","created":"2026-12-01",
          "puzzles":[{"id":"vf-1","rule":"renju","size":15,"to_move":"black","black":["h8","i8","j8"],
          "white":["h9","i9","a1"],"theme":"vcf","goal":"win","solution":{"first_moves":["g8","k8"],
          "line":["g8","f8","k8"]},"rating":1234,"length":1},
          {"id":"big","rule":"freestyle","size":19,"to_move":"black","black":["s19","a1"],"white":["j10","k10"],
          "theme":"defend","goal":"defend","solution":{"first_moves":["b2"],"line":[]},"rating":900}]}"#;
        setfile::parse(text).unwrap()
    }

    #[test]
    fn round_trips() {
        let set = sample();
        let code = encode(&set);
        assert!(code
            .bytes()
            .all(|c| c.is_ascii_alphanumeric() || c == b'-' || c == b'_'));
        assert_eq!(decode(&code).unwrap(), set);
        assert_eq!(decode(&format!("  {code}\n")).unwrap(), set);
    }

    #[test]
    fn damage_is_detected() {
        let code = encode(&sample());
        // Every truncation and a change of each character is refused, never half-loaded.
        for cut in 1..code.len() {
            assert!(decode(&code[..code.len() - cut]).is_err(), "cut {cut}");
        }
        for i in 0..code.len() {
            let mut b = code.clone().into_bytes();
            b[i] = if b[i] == b'A' { b'B' } else { b'A' };
            let damaged = String::from_utf8(b).unwrap();
            assert!(decode(&damaged).is_err(), "position {i}");
        }
        assert_eq!(decode("hello there"), Err(ShareError::NotACode));
    }
}

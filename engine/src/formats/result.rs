//! Result codes: what a student sends back after a set, short enough to read out or type.
//!
//! A code names the set (a fingerprint of its puzzle ids), the student (as typed, up to 24
//! bytes) and, per puzzle, one of four outcomes in two bits. It is written in Crockford's base 32
//! (digits and capital letters without I, L, O and U, so that it survives being read aloud and
//! typed by hand; lower case and the look-alikes I, L and O are accepted when reading) in groups
//! of four separated by dashes, and ends in a CRC-32 of the rest, so that a mistyped code is
//! refused rather than misread.

use std::fmt;

use super::setfile::PuzzleSet;
use crate::puzzle::attempt::Attempt;

/// A decoded result code.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Results {
    /// The fingerprint of the set it belongs to ([`fingerprint`]).
    pub set: u32,
    /// The student's name as typed.
    pub name: String,
    /// One outcome per puzzle, in set order, as [`Attempt::recorded`] gives it (never
    /// `Trying`).
    pub outcomes: Vec<Attempt>,
}

/// Why a result code could not be read.
#[derive(Clone, Debug, PartialEq, Eq)]
pub enum ResultError {
    /// A character that cannot be in a code.
    BadCharacter(char),
    /// The checksum does not match: a typing mistake, or a cut-off code.
    Damaged,
    /// A code from a newer version.
    NewerVersion(u8),
}

impl fmt::Display for ResultError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            ResultError::BadCharacter(c) => write!(f, "'{c}' cannot appear in a result code"),
            ResultError::Damaged => {
                f.write_str("this result code does not check out: a character is wrong or missing")
            }
            ResultError::NewerVersion(v) => {
                write!(
                    f,
                    "this result code was made by a newer version of Fivefold ({v})"
                )
            }
        }
    }
}

impl std::error::Error for ResultError {}

const ALPHABET: &[u8; 32] = b"0123456789ABCDEFGHJKMNPQRSTVWXYZ";
const VERSION: u8 = 1;

/// The fingerprint of a set: a CRC-32 of its puzzles as the set file writes them (ids,
/// rules, stones, answers), so that two sets that reuse the same ids are still told apart;
/// the title, the date and the generator block do not count.
pub fn fingerprint(set: &PuzzleSet) -> u32 {
    let bare = PuzzleSet {
        title: String::new(),
        created: String::new(),
        puzzles: set.puzzles.clone(),
        generator: None,
    };
    crc32fast::hash(super::setfile::to_json(&bare).as_bytes())
}

fn to_base32(bytes: &[u8]) -> String {
    let mut out = String::new();
    let mut acc = 0u32;
    let mut bits = 0;
    for &b in bytes {
        acc = (acc << 8 | b as u32) & 0xFFFF;
        bits += 8;
        while bits >= 5 {
            bits -= 5;
            out.push(ALPHABET[(acc >> bits & 31) as usize] as char);
        }
    }
    if bits > 0 {
        out.push(ALPHABET[(acc << (5 - bits) & 31) as usize] as char);
    }
    out
}

fn from_base32(text: &str) -> Result<Vec<u8>, ResultError> {
    let mut out = Vec::new();
    let mut acc = 0u32;
    let mut bits = 0;
    for c in text.chars() {
        if c == '-' || c.is_whitespace() {
            continue;
        }
        let u = match c.to_ascii_uppercase() {
            'O' => '0',
            'I' | 'L' => '1',
            x => x,
        };
        let v = ALPHABET
            .iter()
            .position(|&a| a as char == u)
            .ok_or(ResultError::BadCharacter(c))? as u32;
        acc = (acc << 5 | v) & 0xFFFF;
        bits += 5;
        if bits >= 8 {
            bits -= 8;
            out.push((acc >> bits & 0xFF) as u8);
        }
    }
    Ok(out)
}

/// The two bits a puzzle's outcome takes in a code.
fn bits(a: Attempt) -> u8 {
    match a.recorded() {
        Attempt::Untried => 0,
        Attempt::Clean => 1,
        Attempt::Helped => 2,
        _ => 3,
    }
}

/// Encodes a student's results on a set (each outcome as [`Attempt::recorded`] gives it).
pub fn encode(set: u32, name: &str, outcomes: &[Attempt]) -> String {
    let mut name = name.trim().to_string();
    while name.len() > 24 {
        name.pop();
    }
    let mut raw = vec![VERSION];
    raw.extend_from_slice(&set.to_le_bytes());
    raw.push(name.len() as u8);
    raw.extend_from_slice(name.as_bytes());
    raw.extend_from_slice(&(outcomes.len().min(u16::MAX as usize) as u16).to_le_bytes());
    for chunk in outcomes.chunks(4) {
        let mut b = 0u8;
        for (i, o) in chunk.iter().enumerate() {
            b |= bits(*o) << (2 * i);
        }
        raw.push(b);
    }
    let crc = crc32fast::hash(&raw);
    raw.extend_from_slice(&crc.to_le_bytes());
    let text = to_base32(&raw);
    text.as_bytes()
        .chunks(4)
        .map(|c| String::from_utf8_lossy(c).to_string())
        .collect::<Vec<_>>()
        .join("-")
}

/// Decodes a result code.
pub fn decode(code: &str) -> Result<Results, ResultError> {
    let raw = from_base32(code)?;
    if raw.len() < 12 {
        return Err(ResultError::Damaged);
    }
    let (body, crc) = raw.split_at(raw.len() - 4);
    if crc32fast::hash(body).to_le_bytes() != crc {
        return Err(ResultError::Damaged);
    }
    if body[0] > VERSION {
        return Err(ResultError::NewerVersion(body[0]));
    }
    let set = u32::from_le_bytes([body[1], body[2], body[3], body[4]]);
    let nlen = body[5] as usize;
    let name_end = 6 + nlen;
    let name = body
        .get(6..name_end)
        .and_then(|b| String::from_utf8(b.to_vec()).ok())
        .ok_or(ResultError::Damaged)?;
    let count = body
        .get(name_end..name_end + 2)
        .map(|b| u16::from_le_bytes([b[0], b[1]]) as usize)
        .ok_or(ResultError::Damaged)?;
    let packed = &body[name_end + 2..];
    if packed.len() != count.div_ceil(4) {
        return Err(ResultError::Damaged);
    }
    let outcomes = (0..count)
        .map(|i| match packed[i / 4] >> (2 * (i % 4)) & 3 {
            0 => Attempt::Untried,
            1 => Attempt::Clean,
            2 => Attempt::Helped,
            _ => Attempt::Failed,
        })
        .collect();
    Ok(Results {
        set,
        name,
        outcomes,
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn round_trips_and_reads_forgivingly() {
        let outs = [
            Attempt::Clean,
            Attempt::Failed,
            Attempt::Helped,
            Attempt::Untried,
            Attempt::Clean,
        ];
        let code = encode(0xDEAD_BEEF, "Mira of Harbour Street", &outs);
        let r = decode(&code).unwrap();
        assert_eq!(r.set, 0xDEAD_BEEF);
        assert_eq!(r.name, "Mira of Harbour Street");
        assert_eq!(r.outcomes, outs);
        assert_eq!(decode(&code.to_lowercase().replace('-', " ")).unwrap(), r);
    }

    #[test]
    fn a_typo_is_refused() {
        let code = encode(7, "Tomas", &[Attempt::Clean; 10]);
        let mut chars: Vec<char> = code.chars().collect();
        let i = chars.iter().position(|&c| c != '-').unwrap() + 5;
        chars[i] = if chars[i] == 'Z' { 'Y' } else { 'Z' };
        let bad: String = chars.into_iter().collect();
        assert!(decode(&bad).is_err());
        assert_eq!(decode("AB*C"), Err(ResultError::BadCharacter('*')));
    }

    #[test]
    fn the_fingerprint_follows_the_puzzles_not_the_title() {
        let text = include_str!("../../../tests/data/fixture_set.json");
        let set = super::super::setfile::parse(text).unwrap();
        let mut retitled = set.clone();
        retitled.title = "Harbour Street Circle, Thursday".into();
        retitled.created = "2027-01-07".into();
        assert_eq!(fingerprint(&set), fingerprint(&retitled));
        // Same ids, one stone moved: another set.
        let mut changed = set.clone();
        let p = &mut changed.puzzles[0];
        let last = p.black.len() - 1;
        p.black[last] = crate::Point::new(0, 0);
        assert_ne!(fingerprint(&set), fingerprint(&changed));
    }
}

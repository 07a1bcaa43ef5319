//! Result codes: what a student sends back after a set, short enough to read out or type.
//!
//! A code names the set (its [`fingerprint`]), the student (as typed, at most
//! [`MAX_NAME_BYTES`] bytes) and, per puzzle, how it went: the attempt as [`Attempt::recorded`]
//! gives it (untried, clean, helped or failed), the hint steps used (0 to 3) and how long it
//! took, in a [`TimeBucket`]. It is written in Crockford's base 32 (digits and capital letters
//! without I, L, O and U, so that it survives being read aloud and typed by hand; lower case and
//! the look-alikes I, L and O are accepted when reading) in groups of four separated by dashes.
//! Upper-case letters and digits are also what a QR code's alphanumeric mode stores compactly,
//! so a code can travel back to the instructor as a QR code too.
//!
//! The bytes, version 2: the version (2), the fingerprint (4 bytes, least significant first),
//! the name's length in bytes and the name (UTF-8), the number of puzzles (2 bytes), then 7
//! bits per puzzle (attempt 2, hints 2, time 3; most significant bit first, the last byte padded
//! with zero bits), then a CRC-32 (IEEE) of everything before it. Version 1, which is still
//! read, had 2 bits per puzzle (the attempt alone): its codes read with the hints and the time
//! unknown.
//!
//! **Every character is checked.** Base 32 writes 5 bits per character, so the last character
//! usually carries a few bits beyond the last byte. The writer sets them to zero and the reader
//! refuses a code where they are not, so a change to any character changes either the bytes or
//! those bits. A change to one character changes at most 5 consecutive bits of the bytes, and a
//! CRC-32 detects every error burst of 32 bits or fewer (a property of every CRC of degree 32,
//! common knowledge of the trade), so every single-character mistake is refused (a test tries
//! them all). A code with a whole character too many is refused too.
//!
//! The writer refuses what the format cannot hold (a longer name, more puzzles than a set can
//! have, more than three hint steps) with a [`ResultError`] instead of cutting it down.

use std::fmt;

use super::bits::{BitReader, BitWriter};
use super::limits;
use super::setfile::PuzzleSet;
use crate::puzzle::attempt::Attempt;

/// The longest student name a code holds, in bytes of UTF-8.
pub const MAX_NAME_BYTES: usize = 24;

/// The version [`encode`] writes.
pub const VERSION: u8 = 2;

/// The largest first byte read as a code of a newer version rather than as damage (our own
/// bound: versions change rarely).
const LAST_PLAUSIBLE_VERSION: u8 = 15;

/// The most hint steps a puzzle offers (the theme and length, the area, the move).
pub const MAX_HINTS: u8 = 3;

/// How long a student took over one puzzle, in buckets named for the class table. The time is
/// measured by the page (the engine reads no clock) and put in a bucket by
/// [`TimeBucket::of_seconds`].
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, PartialOrd, Ord)]
pub enum TimeBucket {
    /// No time was taken (or, for a version 1 code, none is known).
    NotTimed,
    /// Under 30 seconds.
    Under30s,
    /// 30 seconds to under 2 minutes.
    Under2Min,
    /// 2 to under 5 minutes.
    Under5Min,
    /// 5 minutes or more.
    Longer,
}

impl TimeBucket {
    /// Every bucket, in the order of their numbers in a code.
    pub const ALL: [TimeBucket; 5] = [
        TimeBucket::NotTimed,
        TimeBucket::Under30s,
        TimeBucket::Under2Min,
        TimeBucket::Under5Min,
        TimeBucket::Longer,
    ];

    /// The bucket of a time in whole seconds.
    pub fn of_seconds(seconds: u32) -> TimeBucket {
        match seconds {
            0..=29 => TimeBucket::Under30s,
            30..=119 => TimeBucket::Under2Min,
            120..=299 => TimeBucket::Under5Min,
            _ => TimeBucket::Longer,
        }
    }

    /// The words for the table: "not timed", "under 30 s", "under 2 min", "under 5 min",
    /// "5 min or more".
    pub const fn words(self) -> &'static str {
        match self {
            TimeBucket::NotTimed => "not timed",
            TimeBucket::Under30s => "under 30 s",
            TimeBucket::Under2Min => "under 2 min",
            TimeBucket::Under5Min => "under 5 min",
            TimeBucket::Longer => "5 min or more",
        }
    }
}

impl fmt::Display for TimeBucket {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(self.words())
    }
}

/// How one puzzle went, as a result code records it.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash)]
pub struct PuzzleResult {
    /// The attempt; a code holds [`Attempt::recorded`] of it (never `Trying`).
    pub attempt: Attempt,
    /// Hint steps used, 0 to [`MAX_HINTS`]; `None` when not known (a version 1 code).
    pub hints: Option<u8>,
    /// How long it took.
    pub time: TimeBucket,
}

impl PuzzleResult {
    /// A result with what the page knows: the attempt, the hint steps and the time bucket.
    pub fn new(attempt: Attempt, hints: u8, time: TimeBucket) -> PuzzleResult {
        PuzzleResult {
            attempt,
            hints: Some(hints),
            time,
        }
    }

    /// The cell of a class table: "clean", "helped, 2 hints, under 2 min", "untried".
    pub fn words(&self) -> String {
        let attempt = self.attempt.recorded();
        let mut s = attempt.name().to_string();
        if attempt == Attempt::Untried {
            return s;
        }
        match self.hints {
            Some(1) => s.push_str(", 1 hint"),
            Some(n) if n > 1 => s.push_str(&format!(", {n} hints")),
            _ => {}
        }
        if self.time != TimeBucket::NotTimed {
            s.push_str(", ");
            s.push_str(self.time.words());
        }
        s
    }
}

/// A decoded result code.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Results {
    /// The code's version (1 or 2).
    pub version: u8,
    /// The fingerprint of the set it belongs to ([`fingerprint`]).
    pub set: u32,
    /// The student's name as typed.
    pub name: String,
    /// One result per puzzle, in set order.
    pub puzzles: Vec<PuzzleResult>,
}

/// Why a result code could not be made or read.
#[derive(Clone, Debug, PartialEq, Eq)]
pub enum ResultError {
    /// A character that cannot be in a code.
    BadCharacter {
        /// The character.
        found: char,
        /// Its position in the text, counted in characters from 1.
        at: usize,
    },
    /// The checksum does not match, or the bits do not fit the format: a typing mistake, or a
    /// cut-off code.
    Damaged,
    /// A code from a newer version.
    NewerVersion(u8),
    /// Writing: the name is longer than a code holds.
    NameTooLong {
        /// Its length in bytes.
        bytes: usize,
    },
    /// Writing: more puzzles than a set can have.
    TooManyPuzzles {
        /// How many were given.
        count: usize,
    },
    /// Writing: more hint steps than a puzzle offers.
    TooManyHints {
        /// The puzzle, counted from 1.
        puzzle: usize,
        /// The hint steps given.
        hints: u8,
    },
}

impl fmt::Display for ResultError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            ResultError::BadCharacter { found, at } => {
                write!(
                    f,
                    "'{found}' (character {at}) cannot appear in a result code"
                )
            }
            ResultError::Damaged => {
                f.write_str("this result code does not check out: a character is wrong or missing")
            }
            ResultError::NewerVersion(v) => write!(
                f,
                "this result code was made by a newer version of Fivefold (code version {v}); update \
                 the app to read it"
            ),
            ResultError::NameTooLong { bytes } => write!(
                f,
                "the name takes {bytes} bytes and a result code holds {MAX_NAME_BYTES} (a letter \
                 outside A to Z takes two or more); shorten it"
            ),
            ResultError::TooManyPuzzles { count } => write!(
                f,
                "{count} puzzles; a result code holds at most {}",
                limits::MAX_PUZZLES
            ),
            ResultError::TooManyHints { puzzle, hints } => write!(
                f,
                "puzzle {puzzle}: {hints} hint steps; a puzzle has at most {MAX_HINTS}"
            ),
        }
    }
}

impl std::error::Error for ResultError {}

const ALPHABET: &[u8; 32] = b"0123456789ABCDEFGHJKMNPQRSTVWXYZ";

/// The value of a character in Crockford's base 32, reading lower case and the look-alikes
/// (I and L as 1, O as 0) as the specification asks.
pub(crate) fn symbol(c: char) -> Option<u8> {
    let u = match c.to_ascii_uppercase() {
        'O' => '0',
        'I' | 'L' => '1',
        x => x,
    };
    ALPHABET
        .iter()
        .position(|&a| a as char == u)
        .map(|v| v as u8)
}

/// The longest code in bytes: header, the longest name, 7 bits for each of the most puzzles a
/// set may have, and the checksum.
const MAX_CODE_BYTES: usize = 8 + MAX_NAME_BYTES + (7 * limits::MAX_PUZZLES).div_ceil(8) + 4;

/// The most base-32 characters (dashes and spaces not counted) a code can have.
pub const MAX_CODE_CHARS: usize = (MAX_CODE_BYTES * 8).div_ceil(5);

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
    super::bits::crc32(super::setfile::to_json(&bare).as_bytes())
}

fn to_base32(bytes: &[u8]) -> String {
    let mut out = String::with_capacity((bytes.len() * 8).div_ceil(5));
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
        // The bits beyond the last byte are zero; the reader checks it.
        out.push(ALPHABET[(acc << (5 - bits) & 31) as usize] as char);
    }
    out
}

/// The bytes of a code's characters; dashes and white space are skipped. Refuses a code whose
/// last character carries bits that are not zero, or a whole character too many.
fn from_base32(text: &str) -> Result<Vec<u8>, ResultError> {
    let mut out = Vec::new();
    let mut acc = 0u32;
    let mut bits = 0;
    let mut symbols = 0usize;
    for (i, c) in text.chars().enumerate() {
        if c == '-' || c.is_whitespace() {
            continue;
        }
        let v = symbol(c).ok_or(ResultError::BadCharacter {
            found: c,
            at: i + 1,
        })?;
        symbols += 1;
        if symbols > MAX_CODE_CHARS {
            return Err(ResultError::Damaged);
        }
        acc = (acc << 5 | v as u32) & 0xFFFF;
        bits += 5;
        if bits >= 8 {
            bits -= 8;
            out.push((acc >> bits & 0xFF) as u8);
        }
    }
    if bits >= 5 || acc & ((1 << bits) - 1) != 0 {
        return Err(ResultError::Damaged);
    }
    Ok(out)
}

/// The length in bytes of the whole code whose first bytes are `head`, once `head` holds
/// enough of it (the version, the name's length and the puzzle count): `Ok(None)` while more is
/// needed, an error for a version we do not know. Used to find where one code ends in pasted
/// text without separators.
pub(crate) fn code_bytes(head: &[u8]) -> Result<Option<usize>, ResultError> {
    let Some(&version) = head.first() else {
        return Ok(None);
    };
    if version == 0 || version > VERSION {
        // Only a version a few steps ahead is taken for a newer code: any other first byte is
        // text that is no code at all (a word pasted with the codes, say).
        return Err(
            if (VERSION + 1..=LAST_PLAUSIBLE_VERSION).contains(&version) {
                ResultError::NewerVersion(version)
            } else {
                ResultError::Damaged
            },
        );
    }
    let Some(&name) = head.get(5) else {
        return Ok(None);
    };
    let at = 6 + name as usize;
    let Some(count) = head.get(at..at + 2) else {
        return Ok(None);
    };
    let count = u16::from_le_bytes([count[0], count[1]]) as usize;
    let per = if version == 1 { 2 } else { 7 };
    Ok(Some(at + 2 + (per * count).div_ceil(8) + 4))
}

/// The number of characters of a code of `bytes` bytes.
pub(crate) fn code_chars(bytes: usize) -> usize {
    (bytes * 8).div_ceil(5)
}

/// Encodes a student's results on a set (the set's [`fingerprint`], the name as typed, one
/// result per puzzle in set order). Refuses, instead of cutting down, a name over
/// [`MAX_NAME_BYTES`] (after trimming white space), more puzzles than a set may have, or more
/// than [`MAX_HINTS`] hint steps.
pub fn encode(set: u32, name: &str, puzzles: &[PuzzleResult]) -> Result<String, ResultError> {
    let name = super::plain(name.trim());
    let name = name.trim();
    if name.len() > MAX_NAME_BYTES {
        return Err(ResultError::NameTooLong { bytes: name.len() });
    }
    if puzzles.len() > limits::MAX_PUZZLES {
        return Err(ResultError::TooManyPuzzles {
            count: puzzles.len(),
        });
    }
    let mut raw = vec![VERSION];
    raw.extend_from_slice(&set.to_le_bytes());
    raw.push(name.len() as u8);
    raw.extend_from_slice(name.as_bytes());
    raw.extend_from_slice(&(puzzles.len() as u16).to_le_bytes());
    let mut w = BitWriter::default();
    for (i, p) in puzzles.iter().enumerate() {
        let hints = p.hints.unwrap_or(0);
        if hints > MAX_HINTS {
            return Err(ResultError::TooManyHints {
                puzzle: i + 1,
                hints,
            });
        }
        w.put(2, attempt_bits(p.attempt));
        w.put(2, hints as u64);
        w.put(3, p.time as u64);
    }
    raw.extend_from_slice(&w.into_bytes());
    let crc = super::bits::crc32(&raw);
    raw.extend_from_slice(&crc.to_le_bytes());
    let text = to_base32(&raw);
    Ok(text
        .as_bytes()
        .chunks(4)
        .map(|c| std::str::from_utf8(c).expect("the alphabet is ASCII"))
        .collect::<Vec<_>>()
        .join("-"))
}

/// The two bits of an attempt in a code (the same in versions 1 and 2).
fn attempt_bits(a: Attempt) -> u64 {
    match a.recorded() {
        Attempt::Untried => 0,
        Attempt::Clean => 1,
        Attempt::Helped => 2,
        _ => 3,
    }
}

fn attempt_of(bits: u64) -> Attempt {
    [
        Attempt::Untried,
        Attempt::Clean,
        Attempt::Helped,
        Attempt::Failed,
    ][bits as usize & 3]
}

/// Decodes a result code of version 1 or 2. Lower case, dashes, white space and the
/// look-alikes I, L and O are forgiven; anything else that is wrong is refused.
pub fn decode(code: &str) -> Result<Results, ResultError> {
    let raw = from_base32(code)?;
    if raw.len() < 12 {
        return Err(ResultError::Damaged);
    }
    let (body, crc) = raw.split_at(raw.len() - 4);
    if super::bits::crc32(body).to_le_bytes() != crc {
        return Err(ResultError::Damaged);
    }
    let version = body[0];
    if version > LAST_PLAUSIBLE_VERSION {
        return Err(ResultError::Damaged);
    }
    if version > VERSION {
        return Err(ResultError::NewerVersion(version));
    }
    if code_bytes(&raw)? != Some(raw.len()) {
        return Err(ResultError::Damaged);
    }
    let set = u32::from_le_bytes([body[1], body[2], body[3], body[4]]);
    let name_end = 6 + body[5] as usize;
    let name =
        super::plain(std::str::from_utf8(&body[6..name_end]).map_err(|_| ResultError::Damaged)?)
            .into_owned();
    let count = u16::from_le_bytes([body[name_end], body[name_end + 1]]) as usize;
    let packed = &body[name_end + 2..];
    if count > limits::MAX_PUZZLES && version > 1 {
        return Err(ResultError::Damaged);
    }
    let puzzles = if version == 1 {
        (0..count)
            .map(|i| PuzzleResult {
                attempt: attempt_of((packed[i / 4] >> (2 * (i % 4))) as u64),
                hints: None,
                time: TimeBucket::NotTimed,
            })
            .collect()
    } else {
        let mut r = BitReader::new(packed);
        let mut out = Vec::with_capacity(count);
        for _ in 0..count {
            let attempt = attempt_of(r.get(2).map_err(|_| ResultError::Damaged)?);
            let hints = r.get(2).map_err(|_| ResultError::Damaged)? as u8;
            let time = *TimeBucket::ALL
                .get(r.get(3).map_err(|_| ResultError::Damaged)? as usize)
                .ok_or(ResultError::Damaged)?;
            out.push(PuzzleResult {
                attempt,
                hints: Some(hints),
                time,
            });
        }
        r.finish().map_err(|_| ResultError::Damaged)?;
        out
    };
    Ok(Results {
        version,
        set,
        name,
        puzzles,
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    fn sample() -> Vec<PuzzleResult> {
        vec![
            PuzzleResult::new(Attempt::Clean, 0, TimeBucket::Under30s),
            PuzzleResult::new(Attempt::Failed, 3, TimeBucket::Longer),
            PuzzleResult::new(Attempt::Helped, 2, TimeBucket::Under2Min),
            PuzzleResult::new(Attempt::Untried, 0, TimeBucket::NotTimed),
            PuzzleResult::new(Attempt::Clean, 1, TimeBucket::Under5Min),
        ]
    }

    /// A version 1 code, written by the version 1 encoder (the commit before version 2) for
    /// the set fingerprint 0xDEADBEEF, the name "Mira of Harbour Street" and the outcomes
    /// clean, failed, helped, untried, clean.
    /// A word pasted among the codes is damage, not a code of a newer version: "HELLO" reads
    /// as a first byte of 139 (found by trying the Coach screen).
    #[test]
    fn a_word_is_no_code_of_a_newer_version() {
        let raw = from_base32("HELLO").expect("letters of the code alphabet");
        assert_eq!(raw[0], 139);
        assert_eq!(code_bytes(&raw), Err(ResultError::Damaged));
        assert!(matches!(decode("HELLO"), Err(ResultError::Damaged)));
        assert_eq!(code_bytes(&[3]), Err(ResultError::NewerVersion(3)));
    }

    const V1_CODE: &str =
        "07QV-XBEY-2S6P-JWK1-41QP-C828-C5S6-4VVN-E8G5-6X3J-CNJQ-8180-5M0K-5S66-CM";

    #[test]
    fn round_trips_and_reads_forgivingly() {
        let code = encode(0xDEAD_BEEF, "Mira of Harbour Street", &sample()).unwrap();
        let r = decode(&code).unwrap();
        assert_eq!(r.version, 2);
        assert_eq!(r.set, 0xDEAD_BEEF);
        assert_eq!(r.name, "Mira of Harbour Street");
        assert_eq!(r.puzzles, sample());
        assert_eq!(decode(&code.to_lowercase().replace('-', " ")).unwrap(), r);
        // An unfinished try is recorded as failed.
        let trying = [PuzzleResult::new(Attempt::Trying, 1, TimeBucket::Under2Min)];
        let r = decode(&encode(1, "Tomas", &trying).unwrap()).unwrap();
        assert_eq!(r.puzzles[0].attempt, Attempt::Failed);
    }

    #[test]
    fn version_one_codes_still_read() {
        let r = decode(V1_CODE).unwrap();
        assert_eq!((r.version, r.set), (1, 0xDEAD_BEEF));
        let attempts: Vec<Attempt> = r.puzzles.iter().map(|p| p.attempt).collect();
        use Attempt::*;
        assert_eq!(attempts, [Clean, Failed, Helped, Untried, Clean]);
        assert!(r.puzzles.iter().all(|p| p.hints.is_none()));
    }

    #[test]
    fn what_cannot_be_held_is_refused() {
        assert_eq!(
            encode(1, "Bartholomew of the Harbour", &sample()),
            Err(ResultError::NameTooLong { bytes: 26 })
        );
        // Said in words a student can act on: what a code holds, and why a name is long.
        let said = ResultError::NameTooLong { bytes: 37 }.to_string();
        assert!(
            said.contains("takes 37 bytes and a result code holds 24 (a letter outside A to Z"),
            "{said}"
        );
        // 24 bytes exactly is allowed; 8 letters of 3 bytes each is 24 bytes.
        assert!(encode(1, "ナミダナミダナミ", &sample()).is_ok());
        let many = vec![PuzzleResult::new(Attempt::Clean, 0, TimeBucket::NotTimed); 1001];
        assert_eq!(
            encode(1, "Tomas", &many),
            Err(ResultError::TooManyPuzzles { count: 1001 })
        );
        let hints = [PuzzleResult::new(Attempt::Helped, 4, TimeBucket::NotTimed)];
        assert_eq!(
            encode(1, "Tomas", &hints),
            Err(ResultError::TooManyHints {
                puzzle: 1,
                hints: 4
            })
        );
        assert_eq!(
            decode("AB*C"),
            Err(ResultError::BadCharacter { found: '*', at: 3 })
        );
    }

    /// Every substitution of one character by another symbol of the alphabet is refused, in
    /// every position, for codes of several lengths (so that the last character carries 0 to
    /// 4 padding bits).
    #[test]
    fn every_single_character_mistake_is_refused() {
        let mut padding = std::collections::BTreeSet::new();
        let cases = [
            (1, ""),
            (5, "A"),
            (5, "Ab"),
            (5, "Abc"),
            (5, "Abcd"),
            (5, "Abcde"),
            (12, "Tomas Quay"),
            (40, "Ines"),
        ];
        for (n, name) in cases {
            let puzzles: Vec<PuzzleResult> = (0..n).map(|i| sample()[i % 5]).collect();
            let code = encode(0x1234_5678 + n as u32, name, &puzzles).unwrap();
            let symbols = code.chars().filter(|&c| c != '-').count();
            padding.insert(symbols * 5 % 8);
            let original = decode(&code).unwrap();
            let chars: Vec<char> = code.chars().collect();
            for i in 0..chars.len() {
                if chars[i] == '-' {
                    continue;
                }
                for &c in ALPHABET {
                    if c as char == chars[i] {
                        continue;
                    }
                    let mut changed = chars.clone();
                    changed[i] = c as char;
                    let text: String = changed.into_iter().collect();
                    assert!(
                        decode(&text).is_err(),
                        "{code}: position {i} as {} was accepted as {:?} (was {original:?})",
                        c as char,
                        decode(&text)
                    );
                }
            }
        }
        // The codes above end with every amount of padding bits a code can have.
        assert_eq!(padding.len(), 5, "{padding:?}");
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

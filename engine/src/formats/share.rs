//! Share codes: a whole puzzle set in a short text that travels in a link's fragment (so it
//! never reaches a server) and in a QR code.
//!
//! # Version 2 (written by [`encode`])
//!
//! A code is `$` followed by the set's bytes written three characters for two bytes, in the
//! manner of base45 (RFC 9285): each pair of bytes `a, b` is the number `n = 256a + b`, written
//! as the characters `c d e` with `n = c + 41d + 41²e`; a last single byte is written as two
//! characters `c d` with `n = c + 41d`. A group whose value is too large for its bytes, or a
//! lone last character, is refused, as RFC 9285 asks of a decoder.
//!
//! **The alphabet.** RFC 9285 uses the 45 characters of a QR code's alphanumeric mode, which
//! a QR code stores in 5.5 bits each instead of 8. Two of them, space and `%`, do not survive in
//! a URL fragment (a space is not allowed there, `%` starts an escape), so we keep the other 43
//! and drop two more: `+`, which form decoding (and any code that reads the fragment the way it
//! reads a query) turns into a space, and `*`, which chat programs that use Markdown take for
//! emphasis. 41 characters still write two bytes in three (41³ = 68,921 ≥ 65,536), so nothing is
//! lost. The alphabet is `0-9`, `A-Z`, then `$ - / . :`, in that order. The order matters: link
//! detectors in mail and chat programs leave a trailing `.` or `:` out of the link they find (it
//! reads as the end of the sentence), and the last character of a code can never be `.` or `:`,
//! since they are the alphabet's last two (a last group's final character is at most 38, as
//! 65,535 / 41² < 39, and a last single byte's at most 6). Every character in the alphabet is an
//! RFC 3986 fragment character, so the page reads the code as it is, with no escapes. The
//! leading `$` tells a version 2 code from a version 1 code at a glance: `$` is not in base64.
//!
//! The bytes: one header byte (the format version, 2, in the high four bits, then one bit that
//! says whether the body is DEFLATE-compressed, then three zero bits), the body, and a CRC-32
//! (IEEE, as in zlib) of the header and body, most significant byte first. A damaged or cut
//! code fails the checksum and loads nothing.
//!
//! The body is a bit stream (most significant bit first):
//! - the title (byte length, then UTF-8), the date (year in 14 bits, month in 4, day in 5), the
//!   generator block if there is one, the number of puzzles;
//! - per puzzle: one bit that says the rule, board side and theme are those of the puzzle
//!   before (then they are not written again; otherwise 2, 5 and 3 bits), the side to move
//!   (1 bit), the id, the rating (12 bits), the length (8 bits), and the black stones, white
//!   stones, first moves and main line.
//! - An id of the shape the generator makes, `prefix-` and 1 to 16 lower-case hexadecimal
//!   digits, is stored as the prefix (or one bit, when it is the previous id's prefix), the
//!   digit count and the digits as a number: 6 bytes instead of 15. Any other id is stored as
//!   its text. (The generator's ids are derived from the position and could be recomputed
//!   instead of stored; that needs the generator's derivation exposed, so for now the number
//!   is stored.)
//! - A list of points is its length, then the points in one of three layouts, whichever is
//!   shortest: each point as its index on the board (`row * side + column`, 8 bits on 15x15,
//!   9 on 19x19); for a list in board order (the generator writes stones in board order), the
//!   first index and the gaps between indices as exponential-Golomb codes; for a line of play,
//!   the first index and each move's step from the one before (column and row differences,
//!   exponential-Golomb codes of their zigzag values). The order of a list is always kept.
//!
//! The body is compressed with DEFLATE (RFC 1951) when that makes it shorter: titles and
//! unusual ids compress, well-packed points do not. The compressed body is inflated through a
//! limit ([`MAX_BODY_BYTES`], derived from the set [`limits`]), so a small code cannot expand
//! into a large allocation; every count read from the body is checked against the limits before
//! anything is allocated for it. A decoded set passes [`setfile::check`], so a code carries
//! nothing that a set file could not; a set that fails it is refused by [`encode`] too.
//!
//! # Version 1 (still read)
//!
//! URL-safe base64 without padding of: DEFLATE of a byte layout (format version 1; title and
//! date as length-prefixed UTF-8; the puzzle count; per puzzle the id, a byte of rule, side and
//! theme, the board side, the rating in 2 bytes, the length in 1 byte, then the four point
//! lists with one byte per point up to 15x15 and two above), then a CRC-32 of the compressed
//! bytes. Such codes carry no generator block.

use std::fmt;
use std::io::Write;

use base64::engine::general_purpose::URL_SAFE_NO_PAD;
use base64::Engine as _;

use super::bits::{self, BitError, BitReader, BitWriter};
use super::limits;
use super::setfile::{self, GeneratorInfo, PuzzleSet, SetError};
use crate::geometry::Point;
use crate::puzzle::{Puzzle, Theme};
use crate::types::Rule;
use crate::types::Stone;

/// The version [`encode`] writes.
pub const VERSION: u8 = 2;

/// The characters of a version 2 code, in the order of their values (see the module doc).
pub const ALPHABET: &[u8; 41] = b"0123456789ABCDEFGHIJKLMNOPQRSTUVWXYZ$-/.:";

/// The first character of a version 2 code.
pub const MARK: char = '$';

/// What stands between the address and the code in a link: `https://…/#set=CODE`.
pub const FRAGMENT: &str = "#set=";

/// The most bytes the body of a code may inflate to. A set at every limit takes at most about
/// 650 KB: per puzzle at most 600 bits of id, 32 bits of fields, and at most 489 points (stones
/// and answers share the 361 points of the largest board; a line adds 128) of at most 9 bits
/// each with 21 bits of list headers, that is 5,100 bits; times 1,000 puzzles, plus 2 KB for the
/// title and the set's own fields. A test encodes such a set and opens it again.
pub const MAX_BODY_BYTES: usize = 1 << 20;

/// The longest code text [`decode`] reads: the mark, then three characters per two bytes of
/// header, body (at most [`MAX_BODY_BYTES`], compressed or not) and checksum.
pub const MAX_CODE_CHARS: usize = 1 + (MAX_BODY_BYTES + 5).div_ceil(2) * 3;

/// Why a share code could not be read.
#[derive(Clone, Debug, PartialEq, Eq)]
pub enum ShareError {
    /// Not a share code at all (wrong characters, far too short).
    NotACode,
    /// Longer than any code of a set within the limits.
    TooLong {
        /// Characters in the text.
        chars: usize,
    },
    /// The checksum does not match: the code was damaged or cut short.
    Damaged,
    /// A code from a newer version of Fivefold.
    NewerVersion(u8),
    /// The checksum matches but the content does not follow the format: the code was not made
    /// by Fivefold. Names the part that could not be read.
    Malformed(&'static str),
    /// The code decodes, but the set in it breaks a rule of sets (the error names the puzzle
    /// and field).
    Invalid(SetError),
}

impl fmt::Display for ShareError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            ShareError::NotACode => f.write_str("this is not a Fivefold share code"),
            ShareError::TooLong { chars } => write!(
                f,
                "this share code is {chars} characters long, longer than any set Fivefold \
                 can hold (at most {MAX_CODE_CHARS}); nothing was loaded"
            ),
            ShareError::Damaged => f.write_str(
                "the set in this link is damaged or cut short, so nothing was loaded; \
                 ask for the link again, or for the set file",
            ),
            ShareError::NewerVersion(v) => write!(
                f,
                "this share code was made by a newer version of Fivefold (code version {v}); \
                 update Fivefold to open it"
            ),
            ShareError::Malformed(part) => write!(
                f,
                "this share code was not made by Fivefold ({part} cannot be read); nothing \
                 was loaded"
            ),
            ShareError::Invalid(e) => write!(f, "the set in this share code is not valid: {e}"),
        }
    }
}

impl std::error::Error for ShareError {}

/// The link that opens a set: `base` (the address where the club hosts Fivefold's files; any
/// fragment it has is dropped), then [`FRAGMENT`], then the code.
pub fn link(base: &str, code: &str) -> String {
    let base = base.split('#').next().unwrap_or_default();
    format!("{base}{FRAGMENT}{code}")
}

/// The code in a link made by [`link`], or the text itself when it holds no [`FRAGMENT`].
pub fn code_of_link(text: &str) -> &str {
    match text.rfind(FRAGMENT) {
        Some(at) => &text[at + FRAGMENT.len()..],
        None => text,
    }
}

/// Encodes a set as a share code of version 2, or says why the set cannot be shared: a set
/// that breaks a rule of sets (a limit, an id used twice) is refused, so that no code is made
/// that [`decode`] would refuse.
pub fn encode(set: &PuzzleSet) -> Result<String, SetError> {
    setfile::check(set)?;
    let body = body_bits(set).into_bytes();
    let packed = deflate(&body);
    Ok(if packed.len() < body.len() {
        seal(&packed, true)
    } else {
        seal(&body, false)
    })
}

/// The body compressed with DEFLATE (RFC 1951), at the best compression.
fn deflate(body: &[u8]) -> Vec<u8> {
    let mut d = flate2::write::DeflateEncoder::new(Vec::new(), flate2::Compression::best());
    d.write_all(body).expect("writing to memory cannot fail");
    d.finish().expect("writing to memory cannot fail")
}

/// The code of a body (compressed or not): the mark, then the header, the body and the
/// checksum, three characters for two bytes.
fn seal(body: &[u8], compressed: bool) -> String {
    let mut bytes = vec![VERSION << 4 | (compressed as u8) << 3];
    bytes.extend_from_slice(body);
    let crc = super::bits::crc32(&bytes);
    bytes.extend_from_slice(&crc.to_be_bytes());
    let mut code = String::with_capacity(1 + bytes.len().div_ceil(2) * 3);
    code.push(MARK);
    for pair in bytes.chunks(2) {
        let (mut n, digits) = match pair {
            [a, b] => ((*a as usize) << 8 | *b as usize, 3),
            [a] => (*a as usize, 2),
            _ => unreachable!("chunks of two"),
        };
        for _ in 0..digits {
            code.push(ALPHABET[n % 41] as char);
            n /= 41;
        }
    }
    code
}

/// Decodes a share code of version 1 or 2, or a link that ends in one. Surrounding white space
/// is ignored, and a version 2 code may be in lower case; nothing else is forgiven. The work is
/// linear in the length of the code, and memory is bounded by the limits whatever the code
/// claims.
pub fn decode(code: &str) -> Result<PuzzleSet, ShareError> {
    let code = code_of_link(code.trim());
    if code.len() > MAX_CODE_CHARS {
        return Err(ShareError::TooLong {
            chars: code.chars().count(),
        });
    }
    let set = match code.strip_prefix(MARK) {
        Some(rest) => decode_v2(rest)?,
        None => decode_v1(code)?,
    };
    setfile::check(&set).map_err(ShareError::Invalid)?;
    Ok(set)
}

// ----- Version 2: writing -----

fn rule_bits(r: Rule) -> u64 {
    match r {
        Rule::Freestyle => 0,
        Rule::Standard => 1,
        Rule::Renju => 2,
    }
}

fn rule_of(bits: u64) -> Option<Rule> {
    [Rule::Freestyle, Rule::Standard, Rule::Renju]
        .get(bits as usize)
        .copied()
}

fn theme_bits(t: Theme) -> u64 {
    Theme::ALL.iter().position(|&x| x == t).unwrap_or(0) as u64
}

/// Splits an id of the generator's shape, `prefix-` then 1 to 16 lower-case hexadecimal
/// digits, into the prefix (with its dash), the digit count and the number.
fn hex_tail(id: &str) -> Option<(&str, u32, u64)> {
    let dash = id.rfind('-')?;
    let digits = &id[dash + 1..];
    if digits.is_empty()
        || digits.len() > 16
        || !digits
            .bytes()
            .all(|b| matches!(b, b'0'..=b'9' | b'a'..=b'f'))
    {
        return None;
    }
    let value = u64::from_str_radix(digits, 16).ok()?;
    Some((&id[..=dash], digits.len() as u32, value))
}

fn put_text(w: &mut BitWriter, s: &str) {
    w.golomb(3, s.len() as u64);
    for &b in s.as_bytes() {
        w.put(8, b as u64);
    }
}

/// How a list of points is laid out (see the module doc).
#[derive(Clone, Copy)]
enum Layout {
    Indices = 0,
    Gaps = 1,
    Steps = 2,
}

/// The exponential-Golomb order (0 to 7) that writes `values` in the fewest bits, and that
/// number of bits.
fn best_order(values: &[u64]) -> (u32, usize) {
    (0..8)
        .map(|k| (k, values.iter().map(|&v| bits::golomb_len(k, v)).sum()))
        .min_by_key(|&(_, n)| n)
        .expect("eight orders")
}

fn put_points(w: &mut BitWriter, size: u8, points: &[Point]) {
    w.golomb(3, points.len() as u64);
    let Some(first) = points.first() else {
        return;
    };
    let side = size as usize;
    let width = bits::width_for(side * side);
    let index = |p: &Point| (p.y as usize * side + p.x as usize) as u64;
    let fixed = points.len() * width as usize;
    let ascending = points.windows(2).all(|p| index(&p[0]) < index(&p[1]));
    let gaps: Vec<u64> = points
        .windows(2)
        .map(|p| index(&p[1]).wrapping_sub(index(&p[0])).wrapping_sub(1))
        .collect();
    let steps: Vec<u64> = points
        .windows(2)
        .flat_map(|p| {
            [
                bits::zigzag(p[1].x as i32 - p[0].x as i32),
                bits::zigzag(p[1].y as i32 - p[0].y as i32),
            ]
        })
        .collect();
    let (gap_k, gap_len) = best_order(&gaps);
    let (step_k, step_len) = best_order(&steps);
    let mut choice = (fixed, Layout::Indices, 0, &[][..]);
    if ascending && width as usize + 3 + gap_len < choice.0 {
        choice = (width as usize + 3 + gap_len, Layout::Gaps, gap_k, &gaps[..]);
    }
    if width as usize + 3 + step_len < choice.0 {
        choice = (
            width as usize + 3 + step_len,
            Layout::Steps,
            step_k,
            &steps[..],
        );
    }
    let (_, layout, k, values) = choice;
    w.put(2, layout as u64);
    match layout {
        Layout::Indices => points.iter().for_each(|p| w.put(width, index(p))),
        Layout::Gaps | Layout::Steps => {
            w.put(width, index(first));
            w.put(3, k as u64);
            values.iter().for_each(|&v| w.golomb(k, v));
        }
    }
}

fn body_bits(set: &PuzzleSet) -> BitWriter {
    let mut w = BitWriter::default();
    put_text(&mut w, &set.title);
    let date = set.created.as_bytes();
    let number =
        |r: std::ops::Range<usize>| date[r].iter().fold(0u64, |n, d| n * 10 + (d - b'0') as u64);
    w.put(14, number(0..4));
    w.put(4, number(5..7));
    w.put(5, number(8..10));
    // A generator block of a deep or unique-only generation has fields a version 2 code cannot
    // hold: such a block is left out rather than carried half.
    let generator = set
        .generator
        .as_ref()
        .filter(|g| g.min_moves == 0 && !g.unique);
    w.flag(generator.is_some());
    if let Some(g) = generator {
        w.var(g.seed);
        w.put(3, theme_bits(g.theme));
        w.put(2, rule_bits(g.rule));
        w.put(5, g.size as u64);
        w.golomb(3, g.count as u64);
        w.put(12, g.rating.0 as u64);
        w.put(12, g.rating.1 as u64);
    }
    w.golomb(3, set.puzzles.len() as u64);
    let mut before: Option<&Puzzle> = None;
    let mut prefix_before: Option<&str> = None;
    for p in &set.puzzles {
        let same = before.is_some_and(|q| (q.rule, q.size, q.theme) == (p.rule, p.size, p.theme));
        w.flag(same);
        if !same {
            w.put(2, rule_bits(p.rule));
            w.put(5, p.size as u64);
            w.put(3, theme_bits(p.theme));
        }
        w.flag(p.to_move == Stone::White);
        match hex_tail(&p.id) {
            Some((prefix, digits, value)) => {
                w.flag(true);
                let repeat = prefix_before == Some(prefix);
                w.flag(repeat);
                if !repeat {
                    put_text(&mut w, prefix);
                }
                w.put(4, digits as u64 - 1);
                w.put(4 * digits, value);
                prefix_before = Some(prefix);
            }
            None => {
                w.flag(false);
                put_text(&mut w, &p.id);
            }
        }
        w.put(12, p.rating as u64);
        w.put(8, p.length as u64);
        for list in [&p.black, &p.white, &p.first_moves, &p.line] {
            put_points(&mut w, p.size, list);
        }
        before = Some(p);
    }
    w
}

// ----- Version 2: reading -----

/// Turns the characters after the mark into bytes, three characters for two bytes.
fn base41(text: &str) -> Result<Vec<u8>, ShareError> {
    let mut values = Vec::with_capacity(text.len());
    for c in text.bytes() {
        let c = c.to_ascii_uppercase();
        let v = ALPHABET
            .iter()
            .position(|&a| a == c)
            .ok_or(ShareError::NotACode)?;
        values.push(v);
    }
    let mut bytes = Vec::with_capacity(values.len() / 3 * 2 + 1);
    for group in values.chunks(3) {
        match *group {
            [c, d, e] => {
                let n = c + 41 * d + 41 * 41 * e;
                if n > 0xFFFF {
                    return Err(ShareError::Damaged);
                }
                bytes.extend_from_slice(&(n as u16).to_be_bytes());
            }
            [c, d] => {
                let n = c + 41 * d;
                if n > 0xFF {
                    return Err(ShareError::Damaged);
                }
                bytes.push(n as u8);
            }
            _ => return Err(ShareError::Damaged),
        }
    }
    Ok(bytes)
}

fn decode_v2(text: &str) -> Result<PuzzleSet, ShareError> {
    let bytes = base41(text)?;
    if bytes.len() < 6 {
        return Err(ShareError::Damaged);
    }
    let (signed, crc) = bytes.split_at(bytes.len() - 4);
    if super::bits::crc32(signed).to_be_bytes() != crc {
        return Err(ShareError::Damaged);
    }
    let header = signed[0];
    if header >> 4 != VERSION {
        return Err(if header >> 4 > VERSION {
            ShareError::NewerVersion(header >> 4)
        } else {
            ShareError::Malformed("the header")
        });
    }
    if header & 0b111 != 0 {
        return Err(ShareError::Malformed("the header"));
    }
    let body = &signed[1..];
    if header & 0b1000 == 0 {
        return read_body(body);
    }
    let inflated = inflate(body, ShareError::Malformed("the compressed body"))?;
    read_body(&inflated)
}

/// Inflates a DEFLATE stream (RFC 1951) to at most [`MAX_BODY_BYTES`], or fails with `bad`
/// (a stream that is not valid DEFLATE) or as too large. miniz_oxide's one-call decoder (the
/// library flate2's reader streams through): without the reader the page's module is about
/// 1.9 KB smaller (gzipped). It is a little stricter than the reader: a back-reference to
/// before the start of the output is refused, where the reader copied zeros; only a crafted
/// code has one.
fn inflate(packed: &[u8], bad: ShareError) -> Result<Vec<u8>, ShareError> {
    use miniz_oxide::inflate::{decompress_to_vec_with_limit, TINFLStatus};
    decompress_to_vec_with_limit(packed, MAX_BODY_BYTES).map_err(|e| match e.status {
        TINFLStatus::HasMoreOutput => ShareError::Malformed("the compressed body (too large)"),
        _ => bad,
    })
}

/// Reads the body; every count is checked against the limits before anything is allocated
/// for it.
struct Body<'a> {
    r: BitReader<'a>,
}

impl Body<'_> {
    fn get(&mut self, n: u32, part: &'static str) -> Result<u64, ShareError> {
        self.r
            .get(n)
            .map_err(|_: BitError| ShareError::Malformed(part))
    }

    fn flag(&mut self, part: &'static str) -> Result<bool, ShareError> {
        self.r.flag().map_err(|_| ShareError::Malformed(part))
    }

    fn golomb(&mut self, k: u32, part: &'static str) -> Result<u64, ShareError> {
        self.r.golomb(k).map_err(|_| ShareError::Malformed(part))
    }

    /// A length-prefixed text of at most `max` bytes; a longer one is `too_long`'s error.
    fn text(
        &mut self,
        max: usize,
        part: &'static str,
        too_long: impl FnOnce(u64) -> SetError,
    ) -> Result<String, ShareError> {
        let n = self.golomb(3, part)?;
        if n > max as u64 {
            return Err(ShareError::Invalid(too_long(n)));
        }
        let bytes = (0..n)
            .map(|_| self.get(8, part).map(|b| b as u8))
            .collect::<Result<Vec<u8>, _>>()?;
        String::from_utf8(bytes).map_err(|_| ShareError::Malformed(part))
    }

    fn points(
        &mut self,
        size: u8,
        max: usize,
        too_many: impl FnOnce(u64) -> SetError,
    ) -> Result<Vec<Point>, ShareError> {
        const PART: &str = "a list of points";
        let n = self.golomb(3, PART)?;
        if n > max as u64 {
            return Err(ShareError::Invalid(too_many(n)));
        }
        let n = n as usize;
        let mut out = Vec::with_capacity(n);
        if n == 0 {
            return Ok(out);
        }
        let side = size as usize;
        let cells = side * side;
        let width = bits::width_for(cells);
        let at = |i: u64| -> Result<Point, ShareError> {
            if i >= cells as u64 {
                return Err(ShareError::Malformed(PART));
            }
            Ok(Point::new((i % side as u64) as u8, (i / side as u64) as u8))
        };
        let layout = self.get(2, PART)?;
        if layout == Layout::Indices as u64 {
            for _ in 0..n {
                out.push(at(self.get(width, PART)?)?);
            }
            return Ok(out);
        }
        out.push(at(self.get(width, PART)?)?);
        let k = self.get(3, PART)? as u32;
        for _ in 1..n {
            let last = *out.last().expect("one point is in");
            let next = if layout == Layout::Gaps as u64 {
                let gap = self.golomb(k, PART)?;
                let i = (last.y as u64 * side as u64 + last.x as u64)
                    .checked_add(gap)
                    .and_then(|i| i.checked_add(1))
                    .ok_or(ShareError::Malformed(PART))?;
                at(i)?
            } else if layout == Layout::Steps as u64 {
                let dx = bits::unzigzag(self.golomb(k, PART)?);
                let dy = bits::unzigzag(self.golomb(k, PART)?);
                // A step read from outside can be any 64-bit number: add without overflow.
                let on_board = |from: u8, step: i64| {
                    (from as i64)
                        .checked_add(step)
                        .filter(|v| (0..side as i64).contains(v))
                };
                let (Some(x), Some(y)) = (on_board(last.x, dx), on_board(last.y, dy)) else {
                    return Err(ShareError::Malformed(PART));
                };
                Point::new(x as u8, y as u8)
            } else {
                return Err(ShareError::Malformed(PART));
            };
            out.push(next);
        }
        Ok(out)
    }
}

/// A [`SetError`] for the set's own fields.
fn set_error(field: &str, message: String) -> SetError {
    SetError {
        puzzle: None,
        field: field.into(),
        message,
    }
}

fn read_body(bytes: &[u8]) -> Result<PuzzleSet, ShareError> {
    let mut b = Body {
        r: BitReader::new(bytes),
    };
    let title = b.text(limits::MAX_TITLE_BYTES, "the title", |n| {
        set_error(
            "title",
            format!(
                "{n} bytes long; a title is at most {} bytes",
                limits::MAX_TITLE_BYTES
            ),
        )
    })?;
    let (year, month, day) = (
        b.get(14, "the date")?,
        b.get(4, "the date")?,
        b.get(5, "the date")?,
    );
    if year > 9999 {
        return Err(ShareError::Malformed("the date"));
    }
    let created = format!("{year:04}-{month:02}-{day:02}");
    let generator = if b.flag("the generator")? {
        const PART: &str = "the generator";
        let seed = b.r.var().map_err(|_| ShareError::Malformed(PART))?;
        let theme = *Theme::ALL
            .get(b.get(3, PART)? as usize)
            .ok_or(ShareError::Malformed(PART))?;
        let rule = rule_of(b.get(2, PART)?).ok_or(ShareError::Malformed(PART))?;
        let size = b.get(5, PART)? as u8;
        let count = b.golomb(3, PART)?;
        let count = usize::try_from(count)
            .ok()
            .filter(|&c| c <= limits::MAX_PUZZLES)
            .ok_or(ShareError::Malformed(PART))?;
        let rating = (b.get(12, PART)? as u32, b.get(12, PART)? as u32);
        Some(GeneratorInfo {
            seed,
            theme,
            rule,
            size,
            count,
            rating,
            min_moves: 0,
            unique: false,
        })
    } else {
        None
    };
    let count = b.golomb(3, "the number of puzzles")?;
    if count == 0 || count > limits::MAX_PUZZLES as u64 {
        return Err(ShareError::Invalid(set_error(
            "puzzles",
            format!("{count} puzzles; a set holds 1 to {}", limits::MAX_PUZZLES),
        )));
    }
    let mut puzzles: Vec<Puzzle> = Vec::with_capacity(count as usize);
    let mut prefix_before: Option<String> = None;
    for n in 1..=count as usize {
        const PART: &str = "a puzzle";
        let (rule, size, theme) = if b.flag(PART)? {
            let q = puzzles.last().ok_or(ShareError::Malformed(PART))?;
            (q.rule, q.size, q.theme)
        } else {
            let rule = rule_of(b.get(2, PART)?).ok_or(ShareError::Malformed(PART))?;
            let size = b.get(5, PART)? as u8;
            let theme = *Theme::ALL
                .get(b.get(3, PART)? as usize)
                .ok_or(ShareError::Malformed(PART))?;
            (rule, size, theme)
        };
        let to_move = if b.flag(PART)? {
            Stone::White
        } else {
            Stone::Black
        };
        let id_too_long = |len: u64| SetError {
            puzzle: Some((n, String::new())),
            field: "id".into(),
            message: format!(
                "{len} bytes long; an id is at most {} bytes",
                limits::MAX_ID_BYTES
            ),
        };
        let id = if b.flag("an id")? {
            let prefix = if b.flag("an id")? {
                prefix_before
                    .clone()
                    .ok_or(ShareError::Malformed("an id"))?
            } else {
                b.text(limits::MAX_ID_BYTES, "an id", id_too_long)?
            };
            let digits = b.get(4, "an id")? as u32 + 1;
            let value = b.get(4 * digits, "an id")?;
            let id = format!("{prefix}{value:0width$x}", width = digits as usize);
            if hex_tail(&id) != Some((&prefix, digits, value)) {
                return Err(ShareError::Malformed("an id"));
            }
            prefix_before = Some(prefix);
            id
        } else {
            b.text(limits::MAX_ID_BYTES, "an id", id_too_long)?
        };
        let rating = b.get(12, PART)? as u32;
        let length = b.get(8, PART)? as u16;
        if !(limits::MIN_SIZE..=limits::MAX_SIZE).contains(&size) {
            return Err(ShareError::Invalid(SetError {
                puzzle: Some((n, id)),
                field: "size".into(),
                message: format!("{size} is not a board size (5 to 19)"),
            }));
        }
        let too_many = |field: &'static str, max: usize| {
            let id = id.clone();
            move |got: u64| SetError {
                puzzle: Some((n, id)),
                field: field.into(),
                message: format!("{got} points; at most {max}"),
            }
        };
        let cells = size as usize * size as usize;
        let black = b.points(
            size,
            limits::MAX_STONES,
            too_many("black", limits::MAX_STONES),
        )?;
        let room = limits::MAX_STONES - black.len();
        let white = b.points(size, room, too_many("white", room))?;
        let first_moves = b.points(size, cells, too_many("solution.first_moves", cells))?;
        let line = b.points(
            size,
            limits::MAX_LINE,
            too_many("solution.line", limits::MAX_LINE),
        )?;
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
    b.r.finish()
        .map_err(|_| ShareError::Malformed("the end of the code"))?;
    Ok(PuzzleSet {
        title: super::plain(&title).into_owned(),
        created,
        puzzles,
        generator,
    })
}

// ----- Version 1: reading only -----

/// Reads the byte layout of version 1.
struct V1<'a> {
    b: &'a [u8],
    at: usize,
}

impl V1<'_> {
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

    fn text(&mut self, max: usize, field: &str) -> Result<String, ShareError> {
        let n = self.len()?;
        if n > max {
            return Err(ShareError::Invalid(set_error(
                field,
                format!("{n} bytes long; at most {max}"),
            )));
        }
        String::from_utf8(self.bytes(n)?.to_vec()).map_err(|_| ShareError::Damaged)
    }

    fn points(&mut self, size: u8, max: usize) -> Result<Vec<Point>, ShareError> {
        let n = self.len()?;
        if n > max {
            return Err(ShareError::Malformed("a list of points"));
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
                return Err(ShareError::Malformed("a list of points"));
            }
            out.push(Point::new(x as u8, y as u8));
        }
        Ok(out)
    }
}

fn decode_v1(code: &str) -> Result<PuzzleSet, ShareError> {
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
    if super::bits::crc32(packed).to_le_bytes() != crc {
        return Err(ShareError::Damaged);
    }
    let raw = inflate(packed, ShareError::Damaged)?;
    let mut r = V1 { b: &raw, at: 0 };
    let version = r.byte()?;
    if version != 1 {
        return Err(ShareError::Malformed("the version"));
    }
    let title = super::plain(&r.text(limits::MAX_TITLE_BYTES, "title")?).into_owned();
    let created = r.text(10, "created")?;
    let n = r.len()?;
    if n == 0 || n > limits::MAX_PUZZLES {
        return Err(ShareError::Invalid(set_error(
            "puzzles",
            format!("{n} puzzles; a set holds 1 to {}", limits::MAX_PUZZLES),
        )));
    }
    let mut puzzles = Vec::with_capacity(n);
    for _ in 0..n {
        let id = r.text(limits::MAX_ID_BYTES, "id")?;
        let bits = r.byte()?;
        let rule = rule_of((bits & 3) as u64).ok_or(ShareError::Malformed("a rule"))?;
        let to_move = if bits >> 2 & 1 == 0 {
            Stone::Black
        } else {
            Stone::White
        };
        let theme = *Theme::ALL
            .get((bits >> 3) as usize)
            .ok_or(ShareError::Malformed("a theme"))?;
        let size = r.byte()?;
        if !(limits::MIN_SIZE..=limits::MAX_SIZE).contains(&size) {
            return Err(ShareError::Malformed("a board size"));
        }
        let rb = r.bytes(2)?;
        let rating = u16::from_le_bytes([rb[0], rb[1]]) as u32;
        let length = r.byte()? as u16;
        let cells = size as usize * size as usize;
        let black = r.points(size, limits::MAX_STONES)?;
        let white = r.points(size, limits::MAX_STONES)?;
        let first_moves = r.points(size, cells)?;
        let line = r.points(size, limits::MAX_LINE)?;
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
    Ok(PuzzleSet {
        title,
        created,
        puzzles,
        generator: None,
    })
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

    /// A code written by the version 1 encoder (the commit before version 2) for
    /// [`sample`]; kept so that links already handed out keep opening.
    const V1_SAMPLE: &str = "AVoApf8BHEhhcmJvdXIgU3RyZWV0LCBUaHVyc2RheSA8Yj4KMjAyNi0xMi0wMQIEdmYtMQoP0gQBA3BxcgN_gAACb3MDb25zA2JpZxgThAMAAmgBAAACtAC1AAEUAADL0tUD";

    #[test]
    fn round_trips() {
        let set = sample();
        let code = encode(&set).unwrap();
        assert!(code.starts_with(MARK));
        assert!(code[1..].bytes().all(|c| ALPHABET.contains(&c)), "{code}");
        assert_eq!(decode(&code).unwrap(), set);
        assert_eq!(decode(&format!("  {code}\n")).unwrap(), set);
        assert_eq!(decode(&code.to_lowercase()).unwrap(), set);
        let url = link("https://harbour-street.example/fivefold/#old", &code);
        assert_eq!(
            url,
            format!("https://harbour-street.example/fivefold/#set={code}")
        );
        assert_eq!(decode(&url).unwrap(), set);
    }

    #[test]
    fn version_one_codes_still_open() {
        assert_eq!(decode(V1_SAMPLE).unwrap(), sample());
    }

    #[test]
    fn damage_is_detected() {
        let code = encode(&sample()).unwrap();
        // Every truncation and every change of one character is refused, never half-loaded.
        for cut in 1..code.len() {
            assert!(decode(&code[..code.len() - cut]).is_err(), "cut {cut}");
        }
        for i in 1..code.len() {
            for &c in ALPHABET {
                let mut b = code.clone().into_bytes();
                if b[i] == c {
                    continue;
                }
                b[i] = c;
                let damaged = String::from_utf8(b).unwrap();
                assert!(decode(&damaged).is_err(), "position {i}, {}", c as char);
            }
        }
        assert_eq!(decode("hello there"), Err(ShareError::NotACode));
    }

    /// A version 2 code around any body, compressed or not, with a good checksum: what a
    /// crafted code looks like.
    fn wrap(body: &[u8], compressed: bool) -> String {
        if compressed {
            seal(&deflate(body), true)
        } else {
            seal(body, false)
        }
    }

    #[test]
    fn a_code_that_inflates_past_the_limit_is_refused_unread() {
        // Two megabytes of zeros compress to a few kilobytes; the reader stops at its limit.
        let bomb = wrap(&vec![0u8; 2 * MAX_BODY_BYTES], true);
        assert!(bomb.len() < 10_000, "{}", bomb.len());
        assert_eq!(
            decode(&bomb),
            Err(ShareError::Malformed("the compressed body (too large)"))
        );
        // The same wrapping of a real body opens, so the refusal above is the limit's.
        let body = body_bits(&sample()).into_bytes();
        assert_eq!(decode(&wrap(&body, true)), Ok(sample()));
    }

    #[test]
    fn a_code_over_a_limit_is_refused_with_the_limit_named() {
        let mut set = sample();
        set.title = "Harbour Street ".repeat(14);
        assert!(set.title.len() > limits::MAX_TITLE_BYTES);
        let code = wrap(&body_bits(&set).into_bytes(), false);
        match decode(&code) {
            Err(ShareError::Invalid(e)) => {
                assert_eq!(e.field, "title");
                assert!(e.to_string().contains("at most 200 bytes"), "{e}");
            }
            other => panic!("{other:?}"),
        }
        // Stray bits after the last puzzle are refused.
        let mut body = body_bits(&sample()).into_bytes();
        body.push(0);
        assert_eq!(
            decode(&wrap(&body, false)),
            Err(ShareError::Malformed("the end of the code"))
        );
    }

    #[test]
    fn a_step_off_the_board_is_refused_whatever_its_size() {
        // A body written by hand: no title, a date, no generator, one puzzle (freestyle,
        // 15x15, vcf, black to move, a free-text id), whose black list is in the steps layout:
        // o15, then o15 plus a step (zigzag-coded: 1 is one to the left, 2 one to the right).
        // Then no white stones, one answer (a1) and no line.
        for step in [1u64, 2, 40, u64::MAX - 1, u64::MAX] {
            let mut w = BitWriter::default();
            w.golomb(3, 0);
            w.put(14, 2026);
            w.put(4, 12);
            w.put(5, 2);
            w.flag(false);
            w.golomb(3, 1);
            w.flag(false);
            w.put(2, 0);
            w.put(5, 15);
            w.put(3, 1);
            w.flag(false);
            w.flag(false);
            put_text(&mut w, "x");
            w.put(12, 1500);
            w.put(8, 1);
            w.golomb(3, 2);
            w.put(2, Layout::Steps as u64);
            w.put(8, 224);
            w.put(3, 0);
            w.golomb(0, step);
            w.golomb(0, 0);
            w.golomb(3, 0);
            w.golomb(3, 1);
            w.put(2, Layout::Indices as u64);
            w.put(8, 0);
            w.golomb(3, 0);
            let decoded = decode(&wrap(&w.into_bytes(), false));
            if step == 1 {
                let black = &decoded.unwrap().puzzles[0].black;
                assert_eq!(black, &["o15".parse().unwrap(), "n15".parse().unwrap()]);
            } else {
                assert_eq!(
                    decoded,
                    Err(ShareError::Malformed("a list of points")),
                    "step {step}"
                );
            }
        }
    }
}

//! The class table: students' result codes read from pasted text against one set, a table of
//! students by puzzles, and its export as CSV.
//!
//! **Reading pasted text.** An instructor pastes whatever the students sent: one code per line,
//! or several on a line separated by spaces, commas or semicolons, each code written as the page
//! shows it (groups of four joined by dashes, or by the other dashes a phone may write) or typed
//! with spaces between the groups, in lower case, with I, L or O for 1, 1 or 0 (the result
//! code's own forgiving reading), and with the punctuation of a chat around it ("Mira: CODE.",
//! "(CODE)", quotes, the invisible characters messaging apps insert): every character but the
//! letters and digits of the Latin alphabet and dashes separates words as a space does. Commas
//! and semicolons always separate codes. Spaces may separate codes or groups of one code: a
//! code's first bytes say how long it is (its version, name length and puzzle count), so the
//! reader takes exactly that many characters, across spaces, and the code must end where a word
//! ends. A line break separates codes too, unless a code is wrapped (a mail program's line
//! length, a code typed in two halves): a code that starts in a line's last text that cannot be
//! read and runs out of text (its header, or the length it gives, goes on past the line's end)
//! is read on into the next lines, up to [`WRAP_LINES`] lines in all, while it still runs out,
//! and the join is kept when it gives more codes than those lines alone, or as many and the
//! code, its first word looking like one, has a length that ends where a later line ends (a
//! damaged code wrapped is reported once). Text that cannot be read is reported with its line
//! and skipped; consecutive words that cannot be read are reported once. Such text is called a
//! damaged code when it could be part of one ([`looks_like_code`]), and otherwise words around
//! the codes (a greeting, a name, a date), reported as [`Problem::NotACode`]. The reading is
//! linear in the length of the text: each word starts at most a bounded header read, a whole
//! code is decoded only when its length ends on a word boundary, after which reading goes on
//! after it, and a line is read again only in the joins of a code that runs out of text, at
//! most [`WRAP_LINES`] times.
//!
//! **Which codes count.** Each code is checked: unreadable (a typing mistake, cut short), for
//! another set (its fingerprint differs from the set's), or for a set of another length. A
//! student is known by name, compared without regard to case or repeated spaces. **A code
//! carries no time, so a student's codes are ordered by what they hold**: the page's record of
//! a puzzle only moves on (untried, then failed, then solved; a solve stays), so a code that
//! carries on from the one in the table ([`carries_on`]) replaces it, and one the table's
//! carries on from is an earlier code, reported and kept out, whatever order they are pasted
//! in. Two codes that neither carries on from (two devices) are settled by the order they are
//! read in: the later read replaces the earlier, and the report says so. A code that repeats
//! what the table already holds for that student is reported as a repeat and changes nothing.
//! A code with no name is its own row. Adding codes never removes a student.
//!
//! **CSV.** [`ClassTable::to_csv`] follows RFC 4180: a header row, records ending in CRLF,
//! fields quoted when they hold a comma, a double quote, CR or LF, quotes inside doubled, UTF-8.
//! A field that starts with `=`, `+`, `-`, `@`, a tab or a carriage return is prefixed with a
//! single quote, so that a spreadsheet shows it as text and never runs it as a formula (the
//! OWASP advice on CSV injection); student names come from outside.

use std::borrow::Cow;
use std::collections::HashMap;
use std::fmt;

use super::result::{self, PuzzleResult, ResultError, Results, TimeBucket};
use super::setfile::PuzzleSet;
use crate::puzzle::attempt::Attempt;

/// One code found in pasted text, read or not.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Found {
    /// The line it starts on, counted from 1.
    pub line: usize,
    /// The text as read: its words joined by single spaces, the punctuation that parted them
    /// dropped, other dashes written as `-`.
    pub text: String,
    /// The text as written, for a report ([`said`]): from its first word to its last, with the
    /// punctuation between them ("Here's", "see you Tuesday!" but not the quote around it).
    pub said: String,
    /// The decoded code, or why it could not be read.
    pub code: Result<Results, ResultError>,
}

/// One word of a piece of text: its line, its symbols and whether it holds a character no
/// code has, and where it is in the text as written.
#[derive(Clone)]
struct Word<'a> {
    line: usize,
    text: &'a str,
    /// The piece of the line as written, and the word's bytes in it.
    written: &'a str,
    span: (usize, usize),
    symbols: usize,
    bad: Option<(char, usize)>,
}

/// Finds the result codes in pasted text (see the module doc for the rules).
pub fn find_codes(text: &str) -> Vec<Found> {
    // Every piece: its line, whether it starts the line, and its text with every character
    // but the letters and digits of the alphabet a code is written in, and dashes, made a space
    // (punctuation, quotes, invisible characters and other scripts part words as a space does).
    let mut pieces: Vec<(usize, bool, String, &str)> = Vec::new();
    for (n, line) in text.lines().enumerate() {
        for (k, written) in line.split([',', ';']).enumerate() {
            let piece: String = written
                .chars()
                .map(|c| match c {
                    '\u{2010}'..='\u{2015}' | '\u{2212}' => '-',
                    c if c.is_ascii_alphanumeric() || c == '-' => c,
                    _ => ' ',
                })
                .collect();
            pieces.push((n + 1, k == 0, piece, written));
        }
    }
    let codes = |f: &[Found]| f.iter().filter(|f| f.code.is_ok()).count();
    let mut found = Vec::new();
    let mut i = 0;
    while i < pieces.len() {
        let mut words = words_of(pieces[i].0, &pieces[i].2, pieces[i].3);
        let mut here = scan(&words);
        // A code wrapped onto the next lines: a code that starts in this piece's last run of
        // unread text runs out of text. It is read on into the first pieces of the lines after
        // it (at most WRAP_LINES lines in all) while it still runs out, and the join is kept
        // if it gives more codes than those pieces alone (a code's checksum makes a chance
        // join all but impossible), or as many and the code's length, read from its header,
        // ends where a later line ends (a damaged code, reported once).
        while let Some((run, start)) = here.runs_out {
            let mut joint: Vec<Word> = words[start..].to_vec();
            let mut alone = 0;
            let mut joined = None;
            for (j, (line, first, next, written)) in pieces.iter().enumerate().skip(i + 1) {
                let end = joint.last().expect("a run has a word").line;
                if !first || *line != end + 1 || *line - words[start].line >= WRAP_LINES {
                    break;
                }
                let next = words_of(*line, next, written);
                alone += codes(&scan(&next).found);
                joint.extend(next);
                let read = scan(&joint);
                // More codes; or as many, with the first one looking like a code and its
                // length ending where a line read on into ends (a damaged code wrapped:
                // reported once, on its first line).
                let got = codes(&read.found);
                if got > alone || (got == alone && codeish(joint[0].text) && spans_words(&joint)) {
                    joined = Some((j, read));
                    break;
                }
                if read.runs_out.map(|r| r.1) != Some(0) {
                    break;
                }
            }
            let Some((j, read)) = joined else {
                break;
            };
            // The run's words before the code's first stay as they were read on their own.
            here.found.pop();
            here.found.extend(scan(&words[run..start]).found);
            here.found.extend(read.found);
            here.runs_out = read.runs_out;
            words = joint;
            i = j;
        }
        found.extend(here.found);
        i += 1;
    }
    found
}

/// The words of one piece of a line: `piece` is `written` with every character made one
/// ASCII byte (see [`find_codes`]), so a word's bytes in `piece` are its characters in
/// `written`.
fn words_of<'a>(line: usize, piece: &'a str, written: &'a str) -> Vec<Word<'a>> {
    // The byte where each character of `written` starts, and its end, when they differ from
    // the character's number.
    let starts: Vec<usize> = if written.is_ascii() {
        Vec::new()
    } else {
        written
            .char_indices()
            .map(|(b, _)| b)
            .chain([written.len()])
            .collect()
    };
    let byte = |at: usize| starts.get(at).copied().unwrap_or(at);
    piece
        .split_whitespace()
        .map(|w| {
            let at = w.as_ptr() as usize - piece.as_ptr() as usize;
            let mut symbols = 0;
            let mut bad = None;
            for (i, c) in w.chars().enumerate() {
                if c == '-' {
                    continue;
                }
                if result::symbol(c).is_some() {
                    symbols += 1;
                } else if bad.is_none() {
                    bad = Some((c, i + 1));
                }
            }
            Word {
                line,
                text: w,
                written,
                span: (byte(at), byte(at + w.len())),
                symbols,
                bad,
            }
        })
        .collect()
}

/// The most lines one code is read across: more than a mail or chat program's wrap makes of
/// the code of a usual set (a 12-puzzle set's is about 80 characters), and a bound that keeps
/// the reading linear in the text.
pub const WRAP_LINES: usize = 8;

/// No word ends after this many symbols.
const NO_WORD: u32 = u32::MAX;

/// What [`scan`] read of a piece.
struct Scanned {
    /// The codes and the runs of text that could not be read, in order.
    found: Vec<Found>,
    /// When the piece ends in a run that could not be read in which a code runs out of text
    /// (its header, or the length it gives, goes on past the last word): the run's first word
    /// and the first word of the earliest such code.
    runs_out: Option<(usize, usize)>,
}

/// Reads the codes of one piece (a part of a line between commas and semicolons, or such parts
/// of up to [`WRAP_LINES`] lines when a code is wrapped); each is reported on the line of its
/// first word.
fn scan(words: &[Word]) -> Scanned {
    let mut found = Vec::new();
    let mut runs_out = None;
    let (before, ends) = word_ends(words);
    let joined = |from: usize, to: usize| -> String {
        words[from..=to]
            .iter()
            .map(|w| w.text)
            .collect::<Vec<_>>()
            .join(" ")
    };
    let mut failed: Option<(usize, ResultError)> = None;
    // Whether the failed run starts with a word that could be part of a code.
    let mut run_codeish = false;
    let flush = |failed: &mut Option<(usize, ResultError)>, upto: usize, found: &mut Vec<Found>| {
        if let Some((from, error)) = failed.take() {
            found.push(Found {
                line: words[from].line,
                text: joined(from, upto - 1),
                said: said(&words[from..upto]),
                code: Err(error),
            });
        }
    };
    let mut i = 0;
    while i < words.len() {
        if words[i].symbols == 0 && words[i].bad.is_none() {
            // A lone dash: nothing to read.
            i += 1;
            continue;
        }
        match attempt(words, i, &before, &ends) {
            Ok((code, k)) => {
                flush(&mut failed, i, &mut found);
                runs_out = None;
                found.push(Found {
                    line: words[i].line,
                    text: joined(i, k),
                    said: said(&words[i..=k]),
                    code: Ok(code),
                });
                i = k + 1;
            }
            Err((error, next, out)) => {
                let here = codeish(words[i].text);
                let run = failed.as_ref().map_or(i, |f| f.0);
                if out && runs_out.is_none() {
                    runs_out = Some((run, i));
                }
                match &mut failed {
                    None => {
                        failed = Some((i, error));
                        run_codeish = here;
                    }
                    // A run that starts with words (a greeting) gives the error of its first
                    // word that could be part of a code, not one read from the greeting.
                    Some((_, e)) if here && !run_codeish => {
                        *e = error;
                        run_codeish = true;
                    }
                    Some(_) => {}
                }
                i = next;
            }
        }
    }
    if failed.is_none() {
        runs_out = None;
    }
    flush(&mut failed, words.len(), &mut found);
    Scanned { found, runs_out }
}

/// The text of `words` as written: on each line, from the first word to the last with what
/// parts them (out to the ends of the words of any script at either end), the lines' texts
/// joined by a space. Characters that would not show as themselves in a report are left out
/// (the invisible ones messaging apps insert, the marks that turn text's direction, control
/// characters) and spaces run together.
fn said(words: &[Word]) -> String {
    let mut out = String::new();
    for line in words.chunk_by(|a, b| a.line == b.line) {
        let (first, last) = (&line[0], &line[line.len() - 1]);
        let written = first.written;
        // Out to the whole words at the ends ("café", whose last letter parts words as read).
        let start = written[..first.span.0]
            .char_indices()
            .rev()
            .take_while(|&(_, c)| letter(c))
            .last()
            .map_or(first.span.0, |(b, _)| b);
        let end = written[last.span.1..]
            .char_indices()
            .find(|&(_, c)| !letter(c))
            .map_or(written.len(), |(b, _)| last.span.1 + b);
        let text = &written[start..end];
        for part in text.split_whitespace() {
            let part: String = part.chars().filter(|&c| shows(c)).collect();
            if part.is_empty() {
                continue;
            }
            if !out.is_empty() {
                out.push(' ');
            }
            out.push_str(&part);
        }
    }
    out
}

/// Whether a character outside ASCII goes on a word as read, for a report: a letter of another
/// alphabet (`é` in "café"), not a space or a mark of punctuation. A few ranges, not Unicode's
/// tables, which would add kilobytes to the page: Latin-1's signs, the general and CJK
/// punctuation blocks, and the full-width forms' signs.
fn letter(c: char) -> bool {
    !c.is_ascii()
        && !c.is_whitespace()
        && !matches!(c,
            '\u{80}'..='\u{bf}' | '\u{d7}' | '\u{f7}' | '\u{2000}'..='\u{206f}'
            | '\u{3000}'..='\u{303f}' | '\u{ff01}'..='\u{ff0f}' | '\u{ff1a}'..='\u{ff20}'
            | '\u{ff3b}'..='\u{ff40}' | '\u{ff5b}'..='\u{ff65}')
}

/// Whether a character shows as itself in a report: not a control character, nor an
/// invisible format character (Unicode's Cf category: zero-width spaces and joiners, the
/// direction marks, embeddings, overrides and isolates, the byte-order mark and the like).
fn shows(c: char) -> bool {
    !c.is_control()
        && !super::turns_direction(c)
        && !matches!(c,
            '\u{ad}' | '\u{600}'..='\u{605}' | '\u{6dd}' | '\u{70f}' | '\u{180e}'
            | '\u{200b}'..='\u{200d}' | '\u{2060}'..='\u{2064}' | '\u{206a}'..='\u{206f}'
            | '\u{feff}' | '\u{fff9}'..='\u{fffb}' | '\u{e0001}' | '\u{e0020}'..='\u{e007f}')
}

/// For reading codes across words: `before[j]`, the symbols in `words[..j]`, and `ends[s]`,
/// the first word after which exactly `s` symbols have been read, or [`NO_WORD`].
fn word_ends(words: &[Word]) -> (Vec<usize>, Vec<u32>) {
    let mut before = Vec::with_capacity(words.len() + 1);
    before.push(0usize);
    for w in words {
        before.push(before.last().expect("one entry") + w.symbols);
    }
    let total = *before.last().expect("one entry");
    // Word numbers fit 32 bits (a text of 4 GiB would be needed to overflow them); the table
    // then takes 4 bytes per symbol of the piece.
    let mut ends: Vec<u32> = vec![NO_WORD; total + 1];
    for j in (0..words.len()).rev() {
        ends[before[j + 1]] = j as u32;
    }
    (before, ends)
}

/// Whether the code that starts at the first word, its length read from its header, ends
/// where a later line ends, over words of code characters only (read, or refused as it is
/// decoded): how a damaged code wrapped by a mail program looks. A code that would end inside a
/// line, or take in a word no code has, is not taken to go on there.
fn spans_words(words: &[Word]) -> bool {
    let (before, ends) = word_ends(words);
    let k = match attempt(words, 0, &before, &ends) {
        Ok((_, k)) => k,
        Err((_, next, _)) => next - 1,
    };
    let line_ends = words.get(k + 1).is_none_or(|w| w.line != words[k].line);
    k > 0 && line_ends && words[1..=k].iter().all(|w| w.bad.is_none())
}

/// Tries to read one code starting at word `i`: the code and its last word, or why not, where
/// to try next, and whether the code runs out of text (its header, or the length it gives, goes
/// on past the last word).
fn attempt(
    words: &[Word],
    i: usize,
    before: &[usize],
    ends: &[u32],
) -> Result<(Results, usize), (ResultError, usize, bool)> {
    let next = i + 1;
    // Read the header symbol by symbol until the code's length is known. The header is at most
    // 8 + 255 bytes, so this is bounded whatever the text.
    let mut head = Vec::new();
    let (mut acc, mut bits) = (0u32, 0);
    let mut length = None;
    'words: for w in &words[i..] {
        if let Some((found, at)) = w.bad {
            return Err((ResultError::BadCharacter { found, at }, next, false));
        }
        for c in w.text.chars().filter(|&c| c != '-') {
            let v = result::symbol(c).expect("checked above");
            acc = (acc << 5 | v as u32) & 0xFFFF;
            bits += 5;
            if bits >= 8 {
                bits -= 8;
                head.push((acc >> bits & 0xFF) as u8);
                match result::code_bytes(&head) {
                    Ok(Some(n)) => {
                        length = Some(n);
                        break 'words;
                    }
                    Ok(None) => {}
                    Err(e) => return Err((e, next, false)),
                }
            }
        }
    }
    let Some(bytes) = length else {
        return Err((ResultError::Damaged, next, true));
    };
    let symbols = result::code_chars(bytes);
    if symbols > result::MAX_CODE_CHARS {
        return Err((ResultError::Damaged, next, false));
    }
    // The code must end where a word ends.
    let k = match ends.get(before[i] + symbols) {
        Some(&k) if k != NO_WORD => k as usize,
        Some(_) => return Err((ResultError::Damaged, next, false)),
        None => return Err((ResultError::Damaged, next, true)),
    };
    let text: String = words[i..=k].iter().map(|w| w.text).collect();
    result::decode(&text)
        .map(|r| (r, k))
        .map_err(|e| (e, k + 1, false))
}

/// A word that could be a group of a code or a whole one: four code characters or more, with
/// a digit and a letter among them (a code's groups hold both, and its first character is a
/// digit, as it writes its version first).
fn codeish(word: &str) -> bool {
    code_chars(word) >= 4
        && word.chars().any(|c| c.is_ascii_digit())
        && word.chars().any(|c| c.is_ascii_alphabetic())
}

/// Whether text that could not be read as a code could be part of one: it holds a `codeish`
/// word of eight code characters or more (a code as the page writes it, groups joined by
/// dashes) or two such words (groups typed apart). A damaged code passes whichever character
/// went wrong (a test tries them all); words such as "thanks", "Mira", "12th", or a chat's
/// date and time ("02/12/2026 21:14") do not.
pub fn looks_like_code(text: &str) -> bool {
    let words: Vec<&str> = text.split_whitespace().filter(|w| codeish(w)).collect();
    words.len() >= 2 || words.iter().any(|w| code_chars(w) >= 8)
}

/// The characters of a word that a code may hold.
fn code_chars(word: &str) -> usize {
    word.chars()
        .filter(|&c| result::symbol(c).is_some())
        .count()
}

/// Whether the results `later` carry on from `earlier`: each puzzle's record is where the
/// page's could have moved from the earlier one: the attempt by [`Attempt::merge`] (an untried
/// puzzle tried, a failed one failed again or solved; a solve stays as it was), the hint steps
/// never fewer (the record keeps the most), and the time set once, by the first finished try.
pub fn carries_on(later: &[PuzzleResult], earlier: &[PuzzleResult]) -> bool {
    later.len() == earlier.len()
        && later.iter().zip(earlier).all(|(l, e)| {
            e.attempt.merge(l.attempt) == l.attempt
                && l.hints >= e.hints
                && (l.time == e.time || e.time == TimeBucket::NotTimed)
        })
}

/// Why a code found in pasted text did not simply add a student.
#[derive(Clone, Debug, PartialEq, Eq)]
pub enum Problem {
    /// The code could not be read (a typing mistake, cut short).
    Unreadable(ResultError),
    /// Text that could not be read and is no code (see [`looks_like_code`]): words around the
    /// codes.
    NotACode,
    /// A code for another set.
    OtherSet {
        /// The fingerprint in the code.
        fingerprint: u32,
    },
    /// A code with the set's fingerprint but another number of puzzles.
    WrongLength {
        /// Results in the code.
        found: usize,
        /// Puzzles in the set.
        expected: usize,
    },
    /// The same results again for a student already in the table: nothing changed.
    Repeated {
        /// The student.
        name: String,
    },
    /// A new code for a student already in the table: it replaced the earlier results.
    Replaced {
        /// The student.
        name: String,
        /// Whether it carries on from the results it replaced ([`carries_on`]); if not (two
        /// devices), it replaced them for being read later.
        later: bool,
    },
    /// A code the table's results for the student carry on from: an earlier one, kept out.
    Earlier {
        /// The student.
        name: String,
    },
}

/// Text that was refused or skipped, a code that repeated, came before, or replaced a
/// student's results.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Notice {
    /// The line of the pasted text, counted from 1.
    pub line: usize,
    /// The text as written ([`Found::said`], at most 40 characters of it).
    pub text: String,
    /// What happened.
    pub problem: Problem,
}

impl Problem {
    /// The problem of text that could not be read: [`Problem::Unreadable`] when it could be a
    /// damaged code, [`Problem::NotACode`] otherwise.
    pub fn unreadable(text: &str, error: ResultError) -> Problem {
        if looks_like_code(text) {
            Problem::Unreadable(error)
        } else {
            Problem::NotACode
        }
    }
}

impl fmt::Display for Notice {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        write!(f, "line {}, ‘{}’: ", self.line, self.text)?;
        match &self.problem {
            Problem::Unreadable(e) => write!(f, "{e}; skipped"),
            Problem::NotACode => f.write_str("not a result code; skipped"),
            Problem::OtherSet { fingerprint } => write!(
                f,
                "a result for another set (set key {fingerprint:08x}); skipped"
            ),
            Problem::WrongLength { found, expected } => write!(
                f,
                "a result for {found} puzzles, but the set has {expected}; skipped"
            ),
            Problem::Repeated { name } => {
                write!(f, "the same result for {name} again; nothing changed")
            }
            Problem::Replaced { name, later: true } => {
                write!(f, "a result for {name} with more done than the table's; it takes its place")
            }
            Problem::Replaced { name, later: false } => write!(
                f,
                "another result for {name} (another device?); read later, it replaces the one before"
            ),
            Problem::Earlier { name } => write!(
                f,
                "a result for {name} with less done than the table's (read before, or from another device); the table keeps its own"
            ),
        }
    }
}

/// What adding codes to a table did.
#[derive(Clone, Debug, Default, PartialEq, Eq)]
pub struct Added {
    /// Codes that added a student.
    pub new_students: usize,
    /// Codes that replaced a student's earlier results.
    pub replaced: usize,
    /// Everything worth telling, in the order of the text.
    pub notices: Vec<Notice>,
}

/// One student's row.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Student {
    /// The name as in the code the row holds.
    pub name: String,
    /// One result per puzzle.
    pub results: Vec<PuzzleResult>,
}

impl Student {
    /// Puzzles solved (clean or with help): the score.
    pub fn solved(&self) -> usize {
        self.results.iter().filter(|r| r.attempt.solved()).count()
    }

    /// Puzzles solved with no wrong move and no hint.
    pub fn clean(&self) -> usize {
        self.results
            .iter()
            .filter(|r| r.attempt == Attempt::Clean)
            .count()
    }
}

/// How to order the rows.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum SortBy {
    /// In the order the students were first added.
    Added,
    /// By name, ignoring case.
    Name,
    /// By score (solved, then clean) from the highest, then by name.
    Score,
}

/// How the class did on one puzzle.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct PuzzleStats {
    /// Students who solved it (clean or with help).
    pub solved: usize,
    /// Students who solved it clean.
    pub clean: usize,
    /// Students who tried it (anything but untried).
    pub tried: usize,
    /// Students in the table.
    pub students: usize,
}

impl PuzzleStats {
    /// The solve rate in whole percent of the students in the table, rounded half up; `None`
    /// for an empty table. Integer arithmetic, so the same on every platform.
    pub fn percent(&self) -> Option<usize> {
        (self.students > 0).then(|| (200 * self.solved + self.students) / (2 * self.students))
    }
}

/// Students by puzzles for one set.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct ClassTable {
    set: u32,
    puzzles: usize,
    students: Vec<Student>,
    /// Row of each student's name key (looked up, never iterated).
    rows: HashMap<String, usize>,
}

/// The key a student is known by: the name without regard to case or repeated spaces.
fn name_key(name: &str) -> String {
    name.split_whitespace()
        .collect::<Vec<_>>()
        .join(" ")
        .to_lowercase()
}

/// Orders two texts as a reader would a list of names: runs of digits by their value ("(no
/// name 2)" before "(no name 10)", "Table 9" before "Table 10"), the rest by character.
fn by_numbers(a: &str, b: &str) -> std::cmp::Ordering {
    let (mut a, mut b) = (a, b);
    loop {
        let digits = |s: &str| s.find(|c: char| !c.is_ascii_digit()).unwrap_or(s.len());
        let (da, db) = (digits(a), digits(b));
        if da > 0 && db > 0 {
            // By value: without leading zeros, the longer run is the larger; then by digits,
            // then the shorter (fewer leading zeros) first.
            let (na, nb) = (
                a[..da].trim_start_matches('0'),
                b[..db].trim_start_matches('0'),
            );
            let order = na.len().cmp(&nb.len()).then(na.cmp(nb)).then(da.cmp(&db));
            if order.is_ne() {
                return order;
            }
            (a, b) = (&a[da..], &b[db..]);
            continue;
        }
        let mut ca = a.chars();
        let mut cb = b.chars();
        match (ca.next(), cb.next()) {
            (None, None) => return std::cmp::Ordering::Equal,
            (x, y) if x != y => return x.cmp(&y),
            _ => (a, b) = (ca.as_str(), cb.as_str()),
        }
    }
}

/// At most 40 characters of a text, for a report ([`Notice::text`]).
pub fn shorten(text: &str) -> String {
    match text.char_indices().nth(40) {
        Some((at, _)) => format!("{}…", &text[..at]),
        None => text.to_string(),
    }
}

impl ClassTable {
    /// An empty table for a set.
    pub fn new(set: &PuzzleSet) -> ClassTable {
        ClassTable {
            set: result::fingerprint(set),
            puzzles: set.puzzles.len(),
            students: Vec::new(),
            rows: HashMap::new(),
        }
    }

    /// The fingerprint of the table's set.
    pub fn fingerprint(&self) -> u32 {
        self.set
    }

    /// The number of puzzles of the table's set.
    pub fn puzzles(&self) -> usize {
        self.puzzles
    }

    /// Reads pasted text and adds its codes: new students are appended, a student's code
    /// replaces the results it carries on from (or, from another device, those read before),
    /// nothing is removed.
    pub fn add(&mut self, text: &str) -> Added {
        let mut added = Added::default();
        for found in find_codes(text) {
            let notice = |problem| Notice {
                line: found.line,
                text: shorten(&found.said),
                problem,
            };
            let code = match found.code {
                Err(e) => {
                    added
                        .notices
                        .push(notice(Problem::unreadable(&found.text, e)));
                    continue;
                }
                Ok(code) => code,
            };
            if code.set != self.set {
                added.notices.push(notice(Problem::OtherSet {
                    fingerprint: code.set,
                }));
                continue;
            }
            if code.puzzles.len() != self.puzzles {
                added.notices.push(notice(Problem::WrongLength {
                    found: code.puzzles.len(),
                    expected: self.puzzles,
                }));
                continue;
            }
            let key = name_key(&code.name);
            let row = if key.is_empty() {
                None
            } else {
                self.rows.get(&key).copied()
            };
            match row {
                Some(row) => {
                    let student = &mut self.students[row];
                    let later = carries_on(&code.puzzles, &student.results);
                    if student.results == code.puzzles {
                        added
                            .notices
                            .push(notice(Problem::Repeated { name: code.name }));
                    } else if !later && carries_on(&student.results, &code.puzzles) {
                        added
                            .notices
                            .push(notice(Problem::Earlier { name: code.name }));
                    } else {
                        student.results = code.puzzles;
                        student.name = code.name.clone();
                        added.replaced += 1;
                        added.notices.push(notice(Problem::Replaced {
                            name: code.name,
                            later,
                        }));
                    }
                }
                None => {
                    // Numbered among the nameless rows (every named row has a key in `rows`):
                    // a line number would change as the page reads its codes again.
                    let name = if key.is_empty() {
                        format!("(no name {})", self.students.len() - self.rows.len() + 1)
                    } else {
                        self.rows.insert(key, self.students.len());
                        code.name
                    };
                    self.students.push(Student {
                        name,
                        results: code.puzzles,
                    });
                    added.new_students += 1;
                }
            }
        }
        added
    }

    /// The students in the order they were first added.
    pub fn students(&self) -> &[Student] {
        &self.students
    }

    /// The students in the given order.
    pub fn sorted(&self, by: SortBy) -> Vec<&Student> {
        let mut rows: Vec<&Student> = self.students.iter().collect();
        let by_name = |a: &&Student, b: &&Student| {
            by_numbers(&name_key(&a.name), &name_key(&b.name)).then_with(|| a.name.cmp(&b.name))
        };
        match by {
            SortBy::Added => {}
            SortBy::Name => rows.sort_by(by_name),
            SortBy::Score => rows.sort_by(|a, b| {
                b.solved()
                    .cmp(&a.solved())
                    .then(b.clean().cmp(&a.clean()))
                    .then_with(|| by_name(a, b))
            }),
        }
        rows
    }

    /// How the class did on each puzzle, in set order.
    pub fn stats(&self) -> Vec<PuzzleStats> {
        (0..self.puzzles)
            .map(|i| {
                let results = self.students.iter().map(|s| s.results[i]);
                PuzzleStats {
                    solved: results.clone().filter(|r| r.attempt.solved()).count(),
                    clean: results
                        .clone()
                        .filter(|r| r.attempt == Attempt::Clean)
                        .count(),
                    tried: results.filter(|r| r.attempt != Attempt::Untried).count(),
                    students: self.students.len(),
                }
            })
            .collect()
    }

    /// The table as CSV (RFC 4180, see the module doc): a header row (`Student`, `Solved`,
    /// `Clean`, `Puzzle 1`, …), one row per student with each cell in words ("helped, 2
    /// hints, under 2 min"), and a last row with each puzzle's solve rate ("3 of 4 (75%)").
    pub fn to_csv(&self, by: SortBy) -> String {
        let mut out = String::new();
        let mut header = vec!["Student".to_string(), "Solved".into(), "Clean".into()];
        header.extend((1..=self.puzzles).map(|i| format!("Puzzle {i}")));
        csv_record(&mut out, &header);
        for s in self.sorted(by) {
            let mut row = vec![
                s.name.clone(),
                s.solved().to_string(),
                s.clean().to_string(),
            ];
            row.extend(s.results.iter().map(PuzzleResult::words));
            csv_record(&mut out, &row);
        }
        let mut last = vec!["Solved by".to_string(), String::new(), String::new()];
        last.extend(self.stats().iter().map(|st| match st.percent() {
            Some(p) => format!("{} of {} ({p}%)", st.solved, st.students),
            None => String::new(),
        }));
        csv_record(&mut out, &last);
        out
    }
}

/// One CSV field: quoted when it holds a comma, a double quote, CR or LF (quotes inside
/// doubled, RFC 4180 section 2, rules 6 and 7), and prefixed with a single quote when it starts
/// with `=`, `+`, `-`, `@`, a tab or a carriage return (OWASP, CSV injection).
pub fn csv_field(text: &str) -> Cow<'_, str> {
    let guarded: Cow<str> = if text.starts_with(['=', '+', '-', '@', '\t', '\r']) {
        Cow::Owned(format!("'{text}"))
    } else {
        Cow::Borrowed(text)
    };
    if guarded.contains([',', '"', '\r', '\n']) {
        Cow::Owned(format!("\"{}\"", guarded.replace('"', "\"\"")))
    } else {
        guarded
    }
}

/// Appends one CSV record and its CRLF.
pub fn csv_record<S: AsRef<str>>(out: &mut String, fields: &[S]) {
    for (i, f) in fields.iter().enumerate() {
        if i > 0 {
            out.push(',');
        }
        out.push_str(&csv_field(f.as_ref()));
    }
    out.push_str("\r\n");
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::formats::setfile;

    fn set() -> PuzzleSet {
        setfile::parse(include_str!("../../../tests/data/fixture_set.json")).unwrap()
    }

    fn code(set: &PuzzleSet, name: &str, attempts: &[Attempt]) -> String {
        let results: Vec<PuzzleResult> = (0..set.puzzles.len())
            .map(|i| {
                let a = attempts.get(i).copied().unwrap_or(Attempt::Untried);
                PuzzleResult::new(a, (i % 2) as u8, TimeBucket::Under2Min)
            })
            .collect();
        result::encode(result::fingerprint(set), name, &results).unwrap()
    }

    #[test]
    fn codes_are_found_whatever_separates_them() {
        let s = set();
        let a = code(&s, "Mira", &[Attempt::Clean]);
        let b = code(&s, "Tomas", &[Attempt::Failed]);
        let c = code(&s, "Ines", &[Attempt::Helped]);
        let spaced = c.to_lowercase().replace('-', " ");
        let text = format!("{a} {b}\n\n  {spaced} ;{a},\r\n{b}");
        let found = find_codes(&text);
        let names: Vec<(usize, String)> = found
            .iter()
            .map(|f| (f.line, f.code.as_ref().unwrap().name.clone()))
            .collect();
        let expect = [
            (1, "Mira"),
            (1, "Tomas"),
            (3, "Ines"),
            (3, "Mira"),
            (4, "Tomas"),
        ];
        assert_eq!(
            names,
            expect.map(|(l, n)| (l, n.to_string())).to_vec(),
            "{found:?}"
        );
    }

    #[test]
    fn damaged_codes_and_words_are_reported_once_with_their_line() {
        let s = set();
        let a = code(&s, "Mira", &[Attempt::Clean]);
        let b = code(&s, "Tomas", &[Attempt::Failed]);
        // One character of a dropped: the rest of the line still reads.
        let cut: String = a.chars().skip(1).collect();
        let text = format!("hello from the harbour\n{cut} {b}\nthanks!");
        let found = find_codes(&text);
        assert_eq!(found.len(), 4, "{found:#?}");
        assert!(found[0].code.is_err() && found[0].line == 1);
        assert!(found[1].code.is_err() && found[1].line == 2);
        assert_eq!(found[2].code.as_ref().unwrap().name, "Tomas");
        assert!(found[3].code.is_err() && found[3].line == 3);
    }

    #[test]
    fn a_code_wrapped_onto_the_next_lines_is_read_whole() {
        let s = set();
        let a = code(&s, "Mira", &[Attempt::Clean]);
        let b = code(&s, "Tomas", &[Attempt::Failed]);
        let names = |text: &str| -> Vec<(usize, Result<String, String>)> {
            find_codes(text)
                .into_iter()
                .map(|f| (f.line, f.code.map(|r| r.name).map_err(|_| f.text)))
                .collect()
        };
        let ok = |line: usize, name: &str| (line, Ok(name.to_string()));
        // Broken after a dash, in the middle of a group, and in three pieces, with words
        // before it and a code after it.
        let at_dash = a.find('-').unwrap() + 1;
        let wrapped = [
            format!("Mira: {}\n{} {b}", &a[..at_dash], &a[at_dash..]),
            format!("Mira: {}\n{} {b}", &a[..7], &a[7..]),
            format!("{}\n{}\n{}\n{b}", &a[..12], &a[12..30], &a[30..]),
        ];
        for text in &wrapped {
            let got = names(text);
            let want_b = if text.matches('\n').count() == 1 {
                2
            } else {
                4
            };
            assert_eq!(got.last(), Some(&ok(want_b, "Tomas")), "{text}: {got:?}");
            assert!(got.contains(&ok(1, "Mira")), "{text}: {got:?}");
            assert_eq!(
                got.iter().filter(|x| x.1.is_ok()).count(),
                2,
                "{text}: {got:?}"
            );
        }
        // Typed with spaces between the groups, in lower case, wrapped after a group or inside
        // one; with CRLF line ends; a comma piece after the code's end on the next line.
        let spaced = a.replace('-', " ").to_lowercase();
        let group = spaced.find(' ').unwrap() + 1;
        let wrapped = [
            format!("{}\r\n{}\r\n{b}", &spaced[..group], &spaced[group..]),
            format!("{}\n{}, {b}", &spaced[..group + 2], &spaced[group + 2..]),
        ];
        for text in &wrapped {
            let got = names(text);
            assert_eq!(got.first(), Some(&ok(1, "Mira")), "{text}: {got:?}");
            assert_eq!(
                got.iter().filter(|x| x.1.is_ok()).count(),
                2,
                "{text}: {got:?}"
            );
        }
        // Cut into more lines than WRAP_LINES: not read (each line is reported).
        let chars: Vec<char> = a.chars().collect();
        let many: Vec<String> = chars
            .chunks((a.len() / (WRAP_LINES + 1)).max(1))
            .map(|c| c.iter().collect())
            .collect();
        assert!(many.len() > WRAP_LINES);
        assert!(names(&many.join("\n")).iter().all(|x| x.1.is_err()));
        assert_eq!(names(&many[..WRAP_LINES].join("\n")).len(), WRAP_LINES);
        // A damaged code wrapped (one character changed) is one code to look at, on its first
        // line, and the code after it still reads.
        let at = a.len() - 3;
        let swap = if &a[at..=at] == "7" { "8" } else { "7" };
        let damaged = format!("{}{swap}{}", &a[..at], &a[at + 1..]);
        let got = names(&format!(
            "{}\n{}\n{b}",
            &damaged[..at_dash],
            &damaged[at_dash..]
        ));
        assert_eq!(got.len(), 2, "{got:?}");
        let as_read = format!("{} {}", &damaged[..at_dash], &damaged[at_dash..]);
        assert_eq!(got[0], (1, Err(as_read)), "{got:?}");
        assert_eq!(got[1], ok(3, "Tomas"));
        // A code cut short before a line of chat keeps the chat apart, whatever its length.
        for chat in ["thank you", "see you on Tuesday at the Circle", "ok 12th"] {
            let got = names(&format!("{}\n{chat}", &a[..a.len() - 6]));
            assert_eq!(got.len(), 2, "{chat}: {got:?}");
            assert_eq!(got[1].0, 2, "{chat}: {got:?}");
        }
        // A damaged code at the end of a line is not joined to the whole code that starts the
        // next: it is reported, and the next line's code reads.
        let cut = &a[..a.len() - 3];
        assert_eq!(
            names(&format!("{cut}\n{b}")),
            vec![(1, Err(cut.to_string())), ok(2, "Tomas")]
        );
        // Only the next line is read on into: a blank line between ends the code.
        let got = names(&format!("{}\n\n{}", &a[..12], &a[12..]));
        assert!(got.iter().all(|x| x.1.is_err()), "{got:?}");
    }

    #[test]
    fn words_around_the_codes_are_not_called_damaged_codes() {
        let s = set();
        let a = code(&s, "Mira", &[Attempt::Clean]);
        let mut table = ClassTable::new(&s);
        let text =
            format!("Codes from the Harbour Street Circle: {a} (Mira)\nThanks! See you at 9pm");
        let added = table.add(&text);
        assert_eq!(added.new_students, 1);
        assert!(!added.notices.is_empty());
        for n in &added.notices {
            assert_eq!(n.problem, Problem::NotACode, "{n}");
            assert!(n.to_string().ends_with("not a result code; skipped"), "{n}");
        }
        // A chat's date and time are words too; a group of code characters with a digit and a
        // letter could be a damaged code, and is reported as one.
        let added = table.add("[02/12/2026 21:14] Tomas Reyne: thanks 12th\n0B5G-X7SV");
        assert_eq!(added.notices.len(), 2, "{:?}", added.notices);
        assert_eq!(added.notices[0].problem, Problem::NotACode);
        assert!(matches!(added.notices[1].problem, Problem::Unreadable(_)));
        assert_eq!(added.notices[1].text, "0B5G-X7SV");
        // A greeting before a damaged code on its line: the code's own error is given, not one
        // read from the greeting's letters (here, a code header of a newer version).
        let mut damaged = a.clone();
        let last = damaged.pop().unwrap();
        damaged.push(if last == '7' { '8' } else { '7' });
        let added = table.add(&format!("Levi here {damaged}"));
        assert_eq!(added.notices.len(), 1, "{:?}", added.notices);
        assert_eq!(
            added.notices[0].problem,
            Problem::Unreadable(ResultError::Damaged)
        );
    }

    #[test]
    fn a_report_quotes_the_text_as_it_was_written() {
        let s = set();
        let a = code(&s, "Mira", &[Attempt::Clean]);
        let mut table = ClassTable::new(&s);
        // An apostrophe, a comma's other side and an exclamation inside the skipped words are
        // kept; the punctuation around them (the quote, the colon before the code) is not.
        let text = format!("“Here’s mine, from the café:” {a}\nThanks!! See you on Tuesday :)");
        let added = table.add(&text);
        assert_eq!(added.new_students, 1);
        let quoted: Vec<&str> = added.notices.iter().map(|n| n.text.as_str()).collect();
        assert_eq!(
            quoted,
            [
                "Here’s mine",
                "from the café",
                "Thanks!! See you on Tuesday"
            ]
        );
        assert!(added.notices.iter().all(|n| n.problem == Problem::NotACode));
        assert_eq!(
            added.notices[0].to_string(),
            "line 1, ‘Here’s mine’: not a result code; skipped"
        );
        // Invisible characters and direction marks are left out of the quote, and a long text
        // is cut at 40 characters.
        let added = table.add("see\u{200b}you \u{202e}tuesday\u{202c}\u{feff} \u{7}ok");
        assert_eq!(added.notices[0].text, "seeyou tuesday ok");
        let added = table.add(&"ab cd ".repeat(20));
        assert_eq!(
            added.notices[0].text,
            format!("{}…", &"ab cd ".repeat(7)[..40])
        );
        // A damaged code wrapped over two lines is quoted from both, as written.
        let mut damaged = a.clone();
        let last = damaged.pop().unwrap();
        damaged.push(if last == '7' { '8' } else { '7' });
        let cut = damaged.len() / 2;
        let wrapped = format!("{}\r\n{}", &damaged[..cut], &damaged[cut..]);
        let found = find_codes(&wrapped);
        assert_eq!(found.len(), 1, "{found:?}");
        assert_eq!(
            found[0].said,
            format!("{} {}", &damaged[..cut], &damaged[cut..])
        );
        // A code read is quoted as written too: in lower case, its groups typed apart.
        let typed = a.to_lowercase().replace('-', " ");
        let found = find_codes(&format!("({typed})"));
        assert!(found[0].code.is_ok());
        assert_eq!(found[0].said, typed);
        assert_eq!(found[0].text, a.to_lowercase().replace('-', " "));
    }

    #[test]
    fn a_code_in_a_chat_reads_with_the_punctuation_around_it() {
        let s = set();
        let a = code(&s, "Mira", &[Attempt::Clean]);
        let dashed = a.replace('-', "\u{2013}");
        for text in [
            format!("{a}."),
            format!("({a})"),
            format!("\"{a}\"!"),
            format!("“{a}”"),
            format!("Mira:{a}"),
            format!("Ines: {a}. Sorry, only did one"),
            format!("{a}\u{200B}"),
            format!("\u{FEFF}{dashed}"),
        ] {
            let mut table = ClassTable::new(&s);
            let added = table.add(&text);
            assert_eq!(added.new_students, 1, "{text}: {:?}", added.notices);
            assert!(
                added.notices.iter().all(|n| n.problem == Problem::NotACode),
                "{text}: {:?}",
                added.notices
            );
        }
    }

    #[test]
    fn a_students_codes_count_in_the_order_they_carry_on_whatever_the_pasting_order() {
        let s = set();
        let n = s.puzzles.len();
        assert!(n >= 2);
        // At 19:00 Tomas failed puzzle 1 and stopped; at 21:00 he had solved it (helped, after
        // the failure) and puzzle 2 cleanly.
        let evening = code(&s, "Tomas", &[Attempt::Failed]);
        let night = code(&s, "Tomas", &[Attempt::Helped, Attempt::Clean]);
        let solved = |t: &ClassTable| t.students()[0].solved();
        let mut table = ClassTable::new(&s);
        let added = table.add(&format!("{night}\n{evening}"));
        assert_eq!((added.new_students, added.replaced), (1, 0));
        assert_eq!(
            added.notices[0].problem,
            Problem::Earlier {
                name: "Tomas".into()
            }
        );
        assert_eq!(solved(&table), 2, "the later code stays");
        let mut table = ClassTable::new(&s);
        let added = table.add(&format!("{evening}\n{night}"));
        assert_eq!((added.new_students, added.replaced), (1, 1));
        assert!(matches!(
            added.notices[0].problem,
            Problem::Replaced { later: true, .. }
        ));
        assert_eq!(solved(&table), 2);
        // The same attempt with more hint steps carries on from fewer, not the other way.
        let hinted = |hints: u8| {
            let results: Vec<PuzzleResult> = (0..n)
                .map(|i| match i {
                    0 => PuzzleResult::new(Attempt::Failed, hints, TimeBucket::Under2Min),
                    _ => PuzzleResult::new(Attempt::Untried, 0, TimeBucket::NotTimed),
                })
                .collect();
            result::encode(result::fingerprint(&s), "Ines", &results).unwrap()
        };
        let mut ines = ClassTable::new(&s);
        let added = ines.add(&format!("{}\n{}", hinted(3), hinted(1)));
        assert_eq!(
            added.notices[0].problem,
            Problem::Earlier {
                name: "Ines".into()
            }
        );
        assert_eq!(ines.students()[0].results[0].hints, Some(3));
        // Codes from two devices: neither carries on from the other, and the later read wins.
        let other = code(&s, "Tomas", &[Attempt::Clean, Attempt::Failed]);
        let added = table.add(&other);
        assert!(matches!(
            added.notices[0].problem,
            Problem::Replaced { later: false, .. }
        ));
        assert_eq!(solved(&table), 1);
    }

    #[test]
    fn every_damaged_code_is_reported_as_one_whatever_went_wrong() {
        let s = set();
        let mut table = ClassTable::new(&s);
        let a = code(&s, "Ines", &[Attempt::Helped]);
        let mut texts = Vec::new();
        for (i, c) in a.char_indices().filter(|&(_, c)| c != '-') {
            // Dropped, and changed to every other character a code may hold.
            texts.push(format!("{}{}", &a[..i], &a[i + 1..]));
            for d in "0123456789ABCDEFGHJKMNPQRSTVWXYZU"
                .chars()
                .filter(|&d| d != c)
            {
                texts.push(format!("{}{d}{}", &a[..i], &a[i + 1..]));
            }
        }
        for text in texts.iter().flat_map(|t| [t.clone(), t.replace('-', " ")]) {
            let added = table.add(&text);
            assert_eq!(added.new_students, 0, "{text}");
            assert!(
                added
                    .notices
                    .iter()
                    .all(|n| matches!(n.problem, Problem::Unreadable(_))),
                "{text}: {:?}",
                added.notices
            );
        }
    }

    #[test]
    fn the_latest_code_of_a_student_counts_and_nobody_is_lost() {
        let s = set();
        let mut table = ClassTable::new(&s);
        let first = code(&s, "Mira", &[Attempt::Failed]);
        let again = code(&s, "mira ", &[Attempt::Helped]);
        let tomas = code(&s, "Tomas", &[Attempt::Clean]);
        let added = table.add(&format!("{first}\n{tomas}\n{first}"));
        assert_eq!((added.new_students, added.replaced), (2, 0));
        assert_eq!(
            added.notices[0].problem,
            Problem::Repeated {
                name: "Mira".into()
            }
        );
        let added = table.add(&again);
        assert_eq!((added.new_students, added.replaced), (0, 1));
        assert!(added.notices[0]
            .to_string()
            .contains("a result for mira with more done than the table's; it takes its place"));
        // Both students are still there; Mira's row now holds the newer results.
        let rows = table.students();
        assert_eq!(rows.len(), 2);
        assert_eq!(rows[0].results[0].attempt, Attempt::Helped);
        assert_eq!(rows[1].name, "Tomas");
        // A code for another set, and one for a set of another length, are refused.
        let mut other = s.clone();
        other.puzzles[0].rating += 1;
        let added = table.add(&code(&other, "Ines", &[Attempt::Clean]));
        assert!(matches!(added.notices[0].problem, Problem::OtherSet { .. }));
        let short = result::encode(result::fingerprint(&s), "Ines", &[]).unwrap();
        let added = table.add(&short);
        assert!(matches!(
            added.notices[0].problem,
            Problem::WrongLength { .. }
        ));
        assert_eq!(table.students().len(), 2);
        // Codes with no name are rows of their own, numbered among themselves, whatever line
        // they are read from.
        let nameless = code(&s, "", &[Attempt::Clean]);
        table.add(&format!("\n\n{nameless}"));
        table.add(&format!("{nameless}\n{}", code(&s, "", &[Attempt::Failed])));
        let names: Vec<&str> = table.students().iter().map(|r| r.name.as_str()).collect();
        assert_eq!(names[2..], ["(no name 1)", "(no name 2)", "(no name 3)"]);
        // Sorted by name, they keep their numbers' order past nine.
        table.add(&[nameless.as_str(); 8].join("\n"));
        let sorted: Vec<String> = table.sorted(SortBy::Name)[..11]
            .iter()
            .map(|r| r.name.clone())
            .collect();
        let numbered: Vec<String> = (1..=11).map(|n| format!("(no name {n})")).collect();
        assert_eq!(sorted, numbered);
    }

    #[test]
    fn rows_sort_by_name_and_score_and_the_rates_add_up() {
        let s = set();
        let mut table = ClassTable::new(&s);
        let n = s.puzzles.len();
        let all = vec![Attempt::Clean; n];
        table.add(&code(&s, "bea", &[Attempt::Failed]));
        table.add(&code(&s, "Ana", &[Attempt::Helped]));
        table.add(&code(&s, "Caro", &all));
        let names = |by| {
            table
                .sorted(by)
                .iter()
                .map(|s| s.name.clone())
                .collect::<Vec<_>>()
        };
        assert_eq!(names(SortBy::Added), ["bea", "Ana", "Caro"]);
        assert_eq!(names(SortBy::Name), ["Ana", "bea", "Caro"]);
        // Numbers in names go by their value (common practice in lists of names and files).
        use std::cmp::Ordering::*;
        for (a, b, order) in [
            ("(no name 2)", "(no name 10)", Less),
            ("table 9", "table 10", Less),
            ("table 010", "table 9", Greater),
            ("table 09", "table 9", Greater),
            ("a2b", "a2c", Less),
            ("ana", "ana 1", Less),
            ("ana", "ana", Equal),
            ("ä1", "a1", Greater),
        ] {
            assert_eq!(by_numbers(a, b), order, "{a} against {b}");
            assert_eq!(by_numbers(b, a), order.reverse(), "{b} against {a}");
        }
        assert_eq!(names(SortBy::Score), ["Caro", "Ana", "bea"]);
        let first = table.stats()[0];
        // Puzzle 1: Ana (helped) and Caro (clean) solved it, bea failed: 2 of 3 is 67 %.
        assert_eq!((first.solved, first.clean, first.tried), (2, 1, 3));
        assert_eq!(first.percent(), Some(67));
    }

    /// Parses CSV with an independent reader (the `csv` crate, which reads RFC 4180).
    fn read_csv(text: &str) -> Vec<Vec<String>> {
        csv::ReaderBuilder::new()
            .has_headers(false)
            .from_reader(text.as_bytes())
            .records()
            .map(|r| r.unwrap().iter().map(str::to_string).collect())
            .collect()
    }

    #[test]
    fn csv_follows_the_examples_of_rfc_4180() {
        // RFC 4180, section 2, rule 1: records end in CRLF ("aaa,bbb,ccc CRLF").
        let mut out = String::new();
        csv_record(&mut out, &["aaa", "bbb", "ccc"]);
        csv_record(&mut out, &["zzz", "yyy", "xxx"]);
        assert_eq!(out, "aaa,bbb,ccc\r\nzzz,yyy,xxx\r\n");
        // Rule 6: a field with a line break is quoted ("aaa","b CRLF bb","ccc"; quoting the
        // other fields is optional, and we quote only what needs it).
        let mut out = String::new();
        csv_record(&mut out, &["aaa", "b\r\nbb", "ccc"]);
        assert_eq!(out, "aaa,\"b\r\nbb\",ccc\r\n");
        // Rule 7: a quote inside a quoted field is doubled ("aaa","b""bb","ccc").
        let mut out = String::new();
        csv_record(&mut out, &["aaa", "b\"bb", "ccc"]);
        assert_eq!(out, "aaa,\"b\"\"bb\",ccc\r\n");
        // Rule 4 and 6: commas inside a field are quoted; spaces are part of a field.
        assert_eq!(csv_field("Quay, Tomas"), "\"Quay, Tomas\"");
        assert_eq!(csv_field(" Ines "), " Ines ");
        // The independent reader gets the fields back.
        let mut out = String::new();
        csv_record(&mut out, &["aaa", "b\"bb", "c,c", "d\r\ndd", "e\nee"]);
        assert_eq!(
            read_csv(&out),
            [["aaa", "b\"bb", "c,c", "d\r\ndd", "e\nee"]]
        );
    }

    #[test]
    fn cells_that_a_spreadsheet_would_run_are_made_text() {
        // OWASP, "CSV Injection": cells that begin with =, +, -, @, tab or carriage return
        // are prefixed with a single quote.
        for (cell, written) in [
            ("=1+2", "'=1+2"),
            ("+1", "'+1"),
            ("-2+3", "'-2+3"),
            ("@SUM(A1)", "'@SUM(A1)"),
            ("\tx", "'\tx"),
            ("\rx", "\"'\rx\""),
            (
                "=HYPERLINK(\"x\",\"y\")",
                "\"'=HYPERLINK(\"\"x\"\",\"\"y\"\")\"",
            ),
            ("Mira=1", "Mira=1"),
        ] {
            assert_eq!(csv_field(cell), written, "{cell:?}");
        }
    }

    #[test]
    fn the_table_as_csv_reads_back_cell_by_cell() {
        let s = set();
        let n = s.puzzles.len();
        let mut table = ClassTable::new(&s);
        table.add(&code(&s, "=cmd|' /C calc'!A0", &[Attempt::Clean]));
        table.add(&code(
            &s,
            "Quay, \"Tom\"",
            &[Attempt::Failed, Attempt::Helped],
        ));
        let text = table.to_csv(SortBy::Name);
        assert!(text.ends_with("\r\n") && !text.replace("\r\n", "").contains('\n'));
        let rows = read_csv(&text);
        assert_eq!(rows.len(), 4);
        assert_eq!(rows[0][..4], ["Student", "Solved", "Clean", "Puzzle 1"]);
        assert_eq!(rows[0].len(), 3 + n);
        // By name: the guarded name sorts by its own text, '=' before 'Q'.
        assert_eq!(rows[1][0], "'=cmd|' /C calc'!A0");
        assert_eq!(rows[1][1..4], ["1", "1", "clean, under 2 min"]);
        assert_eq!(rows[2][0], "Quay, \"Tom\"");
        assert_eq!(
            rows[2][3..5],
            ["failed, under 2 min", "helped, 1 hint, under 2 min"]
        );
        assert_eq!(rows[3][0], "Solved by");
        assert_eq!(rows[3][3], "1 of 2 (50%)");
        assert!(rows.iter().all(|r| r.len() == 3 + n));
    }
}

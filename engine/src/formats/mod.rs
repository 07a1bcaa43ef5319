//! File formats and codes that travel outside the program: the set file, share codes (a set in
//! a link or a QR code), result codes (a student's results), the class table read from pasted
//! result codes and its CSV, the QR code of a link, the printable sheet, and the player's own
//! game records (move lists and SGF).
//!
//! Each reader takes text and returns a typed error that says where the text is wrong. Each is
//! linear in its input and checks the [`limits`] before it allocates for what the input claims;
//! each writer checks a set with [`setfile::check`] first, so that nothing is written that its
//! reader would refuse.

use std::borrow::Cow;

mod bits;
pub mod class;
pub mod games;
pub mod limits;
pub mod qr;
pub mod result;
pub mod setfile;
pub mod sgf;
pub mod share;
pub mod sheet;

/// Text from outside (a title, a name) without the characters that change the direction of
/// the text around them: the embeddings, overrides and isolates, and the direction marks
/// (Unicode's bidirectional formatting characters, UAX #9, table 1). Shown in the app's own
/// sentences, a title that starts with a right-to-left override would turn the rest of the
/// sentence round ("Added ".thginoT ot ..."); letters of a right-to-left alphabet stay.
pub fn plain(text: &str) -> Cow<'_, str> {
    if text.contains(turns_direction) {
        Cow::Owned(text.chars().filter(|&c| !turns_direction(c)).collect())
    } else {
        Cow::Borrowed(text)
    }
}

/// Whether a character is one of UAX #9's bidirectional formatting characters (see
/// [`plain`]).
pub(crate) fn turns_direction(c: char) -> bool {
    matches!(c, '\u{61c}' | '\u{200e}' | '\u{200f}' | '\u{202a}'..='\u{202e}' | '\u{2066}'..='\u{2069}')
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn plain_text_keeps_letters_of_every_direction_and_drops_the_controls() {
        // The controls of UAX #9's table 1, each at either end and in the middle.
        for c in [
            '\u{61c}', '\u{200e}', '\u{200f}', '\u{202a}', '\u{202b}', '\u{202c}',
        ]
        .into_iter()
        .chain([
            '\u{202d}', '\u{202e}', '\u{2066}', '\u{2067}', '\u{2068}', '\u{2069}',
        ]) {
            assert_eq!(
                plain(&format!("{c}Mira{c}Okafor{c}")),
                "MiraOkafor",
                "{:x}",
                c as u32
            );
        }
        assert!(matches!(
            plain("Harbour Street"),
            Cow::Borrowed("Harbour Street")
        ));
        assert_eq!(plain("מירה Okafor"), "מירה Okafor");
    }

    #[test]
    fn titles_and_names_arrive_without_direction_controls() {
        let json = include_str!("../../../tests/data/fixture_set.json")
            .replace("\"title\": \"Fixture", "\"title\": \"\\u202eFixture");
        let set = setfile::parse(&json).unwrap();
        assert!(set.title.starts_with("Fixture"), "{}", set.title);
        // A share code made of a title with the control (as an older version wrote it).
        let mut raw = set.clone();
        raw.title = format!("\u{202e}{}", set.title);
        let shared = share::decode(&share::encode(&raw).unwrap()).unwrap();
        assert_eq!(shared.title, set.title);
        // A result code never carries one, and one that does is read without it.
        let key = result::fingerprint(&set);
        let code = result::encode(key, "\u{202e}Mira Okafor\u{202c}", &[]).unwrap();
        assert_eq!(result::decode(&code).unwrap().name, "Mira Okafor");
        // Game records: an SGF player's name and a move list's title.
        let sgf = "(;FF[4]GM[4]SZ[15]PB[\u{202e}Ines Varga];B[hh])";
        let loaded = sgf::read_sgf(sgf.as_bytes(), games::Choices::default()).unwrap();
        assert_eq!(loaded.games[0].info().black.as_deref(), Some("Ines Varga"));
        let lists = games::read_move_lists(
            "# \u{202e}Harbour Street, round 3\nh8 h9 i8",
            games::Choices::default(),
        )
        .unwrap();
        assert_eq!(
            lists[0].info().title.as_deref(),
            Some("Harbour Street, round 3")
        );
    }
}

//! The vocabulary the other modules share: the stone colours and the rules. Everything above
//! it (the board, the rules' decisions, notation, the search) imports these two types from
//! here, so that the bottom layers depend on each other in one direction only.

use std::fmt;
use std::str::FromStr;

/// A stone colour.
#[derive(Clone, Copy, PartialEq, Eq, Hash, Debug, PartialOrd, Ord)]
pub enum Stone {
    /// Black, who moves first.
    Black,
    /// White.
    White,
}

impl Stone {
    /// Both colours, black first.
    pub const ALL: [Stone; 2] = [Stone::Black, Stone::White];

    /// The other colour.
    #[inline]
    pub const fn opponent(self) -> Stone {
        match self {
            Stone::Black => Stone::White,
            Stone::White => Stone::Black,
        }
    }

    /// 0 for black, 1 for white.
    #[inline]
    pub const fn index(self) -> usize {
        self as usize
    }

    /// `"black"` or `"white"`.
    pub const fn name(self) -> &'static str {
        match self {
            Stone::Black => "black",
            Stone::White => "white",
        }
    }

    /// The cell value of this colour on the board's grid (0 is empty).
    #[inline]
    pub(crate) const fn cell(self) -> u8 {
        self as u8 + 1
    }
}

/// A colour serialises as its name, `"black"` or `"white"`.
impl serde::Serialize for Stone {
    fn serialize<S: serde::Serializer>(&self, s: S) -> Result<S::Ok, S::Error> {
        s.serialize_str(self.name())
    }
}

/// And reads back from its name (a name that does not parse is the reader's error).
impl<'de> serde::Deserialize<'de> for Stone {
    fn deserialize<D: serde::Deserializer<'de>>(d: D) -> Result<Self, D::Error> {
        let name = String::deserialize(d)?;
        name.trim().parse().map_err(serde::de::Error::custom)
    }
}

impl fmt::Display for Stone {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(self.name())
    }
}

/// Text that is neither `black` nor `white`.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct StoneParseError(pub String);

impl fmt::Display for StoneParseError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        write!(f, "'{}' is not black or white", self.0)
    }
}

impl std::error::Error for StoneParseError {}

impl FromStr for Stone {
    type Err = StoneParseError;
    /// `black` or `white`, as [`Stone::name`] writes them.
    fn from_str(s: &str) -> Result<Stone, StoneParseError> {
        match s {
            "black" => Ok(Stone::Black),
            "white" => Ok(Stone::White),
            _ => Err(StoneParseError(s.to_string())),
        }
    }
}

/// A rule set.
#[derive(Clone, Copy, PartialEq, Eq, Hash, Debug)]
pub enum Rule {
    /// Five or more in a row wins.
    Freestyle,
    /// Exactly five in a row wins, for both colours.
    Standard,
    /// The International Rules of Renju (RIF 1996/1998).
    Renju,
}

impl Rule {
    /// All rules.
    pub const ALL: [Rule; 3] = [Rule::Freestyle, Rule::Standard, Rule::Renju];

    /// Whether colour `c` wins only with exactly five (an overline does not count).
    #[inline]
    pub const fn exact_five(self, c: Stone) -> bool {
        match self {
            Rule::Freestyle => false,
            Rule::Standard => true,
            Rule::Renju => matches!(c, Stone::Black),
        }
    }

    /// Whether colour `c` has forbidden points under this rule.
    #[inline]
    pub const fn has_forbidden(self, c: Stone) -> bool {
        matches!((self, c), (Rule::Renju, Stone::Black))
    }

    /// `"freestyle"`, `"standard"` or `"renju"`.
    pub const fn name(self) -> &'static str {
        match self {
            Rule::Freestyle => "freestyle",
            Rule::Standard => "standard",
            Rule::Renju => "renju",
        }
    }
}

/// A rule serialises as its name, like `"renju"`.
impl serde::Serialize for Rule {
    fn serialize<S: serde::Serializer>(&self, s: S) -> Result<S::Ok, S::Error> {
        s.serialize_str(self.name())
    }
}

impl fmt::Display for Rule {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(self.name())
    }
}

/// Text that names no rule.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct RuleParseError(pub String);

impl fmt::Display for RuleParseError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        write!(
            f,
            "unknown rule '{}' (expected freestyle, standard or renju)",
            self.0
        )
    }
}

impl std::error::Error for RuleParseError {}

impl FromStr for Rule {
    type Err = RuleParseError;
    fn from_str(s: &str) -> Result<Rule, RuleParseError> {
        match s.to_ascii_lowercase().as_str() {
            "freestyle" => Ok(Rule::Freestyle),
            "standard" => Ok(Rule::Standard),
            "renju" => Ok(Rule::Renju),
            _ => Err(RuleParseError(s.to_string())),
        }
    }
}

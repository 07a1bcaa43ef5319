//! File formats and codes that travel outside the program: the set file, the printable sheet,
//! and the player's own game records (move lists and SGF). Each reader takes text and returns
//! a typed error that says where the text is wrong.

pub mod games;
pub mod result;
pub mod setfile;
pub mod sgf;
pub mod share;
pub mod sheet;

//! File formats and codes that travel outside the program: the set file, share codes (a set in
//! a link or a QR code), result codes (a student's results), the class table read from pasted
//! result codes and its CSV, the QR code of a link, the printable sheet, and the player's own
//! game records (move lists and SGF).
//!
//! Each reader takes text and returns a typed error that says where the text is wrong. Each is
//! linear in its input and checks the [`limits`] before it allocates for what the input claims;
//! each writer checks a set with [`setfile::check`] first, so that nothing is written that its
//! reader would refuse.

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

//! File formats and codes that travel outside the program: the set file and the printable
//! sheet. Each reader takes text and returns a typed error that says where the text is wrong.

mod bits;
pub mod class;
pub mod limits;
pub mod qr;
pub mod result;
pub mod setfile;
pub mod share;
pub mod sheet;

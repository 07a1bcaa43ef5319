//! `fivefold share`: the link (or bare code) that hands a set out, and its QR code; and the
//! hidden `fivefold qr-versions`, which measures the QR version of sets' links.

use clap::builder::RangedU64ValueParser;
use clap::Args;
use engine::formats::setfile::PuzzleSet;
use engine::formats::{limits, qr, share};

use crate::generate::read_set;
use crate::out;

#[derive(Args)]
pub struct ShareArgs {
    /// The set file.
    pub set: String,
    /// The address where your club hosts Fivefold's files (the page students open), for
    /// example https://harbour-street.example/fivefold/. The link is this address, then
    /// "#set=", then the code. Without it the bare share code is printed, which students can
    /// paste into Fivefold's "open a set" box.
    #[arg(long)]
    pub base: Option<String>,
    /// Also write the QR code of the link (or of the bare code) to this SVG file.
    #[arg(long, value_name = "OUT.svg")]
    pub qr: Option<String>,
}

/// The link of a set, or its bare code when there is no base address.
fn link_or_code(set: &PuzzleSet, base: Option<&str>) -> Result<String, String> {
    let code = share::encode(set).map_err(|e| format!("this set cannot be shared: {e}"))?;
    Ok(match base {
        Some(base) => share::link(base, &code),
        None => code,
    })
}

pub fn run(args: &ShareArgs) -> Result<(), String> {
    let set = read_set(&args.set)?;
    let text = link_or_code(&set, args.base.as_deref())?;
    if let Some(path) = &args.qr {
        // The image is written before the link is printed, so a reader of standard output
        // that stops early does not stop the image from being written.
        let code = qr::encode(&text).map_err(|e| e.to_string())?;
        out::write_file(path, code.to_svg(60).as_bytes())?;
        out::note(&format!(
            "wrote the QR code to {path} (QR version {}, error correction level M, {}x{} \
             modules)",
            code.version(),
            code.size(),
            code.size()
        ));
    }
    if args.base.is_none() {
        out::note(
            "no --base given: this is the bare share code; pass --base with the address where \
             your club hosts Fivefold to get a link",
        );
    }
    out::print(&format!("{text}\n"))
}

#[derive(Args)]
pub struct QrVersionsArgs {
    /// Set files.
    pub sets: Vec<String>,
    /// Use only the first N puzzles of each set, 1 to 1000.
    #[arg(
        long,
        value_parser = RangedU64ValueParser::<usize>::new().range(1..=limits::MAX_PUZZLES as u64),
        allow_negative_numbers = true
    )]
    pub first: Option<usize>,
    /// The address part of the link.
    #[arg(long, default_value = "https://harbour-street.example/fivefold/")]
    pub base: String,
}

/// Prints one Markdown table row per set: puzzles, characters of the code, of the link, and the
/// QR version at level M of the link.
pub fn qr_versions(args: &QrVersionsArgs) -> Result<(), String> {
    let mut table = String::from(
        "| set | puzzles | code characters | link characters | QR version (M) |\n\
         | --- | ---: | ---: | ---: | ---: |\n",
    );
    for path in &args.sets {
        let mut set = read_set(path)?;
        if let Some(n) = args.first {
            set.puzzles.truncate(n);
        }
        let link = link_or_code(&set, Some(&args.base))?;
        let code = share::code_of_link(&link);
        let version = qr::encode(&link).map_err(|e| e.to_string())?.version();
        let name = std::path::Path::new(path)
            .file_stem()
            .map_or(path.clone(), |s| s.to_string_lossy().to_string());
        table += &format!(
            "| {name} | {} | {} | {} | {version} |\n",
            set.puzzles.len(),
            code.len(),
            link.len()
        );
    }
    out::print(&table)
}

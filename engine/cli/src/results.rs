//! `fivefold results`: read students' result codes against a set and print the class table,
//! optionally as CSV.

use clap::{Args, ValueEnum};
use engine::formats::class::{ClassTable, SortBy};
use engine::formats::result::{PuzzleResult, TimeBucket};
use engine::puzzle::attempt::Attempt;

use crate::generate::read_set;
use crate::out;

#[derive(Clone, Copy, ValueEnum)]
pub enum Sort {
    /// As the codes came.
    Added,
    /// By name.
    Name,
    /// By score, highest first.
    Score,
}

#[derive(Args)]
pub struct ResultsArgs {
    /// The set file the students played.
    pub set: String,
    /// A text file with the students' result codes (one per line, or separated by spaces,
    /// commas or semicolons), or - to read them from standard input.
    pub codes: String,
    /// Also write the table as CSV (RFC 4180, UTF-8) to this file, whole or not at all.
    #[arg(long, value_name = "OUT.csv")]
    pub csv: Option<String>,
    /// Order of the rows.
    #[arg(long, value_enum, default_value = "name")]
    pub sort: Sort,
}

/// A cell of the printed table: C (clean), H (helped), F (failed) or . (untried), the hint
/// steps when any, and the time bucket.
fn cell(r: &PuzzleResult) -> String {
    let mut s = match r.attempt.recorded() {
        Attempt::Clean => "C",
        Attempt::Helped => "H",
        Attempt::Untried => ".",
        _ => "F",
    }
    .to_string();
    if let Some(h) = r.hints.filter(|&h| h > 0) {
        s.push_str(&h.to_string());
    }
    let time = match r.time {
        TimeBucket::NotTimed => "",
        TimeBucket::Under30s => ":30s",
        TimeBucket::Under2Min => ":2m",
        TimeBucket::Under5Min => ":5m",
        TimeBucket::Longer => ":5m+",
    };
    if r.attempt.recorded() != Attempt::Untried {
        s.push_str(time);
    }
    s
}

pub fn run(args: &ResultsArgs) -> Result<(), String> {
    let set = read_set(&args.set)?;
    let what = "a file of result codes";
    let text = if args.codes == "-" {
        out::read_stdin(out::MAX_CODES_BYTES, what)?
    } else {
        out::read_text(&args.codes, out::MAX_CODES_BYTES, what)?
    };
    let mut table = ClassTable::new(&set);
    let added = table.add(&text);
    for notice in &added.notices {
        out::note(&format!("{}: {notice}", args.codes));
    }
    let by = match args.sort {
        Sort::Added => SortBy::Added,
        Sort::Name => SortBy::Name,
        Sort::Score => SortBy::Score,
    };
    let mut rows: Vec<Vec<String>> = Vec::new();
    let mut header = vec!["Student".to_string(), "Solved".into(), "Clean".into()];
    header.extend((1..=table.puzzles()).map(|i| i.to_string()));
    rows.push(header);
    for s in table.sorted(by) {
        let mut row = vec![
            s.name.clone(),
            s.solved().to_string(),
            s.clean().to_string(),
        ];
        row.extend(s.results.iter().map(cell));
        rows.push(row);
    }
    let mut rates = vec!["Solved by".to_string(), String::new(), String::new()];
    rates.extend(
        table
            .stats()
            .iter()
            .map(|st| st.percent().map_or(String::new(), |p| format!("{p}%"))),
    );
    rows.push(rates);
    let columns = rows[0].len();
    let widths: Vec<usize> = (0..columns)
        .map(|c| rows.iter().map(|r| r[c].chars().count()).max().unwrap_or(0))
        .collect();
    let mut text = format!("{} ({} students)\n", set.title, table.students().len());
    for r in &rows {
        let line: Vec<String> = r
            .iter()
            .zip(&widths)
            .enumerate()
            .map(|(c, (v, w))| {
                let pad = w - v.chars().count();
                if c == 0 {
                    format!("{v}{}", " ".repeat(pad))
                } else {
                    format!("{}{v}", " ".repeat(pad))
                }
            })
            .collect();
        text += line.join("  ").trim_end();
        text.push('\n');
    }
    text += "C clean, H helped, F failed, . untried; a digit counts hint steps; :30s, :2m, :5m, \
             :5m+ are times under 30 s, 2 min, 5 min and longer\n";
    // The CSV file is written before the table is printed, so a reader of standard output
    // that stops early does not stop the file from being written.
    if let Some(path) = &args.csv {
        out::write_file(path, table.to_csv(by).as_bytes())?;
        out::note(&format!("wrote the table to {path}"));
    }
    out::print(&text)?;
    if added.new_students == 0 && !added.notices.is_empty() && table.students().is_empty() {
        return Err("no result code for this set could be read".into());
    }
    Ok(())
}

//! Coach's printable sheet and class table (in the workshop module only, see `Cargo.toml`):
//! the class table is rebuilt from the result codes the page keeps with a set, so the page
//! stores only text it can show.

use engine::formats::class::{self, ClassTable, Notice, Problem, SortBy};
use engine::formats::{setfile, sheet};
use serde::Serialize;
use wasm_bindgen::prelude::*;

use crate::api::err;
use crate::boards::to_js;

/// The printable sheet of a set: one HTML page (see `engine::formats::sheet`); every text from
/// the set in it is escaped.
#[wasm_bindgen(js_name = sheetHtml)]
pub fn sheet_html(set_json: &str) -> Result<String, JsValue> {
    let set = setfile::parse(set_json).map_err(err)?;
    Ok(sheet::sheet_html(&set))
}

fn sort_by(name: &str) -> Result<SortBy, JsValue> {
    match name {
        "added" => Ok(SortBy::Added),
        "name" => Ok(SortBy::Name),
        "score" => Ok(SortBy::Score),
        _ => Err(err(format!("unknown order '{name}'"))),
    }
}

/// The table of a set with the codes kept so far (codes the table refuses are skipped: they
/// were checked when they came in).
fn table_of(set_json: &str, codes: &[String]) -> Result<ClassTable, JsValue> {
    let set = setfile::parse(set_json).map_err(err)?;
    let mut table = ClassTable::new(&set);
    table.add(&codes.join("\n"));
    Ok(table)
}

#[derive(Serialize)]
struct CellJs {
    /// The attempt's name as a code records it: untried, clean, helped or failed.
    attempt: &'static str,
    /// The cell in words: "helped, 2 hints, under 2 min".
    words: String,
}

#[derive(Serialize)]
struct StudentJs {
    name: String,
    solved: usize,
    clean: usize,
    results: Vec<CellJs>,
}

#[derive(Serialize)]
struct StatsJs {
    solved: usize,
    clean: usize,
    tried: usize,
    students: usize,
    percent: Option<usize>,
}

#[derive(Serialize)]
struct TableJs {
    puzzles: usize,
    students: Vec<StudentJs>,
    stats: Vec<StatsJs>,
}

fn table_js(table: &ClassTable, by: SortBy) -> TableJs {
    TableJs {
        puzzles: table.puzzles(),
        students: table
            .sorted(by)
            .into_iter()
            .map(|s| StudentJs {
                name: s.name.clone(),
                solved: s.solved(),
                clean: s.clean(),
                results: s
                    .results
                    .iter()
                    .map(|r| CellJs {
                        attempt: r.attempt.recorded().name(),
                        words: r.words(),
                    })
                    .collect(),
            })
            .collect(),
        stats: table
            .stats()
            .into_iter()
            .map(|st| StatsJs {
                solved: st.solved,
                clean: st.clean,
                tried: st.tried,
                students: st.students,
                percent: st.percent(),
            })
            .collect(),
    }
}

#[derive(Serialize)]
struct NoticeJs {
    line: usize,
    /// "refused", "skipped" (words around the codes), "repeated" or "replaced".
    kind: &'static str,
    /// The text as written (`class::Found::said`), shortened.
    text: String,
    /// The whole report: "line 3, ‘AB12-…’: a result for another set …".
    message: String,
}

impl NoticeJs {
    fn of(n: Notice) -> NoticeJs {
        let kind = match n.problem {
            Problem::Repeated { .. } | Problem::Earlier { .. } => "repeated",
            Problem::Replaced { .. } => "replaced",
            Problem::NotACode => "skipped",
            _ => "refused",
        };
        NoticeJs {
            line: n.line,
            kind,
            message: n.to_string(),
            text: n.text,
        }
    }
}

#[derive(Serialize)]
#[serde(rename_all = "camelCase")]
struct ReadJs {
    /// The codes from the text that changed the table, in order: to keep with the set.
    accepted: Vec<String>,
    new_students: usize,
    replaced: usize,
    notices: Vec<NoticeJs>,
    table: TableJs,
}

/// Reads pasted text (result codes, any separators) into the class table of a set that already
/// holds `codes`: `{accepted, newStudents, replaced, notices, table}`. `accepted` are the codes
/// of the text that added or replaced a student (the page keeps them after `codes`); every
/// other code is reported by line in `notices`, and nothing already in the table is lost.
/// `sort` orders the table's rows: "added", "name" or "score".
#[wasm_bindgen(js_name = classRead)]
pub fn class_read(
    set_json: &str,
    codes: Vec<String>,
    text: &str,
    sort: &str,
) -> Result<JsValue, JsValue> {
    let by = sort_by(sort)?;
    let mut table = table_of(set_json, &codes)?;
    let mut out = ReadJs {
        accepted: Vec::new(),
        new_students: 0,
        replaced: 0,
        notices: Vec::new(),
        table: table_js(&table, by),
    };
    for found in class::find_codes(text) {
        match found.code {
            Err(e) => out.notices.push(NoticeJs::of(Notice {
                line: found.line,
                text: class::shorten(&found.said),
                problem: Problem::unreadable(&found.text, e),
            })),
            Ok(_) => {
                let added = table.add(&found.text);
                if added.new_students + added.replaced > 0 {
                    out.accepted.push(found.text.clone());
                }
                out.new_students += added.new_students;
                out.replaced += added.replaced;
                out.notices.extend(added.notices.into_iter().map(|n| {
                    NoticeJs::of(Notice {
                        line: found.line,
                        text: class::shorten(&found.said),
                        ..n
                    })
                }));
            }
        }
    }
    out.table = table_js(&table, by);
    to_js(&out)
}

/// The class table of a set with its kept codes, as CSV (RFC 4180, a header row, formula
/// cells guarded; see `engine::formats::class`), rows in the order `sort`.
#[wasm_bindgen(js_name = classCsv)]
pub fn class_csv(set_json: &str, codes: Vec<String>, sort: &str) -> Result<String, JsValue> {
    let by = sort_by(sort)?;
    Ok(table_of(set_json, &codes)?.to_csv(by))
}

#[cfg(test)]
mod tests {
    use super::*;

    const SET: &str = include_str!("../../tests/data/fixture_set.json");

    fn codes_for(names: &[&str]) -> Vec<String> {
        use engine::formats::result::{self, PuzzleResult, TimeBucket};
        use engine::puzzle::attempt::Attempt;
        let set = setfile::parse(SET).unwrap();
        names
            .iter()
            .enumerate()
            .map(|(i, n)| {
                let r: Vec<PuzzleResult> = (0..set.puzzles.len())
                    .map(|k| {
                        let a = if k <= i {
                            Attempt::Clean
                        } else {
                            Attempt::Failed
                        };
                        PuzzleResult::new(a, 0, TimeBucket::Under2Min)
                    })
                    .collect();
                result::encode(result::fingerprint(&set), n, &r).unwrap()
            })
            .collect()
    }

    /// The codes kept by the page rebuild the same table as reading them all at once, and the
    /// CSV names every student.
    #[test]
    fn kept_codes_rebuild_the_table() {
        let codes = codes_for(&["Mira Okafor", "Tomas Reyne"]);
        let table = table_of(SET, &codes).unwrap();
        assert_eq!(table.students().len(), 2);
        let by_score = table_js(&table, SortBy::Score);
        assert_eq!(by_score.students[0].name, "Tomas Reyne");
        assert_eq!(by_score.students[0].solved, 2.min(table.puzzles()));
        let csv = class_csv(SET, codes.clone(), "name").unwrap();
        assert!(csv.starts_with("Student,Solved,Clean,Puzzle 1"));
        assert!(csv.find("Mira Okafor").unwrap() < csv.find("Tomas Reyne").unwrap());
    }

    #[test]
    fn every_order_the_page_asks_for_is_known() {
        for name in ["added", "name", "score"] {
            assert!(sort_by(name).is_ok(), "{name}");
        }
    }
}

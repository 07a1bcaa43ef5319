//! The printable sheet: numbered diagrams drawn as SVG with the goal under each, and the answer
//! key on a separate page. One self-contained HTML page; every text from the set (title, ids)
//! is escaped, so a set cannot inject markup.

use crate::formats::setfile::PuzzleSet;
use crate::puzzle::Puzzle;
use crate::types::Stone;

/// Escapes text for HTML element content and attribute values.
pub fn escape(s: &str) -> String {
    let mut out = String::with_capacity(s.len());
    for c in s.chars() {
        match c {
            '&' => out.push_str("&amp;"),
            '<' => out.push_str("&lt;"),
            '>' => out.push_str("&gt;"),
            '"' => out.push_str("&quot;"),
            '\'' => out.push_str("&#39;"),
            _ => out.push(c),
        }
    }
    out
}

const CELL: f64 = 14.0;
const PAD: f64 = 16.0;

/// One diagram as an SVG element: grid, edge coordinates, stones.
pub fn diagram_svg(p: &Puzzle) -> String {
    let n = p.size as usize;
    let side = PAD * 2.0 + CELL * (n as f64 - 1.0);
    let at = |i: usize| PAD + CELL * i as f64;
    let mut s = format!(
        "<svg xmlns=\"http://www.w3.org/2000/svg\" viewBox=\"0 0 {side} {side}\" class=\"board\" role=\"img\" aria-label=\"{}\">",
        escape(&crate::words::goal(p))
    );
    s.push_str(&format!(
        "<rect x=\"0\" y=\"0\" width=\"{side}\" height=\"{side}\" fill=\"#fff\"/>"
    ));
    for i in 0..n {
        let (a, b) = (at(0), at(n - 1));
        let c = at(i);
        s.push_str(&format!(
            "<line x1=\"{a}\" y1=\"{c}\" x2=\"{b}\" y2=\"{c}\"/><line x1=\"{c}\" y1=\"{a}\" x2=\"{c}\" y2=\"{b}\"/>"
        ));
        // Column letters along the bottom, row numbers up the left.
        s.push_str(&format!(
            "<text x=\"{c}\" y=\"{}\" class=\"c\">{}</text>",
            side - 3.0,
            (b'a' + i as u8) as char
        ));
        s.push_str(&format!(
            "<text x=\"6\" y=\"{}\" class=\"r\">{}</text>",
            at(n - 1 - i) + 2.5,
            i + 1
        ));
    }
    for (stones, colour) in [(&p.black, Stone::Black), (&p.white, Stone::White)] {
        for q in stones {
            let (x, y) = (at(q.x as usize), at(n - 1 - q.y as usize));
            let fill = if colour == Stone::Black {
                "#111"
            } else {
                "#fff"
            };
            s.push_str(&format!(
                "<circle cx=\"{x}\" cy=\"{y}\" r=\"{}\" fill=\"{fill}\" stroke=\"#111\" stroke-width=\"1\"/>",
                CELL * 0.45
            ));
        }
    }
    s.push_str("</svg>");
    s
}

fn moves(v: &[crate::geometry::Point]) -> String {
    v.iter()
        .map(|p| p.to_string())
        .collect::<Vec<_>>()
        .join(" ")
}

/// The whole sheet.
pub fn sheet_html(set: &PuzzleSet) -> String {
    let title = escape(&set.title);
    let mut s = String::new();
    s.push_str("<!doctype html>\n<html lang=\"en\"><head><meta charset=\"utf-8\">");
    s.push_str(&format!("<title>{title}</title>"));
    s.push_str(
        "<style>\
body{font-family:system-ui,sans-serif;margin:12mm;color:#111}\
h1{font-size:18pt;margin:0 0 2mm}p.meta{margin:0 0 6mm;color:#444}\
.grid{display:grid;grid-template-columns:repeat(2,1fr);gap:6mm}\
figure{margin:0;break-inside:avoid}figcaption{font-size:10pt;margin-top:1mm}\
svg.board{width:100%;max-width:85mm}svg line{stroke:#555;stroke-width:0.6}\
svg text{font-size:5px;fill:#333;text-anchor:middle}svg text.r{text-anchor:start}\
.key{break-before:page}.key ol{columns:2;font-size:10pt}.key li{margin-bottom:2mm}\
b.n{display:inline-block;min-width:6mm}\
</style></head><body>\n",
    );
    s.push_str(&format!("<h1>{title}</h1>\n"));
    s.push_str(&format!(
        "<p class=\"meta\">{} puzzles, made {}</p>\n<div class=\"grid\">\n",
        set.puzzles.len(),
        escape(&set.created)
    ));
    for (i, p) in set.puzzles.iter().enumerate() {
        s.push_str(&format!(
            "<figure>{}<figcaption><b class=\"n\">{}.</b> {} <small>({}, {})</small></figcaption></figure>\n",
            diagram_svg(p),
            i + 1,
            escape(&crate::words::goal(p)),
            p.rule,
            escape(&p.id)
        ));
    }
    s.push_str("</div>\n<section class=\"key\"><h1>Answers</h1><ol>\n");
    for p in &set.puzzles {
        let label = match p.goal() {
            crate::puzzle::Goal::Win => "Correct first moves",
            crate::puzzle::Goal::Defend => "Defences",
        };
        let line_label = match p.goal() {
            crate::puzzle::Goal::Win => "Main line",
            crate::puzzle::Goal::Defend => "The threat",
        };
        s.push_str(&format!(
            "<li>{label}: <b>{}</b>. {line_label}: {}.</li>\n",
            moves(&p.first_moves),
            moves(&p.line)
        ));
    }
    s.push_str("</ol></section>\n</body></html>\n");
    s
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn markup_in_titles_is_escaped() {
        assert_eq!(
            escape("<img src=x onerror=alert(1)>"),
            "&lt;img src=x onerror=alert(1)&gt;"
        );
        let set = PuzzleSet {
            title: "<script>x</script>".into(),
            created: "2026-12-01".into(),
            puzzles: vec![],
            generator: None,
        };
        let html = sheet_html(&set);
        assert!(!html.contains("<script>"));
        assert!(html.contains("&lt;script&gt;"));
    }
}

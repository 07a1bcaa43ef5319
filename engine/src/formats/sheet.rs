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

/// The distance between grid lines, in the diagram's own units.
const CELL: usize = 20;

/// The printed width of a diagram, in millimetres: two fit side by side on A4 and on Letter
/// (186 and 192 mm between 12 mm margins, less a 6 mm gap).
pub const DIAGRAM_MM: usize = 80;

/// The size of the coordinate labels in the diagram's units for a board of side `n`: the
/// smallest whole number that prints at least 3 mm (8.5 pt) high when the diagram is
/// [`DIAGRAM_MM`] wide. Around the grid the diagram has a margin of two font sizes and half a
/// cell on each side (room for the labels beside a stone on the edge), so it is
/// `4 * font + CELL * n` units wide and a label is `font * DIAGRAM_MM / width` mm high;
/// `font * 80 >= 3 * (4 * font + CELL * n)` gives `font >= 3 * CELL * n / 68`.
fn label_size(n: usize) -> usize {
    (3 * CELL * n).div_ceil(DIAGRAM_MM - 12)
}

/// One diagram as an SVG element: grid, coordinates on the left and bottom edges, stones.
pub fn diagram_svg(p: &Puzzle) -> String {
    let n = p.size as usize;
    let font = label_size(n);
    let pad = 2 * font + CELL / 2;
    let side = 2 * pad + CELL * (n - 1);
    let at = |i: usize| pad + CELL * i;
    let mut s = format!(
        "<svg xmlns=\"http://www.w3.org/2000/svg\" viewBox=\"0 0 {side} {side}\" class=\"board\" \
         role=\"img\" aria-label=\"{}\" font-size=\"{font}\">",
        escape(&crate::words::goal(p))
    );
    s.push_str(&format!(
        "<rect x=\"0\" y=\"0\" width=\"{side}\" height=\"{side}\" fill=\"#fff\"/>"
    ));
    let (a, b) = (at(0), at(n - 1));
    for i in 0..n {
        let c = at(i);
        s.push_str(&format!(
            "<line x1=\"{a}\" y1=\"{c}\" x2=\"{b}\" y2=\"{c}\"/><line x1=\"{c}\" y1=\"{a}\" x2=\"{c}\" y2=\"{b}\"/>"
        ));
        // Column letters under the board, row numbers to its left.
        s.push_str(&format!(
            "<text x=\"{c}\" y=\"{}\" class=\"c\">{}</text>",
            b + pad - font / 3,
            (b'a' + i as u8) as char
        ));
        // Row numbers end clear of a stone on the first column (its radius is under half a
        // cell).
        s.push_str(&format!(
            "<text x=\"{}\" y=\"{}\" class=\"r\">{}</text>",
            pad - CELL / 2 - 1,
            at(n - 1 - i) + font / 3,
            i + 1
        ));
    }
    for (stones, colour) in [(&p.black, Stone::Black), (&p.white, Stone::White)] {
        let fill = if colour == Stone::Black {
            "#111"
        } else {
            "#fff"
        };
        for q in stones {
            let (x, y) = (at(q.x as usize), at(n - 1 - q.y as usize));
            s.push_str(&format!(
                "<circle cx=\"{x}\" cy=\"{y}\" r=\"{}\" fill=\"{fill}\" stroke=\"#111\" stroke-width=\"1.5\"/>",
                CELL * 9 / 20
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

/// The whole sheet: one HTML page to print. At the top the set's title and a line for the
/// student's name and the date; then the diagrams, numbered, two to a row, each with its goal
/// in words and a box for the answer; then, starting on a new page, the answer key. Nothing
/// in it names a puzzle by its id: puzzles are numbered.
pub fn sheet_html(set: &PuzzleSet) -> String {
    let title = escape(&set.title);
    let mut s = String::new();
    s.push_str("<!doctype html>\n<html lang=\"en\"><head><meta charset=\"utf-8\">");
    s.push_str(&format!("<title>{title}</title>"));
    s.push_str(&format!(
        "<style>\
@page{{margin:12mm}}\
body{{font-family:system-ui,sans-serif;margin:0;color:#111;font-size:11pt}}\
@media screen{{body{{margin:12mm}}}}\
h1{{font-size:18pt;margin:0 0 3mm}}h2{{font-size:16pt;margin:0 0 3mm}}\
p.who{{margin:0 0 6mm;font-size:12pt}}\
p.who span{{display:inline-block;width:70mm;border-bottom:1px solid #111;margin:0 6mm 0 2mm}}\
.grid{{display:grid;grid-template-columns:repeat(2,{DIAGRAM_MM}mm);gap:6mm 6mm}}\
figure{{margin:0;break-inside:avoid}}figcaption{{font-size:11pt;margin-top:1mm}}\
svg.board{{width:{DIAGRAM_MM}mm;height:{DIAGRAM_MM}mm;display:block}}\
svg line{{stroke:#555;stroke-width:1}}\
svg text{{fill:#222;text-anchor:middle;font-family:system-ui,sans-serif}}\
svg text.r{{text-anchor:end}}\
.answer{{border:1px solid #111;height:10mm;margin-top:2mm;padding:1mm 2mm;font-size:9pt;color:#444}}\
.key{{break-before:page}}.key ol{{columns:2;font-size:11pt}}.key li{{margin-bottom:2mm;break-inside:avoid}}\
b.n{{display:inline-block;min-width:6mm}}\
</style></head><body>\n"
    ));
    s.push_str(&format!("<h1>{title}</h1>\n"));
    s.push_str("<p class=\"who\">Name:<span></span>Date:<span></span></p>\n<div class=\"grid\">\n");
    for (i, p) in set.puzzles.iter().enumerate() {
        s.push_str(&format!(
            "<figure>{}<figcaption><b class=\"n\">{}.</b> {} <small>({}, {}x{})</small></figcaption>\
             <div class=\"answer\">Answer:</div></figure>\n",
            diagram_svg(p),
            i + 1,
            escape(&crate::words::goal(p)),
            p.rule,
            p.size,
            p.size
        ));
    }
    s.push_str(&format!(
        "</div>\n<section class=\"key\"><h2>Answers: {title}</h2><ol>\n"
    ));
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
    use crate::formats::setfile;

    fn library_set() -> PuzzleSet {
        setfile::parse(include_str!("../../../tests/data/fixture_set.json")).unwrap()
    }

    #[test]
    fn markup_in_titles_is_escaped() {
        assert_eq!(
            escape("<img src=x onerror=alert(1)>"),
            "&lt;img src=x onerror=alert(1)&gt;"
        );
        let mut set = library_set();
        set.title = "<script>x</script> & \"co\"".into();
        let html = sheet_html(&set);
        assert!(!html.contains("<script>"));
        assert!(html.contains("&lt;script&gt;x&lt;/script&gt; &amp; &quot;co&quot;"));
    }

    #[test]
    fn the_sheet_has_what_a_class_needs_and_no_ids() {
        let set = library_set();
        let html = sheet_html(&set);
        assert!(html.contains("Name:<span></span>Date:<span></span>"));
        assert_eq!(
            html.matches("<div class=\"answer\">").count(),
            set.puzzles.len()
        );
        for p in &set.puzzles {
            assert!(!html.contains(&p.id), "{} is on the sheet", p.id);
            assert!(html.contains(&escape(&crate::words::goal(p))));
        }
        // The key starts on its own page (CSS Fragmentation, `break-before: page`).
        let key = html.find("<section class=\"key\">").unwrap();
        assert!(html.contains(".key{break-before:page}"));
        assert!(html[key..].contains("Correct first moves") || html[key..].contains("Defences"));
        assert!(!html[..key].contains("Correct first moves"));
    }

    /// The coordinate labels print at least 8 pt high (8/72 inch, 2.82 mm: the usual smallest
    /// size for print read at arm's length, common practice) on every board size, given the
    /// printed width the style sets. Read from the SVG itself: its width in units, its font
    /// size, and the width in millimetres from the style.
    #[test]
    fn coordinates_print_at_least_8_pt() {
        let mut set = library_set();
        let html = sheet_html(&set);
        let width_mm: f64 = html
            .split("svg.board{width:")
            .nth(1)
            .unwrap()
            .split("mm")
            .next()
            .unwrap()
            .parse()
            .unwrap();
        for size in 5..=19u8 {
            let p = &mut set.puzzles[0];
            p.size = size;
            p.black.retain(|q| q.x < size && q.y < size);
            p.white.retain(|q| q.x < size && q.y < size);
            let svg = diagram_svg(p);
            let attr = |name: &str| -> f64 {
                let at = svg.find(&format!("{name}=\"")).unwrap() + name.len() + 2;
                let v = &svg[at..at + svg[at..].find('"').unwrap()];
                v.rsplit(' ').next().unwrap().parse().unwrap()
            };
            let (units, font) = (attr("viewBox"), attr("font-size"));
            let points = font * width_mm / units / 25.4 * 72.0;
            assert!(points >= 8.0, "{size}x{size}: {points:.2} pt");
            // Every column letter and row number is on the diagram.
            assert_eq!(svg.matches("class=\"c\"").count(), size as usize);
            assert_eq!(svg.matches("class=\"r\"").count(), size as usize);
        }
    }
}

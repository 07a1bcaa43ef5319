//! `fivefold plot`: a picture of how the difficulty estimate follows line length over set
//! files, as one SVG file (rating up, attacker moves before the winning one across, a mark
//! per puzzle, one shape and colour per goal kind, and the mean rating at every length).

use std::collections::BTreeMap;
use std::fmt::Write as _;

use clap::Args;
use engine::puzzle::deep::moves_before_win;
use engine::puzzle::Theme;

use crate::generate::read_set;
use crate::out;

#[derive(Args)]
pub struct PlotArgs {
    /// The set files.
    #[arg(required = true)]
    pub files: Vec<String>,
    /// Output SVG file, written whole or not at all.
    #[arg(long)]
    pub out: String,
}

/// The groups of the picture: name, colour, and which themes they hold.
const GROUPS: [(&str, &str, &[Theme]); 4] = [
    (
        "lines of fours (four-three, vcf, forbidden-point themes)",
        "#1f5fa8",
        &[
            Theme::FourThree,
            Theme::Vcf,
            Theme::ForbiddenTrap,
            Theme::ForbiddenWin,
        ],
    ),
    ("threats (vct)", "#c2571a", &[Theme::Vct]),
    (
        "defences (the threat's length)",
        "#2f8a4c",
        &[Theme::Defend],
    ),
    ("mean rating at that length", "#222222", &[]),
];

pub fn run(args: &PlotArgs) -> Result<(), String> {
    let mut points: Vec<(usize, u16, u32)> = Vec::new();
    for f in &args.files {
        let set = read_set(f)?;
        for p in &set.puzzles {
            let g = GROUPS
                .iter()
                .position(|g| g.2.contains(&p.theme))
                .unwrap_or(0);
            points.push((g, moves_before_win(&p.line), p.rating));
        }
    }
    let svg = svg(&points);
    out::write_file(&args.out, svg.as_bytes())?;
    out::note(&format!(
        "wrote a plot of {} puzzles to {}",
        points.len(),
        args.out
    ));
    Ok(())
}

/// The picture of `(group, moves, rating)` marks. Deterministic: the same marks give the same
/// bytes.
fn svg(points: &[(usize, u16, u32)]) -> String {
    let (w, h) = (760.0, 480.0);
    let (left, right, top, bottom) = (70.0, 20.0, 40.0, 120.0);
    let max_x = points.iter().map(|p| p.1).max().unwrap_or(1).max(10) as f64;
    let x = |m: f64| left + (w - left - right) * m / max_x;
    let y = |r: f64| top + (h - top - bottom) * (2600.0 - r) / 2000.0;
    let mut s = String::new();
    let _ = writeln!(
        s,
        "<svg xmlns=\"http://www.w3.org/2000/svg\" width=\"{w}\" height=\"{h}\" \
         viewBox=\"0 0 {w} {h}\" font-family=\"sans-serif\" font-size=\"12\">"
    );
    let _ = writeln!(
        s,
        "<title>Estimated rating against line length, {} puzzles</title>",
        points.len()
    );
    let _ = writeln!(s, "<rect width=\"{w}\" height=\"{h}\" fill=\"#ffffff\"/>");
    // Grid and axes.
    for r in (600..=2600).step_by(250) {
        let yy = y(r as f64);
        let _ = writeln!(
            s,
            "<line x1=\"{left}\" y1=\"{yy:.1}\" x2=\"{:.1}\" y2=\"{yy:.1}\" stroke=\"#dddddd\"/>\
             <text x=\"{:.1}\" y=\"{:.1}\" text-anchor=\"end\">{r}</text>",
            w - right,
            left - 6.0,
            yy + 4.0
        );
    }
    for m in 0..=max_x as u16 {
        let xx = x(m as f64);
        let _ = writeln!(
            s,
            "<line x1=\"{xx:.1}\" y1=\"{top}\" x2=\"{xx:.1}\" y2=\"{:.1}\" stroke=\"#eeeeee\"/>\
             <text x=\"{xx:.1}\" y=\"{:.1}\" text-anchor=\"middle\">{m}</text>",
            h - bottom,
            h - bottom + 16.0
        );
    }
    let _ = writeln!(
        s,
        "<text x=\"{:.1}\" y=\"{:.1}\" text-anchor=\"middle\">attacker moves before the winning \
         move (for a defence: the opponent's threat)</text>",
        (left + w - right) / 2.0,
        h - bottom + 34.0
    );
    let _ = writeln!(
        s,
        "<text x=\"16\" y=\"{:.1}\" transform=\"rotate(-90 16 {:.1})\" \
         text-anchor=\"middle\">estimated rating</text>",
        (top + h - bottom) / 2.0,
        (top + h - bottom) / 2.0
    );
    let _ = writeln!(
        s,
        "<text x=\"{left}\" y=\"24\" font-size=\"14\">Estimated rating against line length \
         ({} puzzles)</text>",
        points.len()
    );
    // Marks, nudged sideways by group so that the groups stay apart at one length.
    for &(g, m, r) in points {
        let (_, colour, _) = GROUPS[g];
        let xx = x(m as f64) + (g as f64 - 1.0) * 5.0;
        let yy = y(r as f64);
        let _ = match g {
            1 => writeln!(
                s,
                "<rect x=\"{:.1}\" y=\"{:.1}\" width=\"6\" height=\"6\" fill=\"{colour}\" \
                 fill-opacity=\"0.55\"/>",
                xx - 3.0,
                yy - 3.0
            ),
            2 => writeln!(
                s,
                "<path d=\"M{xx:.1} {:.1} l4 7 h-8 z\" fill=\"{colour}\" fill-opacity=\"0.55\"/>",
                yy - 4.0
            ),
            _ => writeln!(
                s,
                "<circle cx=\"{xx:.1}\" cy=\"{yy:.1}\" r=\"3.5\" fill=\"{colour}\" \
                 fill-opacity=\"0.55\"/>"
            ),
        };
    }
    // The mean at every length, over every group.
    let mut by_len: BTreeMap<u16, (f64, f64)> = BTreeMap::new();
    for &(_, m, r) in points {
        let e = by_len.entry(m).or_default();
        e.0 += r as f64;
        e.1 += 1.0;
    }
    let path: Vec<String> = by_len
        .iter()
        .map(|(&m, &(sum, n))| format!("{:.1},{:.1}", x(m as f64), y(sum / n)))
        .collect();
    let _ = writeln!(
        s,
        "<polyline points=\"{}\" fill=\"none\" stroke=\"{}\" stroke-width=\"2\"/>",
        path.join(" "),
        GROUPS[3].1
    );
    // Legend.
    for (i, (name, colour, _)) in GROUPS.iter().enumerate() {
        let lx = left + 360.0 * (i % 2) as f64;
        let ly = h - 56.0 + 20.0 * (i / 2) as f64;
        let _ = writeln!(
            s,
            "<rect x=\"{lx}\" y=\"{:.1}\" width=\"10\" height=\"10\" fill=\"{colour}\"/>\
             <text x=\"{:.1}\" y=\"{:.1}\">{name}</text>",
            ly - 9.0,
            lx + 16.0,
            ly
        );
    }
    s.push_str("</svg>\n");
    s
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn every_puzzle_is_a_mark_and_the_mean_follows_the_marks() {
        let pts = [(0, 4, 1430), (0, 15, 2190), (1, 6, 1900), (2, 5, 1800)];
        let a = svg(&pts);
        assert_eq!(a.matches("<circle").count(), 2);
        assert_eq!(a.matches("<rect x=").count(), 1 + GROUPS.len());
        assert_eq!(a.matches("<path").count(), 1);
        assert!(a.contains("4 puzzles"));
        // Same marks, same bytes.
        assert_eq!(a, svg(&pts));
        assert_ne!(a, svg(&pts[..3]));
    }
}

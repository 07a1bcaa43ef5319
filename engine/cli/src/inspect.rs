//! `fivefold inspect`: what the rules say about a position.

use clap::Args;
use engine::board::threat;
use engine::{Board, Point, Stone};
use serde::Serialize;

use crate::out;
use crate::position::PositionArgs;

#[derive(Args)]
pub struct InspectArgs {
    #[command(flatten)]
    pub position: PositionArgs,
    /// Print JSON instead of text.
    #[arg(long)]
    pub json: bool,
}

#[derive(Serialize)]
struct ForbiddenPoint {
    point: String,
    reason: &'static str,
}

#[derive(Serialize)]
struct PerColour {
    black: Vec<String>,
    white: Vec<String>,
}

#[derive(Serialize)]
struct Report {
    rule: &'static str,
    size: u8,
    to_move: &'static str,
    black_stones: usize,
    white_stones: usize,
    winner: Option<&'static str>,
    forbidden: Vec<ForbiddenPoint>,
    five_points: PerColour,
    four_points: PerColour,
}

/// Empty points where `c` would make a five (`five == true`) or a four but no five.
fn points_with(board: &Board, c: Stone, five: bool) -> Vec<String> {
    let mut pts: Vec<Point> = board
        .points()
        .filter(|&p| board.get(p).is_none())
        .filter(|&p| {
            let f = board.flags_at(board.index(p), c);
            if five {
                f & threat::FIVE != 0
            } else {
                f & threat::FOUR != 0 && f & threat::FIVE == 0
            }
        })
        .collect();
    pts.sort_by_key(|p| (p.x, p.y));
    pts.iter().map(|p| p.to_string()).collect()
}

fn per_colour(board: &Board, five: bool) -> PerColour {
    PerColour {
        black: points_with(board, Stone::Black, five),
        white: points_with(board, Stone::White, five),
    }
}

pub fn run(args: &InspectArgs) -> Result<(), String> {
    let pos = args.position.position()?;
    let board = &pos.board;
    let report = Report {
        rule: board.rule().name(),
        size: board.size(),
        to_move: pos.to_move.name(),
        black_stones: board.count(Stone::Black),
        white_stones: board.count(Stone::White),
        winner: board.find_winner().map(|s| s.name()),
        forbidden: board
            .forbidden_points()
            .into_iter()
            .map(|(p, f)| ForbiddenPoint {
                point: p.to_string(),
                reason: f.name(),
            })
            .collect(),
        five_points: per_colour(board, true),
        four_points: per_colour(board, false),
    };
    if args.json {
        let json = serde_json::to_string_pretty(&report).map_err(|e| e.to_string())?;
        return out::print(&format!("{json}\n"));
    }
    let list = |v: &[String]| {
        if v.is_empty() {
            "none".to_string()
        } else {
            v.join(" ")
        }
    };
    let forb: Vec<String> = report
        .forbidden
        .iter()
        .map(|f| format!("{} ({})", f.point, f.reason))
        .collect();
    let mut text = engine::notation::diagram(board);
    text += &format!("rule: {}, {} to move\n", report.rule, report.to_move);
    text += &format!("winner: {}\n", report.winner.unwrap_or("none"));
    text += &format!(
        "five points: black {}; white {}\n",
        list(&report.five_points.black),
        list(&report.five_points.white)
    );
    text += &format!(
        "four points: black {}; white {}\n",
        list(&report.four_points.black),
        list(&report.four_points.white)
    );
    text += &format!("forbidden for black: {}\n", list(&forb));
    out::print(&text)
}

//! The solver benchmark suite: positions harvested from seeded self-play, with the verdict and
//! line length the solver found, kept in a text file so that benchmarks and tests run on the
//! same fixed positions.
//!
//! One position per line, fields separated by single spaces:
//! `rule size to_move search verdict fours black white`, where `fours` is the number of
//! attacker moves before the five in the shortest line (0 when there is no win), and `black`
//! and `white` are comma-separated stone lists (`-` when empty). Lines starting with `#` are
//! comments.

use std::fmt;

use crate::geometry::Point;
use crate::notation::{self, PositionError};
use crate::play::{self, PlayerConfig};
use crate::search::{Budget, Mode, Solver, Verdict};
use crate::types::Rule;
use crate::types::Stone;
use crate::Board;

/// One benchmark position.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Case {
    /// The rule.
    pub rule: Rule,
    /// The board side.
    pub size: u8,
    /// The side to move, which is the attacker.
    pub to_move: Stone,
    /// VCF or VCT.
    pub mode: Mode,
    /// The verdict found when the suite was made.
    pub verdict: Verdict,
    /// Attacker moves before the five in the shortest line (0 without a win).
    pub fours: u16,
    /// Black stones.
    pub black: Vec<Point>,
    /// White stones.
    pub white: Vec<Point>,
}

impl Case {
    /// The position as a board.
    pub fn board(&self) -> Board {
        let mut b = Board::new(self.size, self.rule).expect("suite sizes are valid");
        for &p in &self.black {
            b.place(p, Stone::Black);
        }
        for &p in &self.white {
            b.place(p, Stone::White);
        }
        b
    }
}

fn list(points: &[Point]) -> String {
    if points.is_empty() {
        "-".to_string()
    } else {
        points
            .iter()
            .map(|p| p.to_string())
            .collect::<Vec<_>>()
            .join(",")
    }
}

impl fmt::Display for Case {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        write!(
            f,
            "{} {} {} {} {} {} {} {}",
            self.rule,
            self.size,
            self.to_move,
            match self.mode {
                Mode::Vcf => "vcf",
                Mode::Vct => "vct",
            },
            self.verdict.name(),
            self.fours,
            list(&self.black),
            list(&self.white)
        )
    }
}

/// The timing of one kind of position (VCF or VCT) over a suite run.
#[derive(Clone, Debug, Default, PartialEq, serde::Serialize)]
pub struct Timing {
    /// Positions timed.
    pub positions: usize,
    /// Median time of one position, in milliseconds.
    pub median_ms: f64,
    /// 95th percentile (nearest rank on `(n - 1) * 0.95`), in milliseconds.
    pub p95_ms: f64,
    /// The slowest position, in milliseconds.
    pub max_ms: f64,
    /// All positions together, in milliseconds.
    pub total_ms: f64,
    /// Nodes searched over all positions.
    pub nodes: u64,
}

impl Timing {
    /// The summary of per-position `(milliseconds, nodes)` samples.
    pub fn of(samples: &[(f64, u64)]) -> Timing {
        let mut t: Vec<f64> = samples.iter().map(|s| s.0).collect();
        t.sort_by(f64::total_cmp);
        let at = |p: f64| {
            if t.is_empty() {
                0.0
            } else {
                t[(((t.len() - 1) as f64) * p).round() as usize]
            }
        };
        Timing {
            positions: t.len(),
            median_ms: at(0.5),
            p95_ms: at(0.95),
            max_ms: t.last().copied().unwrap_or(0.0),
            total_ms: t.iter().sum(),
            nodes: samples.iter().map(|s| s.1).sum(),
        }
    }

    /// Nodes per second over the run.
    pub fn nodes_per_second(&self) -> f64 {
        self.nodes as f64 / (self.total_ms / 1e3).max(1e-9)
    }
}

/// One timed pass over a suite: the VCF and VCT timings and the cases whose verdict (or
/// shortest length) differs from the one recorded.
#[derive(Clone, Debug, Default, PartialEq, serde::Serialize)]
pub struct Run {
    /// VCF positions.
    pub vcf: Timing,
    /// VCT positions.
    pub vct: Timing,
    /// Cases answered differently from the suite, in words.
    pub mismatches: Vec<String>,
}

/// Solves every case from a cleared table, each timed with `clock` (milliseconds, any
/// origin). The same code times the suite natively and in the browser, so that their ratio
/// compares the solver and nothing else.
pub fn time_all(cases: &[Case], solver: &mut Solver, mut clock: impl FnMut() -> f64) -> Run {
    let (mut vcf, mut vct) = (Vec::new(), Vec::new());
    let mut mismatches = Vec::new();
    for case in cases {
        let board = case.board();
        solver.clear();
        let start = clock();
        let sol = solver
            .ask(Budget::VERIFICATION)
            .solve(&board, case.to_move, case.mode);
        let ms = clock() - start;
        if sol.verdict != case.verdict || (sol.verdict == Verdict::Win && sol.depth != case.fours) {
            mismatches.push(format!(
                "{case}: now {} depth {} ({} nodes)",
                sol.verdict.name(),
                sol.depth,
                sol.nodes
            ));
        }
        match case.mode {
            Mode::Vcf => vcf.push((ms, sol.nodes)),
            Mode::Vct => vct.push((ms, sol.nodes)),
        }
    }
    Run {
        vcf: Timing::of(&vcf),
        vct: Timing::of(&vct),
        mismatches,
    }
}

/// A line of a suite file that could not be read.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct SuiteError {
    /// The line number, from 1.
    pub line: usize,
    /// What is wrong.
    pub message: String,
}

impl fmt::Display for SuiteError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        write!(f, "suite line {}: {}", self.line, self.message)
    }
}

impl std::error::Error for SuiteError {}

/// Reads a suite file.
pub fn parse(text: &str) -> Result<Vec<Case>, SuiteError> {
    let mut out = Vec::new();
    for (n, line) in text.lines().enumerate() {
        let line = line.trim();
        if line.is_empty() || line.starts_with('#') {
            continue;
        }
        let err = |message: String| SuiteError {
            line: n + 1,
            message,
        };
        let f: Vec<&str> = line.split(' ').collect();
        if f.len() != 8 {
            return Err(err(format!("expected 8 fields, found {}", f.len())));
        }
        let rule: Rule = f[0].parse().map_err(|e| err(format!("{e}")))?;
        let size: u8 = f[1]
            .parse()
            .map_err(|_| err(format!("bad size '{}'", f[1])))?;
        let to_move: Stone = f[2]
            .parse()
            .map_err(|_| err(format!("bad side '{}'", f[2])))?;
        let mode = match f[3] {
            "vcf" => Mode::Vcf,
            "vct" => Mode::Vct,
            other => return Err(err(format!("bad search '{other}'"))),
        };
        let verdict = match f[4] {
            "win" => Verdict::Win,
            "no-win" => Verdict::NoWin,
            other => return Err(err(format!("bad verdict '{other}'"))),
        };
        let fours: u16 = f[5]
            .parse()
            .map_err(|_| err(format!("bad length '{}'", f[5])))?;
        let pts = |s: &str, which: &'static str| -> Result<Vec<Point>, SuiteError> {
            if s == "-" {
                return Ok(Vec::new());
            }
            notation::parse_points(s, which, size, size).map_err(|e| err(e.to_string()))
        };
        let black = pts(f[6], "black")?;
        let white = pts(f[7], "white")?;
        let case = Case {
            rule,
            size,
            to_move,
            mode,
            verdict,
            fours,
            black,
            white,
        };
        // Overlaps are caught when the board is built.
        let mut b = Board::new(size, rule).map_err(|e| err(e.to_string()))?;
        for &p in &case.black {
            b.place(p, Stone::Black);
        }
        for &p in &case.white {
            if b.get(p).is_some() {
                return Err(err(PositionError::Overlap(p).to_string()));
            }
            b.place(p, Stone::White);
        }
        out.push(case);
    }
    Ok(out)
}

/// How many positions of each kind a suite gets.
#[derive(Clone, Debug)]
pub struct Quotas {
    /// VCF wins per length, for lengths 1..=15 (index 0 unused).
    pub vcf: [usize; 16],
    /// VCT wins (without a VCF) per length, for lengths 1..=6.
    pub vct: [usize; 7],
    /// Positions without a VCF (searched as VCF).
    pub vcf_no_win: usize,
    /// Positions without a VCT (searched as VCT).
    pub vct_no_win: usize,
}

impl Default for Quotas {
    fn default() -> Self {
        Quotas {
            vcf: [0, 12, 12, 12, 12, 10, 10, 10, 8, 8, 6, 6, 5, 5, 4, 4],
            vct: [0, 8, 12, 12, 12, 10, 8],
            vcf_no_win: 20,
            vct_no_win: 20,
        }
    }
}

impl Quotas {
    fn full(&self) -> bool {
        self.vcf.iter().all(|&q| q == 0)
            && self.vct.iter().all(|&q| q == 0)
            && self.vcf_no_win == 0
            && self.vct_no_win == 0
    }
}

/// The budget of the harvest's searches: small, so that harvesting stays quick; the kept
/// positions are then solved again with [`Budget::VERIFICATION`].
const HARVEST: Budget = Budget::nodes(60_000);

/// Harvests a suite from seeded self-play: games from seeded openings under the three rules;
/// every position from the eighth stone on is searched for a VCF and, failing that, a VCT, and
/// kept while its kind's quota lasts. `progress` is called with the number of games played.
pub fn harvest(
    seed: u64,
    mut quotas: Quotas,
    max_games: u64,
    mut progress: impl FnMut(u64, usize),
) -> Vec<Case> {
    let mut solver = Solver::default();
    let mut out = Vec::new();
    let mut rng = play::rng(seed);
    let config = PlayerConfig {
        depth: 2,
        width: 8,
        noise: 60,
    };
    for g in 0..max_games {
        if quotas.full() {
            break;
        }
        progress(g, out.len());
        let rule = Rule::ALL[(g % 3) as usize];
        // A seeded opening: the centre and two more stones close to it.
        let mut game = play::opening(15, rule, &mut rng, 3, 2);
        let game_seed = play::next_seed(&mut rng);
        let mut player = play::Player::new(game_seed, config.clone());
        while !game.is_over() && game.board().stones() < 150 {
            if game.board().stones() >= 8 {
                // Both sides: the side to move, and the other as if it were its turn.
                for side in [game.to_move(), game.to_move().opponent()] {
                    consider(&mut solver, game.board(), side, &mut quotas, &mut out);
                }
            }
            let Some(m) = player.choose(&game) else { break };
            if game.play(m).is_err() {
                break;
            }
        }
    }
    extend(&mut solver, &mut quotas, &mut out);
    // The harvest searched with a small budget; record what the default solver says, so that
    // the suite checks the solver as it is used.
    let mut full = Solver::default();
    out.retain_mut(|case| {
        let sol = full
            .ask(Budget::VERIFICATION)
            .solve(&case.board(), case.to_move, case.mode);
        case.verdict = sol.verdict;
        case.fours = sol.depth;
        sol.verdict != Verdict::Unknown
    });
    out
}

/// Long VCFs are rare in self-play, so the suite also "un-plays" forcing exchanges: from a
/// kept VCF of `n` fours, take away one attacker stone and one defender stone such that the
/// attacker's stone, played again, is a four that the defender's stone blocks. If the smaller
/// position's shortest VCF has `n + 1` fours, it is kept too. Repeats up to 15 fours.
fn extend(solver: &mut Solver, quotas: &mut Quotas, out: &mut Vec<Case>) {
    for n in 1..15u16 {
        let mut i = 0;
        while quotas.vcf[n as usize + 1] > 0 && i < out.len() {
            let case = out[i].clone();
            i += 1;
            if case.mode != Mode::Vcf || case.verdict != Verdict::Win || case.fours != n {
                continue;
            }
            let attacker = case.to_move;
            let (mine, theirs) = match attacker {
                Stone::Black => (&case.black, &case.white),
                Stone::White => (&case.white, &case.black),
            };
            let whole = case.board();
            'pairs: for &a in mine {
                for &b in theirs {
                    let Some(board) = whole.taken_back(a, b, attacker) else {
                        continue;
                    };
                    let sol = solver.ask(HARVEST).solve(&board, attacker, Mode::Vcf);
                    let d = sol.depth as usize;
                    if sol.verdict == Verdict::Win && d > n as usize && d <= 15 && quotas.vcf[d] > 0
                    {
                        quotas.vcf[d] -= 1;
                        out.push(Case {
                            fours: sol.depth,
                            black: board.stones_of(Stone::Black),
                            white: board.stones_of(Stone::White),
                            ..case.clone()
                        });
                        if quotas.vcf[n as usize + 1] == 0 {
                            break 'pairs;
                        }
                    }
                }
            }
        }
    }
}

fn consider(
    solver: &mut Solver,
    board: &Board,
    me: Stone,
    quotas: &mut Quotas,
    out: &mut Vec<Case>,
) {
    let base = |mode, verdict, fours: u16| Case {
        rule: board.rule(),
        size: board.size(),
        to_move: me,
        mode,
        verdict,
        fours,
        black: board.stones_of(Stone::Black),
        white: board.stones_of(Stone::White),
    };
    // Positions where the opponent already threatens five are not puzzle-like; skip them.
    if !board
        .cells_with(me.opponent(), crate::board::threat::FIVE)
        .is_empty()
        || !board.cells_with(me, crate::board::threat::FIVE).is_empty()
    {
        return;
    }
    let vcf = solver.ask(HARVEST).solve(board, me, Mode::Vcf);
    match vcf.verdict {
        Verdict::Win => {
            let fours = vcf.depth;
            if (1..=15).contains(&fours) && quotas.vcf[fours as usize] > 0 {
                quotas.vcf[fours as usize] -= 1;
                out.push(base(Mode::Vcf, Verdict::Win, fours));
            }
            return;
        }
        Verdict::Unknown => return,
        Verdict::NoWin => {}
    }
    let vct_wanted = quotas.vct.iter().any(|&q| q > 0) || quotas.vct_no_win > 0;
    if !vct_wanted {
        if quotas.vcf_no_win > 0 && board.stones().is_multiple_of(3) {
            quotas.vcf_no_win -= 1;
            out.push(base(Mode::Vcf, Verdict::NoWin, 0));
        }
        return;
    }
    let vct = solver.ask(HARVEST).solve(board, me, Mode::Vct);
    match vct.verdict {
        Verdict::Win => {
            let threats = vct.depth;
            if (1..=6).contains(&threats) && quotas.vct[threats as usize] > 0 {
                quotas.vct[threats as usize] -= 1;
                out.push(base(Mode::Vct, Verdict::Win, threats));
            }
        }
        Verdict::NoWin => {
            if quotas.vcf_no_win > 0 && board.stones().is_multiple_of(3) {
                quotas.vcf_no_win -= 1;
                out.push(base(Mode::Vcf, Verdict::NoWin, 0));
            } else if quotas.vct_no_win > 0 && board.stones() % 3 == 1 {
                quotas.vct_no_win -= 1;
                out.push(base(Mode::Vct, Verdict::NoWin, 0));
            }
        }
        Verdict::Unknown => {}
    }
}

//! The forcing-line move generators for the proof-number core: VCF (fours only) and VCT
//! (threats, with every defence).
//!
//! **VCF.** At the attacker's turn: a five ends the search; if the defender has a four, the
//! attacker must block it, and in a VCF the block must itself be a four; otherwise every four
//! the attacker may legally make (in renju, black's forbidden points are out, except that a five
//! is always allowed). At the defender's turn: a defender five refutes; two or more attacker
//! five points win; the single five point is the only reply, and in renju, when the defender is
//! black and that point is forbidden, black cannot block and loses.
//!
//! **VCT.** The attacker also plays threes, broken threes and closed threes (moves that create a
//! new four) after which it would win by VCF if the defender passed; a defender four must be
//! blocked (by any move). At the defender's turn, after a non-four threat, the attacker's VCF
//! (found by the VCF oracle, `vcf::VcfOracle`, as if the defender passed) is the threat to
//! stop; a defender with a VCF of its own wins at once; the replies searched are the defence
//! candidates of `defence::defence_candidates`, whose module argues why no other reply needs
//! trying.

use super::defence::defence_candidates;
use super::dfpn::{Node, Space, Watch};
use super::vcf::{VcfLine, VcfOracle};
use crate::board::{threat, Board};
use crate::geometry::{best_first_key, Point};
use crate::types::{Rule, Stone};
use crate::zobrist::splitmix64;

/// Which forcing moves the attacker may use.
#[derive(Clone, Copy, PartialEq, Eq, Debug, Hash)]
pub enum Mode {
    /// Victory by continuous fours.
    Vcf,
    /// Victory by continuous threats (threes and fours).
    Vct,
}

/// A depth that never runs out.
pub const UNLIMITED: u16 = u16::MAX;

/// How many of the attacker's latest threats a new threat may depend on (see
/// `ThreatSpace::dependent`).
pub const RECENT: usize = 2;

/// The longest VCF (in fours before the five) that turns a quiet move into a VCT threat. A
/// move that makes neither a four nor a three is a threat when the attacker would then win by
/// a four-three or double four within this many fours; longer "threats" give the defender so
/// many replies that the search could not bound them.
pub const THREAT_FOURS: u16 = 2;

/// Mixes everything a node's value depends on besides the stones into its key.
pub(crate) fn salt(mode: Mode, attacker: Stone, rule: Rule, width: u8, height: u8) -> u64 {
    let m = match mode {
        Mode::Vcf => 1u64,
        Mode::Vct => 2,
    };
    let r = match rule {
        Rule::Freestyle => 1u64,
        Rule::Standard => 2,
        Rule::Renju => 3,
    };
    splitmix64(
        m << 40 | (attacker.index() as u64) << 32 | r << 24 | (width as u64) << 8 | height as u64,
    )
}

#[inline]
pub(crate) fn side_key(c: Stone) -> u64 {
    match c {
        Stone::Black => 0,
        Stone::White => 0x2B99_2DDF_A232_49D6,
    }
}

/// The key of the attacker's last threat (VCT only: the VCF generator does not look at it, so
/// its keys leave it out).
#[inline]
fn played_key(m: u16) -> u64 {
    splitmix64(0x91A7_0000_0000 + m as u64)
}

#[inline]
pub(crate) fn depth_key(depth: u16) -> u64 {
    if depth == UNLIMITED {
        0
    } else {
        splitmix64(0xDE97_0000 + depth as u64)
    }
}

/// The search space of a forcing-line search on a gomoku board.
pub(crate) struct ThreatSpace<'b> {
    pub(crate) board: &'b mut Board,
    attacker: Stone,
    to_move: Stone,
    mode: Mode,
    depth: u16,
    salt: u64,
    trail: Vec<u16>,
    /// The attacker's moves since the root of the search, each marked whether it was a threat
    /// (not a forced block). The dependency rule makes a node's moves depend on the last
    /// threat, so that is part of every key.
    played: Vec<(u16, bool)>,
    oracle: Option<&'b mut VcfOracle>,
    /// The question's stop check, passed on to the oracle's searches.
    stop: Option<Watch<'b>>,
    /// The oracle's `used` count at the last [`Space::take_spent`].
    seen: u64,
}

impl<'b> ThreatSpace<'b> {
    pub(crate) fn new(
        board: &'b mut Board,
        attacker: Stone,
        to_move: Stone,
        mode: Mode,
        depth: u16,
        oracle: Option<&'b mut VcfOracle>,
    ) -> ThreatSpace<'b> {
        debug_assert!(mode == Mode::Vcf || oracle.is_some());
        let salt = salt(mode, attacker, board.rule(), board.width(), board.height());
        ThreatSpace {
            board,
            attacker,
            to_move,
            mode,
            depth,
            salt,
            trail: Vec::new(),
            played: Vec::new(),
            seen: oracle.as_deref().map_or(0, |o| o.used),
            oracle,
            stop: None,
        }
    }

    /// Polls `stop` in the oracle's searches too.
    pub(crate) fn watched(mut self, stop: Option<Watch<'b>>) -> Self {
        self.stop = stop;
        self
    }

    /// Starts the search below moves already played: `history` holds every move since the
    /// start of the line with its colour and whether it was a threat (not the forced block of
    /// a four). The dependency rule of a VCT looks back at the attacker's last threats, so a
    /// question asked in the middle of a line searches the same lines as the proof from the
    /// start did only when it knows them.
    pub(crate) fn with_history(mut self, history: &[(Point, Stone, bool)]) -> Self {
        if self.mode == Mode::Vct {
            self.played = history
                .iter()
                .filter(|h| h.1 == self.attacker && self.board.contains(h.0))
                .map(|h| (self.board.index(h.0) as u16, h.2))
                .collect();
        }
        self
    }

    /// The side to move.
    pub(crate) fn to_move(&self) -> Stone {
        self.to_move
    }

    /// The attacker's current five points.
    pub(crate) fn attacker_fives(&self) -> Vec<u16> {
        self.board
            .cells_with(self.attacker, threat::FIVE)
            .iter()
            .map(|c| c as u16)
            .collect()
    }

    /// In a VCT space, the attacker's VCF from the current node (attacker to move).
    pub(crate) fn oracle_vcf(&mut self) -> Option<VcfLine> {
        let oracle = self.oracle.as_deref_mut()?;
        oracle.find(self.board, self.attacker, UNLIMITED, self.stop)
    }

    /// The remaining depth after the side to move plays `m` here. In a VCF every attacker move
    /// counts; in a VCT only threats that are not fours count (fours force a reply at once, and
    /// a forced block of a defender four is no threat at all).
    #[inline]
    fn depth_after(&self, m: u16) -> u16 {
        if self.depth == UNLIMITED || self.to_move != self.attacker {
            return self.depth;
        }
        if self.mode == Mode::Vct {
            let d = self.attacker.opponent();
            let forced = !self.board.cells_with(d, threat::FIVE).is_empty();
            let four = self.board.flags_at(m as usize, self.attacker) & threat::FOUR != 0;
            if forced || four {
                return self.depth;
            }
        }
        self.depth.saturating_sub(1)
    }

    #[inline]
    fn legal(&mut self, idx: usize, c: Stone) -> bool {
        // A five is always allowed, even on a forbidden point.
        self.board.flags_at(idx, c) & threat::FIVE != 0 || self.board.legal_at(idx, c)
    }

    fn expand_attacker(&mut self, out: &mut Vec<u16>) -> Node {
        let a = self.attacker;
        let d = a.opponent();
        if !self.board.cells_with(a, threat::FIVE).is_empty() {
            return Node::Win(1);
        }
        let dfives = *self.board.cells_with(d, threat::FIVE);
        if !dfives.is_empty() {
            if dfives.len() >= 2 {
                return Node::Loss;
            }
            let b = dfives.first().unwrap_or(0);
            let ok = match self.mode {
                Mode::Vcf => {
                    self.depth > 0
                        && self.board.flags_at(b, a) & threat::FOUR != 0
                        && self.legal(b, a)
                }
                Mode::Vct => self.legal(b, a),
            };
            if !ok {
                return Node::Loss;
            }
            out.push(b as u16);
            return Node::Or;
        }
        if self.mode == Mode::Vct {
            let oracle = self.oracle.as_deref_mut().expect("VCT needs an oracle");
            if let Some(line) = oracle.find(self.board, a, UNLIMITED, self.stop) {
                return Node::Win(line.attacker_moves());
            }
        }
        if self.depth == 0 && self.mode == Mode::Vcf {
            return Node::Loss;
        }
        if self.mode == Mode::Vct {
            let key = self.key();
            if let Some(cached) = self.oracle.as_deref().and_then(|o| o.moves.get(key)) {
                out.extend_from_slice(cached);
                return Node::Or;
            }
            self.attacker_moves(out);
            if let Some(o) = self.oracle.as_deref_mut() {
                o.moves.put(key, out);
            }
        } else {
            self.attacker_moves(out);
        }
        Node::Or
    }

    /// The attacker's candidate moves when the defender has no four: fours, and in a VCT also
    /// threes, broken threes and closed threes; legal ones only, strongest first.
    pub(crate) fn attacker_moves(&mut self, out: &mut Vec<u16>) {
        let a = self.attacker;
        let mut cand = *self.board.cells_with(a, threat::FOUR);
        if self.mode == Mode::Vct {
            cand = cand
                .union(self.board.cells_with(a, threat::THREE))
                .union(self.board.cells_with(a, threat::CLOSED_THREE));
        }
        let fours = *self.board.cells_with(a, threat::FOUR);
        // Without forbidden points for the attacker, whether a quiet move makes a VCF threat
        // is read from the shape tables as they would be after it (see `makes_vcf_threat`).
        // Its `before` is found once, when the first quiet candidate needs it.
        let read = self.mode == Mode::Vct && self.depth > 0 && !self.board.rule().has_forbidden(a);
        let mut before: Option<Vec<usize>> = None;
        let mut scored: Vec<u64> = Vec::new();
        for c in cand.iter() {
            if !self.legal(c, a) {
                continue;
            }
            if self.mode == Mode::Vct && !self.dependent(c) {
                continue;
            }
            if self.mode == Mode::Vct && !fours.contains(c) {
                // Threes are threats by themselves; other moves only if they make a VCF threat,
                // and after the first move only where they depend on the line so far.
                let three = self.board.flags_at(c, a) & threat::THREE != 0;
                let threat = (three && self.real_three(c)) || {
                    if read && before.is_none() {
                        before = Some(self.board.double_threat_points(a));
                    }
                    self.makes_vcf_threat(c, before.as_deref())
                };
                if !threat {
                    continue;
                }
            }
            scored.push(best_first_key(self.score(c, a), c as u16));
        }
        scored.sort_unstable();
        out.extend(scored.iter().map(|&k| k as u16));
    }

    /// Whether a quiet (non-four) move on `c` makes a threat: after it the attacker has a
    /// point where one stone makes a double four or a four-three, so that it would win by VCF
    /// (within [`THREAT_FOURS`] fours) if the defender passed. This is a quick test on the
    /// shape tables; the defender's node below checks the VCF itself before trusting it.
    /// `before`, the attacker's double-threat points as the board stands, when the attacker
    /// has no forbidden points: then the tables are read as they would be after the move
    /// ([`Board::double_threat_after`]) instead of placing it and taking it back.
    fn makes_vcf_threat(&mut self, c: usize, before: Option<&[usize]>) -> bool {
        let a = self.attacker;
        if self.depth == 0 {
            return false;
        }
        if let Some(before) = before {
            return self.board.double_threat_after(c, a, before);
        }
        self.board.place_at(c, a);
        let fours: Vec<usize> = self.board.cells_with(a, threat::FOUR).iter().collect();
        let mut found = false;
        for q in fours {
            let (mut n4, mut n3) = (0, 0);
            for d in 0..4 {
                let s = self.board.shape_at(q, a, d);
                n4 += s.four_count();
                n3 += s.is_three() as u32;
            }
            if (n4 >= 2 || (n4 == 1 && n3 >= 1)) && self.board.legal_at(q, a) {
                found = true;
                break;
            }
        }
        self.board.remove_at(c);
        found
    }

    /// Whether a VCT candidate depends on the attacker's recent threats: at the root every
    /// threat may start a line; after that a threat must share a line, within four points, with
    /// one of the attacker's last [`RECENT`] threats. This is the dependency requirement of
    /// threat-space search (Allis, van den Herik and Huntjens 1993), bounded to recent threats
    /// so that a node's moves depend on little of the path (which is part of the key).
    fn dependent(&self, c: usize) -> bool {
        let mut recent = self.recent_threats().peekable();
        if recent.peek().is_none() {
            return true;
        }
        let p = self.board.point(c);
        recent.any(|m| {
            let q = self.board.point(m as usize);
            let (dx, dy) = (q.x as i32 - p.x as i32, q.y as i32 - p.y as i32);
            (dx == 0 || dy == 0 || dx.abs() == dy.abs()) && dx.abs().max(dy.abs()) <= 4
        })
    }

    /// The attacker's last [`RECENT`] threats since the root, newest first.
    #[inline]
    fn recent_threats(&self) -> impl Iterator<Item = u16> + '_ {
        self.played
            .iter()
            .rev()
            .filter(|x| x.1)
            .take(RECENT)
            .map(|x| x.0)
    }

    /// The key of the recent threats (their order does not matter to the rule).
    #[inline]
    fn recent_key(&self) -> u64 {
        self.recent_threats().fold(0, |k, m| k ^ played_key(m))
    }

    /// The recent-threat key after the attacker's threat `m`.
    #[inline]
    fn recent_key_after(&self, m: u16) -> u64 {
        self.recent_threats()
            .take(RECENT - 1)
            .fold(played_key(m), |k, x| k ^ played_key(x))
    }

    /// Whether the attacker, to move, is forced to block a defender four.
    #[inline]
    fn forced(&self) -> bool {
        !self
            .board
            .cells_with(self.attacker.opponent(), threat::FIVE)
            .is_empty()
    }

    /// Whether a move on `c` makes a three that the attacker can legally turn into a straight
    /// four, which by itself is a VCF threat (the straight four wins).
    fn real_three(&mut self, c: usize) -> bool {
        let a = self.attacker;
        if self.depth == 0 {
            return false;
        }
        let lines: Vec<(usize, crate::patterns::LineInfo)> = (0..4)
            .map(|d| (d, self.board.line_at(c, a, d)))
            .filter(|(_, l)| l.shape().is_three())
            .collect();
        if !self.board.rule().has_forbidden(a) {
            return !lines.is_empty();
        }
        self.board.place_at(c, a);
        let real = lines.iter().any(|&(d, info)| {
            info.offsets().any(|off| {
                let q = self.board.offset(c, d, off as isize);
                self.board.is_empty_at(q) && self.board.legal_at(q, a)
            })
        });
        self.board.remove_at(c);
        real
    }

    /// Move-ordering score for an attacker candidate: stronger combined threats first.
    fn score(&self, c: usize, a: Stone) -> i32 {
        let mut fours = 0;
        let mut threes = 0;
        let mut closed = 0;
        let mut twos = 0;
        let mut straight = false;
        for d in 0..4 {
            let s = self.board.line_at(c, a, d).shape();
            fours += s.four_count();
            straight |= s == crate::patterns::LineShape::StraightFour;
            if s.is_three() {
                threes += 1;
            }
            if s == crate::patterns::LineShape::ClosedThree {
                closed += 1;
            }
            if s == crate::patterns::LineShape::Two {
                twos += 1;
            }
        }
        let mut score = 0i32;
        if straight || fours >= 2 {
            score += 1000;
        }
        score += fours as i32 * 100 + threes * 60 + closed * 15 + twos * 3;
        // Defender's view of the point: taking a point the defender also wants is good.
        let dflags = self.board.flags_at(c, a.opponent());
        if dflags & (threat::FOUR | threat::THREE) != 0 {
            score += 20;
        }
        score
    }

    fn expand_defender(&mut self, out: &mut Vec<u16>) -> Node {
        let a = self.attacker;
        let d = a.opponent();
        if !self.board.cells_with(d, threat::FIVE).is_empty() {
            return Node::Loss;
        }
        let afives = *self.board.cells_with(a, threat::FIVE);
        match afives.len() {
            0 => {}
            1 => {
                let b = afives.first().unwrap_or(0);
                if !self.legal(b, d) {
                    return Node::Win(1);
                }
                out.push(b as u16);
                return Node::And;
            }
            _ => return Node::Win(1),
        }
        if self.mode == Mode::Vcf {
            // The attacker's last move was not a four: in a VCF that cannot happen, but a
            // position given to the search might be like this; the defender is free.
            return Node::Loss;
        }
        let oracle = self.oracle.as_deref_mut().expect("VCT needs an oracle");
        // Facing a threat that is not a four, a defender with a VCF of its own simply wins: the
        // attacker can only answer its fours.
        if oracle.has_vcf(self.board, d, self.stop) {
            return Node::Loss;
        }
        // The shortest threat gives the defender the fewest replies to try; both are sound.
        let stop = self.stop;
        let short = oracle.find(self.board, a, THREAT_FOURS, stop);
        let line = short.or_else(|| oracle.find(self.board, a, UNLIMITED, stop));
        let Some(line) = line else {
            return Node::Loss;
        };
        let mut cand = defence_candidates(self.board, a, &line);
        cand.retain(|&m| {
            let m = m as usize;
            self.board.flags_at(m, d) & threat::FIVE != 0 || self.board.legal_at(m, d)
        });
        if cand.is_empty() {
            return Node::Win(line.attacker_moves());
        }
        // Likeliest refutations first: points the attacker wants most, then the defender's own
        // strongest shapes.
        let mut scored: Vec<u64> = cand
            .into_iter()
            .map(|m| {
                let i = m as usize;
                let fa = self.board.flags_at(i, a);
                let fd = self.board.flags_at(i, d);
                let mut s = 0;
                for (bit, w) in [
                    (threat::FOUR, 40),
                    (threat::THREE, 30),
                    (threat::CLOSED_THREE, 8),
                    (threat::TWO, 2),
                ] {
                    if fa & bit != 0 {
                        s += w;
                    }
                    if fd & bit != 0 {
                        s += w / 2;
                    }
                }
                best_first_key(s, m)
            })
            .collect();
        scored.sort_unstable();
        out.extend(scored.into_iter().map(|k| k as u16));
        Node::And
    }
}

impl Space for ThreatSpace<'_> {
    fn allow(&mut self, left: u64, spent: u64) {
        if let Some(o) = self.oracle.as_deref_mut() {
            o.allowance = left;
            o.spent = spent;
        }
    }

    fn take_spent(&mut self) -> u64 {
        let used = self.oracle.as_deref().map_or(0, |o| o.used);
        let n = used - self.seen;
        self.seen = used;
        n
    }

    #[inline]
    fn key(&self) -> u64 {
        self.board.hash()
            ^ self.salt
            ^ side_key(self.to_move)
            ^ depth_key(self.depth)
            ^ self.recent_key()
    }

    #[inline]
    fn child_key(&self, m: u16) -> u64 {
        self.board.hash_after(m as usize, self.to_move)
            ^ self.salt
            ^ side_key(self.to_move.opponent())
            ^ depth_key(self.depth_after(m))
            ^ if self.to_move == self.attacker && self.mode == Mode::Vct && !self.forced() {
                self.recent_key_after(m)
            } else {
                self.recent_key()
            }
    }

    fn expand(&mut self, moves: &mut Vec<u16>) -> Node {
        if self.to_move == self.attacker {
            self.expand_attacker(moves)
        } else {
            self.expand_defender(moves)
        }
    }

    #[inline]
    fn play(&mut self, m: u16) {
        let next = self.depth_after(m);
        self.trail.push(self.depth);
        self.depth = next;
        if self.to_move == self.attacker && self.mode == Mode::Vct {
            let threat = !self.forced();
            self.played.push((m, threat));
        }
        self.board.place_at(m as usize, self.to_move);
        self.to_move = self.to_move.opponent();
    }

    #[inline]
    fn undo(&mut self, m: u16) {
        self.board.remove_at(m as usize);
        self.to_move = self.to_move.opponent();
        self.depth = self.trail.pop().unwrap_or(self.depth);
        if self.to_move == self.attacker && self.mode == Mode::Vct {
            self.played.pop();
        }
    }
}

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
//! `P` (found as if the defender passed) is the threat to stop; a defender with a VCF of its own
//! wins at once. The replies searched are all the defender's fours (each gains a tempo, after
//! which the defender moves again), every point of `P`, and every point where a defender stone
//! could change `P`'s outcome: under freestyle and standard, the points that together with `P`'s defender
//! stones could give the defender a five; under renju, where a stone can change which points
//! are forbidden far away, every empty point whose stone makes `P` fail when `P` is replayed.
//! Every other reply leaves `P` a valid VCF, so the attacker still wins: the set is never
//! smaller than soundness needs.
//!
//! A VCT search asks many VCF questions; they are answered by a [`VcfOracle`] with its own table,
//! so the same question is never searched twice while its answer is still stored.

use super::dfpn::{Dfpn, Node, Space, Status};
use super::tt::Table;
use crate::board::{threat, Board, Stone};
use crate::geometry::Point;
use crate::rules::Rule;

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

const fn splitmix(mut z: u64) -> u64 {
    z = z.wrapping_add(0x9E37_79B9_7F4A_7C15);
    z = (z ^ (z >> 30)).wrapping_mul(0xBF58_476D_1CE4_E5B9);
    z = (z ^ (z >> 27)).wrapping_mul(0x94D0_49BB_1331_11EB);
    z ^ (z >> 31)
}

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
    splitmix(
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
    splitmix(0x91A7_0000_0000 + m as u64)
}

#[inline]
pub(crate) fn depth_key(depth: u16) -> u64 {
    if depth == UNLIMITED {
        0
    } else {
        splitmix(0xDE97_0000 + depth as u64)
    }
}

/// A VCF found by the oracle: the moves from the attacker's first four to its last, defender
/// replies in between, and the attacker's five points at the end.
#[derive(Clone, Debug, PartialEq, Eq, Default)]
pub struct VcfLine {
    /// Attacker and defender moves alternating, attacker first.
    pub moves: Vec<u16>,
    /// The attacker's five points after the last move (one or more).
    pub fives: Vec<u16>,
}

impl VcfLine {
    /// Attacker moves in the line, the five included.
    pub fn attacker_moves(&self) -> u16 {
        (self.moves.len().div_ceil(2) + 1) as u16
    }
}

/// Answers "does the attacker, to move, have a VCF here?" with a table of its own.
pub struct VcfOracle {
    tt: Table,
    /// Nodes one question may take before its answer counts as unknown.
    pub node_limit: u64,
    /// Set when some question ran out of nodes (so a "no" is not a proof).
    pub inexact: bool,
    /// The value of `nodes` past which every question counts as unknown without a search
    /// (`u64::MAX`: never); the solver sets it for one search at a time.
    pub spend_limit: u64,
    /// Nodes searched over all questions.
    pub nodes: u64,
    /// The attacker's VCT candidates of recently expanded nodes, so that the proof-number
    /// search, which comes back to the same node many times, does not test them again.
    moves: MoveCache,
}

/// A direct-mapped cache of generated move lists, keyed by node key.
struct MoveCache {
    keys: Vec<u64>,
    lists: Vec<Vec<u16>>,
}

impl MoveCache {
    const SLOTS: usize = 1 << 14;

    fn new() -> MoveCache {
        MoveCache {
            keys: vec![0; Self::SLOTS],
            lists: vec![Vec::new(); Self::SLOTS],
        }
    }

    fn get(&self, key: u64) -> Option<&[u16]> {
        let i = (key as usize) & (Self::SLOTS - 1);
        (self.keys[i] == key).then(|| self.lists[i].as_slice())
    }

    fn put(&mut self, key: u64, moves: &[u16]) {
        let i = (key as usize) & (Self::SLOTS - 1);
        self.keys[i] = key;
        self.lists[i].clear();
        self.lists[i].extend_from_slice(moves);
    }

    fn clear(&mut self) {
        self.keys.fill(0);
    }
}

impl VcfOracle {
    /// An oracle with a table of `megabytes` and a per-question node limit.
    pub fn new(megabytes: usize, node_limit: u64) -> VcfOracle {
        VcfOracle {
            tt: Table::with_megabytes(megabytes),
            node_limit,
            inexact: false,
            spend_limit: u64::MAX,
            nodes: 0,
            moves: MoveCache::new(),
        }
    }

    /// Forgets all stored answers.
    pub fn clear(&mut self) {
        self.tt.clear();
        self.moves.clear();
        self.inexact = false;
    }

    /// The attacker's VCF from this position with the attacker to move, using at most `depth`
    /// attacker moves before the five, if there is one within the node limit.
    pub fn find(&mut self, board: &mut Board, attacker: Stone, depth: u16) -> Option<VcfLine> {
        let Some(limit) = self.question_limit() else {
            self.inexact = true;
            return None;
        };
        let mut sp = ThreatSpace::new(board, attacker, attacker, Mode::Vcf, depth, None);
        let mut dfpn = Dfpn::new(&mut self.tt, limit, None);
        let status = dfpn.solve(&mut sp);
        self.nodes += dfpn.nodes;
        match status {
            Status::Proved => {
                let line = vcf_line(&mut dfpn, &mut sp, self.node_limit);
                if line.is_none() {
                    self.inexact = true;
                }
                line
            }
            Status::Disproved => None,
            Status::Unknown => {
                self.inexact = true;
                None
            }
        }
    }
}

impl VcfOracle {
    /// The node limit of the next question: the per-question limit, or what is left of the
    /// spending limit if that is less; `None` when nothing is left.
    fn question_limit(&self) -> Option<u64> {
        let left = self.spend_limit.saturating_sub(self.nodes);
        (left > 0).then(|| self.node_limit.min(left))
    }

    /// Whether `side` (to move) has a VCF, asked of the defender of a VCT: a yes refutes the
    /// attacker's threat. When the question runs out of nodes the answer is the cautious one,
    /// yes (so that no attacker win rests on it), and the oracle becomes inexact (so that no
    /// attacker no-win rests on it either).
    pub fn has_vcf(&mut self, board: &mut Board, side: Stone) -> bool {
        let Some(limit) = self.question_limit() else {
            self.inexact = true;
            return true;
        };
        let mut sp = ThreatSpace::new(board, side, side, Mode::Vcf, UNLIMITED, None);
        let mut dfpn = Dfpn::new(&mut self.tt, limit, None);
        let status = dfpn.solve(&mut sp);
        self.nodes += dfpn.nodes;
        match status {
            Status::Proved => true,
            Status::Disproved => false,
            Status::Unknown => {
                self.inexact = true;
                true
            }
        }
    }
}

/// Reads the proved VCF of the current node back from the table, re-searching where an entry
/// was overwritten. Leaves the space as it found it.
pub(crate) fn vcf_line(
    dfpn: &mut Dfpn<'_, '_>,
    sp: &mut ThreatSpace,
    budget: u64,
) -> Option<VcfLine> {
    let mut line = VcfLine::default();
    let mut scratch = Vec::new();
    let mut result = None;
    for _ in 0..200 {
        scratch.clear();
        match sp.expand(&mut scratch) {
            Node::Win(_) => {
                line.fives = sp.attacker_fives();
                result = Some(());
                break;
            }
            Node::Loss => break,
            Node::And => {
                if scratch.is_empty() {
                    line.fives = sp.attacker_fives();
                    result = Some(());
                    break;
                }
                let m = scratch[0];
                line.moves.push(m);
                sp.play(m);
            }
            Node::Or => {
                let mut e = dfpn.entry(sp.key());
                if !matches!(e, Some(x) if x.pn == 0) {
                    let before = dfpn.nodes;
                    if dfpn.solve(sp) != Status::Proved || dfpn.nodes - before > budget {
                        break;
                    }
                    e = dfpn.entry(sp.key());
                }
                let Some(m) = e
                    .map(|x| x.best)
                    .filter(|&m| (m as usize) < sp.board.cell_count())
                else {
                    break;
                };
                line.moves.push(m);
                sp.play(m);
            }
        }
    }
    for &m in line.moves.iter().rev() {
        sp.undo(m);
    }
    result.map(|_| line)
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
            oracle,
        }
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
        oracle.find(self.board, self.attacker, UNLIMITED)
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
            if let Some(line) = oracle.find(self.board, a, UNLIMITED) {
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
        let mut scored: Vec<(i32, u16)> = Vec::new();
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
                let threat = (three && self.real_three(c)) || self.makes_vcf_threat(c);
                if !threat {
                    continue;
                }
            }
            scored.push((self.score(c, a), c as u16));
        }
        scored.sort_by(|x, y| y.0.cmp(&x.0).then(x.1.cmp(&y.1)));
        out.extend(scored.iter().map(|s| s.1));
    }

    /// Whether a quiet (non-four) move on `c` makes a threat: after it the attacker has a
    /// point where one stone makes a double four or a four-three, so that it would win by VCF
    /// (within [`THREAT_FOURS`] fours) if the defender passed. This is a quick test on the
    /// shape tables; the defender's node below checks the VCF itself before trusting it.
    fn makes_vcf_threat(&mut self, c: usize) -> bool {
        let a = self.attacker;
        if self.depth == 0 {
            return false;
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
        if oracle.has_vcf(self.board, d) {
            return Node::Loss;
        }
        // The shortest threat gives the defender the fewest replies to try; both are sound.
        let short = oracle.find(self.board, a, THREAT_FOURS);
        let line = short.or_else(|| oracle.find(self.board, a, UNLIMITED));
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
        let mut scored: Vec<(i32, u16)> = cand
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
                (s, m)
            })
            .collect();
        scored.sort_by(|x, y| y.0.cmp(&x.0).then(x.1.cmp(&y.1)));
        out.extend(scored.into_iter().map(|x| x.1));
        Node::And
    }
}

impl Space for ThreatSpace<'_> {
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

/// The defender's replies that need refuting when the attacker threatens the VCF `line` (found
/// with the defender passing). See the module documentation for why the set is sound.
pub(crate) fn defence_candidates(board: &mut Board, attacker: Stone, line: &VcfLine) -> Vec<u16> {
    let d = attacker.opponent();
    let n = board.cell_count();
    let mut mark = vec![false; n];
    let mut out: Vec<u16> = Vec::new();
    let push = |m: usize, mark: &mut Vec<bool>, out: &mut Vec<u16>| {
        if !mark[m] {
            mark[m] = true;
            out.push(m as u16);
        }
    };
    // The defender's own fours gain a tempo: the attacker must block, and then the defender
    // moves again with two more stones on the board, so every one of them is a reply to try.
    let fours: Vec<usize> = board.cells_with(d, threat::FOUR).iter().collect();
    for c in fours {
        push(c, &mut mark, &mut out);
    }
    // Every point of the line and every final five point.
    for &m in line.moves.iter().chain(line.fives.iter()) {
        push(m as usize, &mut mark, &mut out);
    }
    if board.rule() == Rule::Renju {
        // Renju: a stone can also change which points are forbidden. Whether a point is
        // forbidden depends only on the lines through it, and a stone can only change the
        // answer at a point that is forbidden or has two threes or more (a white stone removes
        // black shapes, a black stone adds them, and neither turns a point with at most one
        // three and one four into a forbidden one). The replay records every such point the
        // rules looked at, the recursion of the three rule included; a stone off all their
        // lines changes no decision of the replay. Replay the line against the stones on them.
        board.start_trace();
        replay(board, attacker, line);
        let touched = board.take_trace();
        let mut seen = vec![false; n];
        for x in touched {
            for dir in 0..4 {
                for t in -5isize..=5 {
                    let m = board.offset(x as usize, dir, t);
                    if seen[m] || mark[m] || !board.is_empty_at(m) {
                        continue;
                    }
                    seen[m] = true;
                    if !replay_survives(board, attacker, line, m) {
                        push(m, &mut mark, &mut out);
                    }
                }
            }
        }
    }
    // Freestyle and standard: a defender stone off the line can only break it by giving the
    // defender a five point together with the defender's replies in the line, so it must share
    // a five-window with one of them that holds no attacker stone and enough defender stones.
    let replies: Vec<usize> = line
        .moves
        .iter()
        .skip(1)
        .step_by(2)
        .map(|&m| m as usize)
        .collect();
    let (w, h) = (board.width() as i32, board.height() as i32);
    for &b in &replies {
        let pb = board.point(b);
        for dir in crate::geometry::Direction::ALL {
            let (dx, dy) = dir.step();
            // The cell k steps from b along this line, if it is on the board.
            let at = |k: i32| -> Option<usize> {
                let (x, y) = (pb.x as i32 + dx as i32 * k, pb.y as i32 + dy as i32 * k);
                ((0..w).contains(&x) && (0..h).contains(&y))
                    .then(|| board.index(crate::geometry::Point::new(x as u8, y as u8)))
            };
            for t in -4i32..=4 {
                let Some(m) = at(t) else { continue };
                if t == 0 || mark[m] || !board.is_empty_at(m) {
                    continue;
                }
                // Windows of five on this line through both b (offset 0) and m (offset t) that
                // hold no attacker stone and at least four defender stones once m and the
                // line's replies are counted.
                let (lo, hi) = (t.min(0), t.max(0));
                let threat_found = ((hi - 4)..=lo).any(|start| {
                    let mut count = 0;
                    for k in start..start + 5 {
                        match at(k) {
                            Some(c)
                                if k == t || replies.contains(&c) || board.is_stone_at(c, d) =>
                            {
                                count += 1
                            }
                            Some(c) if board.is_empty_at(c) => {}
                            _ => return false,
                        }
                    }
                    count >= 4
                });
                if threat_found {
                    push(m, &mut mark, &mut out);
                }
            }
        }
    }
    out
}

/// Whether the VCF `line` still wins for `attacker` after a defender stone on `m`, replaying it
/// under the same rules as the search (conservatively: any deviation counts as failure).
pub(crate) fn replay_survives(
    board: &mut Board,
    attacker: Stone,
    line: &VcfLine,
    m: usize,
) -> bool {
    board.place_at(m, attacker.opponent());
    let ok = replay(board, attacker, line);
    board.remove_at(m);
    ok
}

/// Replays the VCF `line` (attacker to move) under the search's rules; any deviation from the
/// line counts as failure. Leaves the board as it found it.
fn replay(board: &mut Board, attacker: Stone, line: &VcfLine) -> bool {
    let d = attacker.opponent();
    let mut placed: Vec<usize> = Vec::new();
    let ok = (|| {
        let mut i = 0;
        loop {
            // Attacker to move.
            if !board.cells_with(attacker, threat::FIVE).is_empty() {
                return true;
            }
            let Some(&mv) = line.moves.get(i) else {
                return false;
            };
            let mv = mv as usize;
            let dfives = board.cells_with(d, threat::FIVE);
            if !dfives.is_empty() && (dfives.len() >= 2 || dfives.first() != Some(mv)) {
                return false;
            }
            if !board.is_empty_at(mv)
                || board.flags_at(mv, attacker) & threat::FOUR == 0
                || !board.legal_at(mv, attacker)
            {
                return false;
            }
            board.place_at(mv, attacker);
            placed.push(mv);
            i += 1;
            // Defender to move.
            if !board.cells_with(d, threat::FIVE).is_empty() {
                return false;
            }
            let afives = *board.cells_with(attacker, threat::FIVE);
            if afives.len() >= 2 {
                return true;
            }
            let Some(b) = afives.first() else {
                return false;
            };
            if board.flags_at(b, d) & threat::FIVE == 0 && !board.legal_at(b, d) {
                return true;
            }
            if line.moves.get(i).map(|&x| x as usize) != Some(b) {
                return false;
            }
            board.place_at(b, d);
            placed.push(b);
            i += 1;
        }
    })();
    for &c in placed.iter().rev() {
        board.remove_at(c);
    }
    ok
}

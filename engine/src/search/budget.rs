//! What a question may spend: named node budgets instead of solver settings that callers
//! change and put back.
//!
//! Every question to the solver carries its [`Budget`] (see [`super::Solver::ask`]); nothing
//! about it outlives the question. The named budgets are the ones Fivefold asks with: a grade
//! in the player's browser must answer within a frame or two, a puzzle is only kept if its
//! proof fits the generation budget, a re-proof from a fresh table gets more room, and a
//! question the player asks on the Study board gets the most.

/// Node limits of one question.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash)]
pub struct Budget {
    /// Nodes one proof-number search of the question may expand (the VCF questions inside a
    /// VCT are counted apart, below).
    pub nodes: u64,
    /// Nodes one VCF question inside a VCT may expand.
    pub vcf_question: u64,
    /// Nodes all the VCF questions inside one VCT search may expand together; past it every
    /// further question counts as unknown (so the search ends soon, as `Unknown` unless it was
    /// already proved). `None`: only the per-question limit applies.
    pub vcf_spend: Option<u64>,
    /// Nodes the whole question may spend: every search it makes, the VCF questions inside a
    /// VCT, the searches for each candidate of a list, and reading lines back. A hard limit:
    /// past it the question ends (as `Unknown`, or with the rest of a list undecided).
    pub total: u64,
}

impl Budget {
    /// Grading a move in the player's browser: what a phone answers within a frame or two for
    /// nearly every move (engine/benches/README.md has the measured latencies).
    pub const GRADING: Budget = Budget {
        nodes: 50_000,
        vcf_question: 100_000,
        vcf_spend: Some(150_000),
        total: 1_500_000,
    };

    /// Every search made while generating puzzles: a puzzle whose proof needs more is not
    /// kept, which also keeps grading it quick.
    pub const GENERATION: Budget = Budget {
        nodes: 50_000,
        vcf_question: 100_000,
        vcf_spend: None,
        total: 5_000_000,
    };

    /// The VCT search of a generation aimed at a club-level band (a top of at most 1600): a
    /// line that rates that low is short and its proof small, while the searches that run out
    /// of the generation budget are half of such a generation's time (engine/benches/README.md,
    /// 2026-12-03: the VCTs of club-band candidates took at most 1,607 nodes, the searches
    /// that ran out a median of 92,098). A puzzle whose proof needs more is not kept in such
    /// a set. Its one VCF question inside a VCT keeps the generation's limit (asked through
    /// [`super::Asking::with_budget`], it could not change it anyway).
    pub const AIMED_VCT: Budget = Budget {
        nodes: 10_000,
        vcf_spend: Some(10_000),
        total: 200_000,
        ..Budget::GENERATION
    };

    /// The defences of a generation aimed at a band with several answers allowed (sets the
    /// library never holds): a fifth of the generation's total and two fifths of its nodes per
    /// search. Defences that need more are the dearest questions of such a generation, and
    /// most of them end undecided, which refuses the position anyway (engine/benches/README.md,
    /// 2026-12-04: Strong club defence spent 25 of its 62 s on 38 such positions). A puzzle
    /// whose defences need more is not kept in such a set.
    pub const AIMED_DEFENCE: Budget = Budget {
        nodes: 20_000,
        total: 1_000_000,
        ..Budget::GENERATION
    };

    /// Re-proving a puzzle (`fivefold verify`, the library tests) and settling a listed answer
    /// that the grading budget could not decide: larger than the generator's, because a fresh
    /// table may need more nodes than the generator's warm one did for the same answer.
    pub const VERIFICATION: Budget = Budget {
        nodes: 1_000_000,
        vcf_question: 100_000,
        vcf_spend: None,
        total: 20_000_000,
    };

    /// A question the player asks on the Study board (in the worker, cancellable): three
    /// million nodes in all, whatever the question.
    pub const STUDY: Budget = Budget::total(3_000_000);

    /// The verification budget with another node limit per search (the tests' own limits);
    /// the question's total grows with it.
    pub const fn nodes(nodes: u64) -> Budget {
        let total = if nodes.saturating_mul(20) > Budget::VERIFICATION.total {
            nodes.saturating_mul(20)
        } else {
            Budget::VERIFICATION.total
        };
        Budget {
            nodes,
            total,
            ..Budget::VERIFICATION
        }
    }

    /// At most `nodes` nodes for the whole question, in one search or many (the Study board,
    /// the command line's `--nodes`).
    pub const fn total(nodes: u64) -> Budget {
        Budget {
            nodes,
            vcf_question: 100_000,
            vcf_spend: None,
            total: nodes,
        }
    }
}

use engine::play::{self, PlayerConfig};
use engine::search::{Mode, Solver, SolverConfig};
use engine::{Board, Game, Rule};
use std::time::Instant;

fn main() {
    let rule: Rule = std::env::args()
        .nth(1)
        .unwrap_or("freestyle".into())
        .parse()
        .unwrap();
    let seed: u64 = std::env::args().nth(2).map_or(1, |s| s.parse().unwrap());
    let mut solver = Solver::new(SolverConfig {
        node_limit: 300_000,
        ..Default::default()
    });
    let mut game = Game::new(Board::new(15, rule).unwrap());
    let mut player = play::Player::new(
        seed,
        PlayerConfig {
            depth: 2,
            width: 8,
            noise: 60,
        },
    );
    while !game.is_over() && game.board().stones() < 100 {
        let t = Instant::now();
        let m = player.choose(&game).unwrap();
        let tp = t.elapsed();
        let t = Instant::now();
        let f = solver.solve(game.board(), game.to_move(), Mode::Vcf, None);
        let tf = t.elapsed();
        let t = Instant::now();
        let v = solver.solve(game.board(), game.to_move(), Mode::Vct, None);
        let tv = t.elapsed();
        println!(
            "{:3} {} play {:?} vcf {:?} {} {:?} vct {:?} {} {:?} {}",
            game.board().stones(),
            m,
            tp,
            f.verdict,
            f.nodes,
            tf,
            v.verdict,
            v.nodes,
            tv,
            v.line.len()
        );
        game.play(m).unwrap();
    }
    println!("{}", engine::notation::format_points(game.moves()));
}

use engine::play::{self, PlayerConfig};
use engine::puzzle::generate::analyse;
use engine::puzzle::Theme;
use engine::search::{Solver, SolverConfig};
use engine::{Board, Game, Rule};
use std::time::Instant;

fn main() {
    let mut solver = Solver::new(SolverConfig {
        node_limit: 200_000,
        ..Default::default()
    });
    let mut game = Game::new(Board::new(15, Rule::Freestyle).unwrap());
    let mut player = play::Player::new(
        3,
        PlayerConfig {
            depth: 2,
            width: 8,
            noise: 60,
        },
    );
    let mut total = std::time::Duration::ZERO;
    while !game.is_over() && game.board().stones() < 80 {
        if game.board().stones() >= 8 {
            let t = Instant::now();
            let p = analyse(&mut solver, game.board(), game.to_move(), Theme::Defend);
            let e = t.elapsed();
            total += e;
            println!(
                "{:3} {:?} {}",
                game.board().stones(),
                e,
                p.map_or("-".to_string(), |p| format!(
                    "{} defences",
                    p.first_moves.len()
                ))
            );
        }
        let m = player.choose(&game).unwrap();
        game.play(m).unwrap();
    }
    println!("total {:?}", total);
}

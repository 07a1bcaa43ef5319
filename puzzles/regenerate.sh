#!/usr/bin/env bash
# Regenerates the starter library from its fixed seeds (the table in README.md), then
# re-proves every set. Run from anywhere: ./puzzles/regenerate.sh
set -euo pipefail
cd "$(dirname "${BASH_SOURCE[0]}")/.."
cargo build --release -q --bin fivefold
F="${CARGO_TARGET_DIR:-target}/release/fivefold"
CREATED=2026-12-01
# file                theme           rule       count  seed  rating      title
while read -r file theme rule count seed rating title; do
    [ -z "$file" ] && continue
    case "$file" in \#*) continue ;; esac
    echo "==> puzzles/$file.json ($count $theme, $rule, seed $seed, rating $rating)"
    "$F" generate --theme "$theme" --rule "$rule" --count "$count" --seed "$seed" \
        --rating "$rating" --created "$CREATED" --title "$title" --out "puzzles/$file.json" --quiet
done <<'SETS'
four-threes-freestyle   four-three      freestyle  30  101  600-2600   Four-threes (freestyle)
four-threes-renju       four-three      renju      20  102  600-2600   Four-threes (renju)
fours-freestyle-club    vcf             freestyle  30  201  600-1450   Win with fours: club (freestyle)
fours-freestyle-strong  vcf             freestyle  25  202  1451-2600  Win with fours: strong (freestyle)
fours-standard          vcf             standard   25  203  600-2600   Win with fours (standard)
fours-renju             vcf             renju      25  204  600-2600   Win with fours (renju)
threats-freestyle       vct             freestyle  30  301  600-2600   Win with threes and fours (freestyle)
threats-standard        vct             standard   15  302  600-2600   Win with threes and fours (standard)
threats-renju           vct             renju      15  303  600-2600   Win with threes and fours (renju)
defence-freestyle       defend          freestyle  30  401  600-2600   Stop the attack (freestyle)
defence-standard        defend          standard   15  402  600-2600   Stop the attack (standard)
defence-renju           defend          renju      15  403  600-2600   Stop the attack (renju)
renju-traps             forbidden-trap  renju      20  501  600-2600   Forbidden-point traps (renju, White)
renju-forbidden-wins    forbidden-win   renju      20  502  600-2600   Past the forbidden points (renju, Black)
SETS
for f in puzzles/*.json; do "$F" verify "$f" --quiet; done

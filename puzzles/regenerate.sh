#!/usr/bin/env bash
# Regenerates the starter library from its fixed seeds (the table in README.md), then
# re-proves every set. Run from anywhere: ./puzzles/regenerate.sh [FILE...] (only those sets)
set -euo pipefail
cd "$(dirname "${BASH_SOURCE[0]}")/.."
cargo build --release -q --bin fivefold
F="${CARGO_TARGET_DIR:-target}/release/fivefold"
CREATED=2026-12-01
# Every set keeps only puzzles with one correct first move (--unique). `moves` > 0 makes a
# deep set: at least that many attacker moves before the winning one (--min-moves).
# file                  theme           rule       count seed  rating     moves title
while read -r file theme rule count seed rating moves title; do
    [ -z "$file" ] && continue
    case "$file" in \#*) continue ;; esac
    if [ $# -gt 0 ] && [[ " $* " != *" $file "* ]]; then continue; fi
    echo "==> puzzles/$file.json ($count $theme, $rule, seed $seed, rating $rating, moves $moves)"
    "$F" generate --theme "$theme" --rule "$rule" --count "$count" --seed "$seed" \
        --rating "$rating" --min-moves "$moves" --unique --created "$CREATED" \
        --title "$title" --out "puzzles/$file.json" --quiet
done <<'SETS'
four-threes-freestyle   four-three      freestyle  30  101  600-2600   0  Four-threes (freestyle)
four-threes-renju       four-three      renju      20  102  600-2600   0  Four-threes (renju)
fours-freestyle-club    vcf             freestyle  30  201  600-1450   0  Win with fours: club (freestyle)
fours-freestyle-strong  vcf             freestyle  25  202  1451-2600  0  Win with fours: strong (freestyle)
fours-standard          vcf             standard   25  203  600-2600   0  Win with fours (standard)
fours-renju             vcf             renju      25  204  600-2600   0  Win with fours (renju)
threats-freestyle       vct             freestyle  30  301  600-2600   0  Win with threes and fours (freestyle)
threats-standard        vct             standard   15  302  600-2600   0  Win with threes and fours (standard)
threats-renju           vct             renju      15  303  600-2600   0  Win with threes and fours (renju)
defence-freestyle       defend          freestyle  30  401  600-2600   0  Stop the attack (freestyle)
defence-standard        defend          standard   15  402  600-2600   0  Stop the attack (standard)
defence-renju           defend          renju      15  403  600-2600   0  Stop the attack (renju)
renju-traps             forbidden-trap  renju      20  501  600-2600   0  Forbidden-point traps (renju, White)
renju-forbidden-wins    forbidden-win   renju      20  502  600-2600   0  Past the forbidden points (renju, Black)
deep-fours-freestyle    vcf             freestyle  12  601  1900-2600  10 Deep fours (freestyle)
deep-fours-standard     vcf             standard   12  602  1900-2600  10 Deep fours (standard)
deep-fours-renju        vcf             renju      12  603  1900-2600  10 Deep fours (renju)
deep-threats-freestyle  vct             freestyle  12  701  1900-2600  6  Deep threats (freestyle)
deep-threats-standard   vct             standard   12  702  1900-2600  6  Deep threats (standard)
deep-threats-renju      vct             renju      12  703  1900-2600  6  Deep threats (renju)
hard-defences-freestyle defend          freestyle  6   801  1900-2600  5  Hard defences (freestyle)
hard-defences-standard  defend          standard   6   802  1900-2600  5  Hard defences (standard)
hard-defences-renju     defend          renju      6   803  1900-2600  5  Hard defences (renju)
SETS
for f in puzzles/*.json; do "$F" verify "$f" --quiet; done

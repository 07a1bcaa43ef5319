#!/usr/bin/env bash
# Runs every test of the project, in order, and stops at the first failure:
#   formatting, clippy, the native tests of the whole workspace, the engine's wasm build,
#   the browser tests of web/ (wasm-bindgen-test in headless Chromium), then builds the app,
#   checks its weight against the budgets and runs the end-to-end tests (node:test +
#   playwright-core) against it.
# Tools that are missing (wasm target, wasm-bindgen-cli, chromium, npm packages) are installed
# first. Respects CARGO_TARGET_DIR.
set -uo pipefail
# shellcheck source=common.sh
source "$(dirname "${BASH_SOURCE[0]}")/common.sh"

LOGS="$(mktemp -d)"
trap 'rm -rf "$LOGS"' EXIT

NAMES=()
TIMES=()
STARTED=$EPOCHREALTIME

elapsed() { # start time -> seconds since, one decimal
    awk -v a="$1" -v b="$EPOCHREALTIME" 'BEGIN { printf "%.1f", b - a }'
}

# Test counts over every log so far: cargo's and the wasm runner's "test result:" lines, and
# node's TAP "# pass" / "# fail" lines.
count() {
    cat "$LOGS"/*.log 2>/dev/null | awk '
        /^test result: / {
            for (i = 1; i <= NF; i++) {
                if ($(i) ~ /^passed/) p += $(i - 1)
                if ($(i) ~ /^failed/) f += $(i - 1)
            }
        }
        /^# pass / { p += $3 }
        /^# fail / { f += $3 }
        END { printf "%d passed, %d failed", p, f }'
}

summary() {
    step "Summary"
    local i
    for i in "${!NAMES[@]}"; do
        printf '    %-4s %-76s %6ss\n' "${STATES[$i]}" "${NAMES[$i]}" "${TIMES[$i]}"
    done
}

STATES=()

# run NAME COMMAND... : runs one step from the repository root, logging its output.
run() {
    local name="$1"
    shift
    step "$name"
    local start=$EPOCHREALTIME
    local log
    log="$LOGS/$(printf '%02d' "${#NAMES[@]}").log"
    (cd "$ROOT" && "$@") 2>&1 | tee "$log"
    local rc=${PIPESTATUS[0]}
    NAMES+=("$name")
    TIMES+=("$(elapsed "$start")")
    if [ "$rc" -ne 0 ]; then
        STATES+=("FAIL")
        summary
        printf '\ntest.sh: FAILED at "%s" (exit code %s). Later steps were not run.\n' "$name" "$rc"
        echo "tests: $(count)"
        exit 1
    fi
    STATES+=("ok")
}

setup() {
    need_rust_components
    need_wasm_target
    need_wasm_bindgen
    need_chromium
    need_node_modules
    note "rustc $(rustc --version | cut -d' ' -f2), $(wasm-bindgen --version)," \
        "$("$CHROMIUM" --version 2>/dev/null | head -n1), node $(node --version)"
}

browser_tests() {
    CARGO_TARGET_WASM32_UNKNOWN_UNKNOWN_RUNNER=wasm-bindgen-test-runner \
        CHROMEDRIVER="$CHROMEDRIVER_BIN" \
        WASM_BINDGEN_TEST_WEBDRIVER_JSON="$WEB_DIR/webdriver.json" \
        cargo test --target "$WASM_TARGET" -p fivefold-web --tests
}

e2e_tests() {
    local files=("$WEB_DIR"/e2e/*.test.mjs)
    [ -f "${files[0]}" ] || die "no end-to-end tests in $WEB_DIR/e2e"
    node --test --test-reporter=tap "${files[@]}"
}

run "Checking tools (installing any that are missing)" setup
run "Formatting: cargo fmt --all -- --check" cargo fmt --all -- --check
run "Lints: cargo clippy --workspace --all-targets -- -D warnings" \
    cargo clippy --workspace --all-targets -- -D warnings
run "Native tests: cargo test --workspace" cargo test --workspace
run "Engine for wasm: cargo check -p fivefold-engine --target $WASM_TARGET" \
    cargo check -p fivefold-engine --target "$WASM_TARGET"
run "Browser tests of web/ (wasm-bindgen-test, headless Chromium)" browser_tests
run "Building the app into web/dist" build_app
run "Page weight within its budgets (web/tools/weight.mjs --check)" node "$WEB_DIR/tools/weight.mjs" --check
run "End-to-end tests (node --test, playwright-core, web/e2e)" e2e_tests

summary
printf '\ntest.sh: all %d steps passed in %ss.\n' "${#NAMES[@]}" "$(elapsed "$STARTED")"
echo "tests: $(count)"

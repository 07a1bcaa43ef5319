# Shared set-up and build steps for serve.sh and test.sh. Source it; do not run it.
#
# Each `need_*` function installs one missing tool and says so; each does nothing when the
# tool is already there. `build_app` builds the web app into web/dist (or $DIST).

# The repository root and the web crate, whatever the caller's working directory.
WEB_DIR="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
ROOT="$(cd "$WEB_DIR/.." && pwd)"
DIST="$WEB_DIR/dist"

WASM_TARGET=wasm32-unknown-unknown
BINDGEN_VERSION=0.2.130
CHROMIUM=/usr/bin/chromium
CHROMEDRIVER_BIN=/usr/bin/chromedriver

# cargo resolves a relative CARGO_TARGET_DIR against the directory it runs in; the scripts run
# cargo from the root, so pin a relative value to the caller's directory first.
if [ -n "${CARGO_TARGET_DIR:-}" ]; then
    case "$CARGO_TARGET_DIR" in
        /*) ;;
        *) CARGO_TARGET_DIR="$PWD/$CARGO_TARGET_DIR" ;;
    esac
    export CARGO_TARGET_DIR
fi

export PATH="$HOME/.cargo/bin:$PATH"

step() {
    printf '\n==> %s\n' "$*"
}

note() {
    printf '    %s\n' "$*"
}

die() {
    printf '\nERROR: %s\n' "$*" >&2
    exit 1
}

# Runs a command as root: directly when we are root, through sudo otherwise.
as_root() {
    if [ "$(id -u)" = 0 ]; then
        "$@"
    else
        command -v sudo >/dev/null || die "need root (or sudo) to run: $*"
        sudo "$@"
    fi
}

need_rust_components() {
    local have
    have="$(rustup component list --installed 2>/dev/null || true)"
    for c in rustfmt clippy; do
        if ! grep -q "^$c" <<<"$have"; then
            step "Installing the Rust component $c"
            rustup component add "$c" || die "rustup component add $c failed"
        fi
    done
}

need_wasm_target() {
    if rustup target list --installed 2>/dev/null | grep -qx "$WASM_TARGET"; then
        return 0
    fi
    step "Installing the Rust target $WASM_TARGET (rustup target add $WASM_TARGET)"
    rustup target add "$WASM_TARGET" || die "rustup target add $WASM_TARGET failed"
}

need_wasm_bindgen() {
    if wasm-bindgen --version 2>/dev/null | grep -q " $BINDGEN_VERSION\$" &&
        wasm-bindgen-test-runner --version 2>/dev/null | grep -q " $BINDGEN_VERSION\$"; then
        return 0
    fi
    step "Installing wasm-bindgen-cli $BINDGEN_VERSION (cargo install; takes a few minutes once)"
    cargo install wasm-bindgen-cli --version "$BINDGEN_VERSION" ||
        die "cargo install wasm-bindgen-cli --version $BINDGEN_VERSION failed"
    wasm-bindgen --version | grep -q " $BINDGEN_VERSION\$" ||
        die "wasm-bindgen on PATH is not $BINDGEN_VERSION: $(command -v wasm-bindgen)"
}

need_chromium() {
    if [ -x "$CHROMIUM" ] && [ -x "$CHROMEDRIVER_BIN" ]; then
        return 0
    fi
    step "Installing chromium and chromium-driver (apt-get)"
    as_root env DEBIAN_FRONTEND=noninteractive apt-get update ||
        die "apt-get update failed"
    as_root env DEBIAN_FRONTEND=noninteractive apt-get install -y chromium chromium-driver ||
        die "apt-get install chromium chromium-driver failed"
    [ -x "$CHROMIUM" ] && [ -x "$CHROMEDRIVER_BIN" ] ||
        die "chromium or chromedriver is still missing after apt-get install"
}

# The e2e tests' npm packages (playwright-core, no browser download; axe-core) from
# web/package-lock.json: installed when any of them is missing or at another version.
need_node_modules() {
    local pkg want have
    for pkg in playwright-core axe-core esbuild @gfx/zopfli; do
        want="$(node -p "require('$WEB_DIR/package-lock.json').packages['node_modules/$pkg'].version")" ||
            die "cannot read web/package-lock.json"
        have="$(node -p "require('$WEB_DIR/node_modules/$pkg/package.json').version" 2>/dev/null || true)"
        if [ "$want" != "$have" ]; then
            step "Installing the build and test packages (npm ci in web/: $pkg $want is missing)"
            (cd "$WEB_DIR" && PLAYWRIGHT_SKIP_BROWSER_DOWNLOAD=1 npm ci --no-audit --no-fund) ||
                die "npm ci in web/ failed"
            return 0
        fi
    done
}

# Where cargo puts its output for this workspace (honours CARGO_TARGET_DIR and cargo config).
target_dir() {
    (cd "$ROOT" && cargo metadata --format-version 1 --no-deps) |
        python3 -c 'import json, sys; print(json.load(sys.stdin)["target_directory"])'
}

# The app's static files, copied as they are into $DIST.
APP_FILES=(index.html style.css icon.svg manifest.webmanifest sw.js
    app.js board.js drill.js jobs.js library.js platform.js practice.js progress.js revisit.js scan.js sounds.js store.js study.js tonight.js ui.js worker.js coach.js coach-data.js lanes.js games.js games-data.js)

need_node() {
    command -v node >/dev/null || die "node (Node.js 18 or later) is needed to build the app"
}

# Builds the app into $DIST: two builds of the web crate, the page's module (without the
# `workshop` feature: the board, grading, practice, codes; $DIST/pkg) and the workshop module
# (everything: generation, searches, reviews, Coach's sheet and class table; $DIST/workshop,
# loaded by the worker and on first use of Coach), with their bindings (name section
# removed); the camera scanner's QR reader (web/scan, its own small wasm module in $DIST/scan,
# loaded only when scanning starts); the page's files, the PNG icons and the stamped service
# worker (tools/stamp.mjs), and the single-file build $DIST/fivefold.html (tools/single.mjs).
# The page's module is built for size (Cargo.toml, profile.page), the workshop for speed.
build_app() {
    need_wasm_target
    need_wasm_bindgen
    need_node
    need_node_modules
    local target out page f
    target="$(target_dir)" || die "cargo metadata failed"
    out="$target/$WASM_TARGET/release"
    page="$target/$WASM_TARGET/page"
    rm -rf "$DIST"
    mkdir -p "$DIST/pkg" "$DIST/workshop" "$DIST/scan"
    step "Building the page's wasm module (cargo build --profile page --target $WASM_TARGET -p fivefold-web --no-default-features)"
    (cd "$ROOT" && cargo build --profile page --target "$WASM_TARGET" -p fivefold-web --no-default-features) ||
        die "the wasm build of the page's module failed"
    [ -f "$page/fivefold_web.wasm" ] || die "no $page/fivefold_web.wasm after the build"
    wasm-bindgen --target web --no-typescript --remove-name-section --out-dir "$DIST/pkg" "$page/fivefold_web.wasm" ||
        die "wasm-bindgen failed on the page's module"
    step "Building the workshop and scanner modules (cargo build --release --target $WASM_TARGET -p fivefold-web -p fivefold-scan)"
    (cd "$ROOT" && cargo build --release --target "$WASM_TARGET" -p fivefold-web -p fivefold-scan) ||
        die "the wasm build of the workshop module failed"
    [ -f "$out/fivefold_scan.wasm" ] || die "no $out/fivefold_scan.wasm after the build"
    step "Generating the bindings and copying the page into $DIST"
    wasm-bindgen --target web --no-typescript --remove-name-section --out-dir "$DIST/workshop" "$out/fivefold_web.wasm" ||
        die "wasm-bindgen failed on the workshop module"
    wasm-bindgen --target web --no-typescript --remove-name-section --out-dir "$DIST/scan" "$out/fivefold_scan.wasm" ||
        die "wasm-bindgen failed on the scanner"
    # The single file's one module: the workshop's code built for size like the page's module
    # (the single file must stay small enough to pass from phone to phone; its searches run
    # about half as fast as the served workshop's). Kept outside $DIST: only single.mjs reads it.
    step "Building the single file's module (cargo build --profile page --target $WASM_TARGET -p fivefold-web)"
    (cd "$ROOT" && cargo build --profile page --target "$WASM_TARGET" -p fivefold-web) ||
        die "the wasm build of the single file's module failed"
    rm -rf "$target/single-module"
    wasm-bindgen --target web --no-typescript --remove-name-section --out-dir "$target/single-module" "$page/fivefold_web.wasm" ||
        die "wasm-bindgen failed on the single file's module"
    for f in "${APP_FILES[@]}"; do
        cp "$WEB_DIR/$f" "$DIST/$f" || die "copying $f failed"
    done
    # The starter library's sets, minified, one file each (the page fetches a set when it opens it).
    # Whitespace outside strings is dropped and nothing else, so every number keeps its digits
    # (a parse and re-print would round integers past 2^53); the result must parse to the same value.
    mkdir -p "$DIST/library"
    node -e 'const fs = require("fs"), path = require("path"), { isDeepStrictEqual } = require("util");
        const [from, to] = process.argv.slice(1);
        for (const f of fs.readdirSync(from).filter((f) => f.endsWith(".json"))) {
          const text = fs.readFileSync(path.join(from, f), "utf8");
          let out = "", inString = false, escaped = false;
          for (const c of text) {
            if (inString) { out += c; if (escaped) escaped = false; else if (c === "\\") escaped = true; else if (c === "\"") inString = false; }
            else if (c === "\"") { inString = true; out += c; }
            else if (!" \t\r\n".includes(c)) out += c;
          }
          if (!isDeepStrictEqual(JSON.parse(out), JSON.parse(text))) throw new Error(`${f}: minified set differs`);
          fs.writeFileSync(path.join(to, f), out);
        }' \
        "$ROOT/puzzles" "$DIST/library" || die "copying the starter library failed"
    # The single file is pasted from the readable modules (and minified whole), then the
    # served files are minified one by one, then the service worker's list is stamped.
    step "Building the single-file app ($DIST/fivefold.html)"
    node "$WEB_DIR/tools/single.mjs" "$DIST" "$target/single-module" || die "the single-file build failed"
    node "$WEB_DIR/tools/minify.mjs" "$DIST" || die "minifying the scripts failed"
    node "$WEB_DIR/tools/stamp.mjs" "$DIST" || die "stamping the service worker failed"
    note "built $(du -sb "$DIST" | cut -f1) bytes in $DIST"
}

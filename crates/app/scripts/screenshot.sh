#!/usr/bin/env bash
# Takes PNG screenshots of the workbench under a virtual X display (no GPU needed: glow on Mesa's
# software OpenGL). Usage: crates/app/scripts/screenshot.sh [PROJECT.ron OUTPUT.png]...
# With no arguments it shoots the built-in demo and the second demo project in assets/demo/.
# SALTWISE_BIN=path uses a binary already built; SCREEN=WxHxD sets the screen size and
# WINDOW=W,H the window's.
set -euo pipefail
cd "$(dirname "$0")/../../.."

need() { command -v "$1" >/dev/null 2>&1; }
if ! need Xvfb || ! need import; then
    apt-get update -qq
    apt-get install -y -qq --no-install-recommends xvfb x11-apps imagemagick
fi

# SALTWISE_BIN runs a binary already built (a debug build is enough to look at the layout).
if [ -n "${SALTWISE_BIN:-}" ]; then
    bin=$SALTWISE_BIN
else
    cargo build --release -p saltwise
    bin=./target/release/saltwise
fi

if [ "$#" -eq 0 ]; then
    set -- "" docs/screenshots/main-demo.png \
        assets/demo/tidewater-degreaser.ron docs/screenshots/main-degreaser.png
fi

display=:99
# SCREEN sets the size of the virtual screen, e.g. 640x480x24 for the smallest window.
Xvfb "$display" -screen 0 "${SCREEN:-1600x1000x24}" -nolisten tcp &
xvfb_pid=$!
config_dir=$(mktemp -d)
cleanup() {
    kill "$xvfb_pid" 2>/dev/null || true
    rm -rf "$config_dir"
}
trap cleanup EXIT
# WINDOW=W,H opens the window at that size (the settings file the workbench reads at start).
if [ -n "${WINDOW:-}" ]; then
    printf '(window_size: Some((%s)))\n' "$WINDOW" >"$config_dir/workbench.ron"
fi
sleep 2

while [ "$#" -ge 2 ]; do
    project=$1
    out=$2
    shift 2
    args=()
    [ -n "$project" ] && args+=("$project")
    env -u WAYLAND_DISPLAY DISPLAY="$display" LIBGL_ALWAYS_SOFTWARE=1 \
        SALTWISE_CONFIG_DIR="$config_dir" "$bin" "${args[@]}" &
    app_pid=$!
    sleep 8
    DISPLAY="$display" import -window root "$out"
    kill "$app_pid" 2>/dev/null || true
    wait "$app_pid" 2>/dev/null || true
    echo "wrote $out"
done

#!/usr/bin/env bash
# Kill-and-recover check of the real workbench binary under a virtual X display.
#
# Starts `saltwise` on the demo project with its own config and data folders, renames the project
# the way a person does (click the name field, select all, type), waits for the copy of unsaved
# work to appear in the data folder, kills the process with SIGKILL, starts it again, checks that
# the copy is offered back (log line and the strip under the menu), clicks "Recover it" and checks
# the window title. Screenshots of both starts go to target/kill-and-recover/.
#
# Usage: crates/app/scripts/kill_and_recover.sh [ROUNDS]   (default 1; PROFILE=release to use
# the release build; SALTWISE_BIN=PATH to use a binary already built). Needs Xvfb and xdotool
# (installed with apt-get when missing); ImageMagick's
# `import`, when present, takes the screenshots. About 11 s a round on 2 cores, debug build.
set -euo pipefail
cd "$(dirname "$0")/../../.."

rounds=${1:-1}
profile=${PROFILE:-debug}
need() { command -v "$1" >/dev/null 2>&1; }
if ! need Xvfb || ! need xdotool; then
    apt-get update -qq
    apt-get install -y -qq --no-install-recommends xvfb xdotool >/dev/null
fi
shot() { if need import; then import -window root "$1"; fi; }
if [ -n "${SALTWISE_BIN:-}" ]; then
    # A binary already built (CI passes the one `cargo test` built, saving a second build).
    bin=$(realpath "$SALTWISE_BIN")
else
    if [ "$profile" = release ]; then
        cargo build --release -p saltwise
    else
        cargo build -p saltwise
    fi
    bin=$PWD/target/$profile/saltwise
fi
out=$PWD/target/kill-and-recover
mkdir -p "$out"

# A display number nobody uses.
display=
for n in $(seq 90 130); do
    if [ ! -e "/tmp/.X11-unix/X$n" ] && [ ! -e "/tmp/.X$n-lock" ]; then
        display=:$n
        break
    fi
done
[ -n "$display" ] || { echo "kill-and-recover: no free X display" >&2; exit 1; }

work=$(mktemp -d)
xvfb_pid=
app_pid=
cleanup() {
    [ -n "$app_pid" ] && kill "$app_pid" 2>/dev/null || true
    [ -n "$xvfb_pid" ] && kill "$xvfb_pid" 2>/dev/null || true
    rm -rf "$work"
}
trap cleanup EXIT
# -noreset: by default the server resets when its last client leaves, and a window opening
# during the reset fails to connect.
Xvfb "$display" -screen 0 1600x1000x24 -nolisten tcp -noreset >"$work/xvfb.log" 2>&1 &
xvfb_pid=$!
export DISPLAY=$display
for _ in $(seq 1 50); do xdotool getdisplaygeometry >/dev/null 2>&1 && break; sleep 0.1; done

fail() {
    echo "kill-and-recover: FAILED: $*" >&2
    echo "--- log of the last start:" >&2
    cat "$work/log" >&2 || true
    echo "--- X server log:" >&2
    cat "$work/xvfb.log" >&2 || true
    shot "$out/failure.png" 2>/dev/null && echo "screenshot: $out/failure.png" >&2
    exit 1
}

start_app() {
    env -u WAYLAND_DISPLAY LIBGL_ALWAYS_SOFTWARE=1 \
        SALTWISE_CONFIG_DIR="$work/config" SALTWISE_DATA_DIR="$work/data" \
        "$bin" >"$work/log" 2>&1 &
    app_pid=$!
    for _ in $(seq 1 120); do
        xdotool search --name "Saltwise" >/dev/null 2>&1 && break
        sleep 0.25
    done
    xdotool search --name "Saltwise" >/dev/null 2>&1 || fail "no window appeared"
    sleep 2 # the first frames (software OpenGL)
    # No window manager runs: give the window the keyboard and rest the pointer on it.
    xdotool search --name "Saltwise" windowfocus --sync 2>/dev/null || true
    xdotool mousemove 800 500
    sleep 0.3
}

title() { xdotool search --name "Saltwise" getwindowname %@ 2>/dev/null | head -1; }

# A click as a hand makes it: move, rest, press, release.
click() {
    xdotool mousemove "$1" "$2"
    sleep 0.3
    xdotool mousedown 1
    sleep 0.1
    xdotool mouseup 1
    sleep 0.3
}

wait_for_title() {
    for _ in $(seq 1 40); do
        [ "$(title)" = "$1" ] && return 0
        sleep 0.25
    done
    fail "title is '$(title)', expected '$1'"
}

for round in $(seq 1 "$rounds"); do
    name="Kill test $round-$RANDOM"
    rm -rf "$work/data" "$work/config"
    start_app
    # The project name field sits in the menu bar, right of "Project".
    click 340 11
    xdotool key ctrl+a
    xdotool type --delay 30 "$name"
    wait_for_title "• $name — Saltwise"
    edit_s=$SECONDS
    copy=
    for _ in $(seq 1 60); do
        copy=$(ls "$work"/data/unsaved-*.ron 2>/dev/null | head -1 || true)
        [ -n "$copy" ] && grep -qF "name: \"$name\"" "$copy" && break
        copy=
        sleep 0.25
    done
    [ -n "$copy" ] || fail "no copy of the unsaved work in $work/data"
    echo "round $round: copy of unsaved work written about $((SECONDS - edit_s)) s after the edit"
    shot "$out/before-kill.png"

    kill -KILL "$app_pid"
    wait "$app_pid" 2>/dev/null || true
    app_pid=
    [ -f "$copy" ] || fail "the copy vanished with the process"

    start_app
    grep -qF "offered for recovery: $copy" "$work/log" || fail "no recovery offer in the log"
    shot "$out/after-restart.png"
    # "Recover it" is the first button of the strip under the menu.
    click 52 61
    wait_for_title "• $name — Saltwise"
    sleep 0.5
    kept=$(ls "$work"/data/unsaved-*.ron 2>/dev/null || true)
    [ "$(echo "$kept" | wc -l)" -eq 1 ] && [ "$kept" != "$copy" ] \
        || fail "the recovered copy should be the new session's own, found: $kept"
    grep -qF "name: \"$name\"" "$kept" || fail "the new session's copy lacks the edit"
    kill "$app_pid"
    wait "$app_pid" 2>/dev/null || true
    app_pid=
    echo "round $round: killed with SIGKILL, restarted, offered, recovered: ok"
done
echo "kill-and-recover: $rounds round(s) passed; screenshots in $out"

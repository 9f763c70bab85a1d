#!/usr/bin/env bash
# The test command: installs what the tests need on a fresh machine, then runs every test.
#   - Python's fontTools (tests/requirements.txt), used as an independent font reader;
#   - Debian's chromium, used to render the HTML report headless (installed when missing).
set -euo pipefail
cd "$(dirname "$0")"

if ! python3 -c "import fontTools" >/dev/null 2>&1; then
    python3 -m pip install --quiet --disable-pip-version-check -r tests/requirements.txt
fi

if ! command -v chromium >/dev/null 2>&1; then
    apt-get update -qq
    DEBIAN_FRONTEND=noninteractive apt-get install -y -qq chromium >/dev/null
fi

log=$(mktemp)
trap 'rm -f "$log"' EXIT
status=0
cargo test --release --all-targets 2>&1 | tee "$log" || status=$?
# One closing line over every test binary, so the total is visible at the end.
awk '/^test result:/ { for (i = 1; i <= NF; i++) { if ($(i+1) ~ /^passed/) p += $i; if ($(i+1) ~ /^failed/) f += $i } }
     END { printf "tests: %d passed, %d failed\n", p, f }' "$log"
if [ "$status" -ne 0 ] && ! grep -q '^test result: FAILED' "$log"; then
    echo "tests: a test binary or the build did not finish (see above)"
fi
exit "$status"

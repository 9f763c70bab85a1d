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

cargo test --release --all-targets

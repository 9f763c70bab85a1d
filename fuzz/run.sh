#!/usr/bin/env bash
# Run every fuzz target for SECONDS each (default 600), one after the other, with libFuzzer via
# cargo-fuzz. Works on a stable toolchain: RUSTC_BOOTSTRAP=1 lets stable rustc accept the
# sanitizer flags cargo-fuzz passes. Crashes land in fuzz/artifacts/<target>/; the corpus in
# fuzz/corpus/<target>/ (both ignored by git). Usage: fuzz/run.sh [SECONDS] [TARGET...]
set -euo pipefail
cd "$(dirname "$0")"
secs="${1:-600}"
shift || true
export RUSTC_BOOTSTRAP=1
command -v cargo-fuzz >/dev/null || cargo install cargo-fuzz
targets=("$@")
if [ ${#targets[@]} -eq 0 ]; then
    mapfile -t targets < <(cargo fuzz list)
fi
cargo fuzz build -O
status=0
for t in "${targets[@]}"; do
    mkdir -p "corpus/$t"
    echo "== $t: ${secs}s"
    # -rss_limit_mb: an input that needs more memory than this is reported as an OOM;
    # -timeout: one input running longer than this is reported as a hang.
    if ! cargo fuzz run -O "$t" "corpus/$t" seeds/"$t" -- \
        -max_total_time="$secs" -rss_limit_mb=2048 -timeout=10 -max_len=65536 \
        -print_final_stats=1; then
        echo "== $t: FAILED (see fuzz/artifacts/$t/)"
        status=1
    fi
done
exit $status

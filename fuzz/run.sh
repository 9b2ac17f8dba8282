#!/bin/sh
# Runs the fuzz targets one after another, one libFuzzer job at a time, each from the committed
# corpus (seeds/TARGET) plus what earlier runs found (corpus/TARGET, not committed).
#
#   fuzz/run.sh                 every target, 10 minutes each
#   fuzz/run.sh sheet 3600      one target for an hour
#   fuzz/run.sh minimize [TARGET]  fold corpus/ into seeds/, keeping inputs that add coverage
#
# Needs cargo-fuzz (`cargo install cargo-fuzz`). The toolchain is stable: RUSTC_BOOTSTRAP=1 lets
# it take the flags cargo-fuzz passes. AddressSanitizer is off by default (FUZZ_SANITIZER=address
# turns it on): the crate forbids unsafe code, and without it a run makes several times more
# executions; debug assertions and overflow checks stay on. A crash or hang is saved under artifacts/TARGET;
# replay it with `cargo fuzz run TARGET artifacts/TARGET/FILE`, then add it to seeds/TARGET so
# `cargo test` keeps it fixed.
set -eu
cd "$(dirname "$0")"
export RUSTC_BOOTSTRAP=1
TARGETS="sheet parsers session"
SANITIZER=${FUZZ_SANITIZER:-none}

fuzz_one() {
    target=$1
    seconds=$2
    mkdir -p "corpus/$target" "seeds/$target"
    cargo fuzz run --sanitizer "$SANITIZER" "$target" "corpus/$target" "seeds/$target" -- \
        -dict=fluxsheet.dict -max_total_time="$seconds" -timeout=10 -rss_limit_mb=2048 \
        -max_len=4096 -print_final_stats=1
}

minimize() {
    for target in $*; do
        work="corpus/$target.all"
        rm -rf "$work"
        mkdir -p "$work" "corpus/$target"
        cp seeds/"$target"/* corpus/"$target"/* "$work"/ 2>/dev/null || true
        # Edges only (no hit counts): the committed corpus stays a few hundred files.
        cargo fuzz cmin --sanitizer "$SANITIZER" "$target" "$work" -- -use_counters=0 -set_cover_merge=1 \
            -max_len=4096
        rm -rf "seeds/$target"
        mv "$work" "seeds/$target"
        echo "$target: $(ls "seeds/$target" | wc -l) inputs kept"
    done
}

case "${1:-all}" in
    minimize) shift; minimize ${*:-$TARGETS} ;;
    all) for target in $TARGETS; do fuzz_one "$target" "${2:-600}"; done ;;
    *) fuzz_one "$1" "${2:-600}" ;;
esac

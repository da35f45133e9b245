#!/usr/bin/env bash
# npm start: runs the built server (.output/server/index.mjs) with the process settings it is
# measured with. The render workers allocate and free many large pixel buffers; with glibc's
# default sliding mmap threshold those land in per-thread arenas that are never given back, so
# every worker keeps its high-water mark. A fixed threshold (scripts/malloc-tunables, see
# mallopt(3), M_MMAP_THRESHOLD) maps each large buffer on its own and returns it when freed.
# A GLIBC_TUNABLES already set is kept as it is.
set -euo pipefail
cd "$(dirname "$0")/.."
export GLIBC_TUNABLES="${GLIBC_TUNABLES:-$(cat scripts/malloc-tunables)}"
exec node .output/server/index.mjs "$@"

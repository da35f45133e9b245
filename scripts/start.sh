#!/usr/bin/env bash
# npm start: runs the built server (.output/server/index.mjs) with the process settings it is
# measured with. The render workers allocate and free many large pixel buffers; with glibc's
# default sliding mmap threshold those land in per-thread arenas that are never given back, so
# every worker keeps its high-water mark. scripts/malloc-tunables (see mallopt(3)) fixes
# M_MMAP_THRESHOLD at 4 MB, so the largest buffers (a decoded upload) are mapped on their own and
# returned when freed, and caps the arenas at two (M_ARENA_MAX). A lower threshold (1 MB) also
# mapped every rendering's buffers: each map and unmap takes the process's memory-map lock and
# faults the pages in again, and two render workers then ran at 1.57x one instead of 1.72x.
# A GLIBC_TUNABLES already set is kept as it is.
set -euo pipefail
cd "$(dirname "$0")/.."
export GLIBC_TUNABLES="${GLIBC_TUNABLES:-$(cat scripts/malloc-tunables)}"
exec node .output/server/index.mjs "$@"

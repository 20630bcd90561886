#!/usr/bin/env bash
# The exhaustive check of the f32 softplus polynomial (docs/benchmarks.md, "f32 softplus"): generates an f32 scorer
# for the demo model, copies its softplus function into softplus_under_test.c, and runs check.c over every
# non-negative float in two processes. Usage: tools/softplus-check/run.sh [stride]   (default 1: every float)
set -euo pipefail
here="$(cd "$(dirname "$0")" && pwd)"
root="$here/../.."
work="${WORK:-$(mktemp -d)}"
dotnet run --project "$root/src/Emit.Cli" -c Release -- compile "$root/demo-data/reefer-fleet.json" --numeric f32 \
  --name sp --out "$work" --force >/dev/null
sed -n '/^static float sp_softplus(float x)$/,/^}$/p' "$work/sp.c" | sed 's/sp_softplus/softplus_under_test/' \
  > "$work/softplus_under_test.c"
cc -std=c99 -O2 -Wall -Wextra -Werror -I "$work" "$here/check.c" -o "$work/check" -lm
"$work/check" "${1:-1}" 0 2 & "$work/check" "${1:-1}" 1 2 & wait

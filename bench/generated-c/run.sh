#!/usr/bin/env bash
# Generated C scorer vs the hand-written dense float loop (docs/benchmarks.md, "Generated C scorer").
# Usage: bench/generated-c/run.sh [extra CFLAGS...]   (default -O2)
set -euo pipefail
here="$(cd "$(dirname "$0")" && pwd)"
root="$here/../.."
work="${BENCH_WORK:-$(mktemp -d)}"
flags=("$@")
[ ${#flags[@]} -eq 0 ] && flags=(-O2)
python3 "$here/make_model.py" "$work"
dotnet run --project "$root/src/Emit.Cli" -c Release -- compile "$work/bench784x500.json" --numeric f32 --out "$work" >/dev/null
cc -std=c99 -Wall -Wextra -Werror "${flags[@]}" -I "$work" "$work/bench784x500.c" "$here/bench.c" -o "$work/bench" -lm
echo "cc $(cc -dumpfullversion) ${flags[*]} on $(uname -m), $(grep -m1 'model name' /proc/cpuinfo | cut -d: -f2 | sed 's/^ //')"
# The machine may be shared: run the process several times; each run keeps its best of 7 rounds.
runs="${BENCH_RUNS:-5}"
for k in $(seq "$runs"); do "$work/bench" "$work/dense.bin"; done | tee "$work/results.txt" | grep -E "^(inputs|selftest|max relative)" | sort -u
echo "per run (dense ns, generated ns, ratio):"
paste <(grep '^dense' "$work/results.txt" | awk '{print $3}') <(grep '^generated' "$work/results.txt" | awk '{print $3}') \
      <(grep '^ratio' "$work/results.txt" | awk '{print $2}')
grep '^ratio' "$work/results.txt" | awk '{print $2}' | tr -d x | sort -n | awk '{a[NR]=$1} END {print "median ratio " a[int((NR+1)/2)] "x"}'

#!/usr/bin/env bash
# Generated C scorers (f32; fixed point with int16 and int8 weights) vs the hand-written dense float loop
# (docs/benchmarks.md, "Generated C scorer" and "Fixed-point scorer speed").
# Usage: bench/generated-c/run.sh [extra CFLAGS...]   (default -O2)
set -euo pipefail
here="$(cd "$(dirname "$0")" && pwd)"
root="$here/../.."
work="${BENCH_WORK:-$(mktemp -d)}"
mkdir -p "$work"
flags=("$@")
[ ${#flags[@]} -eq 0 ] && flags=(-O2)
python3 "$here/make_model.py" "$work"
emit=(dotnet run --project "$root/src/Emit.Cli" -c Release --)
"${emit[@]}" compile "$work/bench784x500.json" --numeric f32 --out "$work" --force >/dev/null
"${emit[@]}" compile "$work/bench784x500.json" --numeric fixed --weights int16 --name bench_i16 --out "$work" --force >/dev/null
"${emit[@]}" compile "$work/bench784x500.json" --numeric fixed --weights int8 --name bench_i8 --out "$work" --force >/dev/null
cc -std=c99 -Wall -Wextra -Werror "${flags[@]}" -I "$work" "$work/bench784x500.c" "$work/bench_i16.c" "$work/bench_i8.c" \
   "$here/bench.c" -o "$work/bench" -lm
echo "cc $(cc -dumpfullversion) ${flags[*]} on $(uname -m), $(grep -m1 'model name' /proc/cpuinfo | cut -d: -f2 | sed 's/^ //')"
# The machine may be shared: run the process several times; each run keeps its best of 7 rounds.
runs="${BENCH_RUNS:-5}"
for k in $(seq "$runs"); do "$work/bench" "$work/dense.bin"; done | tee "$work/results.txt" | grep -E "^(inputs|selftest|stated)" | sort -u
grep -E "^(f32|int16|int8) " "$work/results.txt" | awk '{print $1, "max |F - dense loop|", $7, "nats"}' | sort -u | sort -k1,1 -u
echo "per run: dense ns, then ns and ratio per generated scorer"
paste -d' ' <(grep '^dense' "$work/results.txt" | awk '{print $2}') \
  <(grep '^f32 ' "$work/results.txt" | awk '{print "f32", $2, $5}') \
  <(grep '^int16 ' "$work/results.txt" | awk '{print "int16", $2, $5}') \
  <(grep '^int8 ' "$work/results.txt" | awk '{print "int8", $2, $5}')
for s in f32 int16 int8; do
  grep "^$s " "$work/results.txt" | awk '{print $5}' | tr -d x | sort -n | awk -v s="$s" '{a[NR]=$1} END {print "median ratio " s " " a[int((NR+1)/2)] "x"}'
done
# the limit probe's ratio to the dense loop and the scorer's share of it, medians over the runs
for s in f32 int16 int8; do
  grep "^limit $s " "$work/results.txt" | awk '{print $6}' | tr -d 'x;' | sort -n \
    | awk -v s="$s" '{a[NR]=$1} END {printf "median limit ratio %s %sx", s, a[int((NR+1)/2)]}'
  grep "^limit $s " "$work/results.txt" | awk '{print $9}' | tr -d '%' | sort -n \
    | awk '{a[NR]=$1} END {print ", median share of the limit " a[int((NR+1)/2)] "%"}'
done

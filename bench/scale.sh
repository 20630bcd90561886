#!/usr/bin/env bash
# Scale figures for docs/benchmarks.md: peak memory while scoring 10^7 streamed vectors, and a
# 4096×2048 model through load and inspect (compile and verify join as those commands land).
# Usage: bash bench/scale.sh [ROWS]   (needs /usr/bin/time and python3; writes to /tmp/emit-scale)
set -euo pipefail
cd "$(dirname "$0")/.."
rows=${1:-10000000}
out=/tmp/emit-scale
mkdir -p "$out"
dotnet build -c Release src/Emit.Cli -v q -nologo >/dev/null
emit="dotnet src/Emit.Cli/bin/Release/net10.0/emit.dll"

echo "== score: $rows vectors of the demo model (56 flags) streamed from a generator through stdin"
python3 - "$rows" <<'PY' | /usr/bin/time -f "peak_rss_kib=%M elapsed_s=%e" $emit score demo-data/reefer-fleet.json --input - --output "$out/scores.csv"
import random, sys
rows = int(sys.argv[1])
rng = random.Random(1)
lines = [",".join("1" if rng.random() < 0.2 else "0" for _ in range(56)) for _ in range(4096)]
w = sys.stdout.write
for k in range(rows):
    w(lines[k % 4096] + "\n")
PY
echo "scored_rows=$(($(wc -l < "$out/scores.csv") - 1))"

echo "== 4096×2048 model: write, inspect"
python3 - "$out/big.json" <<'PY'
import json, random, sys
rng = random.Random(2)
v, h = 4096, 2048
with open(sys.argv[1], "w") as f:
    f.write('{"format":"emit.model","version":1,"kind":"rbm","visible":%d,"hidden":%d,\n' % (v, h))
    f.write('"visible_bias":[%s],\n' % ",".join("%.6g" % rng.gauss(0, 0.1) for _ in range(v)))
    f.write('"hidden_bias":[%s],\n' % ",".join("%.6g" % rng.gauss(0, 0.1) for _ in range(h)))
    f.write('"weights":[\n')
    for i in range(v):
        f.write("[%s]%s\n" % (",".join("%.6g" % rng.gauss(0, 0.02) for _ in range(h)), "," if i < v - 1 else ""))
    f.write("]}\n")
PY
ls -l "$out/big.json" | awk '{print "model_bytes=" $5}'
/usr/bin/time -f "inspect peak_rss_kib=%M elapsed_s=%e" $emit inspect "$out/big.json" --json > "$out/big-inspect.json"
echo "inspect_sha256=$(grep -o '"sha256": "[0-9a-f]*"' "$out/big-inspect.json")"

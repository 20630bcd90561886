#!/usr/bin/env bash
# Streamed scoring on an emulated Cortex-M3 (qemu mps2-an385, instruction counting as in run.sh): instructions per
# full score, reset, flip and read, f32 (soft float) and fixed int16, on the demo model and the 784 x 500 benchmark
# model (docs/benchmarks.md, "Streamed scoring"). Needs gcc-arm-none-eabi, libnewlib-arm-none-eabi, qemu-system-arm.
# Usage: bench/cortex-m3/stream.sh
set -euo pipefail
here="$(cd "$(dirname "$0")" && pwd)"
root="$here/../.."
work="${BENCH_WORK:-$(mktemp -d)}"
mkdir -p "$work"
emit=(dotnet run --project "$root/src/Emit.Cli" -c Release --)
cflags=(-mcpu=cortex-m3 -mthumb -mfloat-abi=soft -O2 -std=c99 -Wall -Wextra -Werror --specs=rdimon.specs -T "$here/link.ld")
qemu=(timeout 900 qemu-system-arm -machine mps2-an385 -cpu cortex-m3 -nographic -monitor none -serial none
      -semihosting-config enable=on,target=native -icount shift=0)

python3 "$here/../generated-c/make_model.py" "$work"
build() { # model name numeric density inputs [fixed options]
    local model=$1 name=$2 numeric=$3 density=$4 inputs=$5; shift 5
    "${emit[@]}" compile "$model" --numeric "$numeric" "$@" --stream --name "$name" --out "$work" --force >/dev/null
    arm-none-eabi-gcc "${cflags[@]}" -I "$work" -I "$here" -DSCORER="$name" -DUPPER="${name^^}" \
        -DHEADER="\"$name.h\"" -DINPUTS="$inputs" -DDENSITY="$density" \
        "$here/startup.c" "$here/main_stream.c" "$work/$name.c" -o "$work/$name.elf" -lm
    "${qemu[@]}" -kernel "$work/$name.elf"
}
echo "arm-none-eabi-gcc $(arm-none-eabi-gcc -dumpfullversion) -mcpu=cortex-m3 -O2, $(qemu-system-arm --version | head -1)"
build "$root/demo-data/reefer-fleet.json" sdemo_f32 f32 0.3 50
build "$root/demo-data/reefer-fleet.json" sdemo_i16 fixed 0.3 50 --weights int16
build "$work/bench784x500.json" s784_f32 f32 0.13 4
build "$work/bench784x500.json" s784_i16 fixed 0.13 4 --weights int16

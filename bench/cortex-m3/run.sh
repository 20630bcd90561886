#!/usr/bin/env bash
# Instructions per input on an emulated Cortex-M3 (qemu mps2-an385, no FPU): the generated f32 scorer (soft float)
# and the fixed-point scorers with int16 and int8 weights, on the demo model and on the 784 x 500 benchmark model,
# plus the hand-written dense float loop on the latter (docs/benchmarks.md, "Fixed-point scorer speed"); then the same
# generated scorers built for Cortex-M4 (soft float) on qemu mps2-an386, with the int8 scorers' DSP path (UXTAB16)
# and without it (docs/benchmarks.md, "Generated C toward the machine's limit").
# Needs gcc-arm-none-eabi, libnewlib-arm-none-eabi and qemu-system-arm (Debian). Usage: bench/cortex-m3/run.sh
set -euo pipefail
here="$(cd "$(dirname "$0")" && pwd)"
root="$here/../.."
work="${BENCH_WORK:-$(mktemp -d)}"
mkdir -p "$work"
emit=(dotnet run --project "$root/src/Emit.Cli" -c Release --)
cflags=(-mcpu=cortex-m3 -mthumb -mfloat-abi=soft -O2 -std=c99 -Wall -Wextra -Werror --specs=rdimon.specs -T "$here/link.ld")
qemu=(timeout 600 qemu-system-arm -machine mps2-an385 -cpu cortex-m3 -nographic -monitor none -serial none
      -semihosting-config enable=on,target=native -icount shift=0)

demo="$root/demo-data/reefer-fleet.json"
"${emit[@]}" compile "$demo" --numeric f32 --name demo_f32 --out "$work" --force >/dev/null
"${emit[@]}" compile "$demo" --numeric fixed --weights int16 --name demo_i16 --out "$work" --force >/dev/null
"${emit[@]}" compile "$demo" --numeric fixed --weights int8 --name demo_i8 --out "$work" --force >/dev/null
python3 "$here/../generated-c/make_model.py" "$work"
python3 "$here/make_inputs.py" "$root/demo-data" "$work" "$work/dense.bin"
"${emit[@]}" compile "$work/bench784x500.json" --numeric f32 --out "$work" --force >/dev/null
"${emit[@]}" compile "$work/bench784x500.json" --numeric fixed --weights int16 --name bench_i16 --out "$work" --force >/dev/null
"${emit[@]}" compile "$work/bench784x500.json" --numeric fixed --weights int8 --name bench_i8 --out "$work" --force >/dev/null

arm-none-eabi-gcc "${cflags[@]}" -I "$work" -I "$here" "$here/startup.c" "$here/main_demo.c" \
  "$work/demo_f32.c" "$work/demo_i16.c" "$work/demo_i8.c" -o "$work/demo.elf" -lm
arm-none-eabi-gcc "${cflags[@]}" -I "$work" -I "$here" "$here/startup.c" "$here/main_784.c" \
  "$work/bench784x500.c" "$work/bench_i16.c" "$work/bench_i8.c" -o "$work/gen784.elf" -lm
arm-none-eabi-gcc "${cflags[@]}" -DDENSE -I "$work" -I "$here" "$here/startup.c" "$here/main_784.c" -o "$work/dense784.elf" -lm
echo "arm-none-eabi-gcc $(arm-none-eabi-gcc -dumpfullversion) -mcpu=cortex-m3 -O2, $(qemu-system-arm --version | head -1)"
for image in demo gen784 dense784; do "${qemu[@]}" -kernel "$work/$image.elf"; done

m4flags=("${cflags[@]/-mcpu=cortex-m3/-mcpu=cortex-m4}")
m4qemu=("${qemu[@]/mps2-an385/mps2-an386}")
m4qemu=("${m4qemu[@]/cortex-m3/cortex-m4}")
for dsp in 1 0; do
  arm-none-eabi-gcc "${m4flags[@]}" -DDEMO_I8_DSP_LANES=$dsp -I "$work" -I "$here" "$here/startup.c" "$here/main_demo.c" \
    "$work/demo_f32.c" "$work/demo_i16.c" "$work/demo_i8.c" -o "$work/demo-m4-$dsp.elf" -lm
  arm-none-eabi-gcc "${m4flags[@]}" -DBENCH_I8_DSP_LANES=$dsp -I "$work" -I "$here" "$here/startup.c" "$here/main_784.c" \
    "$work/bench784x500.c" "$work/bench_i16.c" "$work/bench_i8.c" -o "$work/gen784-m4-$dsp.elf" -lm
  echo "Cortex-M4 (-mcpu=cortex-m4 -mfloat-abi=soft -O2, qemu mps2-an386), int8 DSP lanes $dsp:"
  for image in demo-m4-$dsp gen784-m4-$dsp; do "${m4qemu[@]}" -kernel "$work/$image.elf"; done
done

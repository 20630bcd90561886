using System.Globalization;
using Emit.Detection;
using Emit.Emission;
using Emit.Model;
using Emit.Quantize;

namespace Emit.Tests.Emission;

/// <summary>
/// The firmware features on the reference cores, judged by the Arm toolchain (Debian gcc-arm-none-eabi): fixed mode
/// with the features on still builds for Cortex-M0 with float and double poisoned and needs no floating-point,
/// division or libm symbol; the extra flash each feature's header states (<see cref="FootprintModel"/>) covers its
/// functions as <c>arm-none-eabi-nm -S</c> measures them, on Cortex-M0 (fixed) and Cortex-M4F (float), with the
/// margin stated; the RAM it states is <c>sizeof</c> of the caller-owned state on the core.
/// </summary>
public sealed partial class CortexM0Tests
{
    private const string M4FFeatureFlags =
        "-mcpu=cortex-m4 -mthumb -mfpu=fpv4-sp-d16 -mfloat-abi=hard -Os -Werror " + Toolchain.StrictC;

    /// <summary>Compiles <paramref name="name"/>.c; returns the undefined symbols and the size of each function.</summary>
    private static (string[] Undefined, Dictionary<string, int> Sizes) CompileFeatures(string dir, string name,
        BoltzmannModel model, CompileOptions options, string gcc, string flags, string? poison)
    {
        foreach (var f in ScorerCompiler.Compile(model, name + ".json", options))
            File.WriteAllText(Path.Combine(dir, f.FileName), f.Text);
        var obj = Path.Combine(dir, name + ".o");
        string[] include = poison is null ? [] : ["-include", poison];
        Toolchain.RunOk(gcc, [.. Toolchain.Split(flags), .. include, "-I", dir, "-c", Path.Combine(dir, name + ".c"), "-o", obj]);
        var nm = Toolchain.Require("arm-none-eabi-nm");
        var undefined = Toolchain.RunOk(nm, ["-u", obj]).Split('\n', StringSplitOptions.RemoveEmptyEntries)
            .Select(l => l.Trim().Split(' ')[^1]).ToArray();
        var sizes = new Dictionary<string, int>(StringComparer.Ordinal);
        foreach (var line in Toolchain.RunOk(nm, ["-S", obj]).Split('\n', StringSplitOptions.RemoveEmptyEntries))
        {
            var w = line.Split(' ', StringSplitOptions.RemoveEmptyEntries);
            if (w.Length == 4 && w[2] is "T" or "t")
                sizes[w[3]] = int.Parse(w[1], NumberStyles.HexNumber, CultureInfo.InvariantCulture);
        }
        // the caller-owned state's size on the core, as the header states it
        var probe = Path.Combine(dir, name + "_probe.c");
        File.WriteAllText(probe, $"#include \"{name}.h\"\n" +
            $"_Static_assert(sizeof({name}_filter_t) == {Naming.MacroPrefix(name)}_FILTER_RAM_BYTES, \"filter RAM\");\n" +
            "int probe_unused;\n");
        Toolchain.RunOk(gcc, [.. Toolchain.Split(flags.Replace("-std=c99", "-std=c11", StringComparison.Ordinal)), "-I", dir,
            "-c", probe, "-o", Path.Combine(dir, name + "_probe.o")]);
        return (undefined, sizes);
    }

    [SkippableFact]
    public void Fixed_c_with_the_alarm_filter_links_on_cortex_m0_integer_only_and_the_stated_costs_cover_it()
    {
        var gcc = Toolchain.Require("arm-none-eabi-gcc");
        Toolchain.Require("arm-none-eabi-nm");
        var dir = Toolchain.TempDir("m0-features");
        var poison = PoisonHeader(dir);
        var demo = ModelLoader.Load(ReferenceModelPath());
        output.WriteLine("build | filter code measured / stated (bytes)");
        foreach (var (k, n) in new[] { (3, 5), (1, 1), (32, 32), (7, 31) })
        {
            foreach (var mode in new[] { NumericMode.Fixed, NumericMode.F32 })
            {
                string name = $"reefer_{mode.ToText()}_{k}_{n}";
                var options = new CompileOptions(["c"], mode, name, AlarmFilter: new AlarmFilterSpec(k, n));
                bool isFixed = mode == NumericMode.Fixed;
                var (undefined, sizes) = CompileFeatures(dir, name, demo, options, gcc,
                    isFixed ? M0Flags : M4FFeatureFlags, isFixed ? poison : null);
                if (isFixed)
                    foreach (var symbol in undefined)
                    {
                        Assert.False(Forbidden.IsMatch(symbol), $"{name} needs {symbol}");
                        Assert.True(Allowed.IsMatch(symbol), $"{name} needs {symbol}, not on the list of integer helpers");
                    }
                int measured = sizes[name + "_filter_reset"] + sizes[name + "_filter_update"];
                int stated = isFixed ? FootprintModel.FilterCodeBytesM0 : FootprintModel.FilterCodeBytesM4F;
                output.WriteLine($"{name} | {measured} / {stated}");
                // stated: an upper bound with at most 32 bytes of margin
                Assert.True(measured <= stated && stated <= measured + 32, $"{name}: measured {measured}, stated {stated}");
                var header = File.ReadAllText(Path.Combine(dir, name + ".h"));
                Assert.Contains($"_FILTER_FLASH_BYTES {stated}\n", header);
            }
        }
    }

    [SkippableFact]
    public void Fixed_c_classifier_links_on_cortex_m0_integer_only_and_the_stated_costs_cover_it()
    {
        var gcc = Toolchain.Require("arm-none-eabi-gcc");
        var nm = Toolchain.Require("arm-none-eabi-nm");
        var dir = Toolchain.TempDir("m0-classifier");
        var poison = PoisonHeader(dir);
        var demo = ModelLoader.Load(ReferenceModelPath());
        output.WriteLine("build | classify code + offsets measured / stated flash (bytes)");
        foreach (int count in new[] { 2, 3, 5 })
        {
            foreach (var mode in new[] { NumericMode.Fixed, NumericMode.F32 })
            {
                bool isFixed = mode == NumericMode.Fixed;
                string name = $"modes_{mode.ToText()}_{count}";
                var models = Enumerable.Range(0, count)
                    .Select(k => TestModels.Random(ModelKind.Rbm, demo.Visible, 8, seed: 40 + k)
                        .With(null, new LogPartition(30 + k, "exact", 0)))
                    .ToArray();
                var compiled = ClassifierCompiler.Build(models, models.Select((_, k) => $"m{k}.json").ToArray(), null,
                    new CompileOptions(["c"], mode, name));
                foreach (var f in compiled.AllFiles) File.WriteAllText(Path.Combine(dir, f.FileName), f.Text);
                var objects = new List<string>();
                foreach (var c in Directory.GetFiles(dir, name + "*.c"))
                {
                    var obj = Path.ChangeExtension(c, ".o");
                    string[] include = isFixed ? ["-include", poison] : [];
                    Toolchain.RunOk(gcc, [.. Toolchain.Split(isFixed ? M0Flags : M4FFeatureFlags), .. include, "-I", dir,
                        "-c", c, "-o", obj]);
                    objects.Add(obj);
                }
                if (isFixed)
                    foreach (var obj in objects)
                        foreach (var symbol in Toolchain.RunOk(nm, ["-u", obj]).Split('\n', StringSplitOptions.RemoveEmptyEntries)
                                     .Select(l => l.Trim().Split(' ')[^1])
                                     .Where(s => !s.StartsWith(name, StringComparison.Ordinal)))
                        {
                            Assert.False(Forbidden.IsMatch(symbol), $"{name} needs {symbol}");
                            Assert.True(Allowed.IsMatch(symbol), $"{name} needs {symbol}, not on the list of integer helpers");
                        }
                int measured = 0;
                foreach (var line in Toolchain.RunOk(nm, ["-S", Path.Combine(dir, name + ".o")])
                             .Split('\n', StringSplitOptions.RemoveEmptyEntries))
                {
                    var w = line.Split(' ', StringSplitOptions.RemoveEmptyEntries);
                    if (w.Length == 4 && (w[3] == name + "_classify" || w[3] == name + "_offsets"))
                        measured += int.Parse(w[1], NumberStyles.HexNumber, CultureInfo.InvariantCulture);
                }
                var stated = FootprintModel.Classifier(compiled.Plan);
                output.WriteLine($"{name} | {measured} / {stated.FlashBytes}");
                Assert.True(measured <= stated.FlashBytes && stated.FlashBytes <= measured + 64,
                    $"{name}: measured {measured}, stated {stated.FlashBytes}");
            }
        }
    }

    /// <summary>
    /// Fixed mode with every feature on links into one Cortex-M0 image with no floating-point, division or libm code:
    /// a scorer with the alarm filter, streamed scoring and explanations (the most one scorer takes) and a classifier
    /// of three models, called from one <c>main</c>, linked against newlib and libgcc with float and double poisoned.
    /// The linked image, not just each object, is searched, so a helper pulled in by another helper would be caught.
    /// </summary>
    [SkippableFact]
    public void Fixed_c_with_every_feature_links_into_one_cortex_m0_image_integer_only()
    {
        var gcc = Toolchain.Require("arm-none-eabi-gcc");
        var nm = Toolchain.Require("arm-none-eabi-nm");
        var dir = Toolchain.TempDir("m0-all-features");
        var poison = PoisonHeader(dir);
        var demo = ModelLoader.Load(ReferenceModelPath());
        var scorer = new CompileOptions(["c"], NumericMode.Fixed, "reefer_all", AlarmFilter: new AlarmFilterSpec(3, 5),
            Stream: true, Explain: true);
        foreach (var f in ScorerCompiler.Compile(demo, "reefer-fleet.json", scorer))
            File.WriteAllText(Path.Combine(dir, f.FileName), f.Text);
        var models = Enumerable.Range(0, 3)
            .Select(k => TestModels.Random(ModelKind.Rbm, demo.Visible, 8, seed: 70 + k)
                .With(null, new LogPartition(30 + k, "exact", 0)))
            .ToArray();
        var classifier = ClassifierCompiler.Build(models, ["m0.json", "m1.json", "m2.json"], null,
            new CompileOptions(["c"], NumericMode.Fixed, "modes"));
        foreach (var f in classifier.AllFiles) File.WriteAllText(Path.Combine(dir, f.FileName), f.Text);
        File.WriteAllText(Path.Combine(dir, "main.c"), """
            #include "reefer_all.h"
            #include "modes.h"
            volatile uint8_t input_byte;
            volatile int32_t sink;
            int main(void)
            {
                static uint8_t packed[REEFER_ALL_PACKED_BYTES];
                reefer_all_filter_t filter;
                reefer_all_stream_t stream;
                uint16_t units[4];
                reefer_all_energy_t deltas[4];
                modes_energy_t scores[MODES_MODELS];
                reefer_all_energy_t f;
                bool alarm;
                unsigned n, c;
                packed[0] = input_byte;
                f = reefer_all_free_energy(packed);
                reefer_all_filter_reset(&filter);
                alarm = reefer_all_filter_update(&filter, reefer_all_is_unusual(f));
                reefer_all_stream_reset(&stream, packed);
                reefer_all_stream_flip(&stream, 3u);
                f = reefer_all_stream_free_energy(&stream);
                n = reefer_all_explain(packed, 4u, units, deltas);
                c = modes_classify(packed, scores);
                sink = (int32_t)(f & 0xFFFF) + (int32_t)n + (int32_t)c + (alarm ? 1 : 0) + reefer_all_selftest();
                return 0;
            }
            """);
        var sources = Directory.GetFiles(dir, "*.c").Order(StringComparer.Ordinal).ToArray();
        var image = Path.Combine(dir, "image.elf");
        Toolchain.RunOk(gcc, [.. Toolchain.Split(M0Flags), "-include", poison, "-I", dir, "-ffunction-sections",
            "-fdata-sections", "--specs=nosys.specs", "-nostartfiles", "-Wl,-e,main", "-Wl,--gc-sections",
            .. sources, "-o", image]);
        var symbols = Toolchain.RunOk(nm, [image]).Split('\n', StringSplitOptions.RemoveEmptyEntries)
            .Select(l => l.Trim().Split(' ')[^1]).ToArray();
        foreach (var needed in new[] { "reefer_all_explain", "reefer_all_stream_flip", "reefer_all_filter_update",
                     "modes_classify" })
            Assert.Contains(needed, symbols);
        var forbidden = symbols.Where(s => Forbidden.IsMatch(s)).ToArray();
        output.WriteLine($"{sources.Length} sources, {symbols.Length} symbols in the image; forbidden: " +
                         (forbidden.Length == 0 ? "none" : string.Join(", ", forbidden)));
        Assert.Empty(forbidden);
    }
}

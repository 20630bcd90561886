using System.Globalization;

namespace Emit.Harness;

/// <summary>
/// Target <c>cortex-m3</c>: the generated C cross-compiled with <c>arm-none-eabi-gcc</c> (strict flags, Cortex-M3, soft
/// float) and run on qemu's mps2-an385 machine with newlib's semihosting library. The inputs are compiled into the
/// image in batches; each image prints its results through semihosting and its exit status becomes qemu's. Every qemu
/// run has the outer time limit, and a fault ends it with status <see cref="HarnessTemplates.FaultStatus"/>.
/// </summary>
public sealed class CortexM3Runner : ITargetRunner
{
    /// <summary>Most bytes of packed inputs compiled into one image.</summary>
    public const int MaxImageInputBytes = 1 << 19;

    /// <summary>Most inputs in one image.</summary>
    public const int MaxImageInputs = 4096;

    /// <inheritdoc/>
    public string Name => "cortex-m3";
    /// <inheritdoc/>
    public string Description =>
        "generated C99 cross-compiled for Cortex-M3 and run on qemu-system-arm (mps2-an385) with semihosting";
    /// <inheritdoc/>
    public string Language => "c";

    internal static readonly Tool Gcc = new("arm-none-eabi-gcc", "gcc-arm-none-eabi", "cross compiler");
    internal static readonly Tool Qemu = new("qemu-system-arm", "qemu-system-arm", "emulator");
    internal const string NewlibPackage = "libnewlib-arm-none-eabi";

    /// <inheritdoc/>
    public void CheckTools(RunnerSettings settings)
    {
        var gcc = Gcc.Require(Name);
        Qemu.Require(Name);
        // -print-file-name echoes the bare name when the file is not in the compiler's search path
        var r = ExternalProcess.Run(gcc, ["-print-file-name=rdimon.specs"], settings.Limit);
        if (!r.Ok || !File.Exists(r.Out.Trim()))
            throw new EmitException($"target {Name}: newlib's semihosting library (rdimon.specs) not found",
                $"install the Debian package {NewlibPackage} (apt-get install {NewlibPackage})");
    }

    /// <summary>Inputs per image for a model with <paramref name="packedBytes"/> bytes per input.</summary>
    public static int ImageInputs(int packedBytes) =>
        Math.Clamp(MaxImageInputBytes / Math.Max(1, packedBytes), 1, MaxImageInputs);

    /// <inheritdoc/>
    public IScorerSession? Start(ScorerSources sources, HarnessLayout layout, RunnerSettings settings,
        string workDirectory, out string failure)
    {
        var gcc = Gcc.Require(Name);
        var qemu = Qemu.Require(Name);
        Directory.CreateDirectory(workDirectory);
        File.WriteAllText(Path.Combine(workDirectory, "emit-startup.c"), HarnessTemplates.Startup("emit-startup.c"));
        File.WriteAllText(Path.Combine(workDirectory, "emit-cortex-m3.ld"),
            HarnessTemplates.LinkerScript("emit-cortex-m3.ld"));
        var session = new Session(gcc, qemu, sources, layout, settings, workDirectory);
        if (!session.Compile(sources.SourceFile, "emit-scorer.o", "the generated C", out failure)
            || !session.Compile(Path.Combine(workDirectory, "emit-startup.c"), "emit-startup.o", "the start-up code",
                out failure))
            return null;
        var companions = sources.CompanionFiles.Where(f => f.EndsWith(".c", StringComparison.Ordinal)).ToArray();
        for (int k = 0; k < companions.Length; k++)
            if (!session.Compile(companions[k], $"emit-companion-{k}.o", "the generated C", out failure))
                return null;
        return session;
    }

    private sealed class Session(string gcc, string qemu, ScorerSources sources, HarnessLayout layout,
        RunnerSettings settings, string dir) : IScorerSession
    {
        private int _images;

        // the generated decisions so far, the last N − 1 of them at most: the alarm filter's history for the next image
        private readonly List<bool> _decisions = [];

        public int? SelfTestFailures { get; private set; }

        private IEnumerable<string> CompileFlags() =>
            [.. CFlags.Split(CFlags.CortexM3), .. CFlags.Split(CFlags.Strict), "-O2", "-I", sources.Directory];

        public bool Compile(string source, string obj, string what, out string failure)
        {
            var r = ExternalProcess.Run(gcc, [.. CompileFlags(), "-c", source, "-o", Path.Combine(dir, obj)],
                settings.Limit, dir);
            failure = r.Ok ? "" : r.TimedOut
                ? $"arm-none-eabi-gcc did not finish within {settings.Limit.TotalSeconds:F0} s"
                : $"{what} does not compile with arm-none-eabi-gcc {CFlags.CortexM3} {CFlags.Strict} -O2:\n{r.Tail()}";
            return r.Ok;
        }

        public bool TryScore(ReadOnlySpan<byte> packed, int rows, Span<ScoredRow> results, out string failure)
        {
            int per = settings.ImageInputs is int n0 and > 0 ? n0 : ImageInputs(layout.PackedBytes);
            for (int start = 0; start < rows; start += per)
            {
                int n = Math.Min(per, rows - start);
                if (!RunImage(packed.Slice(start * layout.PackedBytes, n * layout.PackedBytes), n,
                    results.Slice(start, n), out failure))
                    return false;
            }
            failure = "";
            return true;
        }

        private bool RunImage(ReadOnlySpan<byte> packed, int rows, Span<ScoredRow> results, out string failure)
        {
            int image = ++_images;
            var main = $"emit-harness-main-{image}.c";
            File.WriteAllText(Path.Combine(dir, main),
                HarnessTemplates.EmbeddedMain(sources, layout, main, packed, rows, _decisions));
            var obj = $"emit-harness-main-{image}.o";
            if (!Compile(Path.Combine(dir, main), obj, "the harness main", out failure)) return false;
            var elf = Path.Combine(dir, $"emit-image-{image}.elf");
            var link = ExternalProcess.Run(gcc,
                [.. CFlags.Split(CFlags.CortexM3), "--specs=rdimon.specs", "-T", Path.Combine(dir, "emit-cortex-m3.ld"),
                 Path.Combine(dir, "emit-startup.o"), Path.Combine(dir, "emit-scorer.o"),
                 .. sources.CompanionFiles.Where(f => f.EndsWith(".c", StringComparison.Ordinal))
                     .Select((_, k) => Path.Combine(dir, $"emit-companion-{k}.o")),
                 Path.Combine(dir, obj), "-lm", "-o", elf],
                settings.Limit, dir);
            if (!link.Ok)
            {
                failure = $"the Cortex-M3 image does not link:\n{link.Tail()}";
                return false;
            }
            var run = ExternalProcess.Run(qemu,
                ["-machine", "mps2-an385", "-cpu", "cortex-m3", "-nographic", "-monitor", "none", "-serial", "none",
                 "-semihosting-config", "enable=on,target=native", "-kernel", elf],
                settings.Limit, dir);
            if (run.TimedOut)
            {
                failure = $"qemu did not finish image {image} within {settings.Limit.TotalSeconds:F0} s (the image " +
                    "hangs)";
                return false;
            }
            if (run.ExitCode != 0)
            {
                failure = run.ExitCode == HarnessTemplates.FaultStatus
                    ? $"image {image} took a fault on the emulated Cortex-M3 (qemu exit status {run.ExitCode})"
                    : $"image {image} ended with exit status {run.ExitCode} on the emulated Cortex-M3";
                if (run.Err.Trim().Length > 0) failure += ": " + string.Join(" | ", run.Err.Trim().Split('\n').Take(6));
                return false;
            }
            var lines = run.Out.Split('\n', StringSplitOptions.RemoveEmptyEntries);
            int? selfTest = layout.ReadHeader(lines.FirstOrDefault(), out failure);
            if (selfTest is null) return false;
            if (SelfTestFailures is { } previous && previous != selfTest)
            {
                failure = $"the self-test reported {previous} and then {selfTest} failures";
                return false;
            }
            SelfTestFailures = selfTest;
            var end = "end " + rows.ToString(CultureInfo.InvariantCulture);
            if (lines.Length != rows + 2 || lines[^1] != end)
            {
                failure = $"image {image} printed {lines.Length - 1} lines for {rows} inputs (last: " +
                    $"\"{HarnessLayout.Shorten(lines[^1])}\")";
                return false;
            }
            for (int r = 0; r < rows; r++)
                if (!layout.TryParseRow(lines[r + 1], out results[r]))
                {
                    failure = $"image {image} printed an unexpected line: \"{HarnessLayout.Shorten(lines[r + 1])}\"";
                    return false;
                }
            if (sources.Manifest.AlarmFilter is { N: var n })
            {
                for (int r = 0; r < rows; r++) _decisions.Add(results[r].Decision == 1);
                if (_decisions.Count > n - 1) _decisions.RemoveRange(0, _decisions.Count - (n - 1));
            }
            failure = "";
            return true;
        }

        public void Dispose()
        {
        }
    }
}

using System.Globalization;
using System.Text;
using Emit.Emission;

namespace Emit.Harness;

/// <summary>Lays out the harness sources from the shipped templates in <c>templates/harness/</c>.</summary>
public static class HarnessTemplates
{
    /// <summary>The folder under templates/ holding the harness templates.</summary>
    public const string Folder = "harness";
    /// <summary>Template of the C harness main.</summary>
    public const string MainTemplate = "main.c.sbn";
    /// <summary>Template of the C# harness program.</summary>
    public const string ProgramTemplate = "Program.cs.sbn";
    /// <summary>Template of the Cortex-M3 start-up code.</summary>
    public const string StartupTemplate = "startup-cortex-m3.c.sbn";
    /// <summary>Template of the Cortex-M3 linker script.</summary>
    public const string LinkerTemplate = "cortex-m3.ld.sbn";

    /// <summary>qemu's exit status when the Cortex-M3 image takes a fault.</summary>
    public const int FaultStatus = 99;

    private static readonly TemplateRenderer Renderer = new(null);

    /// <summary>
    /// The C harness main for <paramref name="sources"/>, reading packed inputs as hex lines from standard input.
    /// </summary>
    public static string Main(ScorerSources sources, HarnessLayout layout, string fileName) =>
        Main(sources, layout, fileName, default, 0, false, []);

    /// <summary>
    /// The C harness main with <paramref name="rows"/> packed inputs compiled in (for an emulator image).
    /// </summary>
    /// <remarks><paramref name="filterWarmup"/>: with the alarm filter, the decisions of earlier images, oldest first
    /// (the filter takes them before the first input, so its state runs on across images).</remarks>
    public static string EmbeddedMain(ScorerSources sources, HarnessLayout layout, string fileName,
        ReadOnlySpan<byte> inputs, int rows, IReadOnlyList<bool>? filterWarmup = null) =>
        Main(sources, layout, fileName, inputs, rows, true, filterWarmup ?? []);

    private static string Main(ScorerSources sources, HarnessLayout layout, string fileName,
        ReadOnlySpan<byte> embedded, int embeddedRows, bool isEmbedded, IReadOnlyList<bool> filterWarmup)
    {
        int partial = layout.Visible % 8;
        var rows = new StringBuilder();
        for (int r = 0; r < embeddedRows; r++)
        {
            rows.Append("    {");
            var row = embedded.Slice(r * layout.PackedBytes, layout.PackedBytes);
            for (int b = 0; b < row.Length; b++)
                rows.Append(b == 0 ? " " : ", ").Append("0x")
                    .Append(row[b].ToString("X2", CultureInfo.InvariantCulture)).Append('u');
            rows.Append(" },\n");
        }
        var model = new HarnessMainModel
        {
            FileName = fileName,
            Name = sources.Name,
            UName = Naming.MacroPrefix(sources.Name),
            HeaderFile = sources.Name + ".h",
            EnergyBytes = layout.EnergyBytes,
            HasThreshold = sources.HasThreshold,
            HasPartialByte = partial != 0,
            UnusedBitsMask = "0x" + ((0xFF << partial) & 0xFF).ToString("X2", CultureInfo.InvariantCulture) + "u",
            Embedded = isEmbedded,
            HasFilter = sources.Manifest.AlarmFilter is not null,
            Classifier = sources.Classifier,
            FilterWarmup = filterWarmup.Count == 0 ? "0" : string.Join(", ", filterWarmup.Select(u => u ? "1u" : "0u")),
            FilterWarmupCount = filterWarmup.Count,
            VectorCount = embeddedRows,
            VectorRows = rows.ToString().TrimEnd('\n'),
            Stream = sources.Manifest.HasStream,
            Explain = sources.Manifest.Explain,
            StreamSteps = StreamWalk.Steps(layout.Visible),
            StreamFirstRead = StreamWalk.FirstRead(layout.Visible),
        };
        return Renderer.Render(Folder, MainTemplate, model);
    }

    /// <summary>The C# harness program around the generated class of <paramref name="sources"/>.</summary>
    public static string Program(ScorerSources sources, string fileName) =>
        Renderer.Render(Folder, ProgramTemplate, new CSharpHarnessModel
        {
            FileName = fileName,
            ClassName = sources.ClassName!,
            Class = sources.QualifiedClass,
            HasThreshold = sources.HasThreshold,
            Stream = sources.Manifest.HasStream,
            Explain = sources.Manifest.Explain,
            EnergyType = sources.Manifest.EnergyType switch
            {
                "f64" => "double",
                "int32" => "int",
                "int64" => "long",
                _ => "float",
            },
            StreamSteps = StreamWalk.Steps(sources.Manifest.Visible),
            StreamFirstRead = StreamWalk.FirstRead(sources.Manifest.Visible),
            HasFilter = sources.Manifest.AlarmFilter is not null,
            Classifier = sources.Classifier,
        });

    /// <summary>The Cortex-M3 start-up source, written as <paramref name="fileName"/>.</summary>
    public static string Startup(string fileName) => Renderer.Render(Folder, StartupTemplate, new StartupModel
    {
        FileName = fileName,
        FaultStatus = FaultStatus,
    });

    /// <summary>The Cortex-M3 linker script, written as <paramref name="fileName"/>.</summary>
    public static string LinkerScript(string fileName) => Renderer.Render(Folder, LinkerTemplate, new StartupModel
    {
        FileName = fileName,
        FaultStatus = FaultStatus,
    });
}

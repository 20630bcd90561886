using System.Reflection;
using Scriban;
using Scriban.Runtime;
using Scriban.Syntax;

namespace Emit.Emission;

/// <summary>
/// Loads and renders the Scriban templates that lay out generated files. Shipped templates are embedded resources
/// named <c>templates/TARGET/FILE.sbn</c>; a templates folder given by the user overrides them file by file
/// (<c>DIR/TARGET/FILE.sbn</c>). Templates see one object, <c>m</c>, whose members keep their C# names
/// (no snake_case renaming). Errors name the template file, line and column.
/// </summary>
public sealed class TemplateRenderer
{
    private readonly string? _overrideDirectory;
    private readonly List<TemplateUse> _used = [];

    public TemplateRenderer(string? overrideDirectory)
    {
        if (overrideDirectory is not null && !Directory.Exists(overrideDirectory))
            throw new EmitException("templates folder does not exist", "give a folder holding c/ and csharp/ template files", overrideDirectory);
        _overrideDirectory = overrideDirectory;
    }

    /// <summary>The templates read so far, each once, in the order first read (for the manifest, docs/manifest.md).</summary>
    public IReadOnlyList<TemplateUse> Used => _used;

    /// <summary>Names of the shipped templates, as <c>TARGET/FILE.sbn</c>.</summary>
    public static IReadOnlyList<string> ShippedTemplates() =>
        typeof(TemplateRenderer).Assembly.GetManifestResourceNames()
            .Where(n => n.StartsWith("templates/", StringComparison.Ordinal))
            .Select(n => n["templates/".Length..])
            .Order(StringComparer.Ordinal)
            .ToArray();

    /// <summary>
    /// Checks an override folder's sub-folder for <paramref name="target"/>: every <c>.sbn</c> file there must be one
    /// the target uses, so a misspelt override does not go unnoticed.
    /// </summary>
    public void CheckOverrides(string target, IReadOnlyCollection<string> known)
    {
        if (_overrideDirectory is null) return;
        var dir = Path.Combine(_overrideDirectory, target);
        if (!Directory.Exists(dir)) return;
        foreach (var file in Directory.GetFiles(dir, "*.sbn").Order(StringComparer.Ordinal))
            if (!known.Contains(Path.GetFileName(file)))
                throw new EmitException("unknown template file name", $"the {target} target uses {string.Join(", ", known)}", file);
    }

    /// <summary>Renders template <c>TARGET/FILE</c> with <paramref name="model"/> as <c>m</c>.</summary>
    public string Render(string target, string file, object model)
    {
        var (text, path) = Load(target, file);
        var template = Template.Parse(text, path);
        if (template.HasErrors)
        {
            var first = template.Messages.First(m => m.Type == Scriban.Parsing.ParserMessageType.Error);
            throw new EmitException($"template error: {first.Message}", "fix the template", path, first.Span.Start.Line + 1, first.Span.Start.Column + 1);
        }
        var globals = new ScriptObject();
        globals.SetValue("m", model, readOnly: true);
        var context = new TemplateContext
        {
            StrictVariables = true,
            EnableRelaxedMemberAccess = false,
            NewLine = "\n",
            LoopLimit = 0,          // a weight table has more than the default 1000 rows
            LimitToString = 0,      // and more than the default 1 MB of text
            MemberRenamer = member => member.Name,
        };
        context.PushGlobal(globals);
        try
        {
            return template.Render(context).Replace("\r\n", "\n", StringComparison.Ordinal);
        }
        catch (ScriptRuntimeException e)
        {
            throw new EmitException($"template error: {e.OriginalMessage}", "fix the template", path, e.Span.Start.Line + 1, e.Span.Start.Column + 1);
        }
    }

    private (string Text, string Path) Load(string target, string file)
    {
        if (_overrideDirectory is not null)
        {
            var path = System.IO.Path.Combine(_overrideDirectory, target, file);
            if (File.Exists(path))
            {
                try { return (Record(target, file, true, File.ReadAllBytes(path)), path); }
                catch (IOException e) { throw new EmitException($"cannot read template: {e.Message}", null, path); }
            }
        }
        var name = $"templates/{target}/{file}";
        using var stream = Assembly.GetExecutingAssembly().GetManifestResourceStream(name)
                           ?? throw new InvalidOperationException($"shipped template {name} is missing from the assembly");
        using var bytes = new MemoryStream();
        stream.CopyTo(bytes);
        return (Record(target, file, false, bytes.ToArray()), name);
    }

    /// <summary>Notes a template read (its SHA-256 over the bytes) and returns its text.</summary>
    private string Record(string target, string file, bool custom, byte[] bytes)
    {
        if (!_used.Any(u => u.Target == target && u.File == file))
            _used.Add(new TemplateUse(target, file, custom, Convert.ToHexStringLower(System.Security.Cryptography.SHA256.HashData(bytes))));
        using var reader = new StreamReader(new MemoryStream(bytes));
        return reader.ReadToEnd();
    }
}

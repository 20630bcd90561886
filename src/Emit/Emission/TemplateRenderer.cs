using System.Reflection;
using Scriban;
using Scriban.Parsing;
using Scriban.Runtime;
using Scriban.Syntax;

namespace Emit.Emission;

/// <summary>
/// Loads and renders the Scriban templates that lay out generated files. Shipped templates are embedded resources
/// named <c>templates/TARGET/FILE.sbn</c>; a templates folder given by the user overrides them file by file
/// (<c>DIR/TARGET/FILE.sbn</c>), included templates (<c>include "common.c.sbn"</c>) too. Member names keep their C#
/// spelling (no snake_case renaming). Errors name the template file, line and column.
/// </summary>
public sealed class TemplateRenderer
{
    private readonly string? _overrideDirectory;

    /// <summary>
    /// A renderer reading overrides from <paramref name="overrideDirectory"/> (null: shipped templates only).
    /// </summary>
    public TemplateRenderer(string? overrideDirectory)
    {
        if (overrideDirectory is not null && !Directory.Exists(overrideDirectory))
            throw new EmitException("templates folder does not exist",
                "give a folder holding c/ and csharp/ template files", overrideDirectory);
        _overrideDirectory = overrideDirectory;
    }

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
                throw new EmitException("unknown template file name",
                    $"the {target} target uses {string.Join(", ", known)}", file);
    }

    /// <summary>Renders template <c>TARGET/FILE</c> with <paramref name="model"/> as <c>m</c>.</summary>
    public string Render(string target, string file, object model) =>
        Render(target, file, globals => globals.SetValue("m", model, readOnly: true)).Text;

    /// <summary>
    /// Renders template <c>TARGET/FILE</c> with the globals <paramref name="register"/> puts on the script object;
    /// returns the text and every template read (the main one first, then its includes).
    /// </summary>
    public (string Text, IReadOnlyList<UsedTemplate> Templates) Render(string target, string file,
        Action<ScriptObject> register)
    {
        var loader = new Loader(this, target);
        var main = loader.Read(target + "/" + file);
        var template = Parse(main);
        var globals = new ScriptObject();
        register(globals);
        var context = new TemplateContext
        {
            StrictVariables = true,
            EnableRelaxedMemberAccess = false,
            NewLine = "\n",
            LoopLimit = 0,          // a weight table has more than the default 1000 rows
            LimitToString = 0,      // and more than the default 1 MB of text
            RecursiveLimit = 0,
            MemberRenamer = member => member.Name,
            TemplateLoader = loader,
        };
        context.PushGlobal(globals);
        try
        {
            var text = template.Render(context).Replace("\r\n", "\n", StringComparison.Ordinal);
            return (text, loader.Used);
        }
        catch (ScriptParserRuntimeException e) when (e.ParserMessages.Count > 0)
        {
            var first = e.ParserMessages.First(m => m.Type == ParserMessageType.Error);
            throw new EmitException($"template error: {first.Message}", "fix the template", first.Span.FileName,
                first.Span.Start.Line + 1, first.Span.Start.Column + 1);
        }
        catch (ScriptRuntimeException e)
        {
            throw new EmitException($"template error: {e.OriginalMessage}", "fix the template",
                e.Span.FileName ?? main.Source,
                e.Span.Start.Line + 1, e.Span.Start.Column + 1);
        }
    }

    private static Template Parse(UsedTemplate t)
    {
        var template = Template.Parse(t.Text, t.Source);
        if (template.HasErrors)
        {
            var first = template.Messages.First(m => m.Type == ParserMessageType.Error);
            throw new EmitException($"template error: {first.Message}", "fix the template", t.Source,
                first.Span.Start.Line + 1, first.Span.Start.Column + 1);
        }
        return template;
    }

    private UsedTemplate Load(string name)
    {
        if (_overrideDirectory is not null)
        {
            var path = Path.Combine(_overrideDirectory, name);
            if (File.Exists(path))
            {
                try { return new UsedTemplate(name, path,
                    File.ReadAllText(path).Replace("\r\n", "\n", StringComparison.Ordinal)); }
                catch (IOException e) { throw new EmitException($"cannot read template: {e.Message}", null, path); }
            }
        }
        var resource = "templates/" + name;
        using var stream = Assembly.GetExecutingAssembly().GetManifestResourceStream(resource)
                           ?? throw new InvalidOperationException(
                               $"shipped template {resource} is missing from the assembly");
        using var reader = new StreamReader(stream);
        return new UsedTemplate(name, resource, reader.ReadToEnd());
    }

    /// <summary>Resolves includes within the target's folder and records every template read.</summary>
    private sealed class Loader(TemplateRenderer owner, string target) : ITemplateLoader
    {
        private readonly List<UsedTemplate> _used = [];

        public IReadOnlyList<UsedTemplate> Used => _used;

        public UsedTemplate Read(string name)
        {
            var found = _used.FirstOrDefault(u => u.Name == name);
            if (found is not null) return found;
            var t = owner.Load(name);
            _used.Add(t);
            return t;
        }

        public string GetPath(TemplateContext context, Scriban.Parsing.SourceSpan callerSpan, string templateName)
        {
            if (templateName.Contains('/') || templateName.Contains('\\') || templateName.Contains(".."))
                throw new EmitException($"template error: include \"{templateName}\" names a folder",
                    "include files of the same target folder by file name",
                    callerSpan.FileName, callerSpan.Start.Line + 1, callerSpan.Start.Column + 1);
            return target + "/" + templateName;
        }

        public string Load(TemplateContext context, Scriban.Parsing.SourceSpan callerSpan, string templatePath) =>
            Read(templatePath).Text;

        public ValueTask<string?> LoadAsync(TemplateContext context, Scriban.Parsing.SourceSpan callerSpan,
            string templatePath) =>
            ValueTask.FromResult<string?>(Load(context, callerSpan, templatePath));
    }
}

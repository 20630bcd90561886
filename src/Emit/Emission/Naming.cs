using System.Globalization;
using System.Text;
using System.Text.RegularExpressions;

namespace Emit.Emission;

/// <summary>
/// The one naming authority: every identifier and every piece of model-supplied text that reaches generated code
/// goes through here. Model text (unit names, file names) may contain anything; what comes out is safe in a C
/// <c>/* */</c> comment, a C# <c>//</c> comment and a C/C# identifier, and never ends a comment, continues a line
/// (backslash-newline or the <c>??/</c> trigraph), starts a directive or breaks a string.
/// </summary>
public static partial class Naming
{
    /// <summary>Longest model text kept in a comment; longer text is cut and marked with "...".</summary>
    public const int MaxCommentLength = 80;

    /// <summary>
    /// Significant initial characters C99 guarantees in an external identifier (ISO/IEC 9899:1999 §5.2.4.1: "31
    /// significant initial characters in an external identifier"); identifiers equal in these may be one symbol to the
    /// linker, and MISRA C:2012 Rule 5.1 requires them distinct.
    /// </summary>
    public const int ExternalSignificant = 31;

    /// <summary>
    /// Significant initial characters C99 guarantees in an internal identifier or a macro name (§5.2.4.1: "63
    /// significant initial characters in an internal identifier or a macro name"); MISRA C:2012 Rules 5.2–5.5.
    /// </summary>
    public const int InternalSignificant = 63;

    /// <summary>
    /// Longest scorer name. The longest external identifiers are <c>NAME_free_energy</c> and
    /// <c>NAME_free_energy_units</c>: with 18 characters the first is 30 long, so both, and the same functions of
    /// any other scorer linked beside them, differ within the first <see cref="ExternalSignificant"/> characters.
    /// Every other generated identifier (tables, helpers, typedefs, macros, the include guard) is then at most 40
    /// characters, within <see cref="InternalSignificant"/>.
    /// </summary>
    public const int MaxScorerNameLength = ExternalSignificant - 13;

    /// <summary>
    /// Longest C# namespace. Roslyn refuses identifiers over 1023 characters and metadata type names are limited in
    /// length too (from memory), so the namespace is kept well inside both.
    /// </summary>
    public const int MaxNamespaceLength = 255;

    /// <summary>C99 keywords (ISO/IEC 9899:1999 §6.4.1).</summary>
    public static readonly IReadOnlySet<string> CKeywords = new HashSet<string>(StringComparer.Ordinal)
    {
        "auto", "break", "case", "char", "const", "continue", "default", "do", "double", "else", "enum", "extern",
        "float", "for", "goto", "if", "inline", "int", "long", "register", "restrict", "return", "short", "signed",
        "sizeof", "static", "struct", "switch", "typedef", "union", "unsigned", "void", "volatile", "while",
        "_Bool", "_Complex", "_Imaginary",
    };

    /// <summary>
    /// C++ keywords and alternative tokens (ISO/IEC 14882:2020 [lex.key], [lex.digraph]) not already C99 keywords.
    /// </summary>
    public static readonly IReadOnlySet<string> CppKeywords = new HashSet<string>(StringComparer.Ordinal)
    {
        "alignas", "alignof", "asm", "bool", "catch", "char8_t", "char16_t", "char32_t", "class", "concept",
        "consteval", "constexpr", "constinit", "const_cast", "co_await", "co_return", "co_yield", "decltype",
        "delete", "dynamic_cast", "explicit", "export", "false", "friend", "mutable", "namespace", "new",
        "noexcept", "nullptr", "operator", "private", "protected", "public", "reinterpret_cast", "requires",
        "static_assert", "static_cast", "template", "this", "thread_local", "throw", "true", "try", "typeid",
        "typename", "using", "virtual", "wchar_t", "and", "and_eq", "bitand", "bitor", "compl", "not", "not_eq",
        "or", "or_eq", "xor", "xor_eq",
    };

    /// <summary>C# keywords and contextual keywords (C# language reference, "Keywords").</summary>
    public static readonly IReadOnlySet<string> CSharpKeywords = new HashSet<string>(StringComparer.Ordinal)
    {
        "abstract", "as", "base", "bool", "break", "byte", "case", "catch", "char", "checked", "class", "const",
        "continue", "decimal", "default", "delegate", "do", "double", "else", "enum", "event", "explicit", "extern",
        "false", "finally", "fixed", "float", "for", "foreach", "goto", "if", "implicit", "in", "int", "interface",
        "internal", "is", "lock", "long", "namespace", "new", "null", "object", "operator", "out", "override",
        "params", "private", "protected", "public", "readonly", "ref", "return", "sbyte", "sealed", "short",
        "sizeof", "stackalloc", "static", "string", "struct", "switch", "this", "throw", "true", "try", "typeof",
        "uint", "ulong", "unchecked", "unsafe", "ushort", "using", "virtual", "void", "volatile", "while",
        "add", "allows", "alias", "and", "ascending", "args", "async", "await", "by", "descending", "dynamic",
        "equals", "field", "file", "from", "get", "global", "group", "init", "into", "join", "let", "managed",
        "nameof", "nint", "not", "notnull", "nuint", "on", "or", "orderby", "partial", "record", "remove",
        "required", "scoped", "select", "set", "unmanaged", "value", "var", "when", "where", "with", "yield",
    };

    [GeneratedRegex("^[A-Za-z_][A-Za-z0-9_]*$")]
    private static partial Regex CIdentifierPattern();

    /// <summary>True when <paramref name="text"/> is a C identifier (<c>[A-Za-z_][A-Za-z0-9_]*</c>).</summary>
    public static bool IsCIdentifier(string text) => CIdentifierPattern().IsMatch(text);

    /// <summary>True for a keyword of C99, C++ or C#.</summary>
    public static bool IsKeyword(string identifier) =>
        CKeywords.Contains(identifier) || CppKeywords.Contains(identifier) || CSharpKeywords.Contains(identifier);

    /// <summary>Appends "_" to an identifier that is a C99, C++ or C# keyword.</summary>
    public static string AvoidKeyword(string identifier) => IsKeyword(identifier) ? identifier + "_" : identifier;

    /// <summary>
    /// Checks a scorer name given with <c>--name</c>: a C identifier, and not one C99 §7.1.3 reserves
    /// (leading underscore followed by an upper-case letter or another underscore).
    /// </summary>
    public static void CheckScorerName(string name)
    {
        if (!IsCIdentifier(name))
            throw new EmitException($"name \"{CommentText(name)}\" is not a C identifier",
                "use letters, digits and _ only, not starting with a digit");
        // The name is also the macro prefix in upper case: "_x" gives _X_VISIBLE, reserved by C99 §7.1.3 (a leading _
        // and an upper-case letter); "x_" gives X__VISIBLE, and a "__" anywhere is reserved in C++ ([lex.name]),
        // which the header supports.
        if (name[0] == '_')
            throw new EmitException(
                $"name \"{name}\" starts with _, which makes reserved identifiers in C ({MacroPrefix(name)}_VISIBLE; " +
                "C99 7.1.3)", "start the name with a letter");
        if (name.Contains("__", StringComparison.Ordinal) || name.EndsWith('_'))
            throw new EmitException($"name \"{name}\" makes identifiers with \"__\", which C++ reserves",
                "use single _ between words and none at the end");
        if (name.Length > MaxScorerNameLength)
            throw new EmitException(
                $"name \"{name}\" has {name.Length} characters; {name}_free_energy_units would not be distinct from " +
                $"other external identifiers within the {ExternalSignificant} characters C99 guarantees (5.2.4.1)",
                $"use at most {MaxScorerNameLength} characters");
    }

    /// <summary>
    /// Checks a C# namespace given with <c>--namespace</c>: dot-separated identifiers, none a C# keyword.
    /// </summary>
    public static void CheckNamespace(string ns)
    {
        if (ns.Length > MaxNamespaceLength)
            throw new EmitException($"namespace has {ns.Length} characters, more than {MaxNamespaceLength}",
                "use a shorter namespace such as Emit.Generated");
        foreach (var part in ns.Split('.'))
            if (!IsCIdentifier(part) || CSharpKeywords.Contains(part))
                throw new EmitException($"namespace \"{CommentText(ns)}\" is not a C# namespace name",
                    "use dot-separated identifiers such as Emit.Generated");
    }

    /// <summary>
    /// The default scorer name made from a model file name: letters and digits kept, every other run of
    /// characters becomes one "_", leading and trailing "_" dropped, "model_" put before a leading digit,
    /// "model" when nothing is left, cut to <see cref="MaxScorerNameLength"/>, keywords suffixed with "_scorer".
    /// </summary>
    public static string ScorerNameFromFile(string path)
    {
        var stem = Path.GetFileNameWithoutExtension(path);
        var id = AsciiWords(stem, upper: false).Trim('_');
        if (id.Length == 0) return "model";
        if (char.IsAsciiDigit(id[0])) id = "model_" + id;
        if (id.Length > MaxScorerNameLength) id = id[..MaxScorerNameLength].TrimEnd('_');
        // A keyword gets "_scorer", not "_": "int_" would make the macros INT__VISIBLE, reserved in C++.
        return IsKeyword(id) ? id + "_scorer" : id;
    }

    /// <summary>UPPER_CASE form of a scorer name, for macros (<c>rbm_a</c> → <c>RBM_A</c>).</summary>
    public static string MacroPrefix(string name) => name.ToUpperInvariant();

    /// <summary>
    /// PascalCase form of a scorer name for a C# class: split at "_", first letter of each part upper-cased
    /// (<c>rbm_a</c> → <c>RbmA</c>); "Model" is put before a result that is empty or starts with a digit.
    /// </summary>
    public static string PascalCase(string name) => AvoidKeyword(PascalWords(name, "Model"));

    /// <summary>
    /// The C# class name for a scorer: <see cref="PascalCase"/>, with "Scorer" appended when it would equal one of
    /// the class's own member names (<paramref name="members"/>), which C# does not allow.
    /// </summary>
    public static string ClassName(string name, IReadOnlySet<string> members)
    {
        var id = PascalCase(name);
        return members.Contains(id) ? id + "Scorer" : id;
    }

    private static string PascalWords(string name, string prefix)
    {
        var sb = new StringBuilder();
        foreach (var part in name.Split('_', StringSplitOptions.RemoveEmptyEntries))
            sb.Append(char.ToUpperInvariant(part[0])).Append(part, 1, part.Length - 1);
        var id = sb.ToString();
        return id.Length == 0 || char.IsAsciiDigit(id[0]) ? prefix + id : id;
    }

    /// <summary>
    /// Identifiers derived from unit names, one per unit, valid and unique: C macro suffixes in upper case
    /// (<c>PUMP_A_TEMP</c>) and C# member names in PascalCase (<c>PumpATemp</c>). A name with no letter or digit
    /// becomes <c>UNIT_i</c> / <c>UnitI</c>; a clash gets <c>_2</c>, <c>_3</c>... (first come, first served, in unit
    /// order).
    /// <paramref name="reserved"/> lists names already taken in the same scope.
    /// </summary>
    public static (IReadOnlyList<string> C, IReadOnlyList<string> CSharp) UnitIdentifiers(IReadOnlyList<string> names,
        IEnumerable<string> reserved) =>
        UnitIdentifiers(names, reserved, UnitIdentifierLength);

    /// <summary>
    /// Longest unit identifier. The C macro is <c>UNAME_UNIT_</c> + the identifier: at most
    /// <see cref="MaxScorerNameLength"/> + 6 + 39 = <see cref="InternalSignificant"/> characters, so two unit macros
    /// that differ at all differ within the significant length (MISRA C:2012 Rule 5.4). C# member names are held to
    /// the same length, far below Roslyn's 1023-character limit on identifiers.
    /// </summary>
    public const int UnitIdentifierLength = InternalSignificant - MaxScorerNameLength - 6;

    /// <summary>
    /// As <see cref="UnitIdentifiers(IReadOnlyList{string}, IEnumerable{string})"/>, with identifiers cut to
    /// <paramref name="maxLength"/> characters.
    /// </summary>
    public static (IReadOnlyList<string> C, IReadOnlyList<string> CSharp) UnitIdentifiers(IReadOnlyList<string> names,
        IEnumerable<string> reserved, int maxLength)
    {
        var takenC = new HashSet<string>(StringComparer.Ordinal);
        var takenCs = new HashSet<string>(reserved, StringComparer.Ordinal);
        var c = new List<string>(names.Count);
        var cs = new List<string>(names.Count);
        for (int i = 0; i < names.Count; i++)
        {
            var upper = AsciiWords(names[i], upper: true).Trim('_');
            if (upper.Length == 0) upper = "UNIT_" + i.ToString(CultureInfo.InvariantCulture);
            upper = Cut(upper, maxLength);
            c.Add(Unique(upper, takenC, "_", maxLength));
            cs.Add(Unique(Cut(AvoidKeyword(PascalWords(upper.ToLowerInvariant(), "Unit")), maxLength), takenCs, "_",
                maxLength));
        }
        return (c, cs);
    }

    /// <summary>The first <paramref name="maxLength"/> characters, without a trailing "_".</summary>
    private static string Cut(string id, int maxLength) => id.Length <= maxLength ? id : id[..maxLength].TrimEnd('_');

    /// <summary>
    /// <paramref name="id"/>, or <c>id_2</c>, <c>id_3</c>... when taken, cut so that the result (suffix included)
    /// has at most <paramref name="maxLength"/> characters.
    /// </summary>
    private static string Unique(string id, HashSet<string> taken, string sep, int maxLength = int.MaxValue)
    {
        var candidate = id;
        for (int n = 2; !taken.Add(candidate); n++)
        {
            var suffix = sep + n.ToString(CultureInfo.InvariantCulture);
            candidate = Cut(id, maxLength - suffix.Length) + suffix;
        }
        return candidate;
    }

    /// <summary>ASCII letters and digits kept, every run of other characters replaced by one "_".</summary>
    private static string AsciiWords(string text, bool upper)
    {
        var sb = new StringBuilder(text.Length);
        bool gap = false;
        foreach (var ch in text)
        {
            if (char.IsAsciiLetterOrDigit(ch) || ch == '_')
            {
                if (gap && sb.Length > 0 && sb[^1] != '_') sb.Append('_');
                gap = false;
                sb.Append(upper ? char.ToUpperInvariant(ch) : ch);
            }
            else gap = true;
        }
        // collapse runs of '_' that came from the text itself
        var s = sb.ToString();
        while (s.Contains("__", StringComparison.Ordinal)) s = s.Replace("__", "_", StringComparison.Ordinal);
        return s;
    }

    /// <summary>
    /// Model text made safe for one line of a comment in generated C or C#: printable ASCII only (other
    /// characters, line breaks and tabs become <c>&lt;U+XXXX&gt;</c>), backslash written as <c>&lt;U+005C&gt;</c>,
    /// <c>*/</c>, <c>/*</c> and <c>//</c> split by a space, no two "?" in a row (trigraphs), cut to
    /// <see cref="MaxCommentLength"/> characters. The empty string becomes <c>(empty)</c>.
    /// </summary>
    public static string CommentText(string text)
    {
        if (text.Length == 0) return "(empty)";
        var sb = new StringBuilder(text.Length + 8);
        foreach (var rune in text.EnumerateRunes())
        {
            int v = rune.Value;
            if (v is >= 0x20 and < 0x7F && v != '\\')
            {
                char ch = (char)v;
                if (sb.Length > 0)
                {
                    char prev = sb[^1];
                    if ((prev == '*' && ch == '/') || (prev == '/' && (ch == '*' || ch == '/'))
                        || (prev == '?' && ch == '?'))
                        sb.Append(' ');
                }
                sb.Append(ch);
            }
            else sb.Append("<U+").Append(v.ToString("X4", CultureInfo.InvariantCulture)).Append('>');
            if (sb.Length > MaxCommentLength) break;
        }
        if (sb.Length > MaxCommentLength)
        {
            sb.Length = MaxCommentLength - 3;
            sb.Append("...");
        }
        // A comment ending in "*" or "/" could join with the closing "*/" or a following "/"; a trailing space could
        // hide it.
        var result = sb.ToString();
        if (result.EndsWith('*') || result.EndsWith('/')) result += " ";
        return result.TrimStart();
    }
}

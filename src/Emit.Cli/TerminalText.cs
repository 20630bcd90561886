using System.Globalization;
using System.Text;

namespace Emit.Cli;

/// <summary>
/// Text from models and data files on its way to a terminal: characters a terminal acts on (C0 controls such as ESC,
/// BEL, NUL, VT and CR; DEL; C1 controls such as NEL; the line and paragraph separators U+2028 and U+2029;
/// bidirectional overrides) are written as <c>&lt;U+XXXX&gt;</c>, the form the generated-code comment sanitiser uses
/// (docs/generated-code.md). Line feeds and tabs pass. See ECMA-48 for the control functions a terminal interprets.
/// </summary>
public static class TerminalText
{
    /// <summary>True for a character that must not reach a terminal as itself.</summary>
    public static bool IsUnsafe(char c) =>
        c < 0x20 && c != '\n' && c != '\t'
        || c is >= '\u007F' and <= '\u009F'
        || c is '\u2028' or '\u2029'
        || c is >= '\u202A' and <= '\u202E'
        || c is >= '\u2066' and <= '\u2069'
        || c is '\u200E' or '\u200F' or '\u061C';

    /// <summary><paramref name="text"/> with every unsafe character escaped.</summary>
    public static string Safe(string text)
    {
        int k = 0;
        while (k < text.Length && !IsUnsafe(text[k])) k++;
        if (k == text.Length) return text;
        var sb = new StringBuilder(text.Length + 16).Append(text, 0, k);
        for (; k < text.Length; k++) Append(sb, text[k]);
        return sb.ToString();
    }

    private static void Append(StringBuilder sb, char c)
    {
        if (IsUnsafe(c)) sb.Append("<U+").Append(((int)c).ToString("X4", CultureInfo.InvariantCulture)).Append('>');
        else sb.Append(c);
    }

    /// <summary>A writer that escapes unsafe characters on their way to <paramref name="inner"/>.</summary>
    public static TextWriter Wrap(TextWriter inner) => inner is SafeWriter ? inner : new SafeWriter(inner);

    private sealed class SafeWriter(TextWriter inner) : TextWriter(CultureInfo.InvariantCulture)
    {
        public override Encoding Encoding => inner.Encoding;

        public override string NewLine
        {
            get => inner.NewLine;
#pragma warning disable CS8765
            set => inner.NewLine = value;
#pragma warning restore CS8765
        }

        public override void Write(char value)
        {
            if (IsUnsafe(value)) inner.Write(Safe(value.ToString()));
            else inner.Write(value);
        }

        public override void Write(string? value)
        {
            if (value is not null) inner.Write(Safe(value));
        }

        public override void Write(char[] buffer, int index, int count) => Write(new string(buffer, index, count));

        public override void Write(ReadOnlySpan<char> buffer) => Write(new string(buffer));

        public override void WriteLine(string? value)
        {
            Write(value);
            inner.Write(inner.NewLine);
        }

        public override void WriteLine() => inner.Write(inner.NewLine);

        public override void WriteLine(ReadOnlySpan<char> buffer) => WriteLine(new string(buffer));

        public override void WriteLine(StringBuilder? value) => WriteLine(value?.ToString());

        public override void WriteLine(object? value) => WriteLine(value?.ToString());

        public override void Flush() => inner.Flush();

        protected override void Dispose(bool disposing)
        {
            if (disposing) inner.Flush();
            base.Dispose(disposing);
        }
    }
}

using Emit.Emission;

namespace Emit.Tests.Emission;

public sealed class NamingTests
{
    [Theory]
    [InlineData("rbm_a", "RbmA")]                // a naming example
    [InlineData("pump_station_2", "PumpStation2")]
    [InlineData("x", "X")]
    [InlineData("_", "Model")]
    [InlineData("a__b", "AB")]
    public void Pascal_case_of_scorer_names(string name, string expected) => Assert.Equal(expected, Naming.PascalCase(name));

    [Theory]
    [InlineData("models/pump-station.json", "pump_station")]
    [InlineData("2024 model.v1.json", "model_2024_model_v")]   // cut to 18 characters (C99 5.2.4.1: 31 significant in external names)
    [InlineData("int.json", "int_scorer")]          // C keyword ("int_" would give INT__VISIBLE, reserved in C++)
    [InlineData("class.npz", "class_scorer")]       // C++ and C# keyword
    [InlineData("a-very-long-model-file-name-from-training.json", "a_very_long_model")]
    [InlineData("....json", "model")]
    [InlineData("Kühler.json", "K_hler")]
    public void Default_scorer_name_from_the_file_name_is_a_valid_identifier(string path, string expected)
    {
        var name = Naming.ScorerNameFromFile(path);
        Assert.Equal(expected, name);
        Assert.True(Naming.IsCIdentifier(name));
        Naming.CheckScorerName(name);
    }

    [Theory]
    [InlineData("1abc")]
    [InlineData("a-b")]
    [InlineData("")]
    [InlineData("a b")]
    [InlineData("_Reserved")]
    [InlineData("__x")]
    [InlineData("ümlaut")]
    public void Scorer_names_that_are_not_usable_C_identifiers_are_refused(string name) =>
        Assert.Throws<EmitException>(() => Naming.CheckScorerName(name));

    [Theory]
    [InlineData("int")]
    [InlineData("restrict")]
    [InlineData("_Bool")]
    [InlineData("nullptr")]
    [InlineData("xor")]
    [InlineData("stackalloc")]
    [InlineData("record")]
    public void Keywords_of_any_target_language_get_a_suffix(string keyword)
    {
        Assert.True(Naming.IsKeyword(keyword));
        Assert.Equal(keyword + "_", Naming.AvoidKeyword(keyword));
    }

    [Fact]
    public void Class_name_never_equals_a_member_name()
    {
        Assert.Equal("VisibleScorer", Naming.ClassName("visible", Emit.Emission.Dialects.CSharpDialect.ClassMembers));
        Assert.Equal("FreeEnergyScorer", Naming.ClassName("free_energy", Emit.Emission.Dialects.CSharpDialect.ClassMembers));
        Assert.Equal("PumpA", Naming.ClassName("pump_a", Emit.Emission.Dialects.CSharpDialect.ClassMembers));
    }

    [Fact]
    public void Unit_identifiers_are_valid_unique_and_keep_their_order()
    {
        var names = CodegenCases.HostileNames.Concat(["Units", "units", "UNIT_9", "", "9lives", "a_2", "a"]).ToArray();
        var (c, cs) = Naming.UnitIdentifiers(names, ["Units"]);
        Assert.Equal(names.Length, c.Count);
        Assert.Equal(names.Length, cs.Count);
        Assert.Equal(c.Count, c.Distinct(StringComparer.Ordinal).Count());
        Assert.Equal(cs.Count, cs.Distinct(StringComparer.Ordinal).Count());
        Assert.All(c, id => Assert.Matches("^[A-Z0-9_]+$", id));          // used after a "NAME_UNIT_" prefix
        Assert.All(cs, id => Assert.True(Naming.IsCIdentifier(id) && !Naming.IsKeyword(id), id));
        Assert.DoesNotContain("Units", cs);
        Assert.Equal("A", c[Array.IndexOf(names, "a")]);
        Assert.Equal("A_2", c[Array.IndexOf(names, "A")]);
        Assert.Equal("Unit9lives", cs[Array.IndexOf(names, "9lives")]);
    }

    [Fact]
    public void Comment_text_cannot_end_a_comment_continue_a_line_or_form_a_trigraph()
    {
        foreach (var name in CodegenCases.HostileNames.Concat(["***/", "a*", "b/", "???", "?" + "?/", new string('x', 500), "\\\n", "\u00A0"]))
        {
            var text = Naming.CommentText(name);
            Assert.True(text.Length <= Naming.MaxCommentLength + 1, text);
            Assert.DoesNotContain("*/", text);
            Assert.DoesNotContain("/*", text);
            Assert.DoesNotContain("//", text);
            Assert.DoesNotContain("??", text);
            Assert.DoesNotContain('\\', text);
            Assert.All(text, ch => Assert.True(ch >= ' ' && ch < 0x7F, $"U+{(int)ch:X4} in \"{text}\""));
            Assert.False(text.EndsWith('*') || text.EndsWith('/'), text);
            // in a C block comment followed by " */" the comment must close exactly there
            var comment = "/* " + text + " */";
            Assert.Equal(comment.Length - 2, comment.IndexOf("*/", StringComparison.Ordinal));
        }
        Assert.Equal("(empty)", Naming.CommentText(""));
        Assert.Equal("K<U+00FC>hler", Naming.CommentText("Kühler"));
        Assert.Equal("line<U+000A>break", Naming.CommentText("line\nbreak"));
    }

    [Theory]
    [InlineData("Emit.Generated")]
    [InlineData("Plant.Monitoring.V2")]
    public void Valid_namespaces_pass(string ns) => Naming.CheckNamespace(ns);

    [Theory]
    [InlineData("Emit..Generated")]
    [InlineData("class.Generated")]
    [InlineData("1x")]
    [InlineData("")]
    public void Invalid_namespaces_are_refused(string ns) => Assert.Throws<EmitException>(() => Naming.CheckNamespace(ns));

    [Theory]
    [InlineData("_x")]                  // _X_VISIBLE: C99 7.1.3 reserves _ followed by an upper-case letter
    [InlineData("_")]
    [InlineData("x_")]                  // X__VISIBLE: C++ [lex.name] reserves any "__"
    [InlineData("a__b")]
    [InlineData("abcdefghijklmnopqrs")] // 19 characters: abcdefghijklmnopqrs_free_energy is 31, _units then differs only after them
    public void Scorer_names_that_make_reserved_or_clashing_identifiers_are_refused(string name) =>
        Assert.Throws<EmitException>(() => Naming.CheckScorerName(name));

    [Fact]
    public void An_18_character_name_keeps_every_external_identifier_distinct_within_31_characters()
    {
        // C99 5.2.4.1: 31 significant initial characters in an external identifier.
        const string name = "abcdefghijklmnopqr";
        Naming.CheckScorerName(name);
        string[] external = [name + "_free_energy", name + "_free_energy_units", name + "_is_unusual", name + "_selftest"];
        Assert.Equal(external.Length, external.Select(e => e[..Math.Min(e.Length, Naming.ExternalSignificant)]).Distinct().Count());
    }

    [Fact]
    public void Unit_macros_equal_in_their_first_63_characters_still_differ_within_63()
    {
        // C99 5.2.4.1: 63 significant initial characters in a macro name; MISRA C:2012 Rule 5.4 wants them distinct.
        var stem = new string('a', 70);
        var (c, cs) = Naming.UnitIdentifiers([stem + "1", stem + "2", stem + "1"], []);
        var macros = c.Select(u => Naming.MacroPrefix("abcdefghijklmnopqr") + "_UNIT_" + u).ToArray();
        Assert.All(macros, m => Assert.True(m.Length <= Naming.InternalSignificant, m));
        Assert.Equal(3, macros.Select(m => m[..Math.Min(m.Length, 63)]).Distinct().Count());
        Assert.All(cs, m => Assert.True(m.Length <= Naming.UnitIdentifierLength, m));
        Assert.Equal(3, cs.Distinct().Count());
    }

    [Fact]
    public void A_unit_name_of_2000_characters_gives_short_identifiers()
    {
        // Roslyn refuses identifiers over 1023 characters (error CS0645, from memory).
        var (c, cs) = Naming.UnitIdentifiers([new string('x', 2000)], []);
        Assert.True(c[0].Length <= Naming.UnitIdentifierLength);
        Assert.True(cs[0].Length <= Naming.UnitIdentifierLength);
    }

    [Fact]
    public void A_namespace_of_2000_characters_is_refused()
    {
        Assert.Throws<EmitException>(() => Naming.CheckNamespace(string.Join(".", Enumerable.Repeat(new string('N', 99), 20))));
        Naming.CheckNamespace("Plant.Monitoring.Reefer");
    }
}

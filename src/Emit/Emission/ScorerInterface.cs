using Emit.Model;
using Emit.Quantize;

namespace Emit.Emission;

/// <summary>
/// What firmware built against a generated scorer depends on, beyond the numbers in its tables: the scorer name (its
/// function, macro and class names), the number of visible units (the input array and packed-byte sizes), the unit
/// names (the <c>NAME_UNIT_...</c> macros and C# constants, docs/generated-code.md), and in fixed point the energy
/// format (how the returned integer is read). <see cref="Changes"/> lists what differs between two models' scorers.
/// </summary>
public sealed record ScorerInterface(string Name, int Visible, IReadOnlyList<string> UnitMacros,
    string? FixedEnergyFormat, string? FixedPlanProblem)
{
    /// <summary>
    /// The interface of the scorer <c>emit compile</c> makes for <paramref name="model"/> from the file
    /// <paramref name="modelFile"/> with default options (the scorer name from the file name, int16 weights, automatic
    /// accumulator).
    /// </summary>
    public static ScorerInterface Of(BoltzmannModel model, string modelFile)
    {
        var macros = model.Names.IsEmpty ? [] : Naming.UnitIdentifiers(model.Names, []).C;
        string? energy = null, problem = null;
        if (model.Hidden > MaxPlannedHidden) problem = $"not planned for more than {MaxPlannedHidden} hidden units";
        else try
        {
            energy = FixedPointPlanner.Build(model, new FixedPointOptions()).EnergyFormat.ToString();
        }
        catch (EmitException e)
        {
            problem = e.Problem;
        }
        return new ScorerInterface(Naming.ScorerNameFromFile(modelFile), model.Visible, macros, energy, problem);
    }

    /// <summary>
    /// Above this many hidden units the fixed-point energy format is not planned (planning time grows with H²).
    /// </summary>
    public const int MaxPlannedHidden = 1024;

    /// <summary>
    /// Each way firmware built against <paramref name="old"/>'s scorer breaks with <paramref name="replacement"/>'s, in
    /// words.
    /// </summary>
    public static IReadOnlyList<string> Changes(ScorerInterface old, ScorerInterface replacement)
    {
        var changes = new List<string>();
        if (old.Name != replacement.Name)
            changes.Add(
                $"default scorer name {old.Name} becomes {replacement.Name}: functions, macros and files are renamed " +
                        $"(compile both with the same {Setting.Name.Ref()} to keep them)");
        if (old.Visible != replacement.Visible)
            changes.Add(
                $"visible units {old.Visible} become {replacement.Visible}: the input array and packed-byte sizes " +
                "change");
        if (old.UnitMacros.Count > 0 && replacement.UnitMacros.Count == 0)
            changes.Add("the new model has no unit names: the per-unit macros and constants disappear");
        else if (old.UnitMacros.Count == 0 && replacement.UnitMacros.Count > 0)
            changes.Add(
                "the old model has no unit names: per-unit macros and constants appear (code using unit numbers " +
                "still builds)");
        else if (old.UnitMacros.Count > 0)
        {
            var gone = old.UnitMacros.Except(replacement.UnitMacros, StringComparer.Ordinal).ToList();
            var moved = old.UnitMacros.Select((m, i) => (m, i)).Count(x => x.i < replacement.UnitMacros.Count &&
                replacement.UnitMacros.Contains(x.m) && replacement.UnitMacros[x.i] != x.m);
            if (gone.Count > 0)
                changes.Add(
                    $"{gone.Count} unit macro{(gone.Count == 1 ? "" : "s")} disappear " +
                    $"({string.Join(", ", gone.Take(5))}{(gone.Count > 5 ? ", ..." : "")})");
            if (moved > 0)
                changes.Add(
                    $"{moved} unit{(moved == 1 ? "" : "s")} keep their name at another position: the macros' values " +
                    "change");
        }
        if (old.FixedEnergyFormat is not null && replacement.FixedEnergyFormat is not null
            && old.FixedEnergyFormat != replacement.FixedEnergyFormat)
            changes.Add(
                $"fixed-point energy format {old.FixedEnergyFormat} becomes {replacement.FixedEnergyFormat} (default " +
                "fixed-point settings): " +
                        "the integer energy returned means another value");
        return changes;
    }
}

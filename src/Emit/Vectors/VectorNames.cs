using Emit.Model;

namespace Emit.Vectors;

/// <summary>Checks a vector file's header of unit names against the model's.</summary>
public static class VectorNames
{
    /// <summary>
    /// A header whose names differ from the model's means the columns are in another order: throws
    /// <see cref="EmitException"/>.
    /// </summary>
    public static void Check(BoltzmannModel model, VectorReader reader)
    {
        if (model.Names.IsEmpty || reader.Names.IsEmpty) return;
        for (int i = 0; i < model.Visible; i++)
            if (reader.Names[i] != model.Names[i])
                throw new EmitException(
                    $"column {i + 1} is named \"{reader.Names[i]}\" but the model's unit {i} is \"{model.Names[i]}\"",
                    "put the columns in the model's order, or remove the header", reader.Source, reader.HeaderLine);
    }
}

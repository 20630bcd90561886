namespace Emit.Model;

/// <summary>
/// Loads a model from a <c>.json</c> model file or an <c>.npz</c> array archive, chosen by extension.
/// </summary>
public static class ModelLoader
{
    /// <summary>Loads a model file, choosing the reader by extension (.json or .npz).</summary>
    public static BoltzmannModel Load(string path)
    {
        if (path.EndsWith(".npz", StringComparison.OrdinalIgnoreCase))
            return NpzModelReader.Read(path);
        return ModelJson.Read(path);
    }
}

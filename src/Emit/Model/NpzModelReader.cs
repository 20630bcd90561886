namespace Emit.Model;

/// <summary>Imports a model from a NumPy .npz archive.</summary>
public static class NpzModelReader
{
    public static BoltzmannModel Read(string path) =>
        throw new EmitException(".npz import is not available yet", "convert to JSON", path);
}

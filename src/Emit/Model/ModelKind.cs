namespace Emit.Model;

/// <summary>Which couplings a Boltzmann machine has.</summary>
public enum ModelKind
{
    /// <summary>Restricted: visible-hidden weights only.</summary>
    Rbm,
    /// <summary>Restricted plus visible-visible (lateral) links.</summary>
    Lateral,
    /// <summary>Lateral links in both layers: visible-visible and hidden-hidden.</summary>
    General,
}

/// <summary>The names of <see cref="ModelKind"/> in files and on the command line.</summary>
public static class ModelKindNames
{
    /// <summary>The kind's name: rbm, lateral or general.</summary>
    public static string ToText(this ModelKind kind) => kind switch
    {
        ModelKind.Rbm => "rbm",
        ModelKind.Lateral => "lateral",
        ModelKind.General => "general",
        _ => throw new ArgumentOutOfRangeException(nameof(kind)),
    };

    /// <summary>The kind named <paramref name="text"/>, or null for an unknown name.</summary>
    public static ModelKind? Parse(string text) => text switch
    {
        "rbm" => ModelKind.Rbm,
        "lateral" => ModelKind.Lateral,
        "general" => ModelKind.General,
        _ => null,
    };
}

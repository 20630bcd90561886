using System.Collections.Immutable;

namespace Emit.Model;

/// <summary>
/// A validated, immutable Boltzmann machine over binary units.
/// Energy convention: -E(v,h) = b·v + c·h + Σ_{i&lt;j} L_ij v_i v_j + Σ_{i,j} v_i W_ij h_j + Σ_{k&lt;l} M_kl h_k h_l.
/// </summary>
public sealed class BoltzmannModel
{
    private string? _sha256;

    /// <summary>Builds and validates a model; throws <see cref="EmitException"/> on any inconsistency.</summary>
    public BoltzmannModel(
        ModelKind kind,
        int visible,
        int hidden,
        ImmutableArray<double> visibleBias,
        ImmutableArray<double> hiddenBias,
        ImmutableArray<double> weights,
        ImmutableArray<Link> visibleLinks = default,
        ImmutableArray<Link> hiddenLinks = default,
        ImmutableArray<string> names = default,
        double? threshold = null,
        LogPartition? logPartition = null,
        string? metadataJson = null)
    {
        Kind = kind;
        Visible = visible;
        Hidden = hidden;
        VisibleBias = visibleBias.IsDefault ? ImmutableArray<double>.Empty : visibleBias;
        HiddenBias = hiddenBias.IsDefault ? ImmutableArray<double>.Empty : hiddenBias;
        Weights = weights.IsDefault ? ImmutableArray<double>.Empty : weights;
        VisibleLinks = visibleLinks.IsDefault ? ImmutableArray<Link>.Empty : visibleLinks;
        HiddenLinks = hiddenLinks.IsDefault ? ImmutableArray<Link>.Empty : hiddenLinks;
        Names = names.IsDefault ? ImmutableArray<string>.Empty : names;
        Threshold = threshold;
        LogPartition = logPartition;
        MetadataJson = metadataJson;
        Validate();
    }

    /// <summary>Which couplings the model has.</summary>
    public ModelKind Kind { get; }
    /// <summary>Visible units.</summary>
    public int Visible { get; }
    /// <summary>Hidden units.</summary>
    public int Hidden { get; }

    /// <summary>b, one per visible unit.</summary>
    public ImmutableArray<double> VisibleBias { get; }

    /// <summary>c, one per hidden unit.</summary>
    public ImmutableArray<double> HiddenBias { get; }

    /// <summary>W row-major: W_ij at [i * Hidden + j], one contiguous row per visible unit.</summary>
    public ImmutableArray<double> Weights { get; }

    /// <summary>L: visible-visible links, sorted by (I, J), I &lt; J.</summary>
    public ImmutableArray<Link> VisibleLinks { get; }

    /// <summary>M: hidden-hidden links, sorted by (I, J), I &lt; J.</summary>
    public ImmutableArray<Link> HiddenLinks { get; }

    /// <summary>Unit names, empty or one per visible unit (any text).</summary>
    public ImmutableArray<string> Names { get; }

    /// <summary>A vector is unusual when F(v) &gt; Threshold.</summary>
    public double? Threshold { get; }

    /// <summary>log Z when known (exact or estimated, with its method), or null.</summary>
    public LogPartition? LogPartition { get; }

    /// <summary>The free-form "metadata" object as JSON text, preserved on rewrite; not part of the identity.</summary>
    public string? MetadataJson { get; }

    /// <summary>W_ij.</summary>
    public double Weight(int i, int j) => Weights[i * Hidden + j];

    /// <summary>Visible unit i's weight row (Hidden values).</summary>
    public ReadOnlySpan<double> WeightRow(int i) => Weights.AsSpan().Slice(i * Hidden, Hidden);

    /// <summary>Lower-case hex SHA-256 of the canonical serialisation (see docs/model-format.md).</summary>
    public string Sha256 => _sha256 ??= ModelJson.CanonicalSha256(this);

    /// <summary>A copy with other threshold / log partition values.</summary>
    public BoltzmannModel With(double? threshold, LogPartition? logPartition) =>
        new(Kind, Visible, Hidden, VisibleBias, HiddenBias, Weights, VisibleLinks, HiddenLinks, Names, threshold,
            logPartition, MetadataJson);

    private void Validate()
    {
        if (Visible < 1 || Visible > ModelLimits.MaxUnits)
            throw new EmitException($"visible = {Visible} is out of range", $"use 1 to {ModelLimits.MaxUnits}");
        if (Hidden < 0 || Hidden > ModelLimits.MaxUnits)
            throw new EmitException($"hidden = {Hidden} is out of range", $"use 0 to {ModelLimits.MaxUnits}");
        if ((long)Visible * Hidden > ModelLimits.MaxWeights)
            throw new EmitException(
                $"visible × hidden = {(long)Visible * Hidden} weights is more than the {ModelLimits.MaxWeights} " +
                "allowed");
        CheckLength("visible_bias", VisibleBias.Length, Visible);
        CheckLength("hidden_bias", HiddenBias.Length, Hidden);
        CheckLength("weights", Weights.Length, Visible * Hidden);
        CheckFinite("visible_bias", VisibleBias);
        CheckFinite("hidden_bias", HiddenBias);
        CheckFinite("weights", Weights);
        if (!Names.IsEmpty) CheckLength("names", Names.Length, Visible);
        if (Kind == ModelKind.Rbm && !VisibleLinks.IsEmpty)
            throw new EmitException("kind rbm has visible_links", "use kind lateral or general, or remove the links");
        if (Kind != ModelKind.General && !HiddenLinks.IsEmpty)
            throw new EmitException($"kind {Kind.ToText()} has hidden_links", "use kind general, or remove the links");
        CheckLinks("visible_links", VisibleLinks, Visible);
        CheckLinks("hidden_links", HiddenLinks, Hidden);
        if (Threshold is { } t && !double.IsFinite(t))
            throw new EmitException("threshold is not a finite number");
        if (LogPartition is { } lp)
        {
            if (!double.IsFinite(lp.Value) || !double.IsFinite(lp.Stderr) || lp.Stderr < 0)
                throw new EmitException("log_partition value/stderr must be finite, stderr >= 0");
            if (lp.Method is not ("exact" or "ais"))
                throw new EmitException($"log_partition method \"{lp.Method}\" is unknown", "use \"exact\" or \"ais\"");
        }
    }

    private static void CheckLength(string field, int actual, long expected)
    {
        if (actual != expected)
            throw new EmitException($"{field} has {actual} values, expected {expected}");
    }

    private static void CheckFinite(string field, ImmutableArray<double> values)
    {
        for (int k = 0; k < values.Length; k++)
            if (!double.IsFinite(values[k]))
                throw new EmitException($"{field}[{k}] is not a finite number");
    }

    private static void CheckLinks(string field, ImmutableArray<Link> links, int units)
    {
        for (int k = 0; k < links.Length; k++)
        {
            var l = links[k];
            if (l.I < 0 || l.J >= units || l.I >= l.J)
                throw new EmitException($"{field}[{k}] = [{l.I}, {l.J}] is out of range", $"need 0 <= i < j < {units}");
            if (!double.IsFinite(l.W))
                throw new EmitException($"{field}[{k}] weight is not a finite number");
            if (k > 0)
            {
                var p = links[k - 1];
                if (p.I == l.I && p.J == l.J)
                    throw new EmitException($"{field} has [{l.I}, {l.J}] twice", "merge duplicate links into one");
                if (p.I > l.I || (p.I == l.I && p.J > l.J))
                    throw new EmitException($"{field} is not sorted", "internal: sort links before building a model");
            }
        }
    }
}

namespace Emit.Quantize;

/// <summary>
/// The parts of the worst-case error, each as a signed interval in nats of (fixed − exact) for the positive
/// sum S(v) = b·v + Σ L v v + Σ_j softplus(x_j) (general: + log-sum-exp), F = −S. The total for F is
/// −(sum of the parts + centring offset); the bound is its largest magnitude plus a floating-point slack.
/// </summary>
public sealed record ErrorBudget
{
    /// <summary>Visible bias rounding: [Σ min(0, Δb_i), Σ max(0, Δb_i)].</summary>
    public required ErrorInterval VisibleBias { get; init; }

    /// <summary>Lateral weight rounding plus the rounding of to_energy on the lateral sum.</summary>
    public required ErrorInterval Lateral { get; init; }

    /// <summary>
    /// Hidden input rounding (weights and hidden biases) carried through softplus: Σ_j [σ(ξ_lo), σ(ξ_hi)] × δ_j.
    /// general: the change of the exact log-sum-exp caused by score rounding (weights, biases, hidden links,
    /// to_energy).
    /// </summary>
    public required ErrorInterval HiddenInputs { get; init; }

    /// <summary>
    /// Softplus table: interpolation, entry rounding, interpolation arithmetic rounding, tails (rbm/lateral).
    /// </summary>
    public required ErrorInterval Softplus { get; init; }

    /// <summary>
    /// general: H merge levels × the error of one integer log-sum-exp of two values ([0, 0] otherwise).
    /// </summary>
    public required ErrorInterval LogSumExp { get; init; }

    /// <summary>Centring constant K·2^−E added to S so the total interval is (nearly) symmetric.</summary>
    public required double Offset { get; init; }

    /// <summary>Allowance for double rounding in the reference scorer and in this analysis.</summary>
    public required double Slack { get; init; }

    /// <summary>Range of F_fixed(v) − F_exact(v) over all binary v (without the slack).</summary>
    public required ErrorInterval Total { get; init; }

    /// <summary>The stated bound: max(|Total.Lo|, |Total.Hi|) + Slack, in nats.</summary>
    public double Bound => Total.MaxAbs + Slack;
}

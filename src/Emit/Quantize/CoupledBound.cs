namespace Emit.Quantize;

/// <summary>
/// Enclosure of S(v, s) = Σ_j s_j δ_j(v), δ_j(v) = δC_j + Σ_i v_i δW_ij, over all binary v and all slopes
/// s_j ∈ [sLo_j, sHi_j]. This is how weight and bias rounding reaches the energy: by the mean value theorem
/// softplus(x + δ) − softplus(x) = s·δ with s = σ(ξ) between the slopes at the ends of the unit's range, and for
/// kind general h_j ∈ {0, 1} plays the part of s_j. Two enclosures are intersected:
/// <list type="number">
/// <item>Per unit (column-wise): Σ_j [sLo_j, sHi_j] × [δ_j min, δ_j max], each unit at its own worst input.</item>
/// <item>Coupled (row-wise): with m_j the slope midpoints and w_j the half-widths,
/// S = Σ_j m_j δ_j(v) + Σ_j (s_j − m_j) δ_j(v). The first part is linear in v, so its exact range is
/// Σ_j m_j δC_j + [Σ_i min(0, r_i), Σ_i max(0, r_i)], r_i = Σ_j m_j δW_ij. The second is at most
/// K = min(Σ_j w_j max|δ_j|, √H′ (‖w∘δC‖₂ + ‖δW·diag(w)‖₂ √V)) in magnitude (Cauchy–Schwarz:
/// ‖u‖₁ ≤ √H′‖u‖₂ over the H′ units with w_j &gt; 0, and ‖v‖₂ ≤ √V), with the spectral norm bounded from above
/// by <see cref="SpectralNorm"/>.</item>
/// </list>
/// The coupled form is much tighter for wide models, where no single input is the worst case of every unit.
/// </summary>
internal static class CoupledBound
{
    /// <summary>Computes the enclosure. <paramref name="dW"/> is V×H row-major (nats).</summary>
    public static ErrorInterval Compute(int visible, int hidden, double[] dW, double[] dC, double[] sLo, double[] sHi,
        bool spectral)
    {
        int v = visible, h = hidden;
        if (h == 0) return ErrorInterval.Zero;
        var neg = new double[h];
        var pos = new double[h];
        var r = new double[v];
        var mid = new double[h];
        var rad = new double[h];
        for (int j = 0; j < h; j++)
        {
            mid[j] = 0.5 * (sLo[j] + sHi[j]);
            rad[j] = 0.5 * (sHi[j] - sLo[j]);
        }
        for (int i = 0; i < v; i++)
        {
            double ri = 0;
            int row = i * h;
            for (int j = 0; j < h; j++)
            {
                double d = dW[row + j];
                if (d < 0) neg[j] += d; else pos[j] += d;
                ri += mid[j] * d;
            }
            r[i] = ri;
        }
        var column = ErrorInterval.Zero;
        double k1 = 0, c0 = 0, wc2 = 0;
        int active = 0;
        for (int j = 0; j < h; j++)
        {
            var delta = new ErrorInterval(dC[j] + neg[j], dC[j] + pos[j]);
            column += new ErrorInterval(sLo[j], sHi[j]).Times(delta);
            k1 += rad[j] * delta.MaxAbs;
            c0 += mid[j] * dC[j];
            wc2 += rad[j] * dC[j] * rad[j] * dC[j];
            if (rad[j] > 0) active++;
        }
        double lo = c0, hi = c0;
        foreach (double ri in r)
        {
            if (ri < 0) lo += ri; else hi += ri;
        }
        double k = k1;
        if (spectral && active > 0)
        {
            var a = new double[v * h];
            for (int i = 0; i < v; i++)
                for (int j = 0; j < h; j++) a[i * h + j] = dW[i * h + j] * rad[j];
            double k2 = Math.Sqrt(active) * (Math.Sqrt(wc2) + SpectralNorm.UpperBound(a, v, h) * Math.Sqrt(v));
            k = Math.Min(k1, k2);
        }
        var coupled = new ErrorInterval(lo - k, hi + k);
        var both = new ErrorInterval(Math.Max(column.Lo, coupled.Lo), Math.Min(column.Hi, coupled.Hi));
        return both.IsEmpty ? column : both;
    }
}

namespace Emit.Quantize;

/// <summary>
/// A guaranteed upper bound on the spectral norm ‖A‖₂ of a dense matrix, computed in double precision:
/// B = AᵀA, a power-iteration estimate t of λ_max(B), then a Cholesky factorisation of tI − B proves
/// λ_max(B) ≤ t up to the rounding errors, which are added explicitly:
/// <list type="bullet">
/// <item>Cholesky that runs to completion on a symmetric M gives RᵀR = M + ΔM with |ΔM| ≤ γ_{n+1}|Rᵀ||R|
/// (Higham, Accuracy and Stability of Numerical Algorithms, 2nd ed., Theorem 10.3; cited from memory), so
/// λ_min(M) ≥ −γ_{n+1}‖R‖_F² = −γ_{n+1} trace(M + ΔM) ≥ −2γ_{n+1} n t.</item>
/// <item>The computed product B̂ = AᵀA + F with |F| ≤ γ_m |A|ᵀ|A| (Higham, section 3.5, inner products;
/// cited from memory), so ‖F‖₂ ≤ γ_m ‖A‖_F².</item>
/// </list>
/// γ_k = k u / (1 − k u), u = 2^−53.
/// </summary>
internal static class SpectralNorm
{
    private static double Gamma(long k)
    {
        double ku = k * Math.ScaleB(1.0, -53);
        return ku / (1 - ku);
    }

    /// <summary>
    /// Largest order n of the Gram matrix (n = min(rows, cols)) the bound is computed for: n² doubles and an n³/3
    /// Cholesky factorisation per trial (1024: 8 MiB and about 0.4·10⁹ operations). Above it the bound is +∞, which
    /// callers take the minimum with.
    /// </summary>
    public const int MaxOrder = 1024;

    /// <summary>
    /// Upper bound on ‖A‖₂ for A with <paramref name="rows"/> rows, row-major. ‖A‖₂ = ‖Aᵀ‖₂, so the Gram matrix is
    /// formed on the smaller side (AᵀA when cols ≤ rows, else AAᵀ): the cost is min(rows, cols)² · max(rows, cols),
    /// not cols², and +∞ is returned when min(rows, cols) &gt; <see cref="MaxOrder"/>.
    /// </summary>
    public static double UpperBound(double[] a, int rows, int cols)
    {
        if (cols == 0 || rows == 0) return 0;
        bool byRows = rows < cols;
        int n = byRows ? rows : cols, m = byRows ? cols : rows;
        if (n > MaxOrder) return double.PositiveInfinity;
        var b = new double[checked(n * n)];
        double frob = 0;
        if (!byRows)
        {
            for (int i = 0; i < rows; i++)
            {
                long r = (long)i * cols;
                for (int j = 0; j < cols; j++)
                {
                    double aij = a[r + j];
                    if (aij == 0) continue;
                    frob += aij * aij;
                    int bj = j * cols;
                    for (int k = j; k < cols; k++) b[bj + k] += aij * a[r + k];
                }
            }
        }
        else
        {
            for (int i = 0; i < rows; i++)
            {
                var ri = a.AsSpan(i * cols, cols);
                for (int j = 0; j < cols; j++) frob += ri[j] * ri[j];
                for (int k = i; k < rows; k++)
                {
                    var rk = a.AsSpan(k * cols, cols);
                    double dot = 0;
                    for (int j = 0; j < cols; j++) dot += ri[j] * rk[j];
                    b[i * n + k] = dot;
                }
            }
        }
        // From here on: B is n×n, built from inner products of length m.
        cols = n;
        rows = m;
        if (frob == 0) return 0;
        for (int j = 0; j < cols; j++)
            for (int k = 0; k < j; k++) b[j * cols + k] = b[k * cols + j];

        // Power iteration for an estimate (a lower bound, up to rounding) of λ_max(B).
        var x = new double[cols];
        var y = new double[cols];
        for (int j = 0; j < cols; j++) x[j] = 1.0 + 0.001 * j;
        double lambda = 0;
        for (int it = 0; it < 300; it++)
        {
            double norm = 0;
            for (int j = 0; j < cols; j++)
            {
                double s = 0;
                int bj = j * cols;
                for (int k = 0; k < cols; k++) s += b[bj + k] * x[k];
                y[j] = s;
                norm += s * s;
            }
            norm = Math.Sqrt(norm);
            double xn = 0;
            for (int j = 0; j < cols; j++) xn += x[j] * x[j];
            double next = norm / Math.Sqrt(xn);
            for (int j = 0; j < cols; j++) x[j] = y[j] / norm;
            if (Math.Abs(next - lambda) <= 1e-9 * next) { lambda = next; break; }
            lambda = next;
        }

        // Prove λ_max(B̂) ≤ t by factorising tI − B̂; widen t until the factorisation succeeds.
        double t = Math.Max(lambda * (1 + 1e-6), frob * 1e-12);
        while (!IsPositiveDefinite(b, cols, t)) t *= 1.02;
        double lambdaMax = t * (1 + 2 * Gamma(cols + 1) * cols) + Gamma(rows) * frob * (1 + 1e-6);
        return Math.Sqrt(lambdaMax) * (1 + 1e-12);
    }

    /// <summary>True when the Cholesky factorisation of tI − B runs to completion with positive pivots.</summary>
    private static bool IsPositiveDefinite(double[] b, int n, double t)
    {
        var l = new double[n * n];
        for (int j = 0; j < n; j++)
        {
            double diag = t - b[j * n + j];
            for (int k = 0; k < j; k++) diag -= l[j * n + k] * l[j * n + k];
            if (!(diag > 0)) return false;
            double ljj = Math.Sqrt(diag);
            l[j * n + j] = ljj;
            for (int i = j + 1; i < n; i++)
            {
                double s = -b[i * n + j];
                for (int k = 0; k < j; k++) s -= l[i * n + k] * l[j * n + k];
                l[i * n + j] = s / ljj;
            }
        }
        return true;
    }
}

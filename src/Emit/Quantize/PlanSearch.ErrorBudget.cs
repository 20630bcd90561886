namespace Emit.Quantize;

internal sealed partial class PlanSearch
{
    /// <summary>
    /// Enclosure of Σ_j s_j δ_j(v) (slopes s_j ∈ [sLo_j, sHi_j]): per unit during the search; coupled (row-wise
    /// with a spectral-norm term, see <see cref="CoupledBound"/>) for the final plan, cached per choice of formats.
    /// </summary>
    private ErrorInterval HiddenInputs(int[] f, Column[] cols, double[] sLo, double[] sHi, bool coupled)
    {
        int h = _m.Hidden, v = _m.Visible;
        if (!coupled)
        {
            var sum = ErrorInterval.Zero;
            for (int j = 0; j < h; j++) sum += new ErrorInterval(sLo[j], sHi[j]).Times(cols[j].Delta);
            return sum;
        }
        string key = string.Join(",", f);
        if (_coupled.TryGetValue(key, out var cached)) return cached;
        var dW = new double[v * h];
        var dC = new double[h];
        for (int j = 0; j < h; j++)
        {
            dC[j] = cols[j].DC;
            var d = cols[j].D;
            for (int i = 0; i < v; i++) dW[i * h + j] = d[i];
        }
        var result = CoupledBound.Compute(v, h, dW, dC, sLo, sHi, spectral: true);
        _coupled[key] = result;
        return result;
    }
}

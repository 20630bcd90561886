using System.Globalization;
using Emit.Harness;

namespace Emit.Cli;

/// <summary>
/// <c>emit verify --plot</c>: a PNG histogram of log10 |F_generated − F_reference| per target (ScottPlot), with each
/// target's error bound as a vertical line; exact agreements are counted in the legend.
/// </summary>
public static class ErrorPlot
{
    public static void Write(VerifyReport report, string path, bool force)
    {
        var inv = CultureInfo.InvariantCulture;
        var plt = new ScottPlot.Plot();
        var palette = new ScottPlot.Palettes.Category10();
        int n = report.Targets.Count;
        double width = 1.0 / ErrorHistogram.BinsPerDecade / Math.Max(1, n);
        for (int t = 0; t < n; t++)
        {
            var target = report.Targets[t];
            var h = target.Histogram;
            var color = palette.GetColor(t);
            var bars = new List<ScottPlot.Bar>();
            for (int k = 0; k < h.BinCount; k++)
            {
                if (h[k] == 0) continue;
                bars.Add(new ScottPlot.Bar
                {
                    Position = ErrorHistogram.LowerExponent(k) + (t + 0.5) * width,
                    Value = h[k],
                    Size = width * 0.9,
                    FillColor = color,
                    LineWidth = 0,
                });
            }
            var plotted = plt.Add.Bars(bars);
            plotted.LegendText = $"{target.Target} {target.Numeric}: {target.Vectors} vectors, {h.Exact} exact" +
                (h.Above > 0 ? $", {h.Above} off the scale" : "");
            if (double.IsFinite(target.ErrorBound) && target.ErrorBound > 0
                && !report.Targets.Take(t).Any(o => o.ErrorBound == target.ErrorBound))
            {
                var line = plt.Add.VerticalLine(Math.Log10(target.ErrorBound), 2, color);
                line.LinePattern = ScottPlot.LinePattern.Dashed;
                var sharing = report.Targets.Where(o => o.ErrorBound == target.ErrorBound).Select(o => o.Target);
                line.LegendText = $"bound {target.ErrorBound.ToString("G3", inv)} nats ({string.Join(", ", sharing)})";
            }
        }
        plt.Title($"emit verify {report.Model}: |F generated - F reference|");
        plt.XLabel("log10 |error| (nats)");
        plt.YLabel("vectors");
        plt.ShowLegend();
        var png = plt.GetImage(900, 500).GetImageBytes(ScottPlot.ImageFormat.Png);
        AtomicFile.Write(path, force, s => s.Write(png));
    }
}

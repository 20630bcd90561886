using System.Globalization;
using Emit.Detection;
using SkiaSharp;

namespace Emit.Cli;

/// <summary>
/// <c>emit calibrate --plot</c>: the free-energy histograms of the normal and anomalous vectors (each scaled to a
/// fraction of its own set) with the threshold as a vertical line and, when anomalies are given, the ROC curve beside
/// them (ScottPlot, rendered on one SkiaSharp canvas). PNG or SVG by the file's extension; the caution is printed
/// under the plots.
/// </summary>
public static class CalibrationPlot
{
    private const int Bins = 60;
    private const int PanelWidth = 640, Height = 480, CautionHeight = 40;

    /// <summary>The formats by extension.</summary>
    public static bool IsSvg(string path) =>
        Path.GetExtension(path).ToLowerInvariant() switch
        {
            ".svg" => true,
            ".png" => false,
            _ => throw new EmitException($"cannot tell the plot format from \"{Path.GetFileName(path)}\"",
                "name the file .png or .svg", path),
        };

    public static void Write(CalibrationReport report, string modelName, string path, bool force)
    {
        bool svg = IsSvg(path);
        // Skia's SVG canvas cannot write dashed lines (it prints a warning on the process's standard output): solid
        // there.
        var panels = new List<ScottPlot.Plot> { Histograms(report, modelName, svg) };
        if (report.AnomalyEnergies is { } an) panels.Add(RocCurve(report, an, svg));
        int width = PanelWidth * panels.Count, height = Height + CautionHeight;
        byte[] bytes;
        if (svg)
        {
            using var ms = new MemoryStream();
            using (var canvas = SKSvgCanvas.Create(new SKRect(0, 0, width, height), ms))
                Draw(canvas, panels, width);
            bytes = ms.ToArray();
        }
        else
        {
            using var surface = SKSurface.Create(new SKImageInfo(width, height))
                ?? throw new EmitException("cannot create an image surface for the plot");
            Draw(surface.Canvas, panels, width);
            using var image = surface.Snapshot();
            using var data = image.Encode(SKEncodedImageFormat.Png, 100);
            bytes = data.ToArray();
        }
        AtomicFile.Write(path, force, s => s.Write(bytes));
    }

    private static void Draw(SKCanvas canvas, List<ScottPlot.Plot> panels, int width)
    {
        canvas.Clear(SKColors.White);
        for (int k = 0; k < panels.Count; k++)
        {
            // each panel in its own clipped, translated region: a plot fills its whole canvas clip with its background
            canvas.Save();
            canvas.ClipRect(new SKRect(k * PanelWidth, 0, (k + 1) * PanelWidth, Height));
            canvas.Translate(k * PanelWidth, 0);
            panels[k].Render(canvas,
                new ScottPlot.PixelRect(new ScottPlot.Pixel(0, 0), new ScottPlot.Pixel(PanelWidth, Height)));
            canvas.Restore();
        }
        using var paint = new SKPaint { Color = SKColors.Black, IsAntialias = true };
        using var font = new SKFont(SKTypeface.Default, 12);
        var lines = Wrap("Caution: " + DetectionCaution.Text, width / 7);
        for (int k = 0; k < lines.Count; k++)
            canvas.DrawText(lines[k], 10, Height + 15 + 14 * k, SKTextAlign.Left, font, paint);
    }

    private static List<string> Wrap(string text, int chars)
    {
        var lines = new List<string>();
        var line = "";
        foreach (var word in text.Split(' '))
        {
            if (line.Length > 0 && line.Length + 1 + word.Length > chars) { lines.Add(line); line = ""; }
            line = line.Length == 0 ? word : line + " " + word;
        }
        if (line.Length > 0) lines.Add(line);
        return lines;
    }

    private static ScottPlot.Plot Histograms(CalibrationReport r, string modelName, bool svg)
    {
        var inv = CultureInfo.InvariantCulture;
        var plt = new ScottPlot.Plot();
        var all = r.AnomalyEnergies is { } a ? r.NormalEnergies.Concat(a) : r.NormalEnergies;
        double lo = Math.Min(all.Min(), r.Threshold), hi = Math.Max(all.Max(), r.Threshold);
        if (hi <= lo) hi = lo + 1;
        double width = (hi - lo) / Bins;
        var palette = new ScottPlot.Palettes.Category10();
        void Add(IReadOnlyList<double> xs, string label, int colour)
        {
            var counts = new int[Bins];
            foreach (var x in xs) counts[Math.Clamp((int)((x - lo) / width), 0, Bins - 1)]++;
            var bars = new List<ScottPlot.Bar>();
            for (int k = 0; k < Bins; k++)
                if (counts[k] > 0)
                    bars.Add(new ScottPlot.Bar
                    {
                        Position = lo + (k + 0.5) * width,
                        Value = counts[k] / (double)xs.Count,
                        Size = width * 0.95,
                        FillColor = palette.GetColor(colour).WithAlpha(0.6),
                        LineWidth = 0,
                    });
            var plotted = plt.Add.Bars(bars);
            plotted.LegendText = label;
        }
        Add(r.NormalEnergies, $"normal ({r.NormalVectors})", 0);
        if (r.AnomalyEnergies is { } an) Add(an, $"anomalies ({an.Count})", 1);
        var line = plt.Add.VerticalLine(r.Threshold, 2, ScottPlot.Colors.Black);
        line.LinePattern = svg ? ScottPlot.LinePattern.Solid : ScottPlot.LinePattern.Dashed;
        line.LegendText = $"threshold {r.Threshold.ToString("0.###", inv)} ({r.Flagged} of {r.NormalVectors} normal " +
            "above)";
        plt.Title($"emit calibrate {modelName}");
        plt.XLabel("free energy F(v) (unusual when F > threshold)");
        plt.YLabel("fraction of vectors");
        plt.Axes.SetLimitsX(lo - width, hi + width);
        plt.ShowLegend(ScottPlot.Alignment.UpperRight);
        return plt;
    }

    private static ScottPlot.Plot RocCurve(CalibrationReport r, IReadOnlyList<double> anomalies, bool svg)
    {
        var inv = CultureInfo.InvariantCulture;
        var plt = new ScottPlot.Plot();
        var curve = Roc.Curve(r.NormalEnergies, anomalies);
        var xs = curve.Select(p => p.FalseAlarmRate).ToArray();
        var ys = curve.Select(p => p.DetectionRate).ToArray();
        var s = plt.Add.ScatterLine(xs, ys);
        s.LegendText = $"ROC, area {r.Anomalies!.RocAuc.ToString("0.0000", inv)}";
        var chance = plt.Add.ScatterLine(new double[] { 0, 1 }, new double[] { 0, 1 });
        chance.LinePattern = svg ? ScottPlot.LinePattern.Solid : ScottPlot.LinePattern.Dotted;
        chance.Color = ScottPlot.Colors.Gray;
        chance.LegendText = "chance";
        var at = plt.Add.ScatterPoints(new[] { r.FalseAlarmRate }, new[] { r.Anomalies.DetectionRate });
        at.MarkerSize = 9;
        at.LegendText = "calibrated threshold";
        plt.Title("ROC: anomalies against normal vectors");
        plt.XLabel("false-alarm rate");
        plt.YLabel("detection rate");
        plt.Axes.SetLimits(0, 1, 0, 1.02);
        plt.ShowLegend(ScottPlot.Alignment.LowerRight);
        return plt;
    }
}

using System.Text.Json;
using Emit.Detection;

namespace Emit.Tests.Detection;

/// <summary>
/// ROC AUC against scikit-learn's roc_auc_score (Debian python3-sklearn 1.2.1; fixture made by
/// tests/reference/make_detection_fixtures.py), on scores rounded so that many tie; sklearn's trapezoidal area counts a
/// tie half, as emit does.
/// </summary>
public sealed class RocTests
{
    public static TheoryData<int> Cases()
    {
        var data = new TheoryData<int>();
        for (int k = 0; k < Load().Count; k++) data.Add(k);
        return data;
    }

    private static List<(double[] Normal, double[] Anomalies, double Auc)> Load()
    {
        using var doc = JsonDocument.Parse(File.ReadAllText(ClopperPearsonTests.Fixture("roc_auc.json")));
        return doc.RootElement.EnumerateArray().Select(c => (
            c.GetProperty("normal").EnumerateArray().Select(x => x.GetDouble()).ToArray(),
            c.GetProperty("anomalies").EnumerateArray().Select(x => x.GetDouble()).ToArray(),
            c.GetProperty("roc_auc").GetDouble())).ToList();
    }

    [Theory]
    [MemberData(nameof(Cases))]
    public void Auc_matches_sklearn(int index)
    {
        var (normal, anomalies, auc) = Load()[index];
        Assert.Equal(auc, Roc.Auc(normal, anomalies), 12);
    }

    [Theory]
    [MemberData(nameof(Cases))]
    public void Trapezoids_under_the_curve_give_the_same_area(int index)
    {
        var (normal, anomalies, auc) = Load()[index];
        var curve = Roc.Curve(normal, anomalies);
        Assert.Equal((1.0, 1.0), (curve[0].FalseAlarmRate, curve[0].DetectionRate));
        Assert.Equal((0.0, 0.0), (curve[^1].FalseAlarmRate, curve[^1].DetectionRate));
        double area = 0;
        for (int k = 1; k < curve.Count; k++)
            area += (curve[k - 1].FalseAlarmRate - curve[k].FalseAlarmRate) * (curve[k - 1].DetectionRate + curve[k].DetectionRate) / 2;
        Assert.Equal(auc, area, 12);
    }
}

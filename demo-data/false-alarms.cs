#:project ../src/Emit.Demo/Emit.Demo.csproj
#:property PublishAot=false
// Scores fresh normal reports from the demo generator with the shipped model's threshold: how often the threshold
// flags normal operation, on far more reports than normal.csv holds (demo-data/README.md, "What the model does").
// Run from the repository root:  dotnet run demo-data/false-alarms.cs
// The seeds differ from the demo logs' (Emit.Demo.DemoData), so these reports are new draws, not copies.
using Emit.Demo;
var model = Emit.Model.ModelLoader.Load("demo-data/reefer-fleet.json");
var scorer = new Emit.Reference.ReferenceScorer(model);
double threshold = model.Threshold ?? throw new InvalidOperationException("the shipped model has no threshold");
const int Reports = 100_000;
long flagged = 0;
foreach (ulong k in new ulong[] { 1, 2, 3, 4, 5 })
{
    var generator = new ReeferFleetGenerator(k * 7919 + 12345);
    int over = 0;
    for (int r = 0; r < Reports; r++)
        if (scorer.FreeEnergy(generator.NextNormal().Flags.AsSpan()) > threshold) over++;
    flagged += over;
    Console.WriteLine($"seed {k * 7919 + 12345}: {over} of {Reports} normal reports flagged ({100.0 * over / Reports:F3} %)");
}
Console.WriteLine($"all: {flagged} of {5 * Reports} ({100.0 * flagged / (5 * Reports):F3} %)");

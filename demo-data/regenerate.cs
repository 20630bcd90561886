#:project ../src/Emit.Demo/Emit.Demo.csproj
#:property PublishAot=false
// Rewrites the demo data in this folder from the deterministic generator and trainer (Emit.Demo.DemoData).
// Run from the repository root:  dotnet run demo-data/regenerate.cs
// or give another folder:        dotnet run demo-data/regenerate.cs -- /tmp/demo-data
// and, to train the model yourself with emit train, the training rows too:
//                                dotnet run demo-data/regenerate.cs -- demo-data /tmp/training.csv
var folder = args.Length > 0 ? args[0] : "demo-data";
foreach (var path in Emit.Demo.DemoData.WriteAll(folder))
    Console.WriteLine($"wrote {path} ({new FileInfo(path).Length} bytes)");
if (args.Length > 1)
{
    var t = Emit.Demo.DemoData.TrainingData();
    File.WriteAllText(args[1], Emit.Training.TrainingData.Csv(t.Units, t.Width, t.Names));
    Console.WriteLine($"wrote {args[1]} ({t.Rows} training rows; sha256 {t.Sha256})");
    Console.WriteLine($"train: emit train --data {args[1]} --hidden 16 --epochs 200 --seed {Emit.Demo.DemoData.TrainerSeed} -o model.json");
}

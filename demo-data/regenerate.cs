#:project ../src/Emit/Emit.csproj
#:property PublishAot=false
// Rewrites the demo data in this folder from the deterministic generator and trainer (Emit.Demo.DemoData).
// Run from the repository root:  dotnet run demo-data/regenerate.cs
// or give another folder:        dotnet run demo-data/regenerate.cs -- /tmp/demo-data
var folder = args.Length > 0 ? args[0] : "demo-data";
foreach (var path in Emit.Demo.DemoData.WriteAll(folder))
    Console.WriteLine($"wrote {path} ({new FileInfo(path).Length} bytes)");

using System.CommandLine;
using System.Globalization;
using System.Text;
using Emit.Analysis;
using Emit.Emission;
using Emit.Model;
using Emit.Reference;
using Emit.Vectors;

namespace Emit.Cli.Commands;

/// <summary>
/// <c>emit classify MODEL MODEL... --input DATA</c>: for each vector, which of several models (one per operating mode
/// or fault class) explains it best, by Bayes' rule with the models' stored log Z; CSV <c>index,best,P(model)...</c>.
/// </summary>
public sealed class ClassifyCommand : ICliCommand
{
    private readonly Argument<FileInfo[]> _models = new("MODEL")
    {
        Description = "Two or more models of the same flags, each with a stored log Z (emit logz MODEL --store)",
        Arity = new ArgumentArity(2, 64),
    };

    private readonly Option<string> _input = new("--input", "-i")
    {
        Description = "Vector file (CSV of 0/1, one vector per line), or - for standard input",
        Required = true,
        HelpName = "DATA",
    };
    private readonly Option<string?> _priors = new("--priors")
    {
        Description = "Prior weight of each model, comma-separated, in model order (default: equal)",
    };
    private readonly Option<bool> _force = CliOptions.Force();
    private readonly Option<string?> _output = new("--output", "-o")
    {
        Description = "CSV file to write, or - for standard output (the default)",
        HelpName = "FILE",
    };

    public Command Build(CliContext ctx)
    {
        _models.MustExist();
        var cmd = new Command("classify",
            "Bayes' rule across several models: the posterior probability of each model (class) for every vector")
        {
            _models, _input, _priors, _output, _force,
        };
        cmd.SetAction(parse =>
        {
            var files = parse.GetRequiredValue(_models);
            AtomicFile.RefuseInput(parse.GetValue(_output),
                [.. files.Select(f => f.FullName), parse.GetRequiredValue(_input)]);
            var models = files.Select(f => ModelLoader.Load(f.FullName)).ToArray();
            var labels = Labels(files);
            var classifier = new BayesClassifier(models, files.Select(f => f.FullName).ToArray(),
                ParsePriors(parse.GetValue(_priors)));
            using var reader = VectorReader.Open(parse.GetRequiredValue(_input), classifier.Visible, ctx.In);
            VectorNames.Check(models[0], reader);
            TextOutput.Write(parse.GetValue(_output), parse.GetValue(_force), ctx.Out,
                w => Write(classifier, labels, reader, w));
            return CliApp.Ok;
        });
        return cmd;
    }

    /// <summary>Column names from the model file names (identifiers, made unique with a suffix).</summary>
    private static string[] Labels(FileInfo[] files)
    {
        var seen = new HashSet<string>(StringComparer.Ordinal);
        return files.Select(f =>
        {
            var label = Naming.ScorerNameFromFile(f.Name);
            var unique = label;
            for (int n = 2; !seen.Add(unique); n++) unique = label + "_" + n;
            return unique;
        }).ToArray();
    }

    internal static double[]? ParsePriors(string? text)
    {
        if (text is null) return null;
        var parts = text.Split(',', StringSplitOptions.TrimEntries);
        var values = new double[parts.Length];
        for (int k = 0; k < parts.Length; k++)
            if (!double.TryParse(parts[k], NumberStyles.Float, CultureInfo.InvariantCulture, out values[k]))
                throw new EmitException($"--priors: \"{Naming.CommentText(parts[k])}\" is not a number",
                    "write the weights like 0.9,0.1");
        return values;
    }

    private static void Write(BayesClassifier classifier, string[] labels, VectorReader reader, TextWriter w)
    {
        int batch = VectorBatch.Rows(classifier.Visible);
        int c = classifier.Classes;
        w.WriteLine("index,best," + string.Join(",", labels.Select(l => "p_" + l)));
        var units = new byte[batch * classifier.Visible];
        var post = new double[batch * c];
        var line = new StringBuilder();
        long index = 0;
        int rows;
        while ((rows = reader.ReadBatch(units, batch)) > 0)
        {
            classifier.Posteriors(units, rows, post, index);
            for (int r = 0; r < rows; r++)
            {
                int best = 0;
                for (int k = 1; k < c; k++) if (post[r * c + k] > post[r * c + best]) best = k;
                line.Clear().Append(index++).Append(',').Append(labels[best]);
                for (int k = 0; k < c; k++)
                    line.Append(',').Append(post[r * c + k].ToString("R", CultureInfo.InvariantCulture));
                w.WriteLine(line);
            }
        }
    }
}

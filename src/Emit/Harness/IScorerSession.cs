namespace Emit.Harness;

/// <summary>
/// A built generated scorer, ready to score batches of packed inputs. Disposing it stops any process it runs.
/// </summary>
public interface IScorerSession : IDisposable
{
    /// <summary>How many embedded self-test vectors the generated code reported failing; null until known.</summary>
    int? SelfTestFailures { get; }

    /// <summary>
    /// Scores <paramref name="rows"/> inputs, each <see cref="HarnessLayout.PackedBytes"/> bytes (unit i = bit i &amp;
    /// 7 of byte i &gt;&gt; 3), into <paramref name="results"/>. Returns false with a reason when the scorer could not
    /// be run (crash, fault, time limit, malformed output); the session is unusable afterwards.
    /// </summary>
    bool TryScore(ReadOnlySpan<byte> packed, int rows, Span<ScoredRow> results, out string failure);
}

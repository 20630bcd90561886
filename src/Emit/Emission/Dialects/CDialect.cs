using Emit.Quantize;
using Scriban.Runtime;

namespace Emit.Emission.Dialects;

/// <summary>
/// C99: identifiers <c>NAME_…</c> and macros <c>UNAME_…</c>, <c>stdint.h</c> types, <c>INT64_C</c> for wide
/// constants, <c>u</c>-suffixed indices, <c>/* */</c> comments.
/// </summary>
public sealed class CDialect : TargetDialect
{
    /// <summary>Hidden units per block of the row additions when optimizing for speed (0: plain loops).</summary>
    /// <remarks>
    /// gcc at -O2 (its "very cheap" vectorizer) turns a fixed-length inner loop into full-width vector code, which a
    /// plain loop over a widening int8/int16 → int32 addition does not get (measured on bench/generated-c,
    /// docs/benchmarks.md).
    /// </remarks>
    public const int SpeedVectorBlock = 16;

    private readonly IReadOnlyList<string> _units;

    /// <summary>The C layout of <paramref name="plan"/>.</summary>
    public CDialect(ScorerPlan plan) : base(plan)
    {
        Name = plan.Options.Name;
        UName = Naming.MacroPrefix(Name);
        _units = plan.UnitNames.Count > 0 ? Naming.UnitIdentifiers(plan.UnitNames, []).C : [];
    }

    /// <inheritdoc/>
    public override string Target => "c";

    /// <summary>The scorer name: prefix of every function, type and table.</summary>
    public string Name { get; }

    /// <summary>The macro prefix.</summary>
    public string UName { get; }

    /// <summary>The header file name.</summary>
    public string HeaderFile => Name + ".h";

    /// <summary>The include guard.</summary>
    public string Guard => "EMIT_GENERATED_" + UName + "_H";

    /// <summary>
    /// The model identity the header and source compare at compile time: the SHA-256's first 32 bits.
    /// </summary>
    public string ModelId => "0x" + Plan.Model.Sha256[..8].ToUpperInvariant() + "u";

    /// <inheritdoc/>
    public override IReadOnlyList<string> UnitIdentifiers => _units;

    /// <inheritdoc/>
    public override string AccType => Acc.ToText() + "_t";

    /// <summary>The unsigned type of the accumulator's width.</summary>
    public string UAccType => "u" + Acc.ToText() + "_t";

    /// <inheritdoc/>
    public override string WeightType => ((FixedScorerPlan)Plan).WeightType.ToText() + "_t";

    /// <inheritdoc/>
    public override string EntryType => ((FixedScorerPlan)Plan).TableEntriesUnsigned16 ? "uint16_t" : "int32_t";

    /// <inheritdoc/>
    public override string IndexType => Plan.LargestCount <= 0xFFFF ? "uint_fast16_t" : "uint_fast32_t";

    /// <summary>Type of the link-start table.</summary>
    public string LinkStartType => Plan.LinkCount <= 0xFFFF ? "uint16_t" : "uint32_t";

    /// <summary>Type of the link-other table.</summary>
    public string LinkOtherType => Plan.Visible <= 0x10000 ? "uint16_t" : "uint32_t";

    /// <summary>The stdint.h types the fixed-point source needs, each with the macro that proves it exists.</summary>
    public IReadOnlyList<RequiredType> RequiredTypes
    {
        get
        {
            var plan = (FixedScorerPlan)Plan;
            var list = new List<RequiredType>();
            void Need(string macro, string type, string use)
            {
                if (list.All(t => t.Macro != macro)) list.Add(new RequiredType(macro, type, use));
            }
            bool wide = Acc == AccumulatorType.Int64;
            Need(wide ? "INT64_MAX" : "INT32_MAX", AccType, "the accumulator type");
            if (plan.HasHidden || plan.HasLinks)
            {
                Need(wide ? "UINT64_MAX" : "UINT32_MAX", UAccType, "shifts of the accumulator");
                Need(plan.WeightType switch { Quantize.WeightType.Int8 => "INT8_MAX",
                    Quantize.WeightType.Int16 => "INT16_MAX", _ => "INT32_MAX" }, WeightType, "the weight type");
            }
            if (plan.HasHidden)
                Need(plan.TableEntriesUnsigned16 ? "UINT16_MAX" : "INT32_MAX", EntryType, "the softplus table");
            if (FractionBitsTable)
                Need("INT8_MAX", "int8_t", "the per-unit fraction bits");
            return list;
        }
    }

    /// <summary>The last byte's mask as a C literal.</summary>
    public string LastByteMask => "0x" + Plan.LastByteMask.ToString("X2", Inv) + "u";

    /// <summary>
    /// Units (or packed words) per block of the row additions after the last whole <see cref="VectorBlock"/>: one
    /// 128-bit vector of 32-bit sums, so the rest of a row is vector code too (at most 3 scalar steps are left; int16
    /// rows of 784 × 500 had 10 at -O2, measured on bench/generated-c, docs/benchmarks.md).
    /// </summary>
    public int TailBlock => VectorBlock > 0 ? SpeedTailBlock : 0;

    /// <summary><see cref="TailBlock"/> when the row additions go in blocks.</summary>
    public const int SpeedTailBlock = 4;

    /// <summary>
    /// Rows per pass of the float row additions: 8 with <c>--optimize speed</c>, as two groups of four added in turn,
    /// acc = (acc + ((r0 + r1) + (r2 + r3))) + ((r4 + r5) + (r6 + r7)), which rounds exactly as two passes of four
    /// (the order the error bound and the C# scorer follow) with half the loads and stores of the accumulators: x86
    /// -O2, 784 × 500 f32, 58× → 62× the dense loop, and no slower at -O3 -march=native, where eight rows summed as
    /// one tree were 8 % slower (bench/generated-c, docs/benchmarks.md). 4 with <c>size</c>.
    /// </summary>
    public int FloatPass => Plan.Optimize == OptimizeFor.Speed ? 8 : 4;

    /// <summary>
    /// Words per block of the packed-row additions (then blocks of <see cref="TailBlock"/>): longer than
    /// <see cref="VectorBlock"/>, since gcc -O2 does not unroll the inner loop and the outer one sets up a pointer per
    /// row each time (784 × 500, x86 -O2, callgrind: int8 −4 % and int16 −6 % instructions a call against blocks of
    /// 16; bench/generated-c, docs/benchmarks.md).
    /// </summary>
    public int PackedBlock => PackedRows ? SpeedPackedBlock : 0;

    /// <summary><see cref="PackedBlock"/> of packed rows.</summary>
    public const int SpeedPackedBlock = 64;

    /// <summary>Hidden units per block of the row additions (0: plain loops).</summary>
    public int VectorBlock =>
        Plan.Optimize == OptimizeFor.Speed && Plan.Hidden >= SpeedVectorBlock ? SpeedVectorBlock : 0;

    /// <summary>
    /// Whether the bit scan reads the packed input a word at a time (64 bits where size_t has 64, else 32) and finds
    /// each word's lowest set bit by De Bruijn multiplication (<see cref="ScanWord"/>, speed) instead of stepping
    /// through each byte's bits (size): a loop over bytes mispredicts its exit about once per nonzero byte, and a
    /// loop over bits about once per set bit (measured on bench/generated-c and on the emulated Cortex-M3,
    /// docs/benchmarks.md).
    /// </summary>
    /// With one visible unit there is nothing to scan.
    public bool WordScan => Plan.Optimize == OptimizeFor.Speed && Plan.Visible > 1;

    /// <summary>The scan words the C chooses between: 64 bits, then 32.</summary>
    public IReadOnlyList<ScanWord> ScanWords => ScanWord.For(Plan.Visible);

    /// <summary>
    /// Whether the weight rows are stored packed, several offset-binary weights to a 32-bit word, and added with
    /// 32-bit unsigned additions (SIMD within a register): when optimizing for speed with int16 or int8 weights, an
    /// int32 accumulator and at least <see cref="SpeedVectorBlock"/> hidden units. int16: word k of a row holds unit
    /// k's weight + 2^15 in bits 0..15 and unit k + P's in bits 16..31 (P = ⌈H/2⌉ words a row); one accumulator sums
    /// whole words, another the words shifted right by 16, and the low lane's sum is their difference. int8: word k
    /// holds the weights + 2^7 of units k, k + Q, k + 2Q, k + 3Q (Q = ⌈H/4⌉ words a row, padded as
    /// <see cref="PackedWords"/> says) in its four bytes; the even bytes are added into two 16-bit lanes, the words
    /// shifted right by 8 (unmasked: B1 + 2^8·B2 + 2^16·B3, from which B2 is taken off when the lanes are emptied)
    /// into a second sum, and both are emptied into the accumulators every 256 rows, before a lane can overflow.
    /// Missing units (H not a multiple of 2 or 4, and padding words) have weight 0. The integers are the same as the
    /// plain loop's: every partial sum is the pre-activation of some input, inside the proved range. With at most 32768
    /// visible units an int16 lane's sum stays below 2^31 (measured on bench/generated-c and bench/cortex-m3,
    /// docs/benchmarks.md).
    /// </summary>
    public bool PackedRows => Plan is FixedScorerPlan f && UsesPackedRows(f.Fixed, Plan.Optimize);

    /// <summary>Whether the C of <paramref name="plan"/> stores its rows packed (<see cref="PackedRows"/>).</summary>
    public static bool UsesPackedRows(FixedPointPlan plan, OptimizeFor optimize) =>
        optimize == OptimizeFor.Speed && plan.Model.Hidden >= SpeedVectorBlock
        && plan.Accumulator == AccumulatorType.Int32
        && plan.WeightType is Quantize.WeightType.Int16 or Quantize.WeightType.Int8 && plan.Model.Visible <= 32768;

    /// <summary>
    /// Rows per pass of the packed-row additions, in both shapes: 8. On Thumb-2 M-profile cores each row has a pointer
    /// advanced word by word and a word's two lane sums stay in registers while all rows are added (three
    /// instructions per row and word for int16, four for int8, plus a load and a store of each lane sum per pass;
    /// bench/cortex-m3, docs/benchmarks.md); elsewhere the rows are added in vectorizable blocks (x86 -O2, 784 × 500
    /// int16: 82× → 86× the dense loop against 4 rows per pass, with half the loads and stores of lane sums;
    /// bench/generated-c). 0 without packed rows.
    /// </summary>
    public int RowsPerPass => PackedRows ? 8 : 0;

    /// <summary>The initialiser of the waiting rows where they have one: a NULL per row of a pass.</summary>
    public string WaitingNulls => string.Join(", ", Enumerable.Repeat("NULL", RowsPerPass));

    /// <summary>The waiting rows of a full pass: waiting[0] .. waiting[7].</summary>
    public IReadOnlyList<string> FullPass =>
        Enumerable.Range(0, RowsPerPass).Select(k => $"waiting[{k}]").ToArray();

    /// <summary>
    /// Hidden units up to which a speed-optimized fixed-point scorer of an RBM evaluates softplus unit by unit, each
    /// call with the unit's fraction bits as a literal, instead of in a loop that reads them from a table: the
    /// compiler then folds each unit's shifts, masks and rounding constants, which on a small model is most of the
    /// softplus cost (demo model 56 × 16 on Cortex-M3: 1 406 → 1 199 instructions a call with int16 weights,
    /// bench/cortex-m3, docs/benchmarks.md), for about 60 bytes of code a unit.
    /// </summary>
    public const int UnrolledSoftplusLimit = 32;

    /// <summary>
    /// Whether softplus is evaluated unit by unit with literal fraction bits (<see cref="UnrolledSoftplusLimit"/>).
    /// </summary>
    public bool UnrolledSoftplus =>
        Plan is FixedScorerPlan && UnrollsSoftplus(Plan.Hidden, Plan.IsGeneral, Plan.Optimize);

    /// <summary>
    /// Whether a fixed-point scorer with these properties unrolls its softplus (<see cref="UnrolledSoftplus"/>).
    /// </summary>
    public static bool UnrollsSoftplus(int hidden, bool general, OptimizeFor optimize) =>
        optimize == OptimizeFor.Speed && !general && hidden > 0 && hidden <= UnrolledSoftplusLimit;

    /// <summary>
    /// Whether the source holds the table of per-unit fraction bits: the units' fraction bits differ and some loop
    /// reads them (the scorer's own softplus loop when it is not unrolled, or the stream's).
    /// </summary>
    public bool FractionBitsTable => Plan is FixedScorerPlan f && f.HasHidden
        && KeepsFractionBitsTable(f.UniformFractionBits is not null, Plan.Hidden, Plan.IsGeneral, Plan.Optimize,
            f.HasStream);

    /// <summary>
    /// Whether a fixed-point scorer with hidden units and these properties holds the table of per-unit fraction bits
    /// (<see cref="FractionBitsTable"/>).
    /// </summary>
    public static bool KeepsFractionBitsTable(bool uniform, int hidden, bool general, OptimizeFor optimize,
        bool stream) => !uniform && (!UnrollsSoftplus(hidden, general, optimize) || stream);

    /// <summary>
    /// Storage of the fixed-point helpers (to_energy, the table lookup, softplus): <c>static inline</c> when
    /// optimizing for speed, a hint that gcc 12 -O2 follows where it would otherwise keep one out-of-line copy and
    /// call it per unit, and that lets it fold the literal fraction bits of <see cref="UnrolledSoftplus"/>.
    /// </summary>
    public string HelperStorage => Plan.Optimize == OptimizeFor.Speed ? "static inline" : "static";

    /// <summary>
    /// The smaller passes over the last rows (fewer than <see cref="RowsPerPass"/>), halving: the waiting rows of
    /// each from waiting[count] after count is lowered by its size; a single last row has a pass of its own.
    /// </summary>
    public IReadOnlyList<IReadOnlyList<string>> RestPasses
    {
        get
        {
            var rests = new List<IReadOnlyList<string>>();
            for (int n = RowsPerPass / 2; n >= 2; n /= 2)
                rests.Add(Enumerable.Range(0, n).Select(k => k == 0 ? "waiting[count]" : $"waiting[count + {k}u]")
                    .ToArray());
            return rests;
        }
    }

    /// <summary>
    /// Whether the 16-bit lanes of int8 packed rows can fill before the last row (more than 256 visible units), so the
    /// row loop must empty them every 256 rows.
    /// </summary>
    public bool LanesCanFill => PackedLanes == 4 && Plan.Visible > 256;

    /// <summary>
    /// Whether the lane sums of int16 packed rows go straight into the softplus loop (unit j's pre-activation is its
    /// bias plus its lane's sum minus the rows' offset) instead of through an accumulator array: packed int16 rows of
    /// an RBM.
    /// </summary>
    public bool FusedSoftplus => PackedRows && FusesSoftplus(((FixedScorerPlan)Plan).WeightType, Plan.IsGeneral);

    /// <summary>
    /// Whether packed rows of these weights feed their lane sums straight to softplus (<see cref="FusedSoftplus"/>).
    /// </summary>
    public static bool FusesSoftplus(Quantize.WeightType weights, bool general) =>
        weights == Quantize.WeightType.Int16 && !general;

    /// <summary>
    /// Whether int8 lane sums go straight into the softplus sum after the last row, instead of through a last emptying
    /// into the accumulators and a loop over those: packed int8 rows of a model without hidden-hidden links whose
    /// softplus sum is a loop (<see cref="UnrolledSoftplus"/> false). The accumulators still hold the biases and the
    /// lanes emptied before (every 256 rows). x86 -O2, 784 × 500: int8 101× → 106× the dense loop
    /// (bench/generated-c, docs/benchmarks.md).
    /// </summary>
    public bool LanesIntoSoftplus =>
        PackedRows && PackedLanes == 4 && !Plan.IsGeneral && !UnrolledSoftplus && FourLaneWords > 0;

    /// <summary>
    /// Words of an int8 packed row whose fourth lane is a unit: H − 3 · ROW_WORDS (ROW_WORDS ≤ H/4 + 4 and H ≥ 33
    /// where <see cref="LanesIntoSoftplus"/> applies, so the first three lanes of every word are units).
    /// </summary>
    public int FourLaneWords => Plan.Hidden - 3 * PackedWords;

    /// <summary>
    /// Whether the C has the function that empties int8 lanes into the accumulators: the lanes can fill before the
    /// last row, or they are not fed straight into softplus.
    /// </summary>
    public bool EmptiesLanes => PackedRows && PackedLanes == 4 && (LanesCanFill || !LanesIntoSoftplus);

    /// <summary>Words of a packed row whose every lane is a unit: ⌊H / lanes⌋.</summary>
    public int FullWords => Plan.Hidden / PackedLanes;

    /// <summary>Weights to a packed word: 2 (int16) or 4 (int8).</summary>
    public int PackedLanes => ((FixedScorerPlan)Plan).WeightType == Quantize.WeightType.Int8 ? 4 : 2;

    /// <summary>
    /// Words of a packed row: ⌈H / lanes⌉, for int8 from <see cref="PadInt8WordsFrom"/> words rounded up to a multiple
    /// of 4.
    /// </summary>
    public int PackedWords
    {
        get
        {
            int words = (Plan.Hidden + PackedLanes - 1) / PackedLanes;
            return PackedLanes == 4 && words >= PadInt8WordsFrom ? (words + 3) / 4 * 4 : words;
        }
    }

    /// <summary>
    /// From this many words a row, int8 packed rows are padded to a multiple of 4 words (at most 3 % more table):
    /// then the row additions' last partial block of <see cref="SpeedVectorBlock"/> words is whole 128-bit vectors,
    /// which compilers vectorize at -O2 instead of adding word by word (measured on bench/generated-c with callgrind,
    /// docs/benchmarks.md). int16 rows are not padded: the Cortex-M pointer passes would add the padding words too.
    /// </summary>
    public const int PadInt8WordsFrom = 100;

    /// <summary>Whether a packed row has lanes past the last unit (weight 0).</summary>
    public bool HasMissingLanes => PackedWords * PackedLanes != Plan.Hidden;

    /// <summary>Row <paramref name="i"/> of the packed weight table (see <see cref="PackedRows"/>).</summary>
    public IReadOnlyList<uint> PackedRow(int i)
    {
        var plan = (FixedScorerPlan)Plan;
        int h = Plan.Hidden, lanes = PackedLanes, words = PackedWords, bits = 32 / lanes;
        long offset = 1L << (bits - 1);
        var row = new uint[words];
        for (int k = 0; k < words; k++)
            for (int l = 0; l < lanes; l++)
            {
                int j = k + l * words;
                long w = j < h ? plan.Fixed.Weights[i * h + j] : 0;
                row[k] |= (uint)(w + offset) << (l * bits);
            }
        return row;
    }

    /// <summary>
    /// Whether the f32 softplus is the branch-free polynomial <see cref="SoftplusF32"/> (no libm call) rather than
    /// libm's expf and logf: f32 models with hidden units and no hidden-hidden links.
    /// </summary>
    public bool SoftplusPolynomial => Plan.Mode == NumericMode.F32 && Plan.HasHidden && !Plan.IsGeneral;

    /// <summary>Literals of <see cref="SoftplusF32.Exp2"/>.</summary>
    public IReadOnlyList<string> SoftplusExp2 { get; } = SoftplusF32.Exp2.Select(c => Literals.Float(c)).ToArray();

    /// <summary>Literals of <see cref="SoftplusF32.Atanh"/>.</summary>
    public IReadOnlyList<string> SoftplusAtanh { get; } = SoftplusF32.Atanh.Select(c => Literals.Float(c)).ToArray();

    /// <summary>The literal of <see cref="SoftplusF32.MinusLog2E"/>.</summary>
    public string SoftplusMinusLog2E { get; } = Literals.Float(SoftplusF32.MinusLog2E);

    /// <summary>The clamp of the softplus argument as a C literal of its bit pattern.</summary>
    public string SoftplusClampBits { get; } = "0x" + SoftplusF32.ClampBits.ToString("X8", Inv) + "u";

    /// <summary>The proved bound of the f32 softplus polynomial, for the comment.</summary>
    public string SoftplusMaxError { get; } = SoftplusF32.MaxAbsError.ToString("G3", Inv);

    /// <summary>The math functions of the float mode (<c>expf</c> or <c>exp</c>...).</summary>
    public string Exp => Plan.Mode == NumericMode.F32 ? "expf" : "exp";

    /// <summary>The natural logarithm of the float mode.</summary>
    public string Log => Plan.Mode == NumericMode.F32 ? "logf" : "log";

    /// <summary>The absolute value of the float mode.</summary>
    public string Fabs => Plan.Mode == NumericMode.F32 ? "fabsf" : "fabs";

    /// <summary>
    /// A C integer constant of the accumulator type: plain decimal within int32, <c>INT64_C(n)</c> beyond it (the
    /// sign outside the macro), and the most negative value of the type as an expression.
    /// </summary>
    public override string Int(long value)
    {
        if (Acc == AccumulatorType.Int32 || (value >= -int.MaxValue && value <= int.MaxValue))
            return value == int.MinValue ? "(-2147483647 - 1)" : value.ToString(Inv);
        if (value == long.MinValue) return "(-INT64_C(9223372036854775807) - 1)";
        return value < 0 ? "-INT64_C(" + (-value).ToString(Inv) + ")" : "INT64_C(" + value.ToString(Inv) + ")";
    }

    /// <summary><see cref="Int"/> in parentheses when it starts with a sign (for macros).</summary>
    public string MacroInt(long value)
    {
        var s = Int(value);
        return s.StartsWith('-') ? "(" + s + ")" : s;
    }

    /// <inheritdoc/>
    public override string Index(long value) => value.ToString(Inv) + "u";

    /// <inheritdoc/>
    public override string Comment(IEnumerable<string> paragraphs, string indent) =>
        indent + "/*\n" + Prefixed(paragraphs, indent + " * ") + "\n" + indent + " */";

    /// <summary>The type of the adjacency list starts of streamed scoring (2 entries per link).</summary>
    public string AdjacentStartType => 2L * Plan.LinkCount <= 0xFFFF ? "uint16_t" : "uint32_t";

    /// <summary>Bytes of <c>NAME_stream_t</c> (<see cref="FeatureFootprint.StreamRam"/>).</summary>
    public long StreamBytes => FeatureFootprint.StreamRam(Plan);

    /// <summary>Predicted extra flash of the stream code on the reference core.</summary>
    public long StreamFlashBytes => FeatureFootprint.StreamFlash(Plan);

    /// <summary>Predicted extra flash of the explanation code on the reference core.</summary>
    public long ExplainFlashBytes => FeatureFootprint.ExplainFlash(Plan);

    /// <summary>Predicted worst-case stack of NAME_explain on the reference core.</summary>
    public int ExplainStackBytes => FeatureFootprint.ExplainStack(Plan, StreamBytes);

    /// <summary>Predicted footprint on the reference core of this mode (stated in the header).</summary>
    public ScorerFootprint Footprint => FootprintModel.Predict(Plan);

    /// <summary>The alarm filter's extra flash and RAM on the reference core (null without a filter).</summary>
    public FeatureCost? FilterFootprint => FootprintModel.Filter(Plan);

    /// <inheritdoc/>
    public override void Register(ScriptObject globals)
    {
        base.Register(globals);
        globals.Import("macro_int", new Func<long, string>(MacroInt));
        globals.Import("packed_row", new Func<int, IReadOnlyList<uint>>(PackedRow));
    }
}

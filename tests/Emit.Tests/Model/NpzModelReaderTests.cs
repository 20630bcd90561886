using Emit.Model;

namespace Emit.Tests.Model;

/// <summary>
/// The .npz import against files numpy itself wrote (tests/reference/make_fixtures.py): every supported variant
/// must give exactly the arrays numpy holds, and every file numpy writes that is not a usable model must give
/// an <see cref="EmitException"/> naming the file and the array entry.
/// </summary>
public sealed class NpzModelReaderTests
{
    [Theory]
    [InlineData("fmt_f8_le_c_stored.npz")]
    [InlineData("fmt_f8_be_f_deflated.npz")]
    [InlineData("fmt_f4_le_f_stored.npz")]
    [InlineData("fmt_f4_be_c_deflated.npz")]
    [InlineData("fmt_v2_f8_le_f_stored.npz")]
    [InlineData("fmt_v3_f4_be_c_deflated.npz")]
    [InlineData("fmt_sklearn_names_f4_be_f_stored.npz")]
    [InlineData("fmt_savez_compressed.npz")]
    [InlineData("sklearn_digits_rbm.npz")]
    [InlineData("digits_native_f4_be_fortran.npz")]
    public void Import_gives_exactly_the_arrays_numpy_wrote(string name)
    {
        // Source: numpy's own values for the same arrays (ndarray.tolist(), written by json with repr precision).
        var expected = NpzFixtures.Expected(name);
        var model = NpzModelReader.Read(NpzFixtures.Path(name));

        Assert.Equal(ModelKind.Rbm, model.Kind);
        Assert.True(model.Names.IsEmpty);
        Assert.Equal(expected.VisibleBias.Length, model.Visible);
        Assert.Equal(expected.HiddenBias.Length, model.Hidden);
        Assert.Equal(expected.VisibleBias, model.VisibleBias.ToArray());
        Assert.Equal(expected.HiddenBias, model.HiddenBias.ToArray());
        for (int i = 0; i < model.Visible; i++)
            Assert.Equal(expected.Weights[i], model.WeightRow(i).ToArray());
    }

    [Fact]
    public void Variants_of_one_model_agree_and_float32_rounding_is_kept_exactly()
    {
        // numpy wrote the same float64 model as float64 and as float32; the float32 files must carry numpy's
        // float32 rounding, not the original doubles.
        var f8 = NpzModelReader.Read(NpzFixtures.Path("fmt_f8_le_c_stored.npz"));
        var f8be = NpzModelReader.Read(NpzFixtures.Path("fmt_f8_be_f_deflated.npz"));
        var f4 = NpzModelReader.Read(NpzFixtures.Path("fmt_f4_le_f_stored.npz"));
        Assert.Equal(f8.Sha256, f8be.Sha256);
        Assert.NotEqual(f8.Sha256, f4.Sha256);
        Assert.Equal((double)(float)f8.Weight(4, 2), f4.Weight(4, 2));
        Assert.Equal(1e-300, f8.Weight(0, 0));
        Assert.Equal(0.0, f4.Weight(0, 0)); // 1e-300 underflows to 0 in float32
    }

    [Fact]
    public void Loader_chooses_the_npz_reader_by_extension()
    {
        var model = ModelLoader.Load(NpzFixtures.Path("sklearn_digits_rbm.npz"));
        Assert.Equal(64, model.Visible);
        Assert.Equal(16, model.Hidden);
    }

    [Theory]
    [InlineData("err_int64.npz", "weights.npy", "'<i8' (signed integers)")]
    [InlineData("err_float16.npz", "weights.npy", "'<f2' (float16)")]
    [InlineData("err_complex.npz", "weights.npy", "'<c16' (complex numbers)")]
    [InlineData("err_object.npz", "weights.npy", "'|O' (pickled Python objects)")]
    [InlineData("err_structured.npz", "weights.npy", "structured (record) dtype")]
    [InlineData("err_nan.npz", "weights.npy", "element [1, 2] is NaN")]
    [InlineData("err_inf.npz", "hidden_bias.npy", "element [2] is +inf")]
    [InlineData("err_3d.npz", "weights.npy", "shape (5, 3, 1), expected (5, 3)")]
    [InlineData("err_bias_2d.npz", "visible_bias.npy", "shape (1, 5), expected a 1-d array")]
    [InlineData("err_shape_mismatch.npz", "weights.npy", "shape (5, 3), expected (4, 3)")]
    [InlineData("err_sklearn_not_transposed.npz", "components_.npy", "shape (5, 3), expected (3, 5)")]
    [InlineData("err_missing_hidden_bias.npz", "hidden_bias.npy", "has no array entry")]
    [InlineData("err_mixed_names.npz", "intercept_hidden_.npy", "mixes the two namings")]
    [InlineData("err_no_visible.npz", "visible_bias.npy", "at least one visible unit")]
    [InlineData("err_plain_npy.npz", null, "single .npy array")]
    public void Files_numpy_writes_that_are_not_usable_models_are_refused(string name, string? entry, string problem)
    {
        var path = NpzFixtures.Path(name);
        var e = Assert.Throws<EmitException>(() => NpzModelReader.Read(path));
        Assert.Equal(path, e.File);
        Assert.Contains(problem, e.Problem);
        if (entry is not null) Assert.Contains(entry, e.Problem);
        Assert.False(string.IsNullOrEmpty(e.Hint));
    }

    [Fact]
    public void Missing_file_and_folder_are_refused()
    {
        var missing = Path.Combine(Path.GetTempPath(), "emit-no-such-" + Guid.NewGuid() + ".npz");
        Assert.Contains("not found", Assert.Throws<EmitException>(() => NpzModelReader.Read(missing)).Problem);
        Assert.Contains("folder", Assert.Throws<EmitException>(() => NpzModelReader.Read(Path.GetTempPath())).Problem);
    }
}

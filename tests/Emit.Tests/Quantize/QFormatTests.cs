using Emit.Quantize;

namespace Emit.Tests.Quantize;

public sealed class QFormatTests
{
    // Q notation as used for the q15/q31 types of DSP libraries (CMSIS-DSP documents q15_t as "16-bit fractional
    // data type in 1.15 format", i.e. Q0.15, and q31_t as 1.31, i.e. Q0.31; from memory).
    [Theory]
    [InlineData(16, 15, true, "Q0.15")]
    [InlineData(32, 31, true, "Q0.31")]
    [InlineData(16, 14, true, "Q1.14")]
    [InlineData(32, 16, true, "Q15.16")]
    [InlineData(8, 10, true, "Q-3.10")]
    [InlineData(16, 12, false, "UQ4.12")]
    public void Formats_are_stated_as_Qm_n(int total, int fraction, bool signed, string expected) =>
        Assert.Equal(expected, new QFormat(total, fraction, signed).ToString());

    [Fact]
    public void Lsb_is_two_to_the_minus_n() => Assert.Equal(1.0 / 16384, new QFormat(16, 14).Lsb);
}

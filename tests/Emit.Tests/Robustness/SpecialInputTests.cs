using System.Diagnostics;
using System.Text;
using Emit.Model;
using Emit.Tests.Cli;

namespace Emit.Tests.Robustness;

/// <summary>
/// Inputs that are not regular files: devices report a length of 0 and never end, FIFOs have no length at all. Size
/// caps count the bytes read; a FIFO carrying a real model (process substitution) still works.
/// </summary>
public sealed class SpecialInputTests
{
    /// <summary>An endless stream: <paramref name="prefix"/>, then <paramref name="fill"/> forever.</summary>
    private sealed class Endless(byte[] prefix, byte fill = (byte)' ') : Stream
    {
        private long _position;
        public long Delivered => _position;
        public override int Read(byte[] buffer, int offset, int count)
        {
            for (int k = 0; k < count; k++, _position++)
                buffer[offset + k] = _position < prefix.Length ? prefix[_position] : fill;
            return count;
        }
        public override bool CanRead => true;
        public override bool CanSeek => false;
        public override bool CanWrite => false;
        public override long Length => throw new NotSupportedException();
        public override long Position { get => _position; set => throw new NotSupportedException(); }
        public override void Flush() { }
        public override long Seek(long offset, SeekOrigin origin) => throw new NotSupportedException();
        public override void SetLength(long value) => throw new NotSupportedException();
        public override void Write(byte[] buffer, int offset, int count) => throw new NotSupportedException();
    }

    [Fact]
    public void The_cap_counts_bytes_read_not_the_reported_length()
    {
        var endless = new Endless("{\"format\":"u8.ToArray());
        var e = Assert.Throws<EmitException>(() => JsonCursor.ReadCapped(endless, 1 << 20, "a model file", "fifo"));
        Assert.Contains("more than 1048576 bytes", e.Message);
        Assert.True(endless.Delivered <= (1 << 21), $"read {endless.Delivered} bytes for a cap of 1 MiB");
    }

    [Fact]
    public void Reading_stops_at_the_first_NUL_even_after_an_opening_brace()
    {
        // "{" then zero bytes forever: no JSON text contains a raw NUL (RFC 8259 §7), so the prefix goes to the parser.
        var endless = new Endless("{\"format\":"u8.ToArray(), fill: 0);
        var bytes = JsonCursor.ReadCapped(endless, 1L << 30, "a model file", "fifo");
        Assert.True(bytes.Length <= 1 << 17, $"read {bytes.Length} bytes");
        Assert.Throws<EmitException>(() => ModelJson.Parse(bytes, "fifo"));
    }

    [Theory]
    [InlineData("/dev/zero")]
    [InlineData("/dev/urandom")]
    public void A_device_given_as_a_model_is_refused_with_exit_2_at_once(string device)
    {
        if (!File.Exists(device)) return;   // not a Unix system
        var dir = CliRunner.TempDir();
        var link = Path.Combine(dir, "model.json");
        File.CreateSymbolicLink(link, device);
        var watch = Stopwatch.StartNew();
        var direct = CliRunner.Run("inspect", device);
        var linked = CliRunner.Run("inspect", link);
        Assert.Equal(2, direct.ExitCode);
        Assert.Equal(2, linked.ExitCode);
        Assert.True(watch.Elapsed < TimeSpan.FromSeconds(30), "read far past the first bytes");
        if (device == "/dev/zero") Assert.Contains(":1:1:", direct.Error);
    }

    [Fact]
    public void A_device_linked_as_an_npz_model_is_refused_with_exit_2()
    {
        if (!File.Exists("/dev/zero")) return;
        var dir = CliRunner.TempDir();
        var link = Path.Combine(dir, "model.npz");
        File.CreateSymbolicLink(link, "/dev/zero");
        Assert.Equal(2, CliRunner.Run("inspect", link).ExitCode);
    }

    /// <summary>Writes <paramref name="bytes"/> into a new FIFO from another thread (as a shell's process substitution does).</summary>
    private static (string Path, Task Writer) Fifo(string dir, string name, byte[] bytes)
    {
        var path = Path.Combine(dir, name);
        using (var p = Process.Start(new ProcessStartInfo("mkfifo", [path]))!) p.WaitForExit();
        var writer = Task.Run(() =>
        {
            using var s = new FileStream(path, FileMode.Open, FileAccess.Write);
            s.Write(bytes);
        });
        return (path, writer);
    }

    [Fact]
    public async Task A_model_arriving_through_a_fifo_is_read()
    {
        if (OperatingSystem.IsWindows()) return;
        var dir = CliRunner.TempDir();
        var model = File.ReadAllBytes(Path.Combine(Emit.Tests.Demo.DemoDataFixture.RepositoryRoot(), "demo-data", "reefer-fleet.json"));
        var (json, w1) = Fifo(dir, "m.json", model);
        var r = CliRunner.Run("inspect", json);
        Assert.True(r.ExitCode == 0, r.Error);
        Assert.Contains("rbm", r.Out);
        await w1.WaitAsync(TimeSpan.FromSeconds(30));

        var npz = File.ReadAllBytes(Path.Combine(Emit.Tests.Demo.DemoDataFixture.RepositoryRoot(), "tests", "Emit.Tests", "Model", "Fixtures", "digits_native_f4_be_fortran.npz"));
        var (npzPath, w2) = Fifo(dir, "m.npz", npz);
        var n = CliRunner.Run("inspect", npzPath);
        Assert.True(n.ExitCode == 0, n.Error);
        await w2.WaitAsync(TimeSpan.FromSeconds(30));
    }

    [Fact]
    public async Task Vectors_arriving_through_a_fifo_are_scored()
    {
        if (OperatingSystem.IsWindows()) return;
        var dir = CliRunner.TempDir();
        var model = Path.Combine(dir, "m.json");
        File.WriteAllText(model, "{\"format\":\"emit.model\",\"version\":1,\"kind\":\"rbm\",\"visible\":2,\"hidden\":1," +
            "\"visible_bias\":[0,0],\"hidden_bias\":[0],\"weights\":[[0],[0]]}");
        var (data, w) = Fifo(dir, "v.csv", Encoding.ASCII.GetBytes("0,1\n1,1\n"));
        var r = CliRunner.Run("score", model, "--input", data);
        Assert.True(r.ExitCode == 0, r.Error);
        Assert.Equal(3, r.Out.Split('\n', StringSplitOptions.RemoveEmptyEntries).Length);
        await w.WaitAsync(TimeSpan.FromSeconds(30));
    }
}

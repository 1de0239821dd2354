using System.Diagnostics;

namespace IndexKeeper.Tests.Isolation;

/// <summary>
/// The hand-built files are hostile only where meant: an independent checker (qpdf, Debian package) finds
/// their structure sound, and the encrypted one encrypted.
/// </summary>
public sealed class HostileFileStructureTests : IDisposable
{
    private readonly ScratchFolder scratch = new();

    public void Dispose() => scratch.Dispose();

    [Theory]
    [InlineData(HostileFiles.CyclicForms)]
    [InlineData(HostileFiles.InflationBomb)]
    public void Qpdf_finds_no_syntax_or_stream_errors(string name)
    {
        var (exitCode, output) = Qpdf("--check", HostileFiles.Write(name, scratch));

        Assert.True(exitCode == 0, output);
        Assert.Contains("No syntax or stream encoding errors found", output, StringComparison.Ordinal);
    }

    [Fact]
    public void Qpdf_sees_the_encrypted_file_as_encrypted()
    {
        // qpdf --is-encrypted exits 0 for an encrypted file, 2 for one that is not (qpdf manual).
        Assert.Equal(0, Qpdf("--is-encrypted", HostileFiles.Write(HostileFiles.Encrypted, scratch)).ExitCode);
        Assert.Equal(2, Qpdf("--is-encrypted", scratch.Write("plain.pdf", GoodFiles.InspectionPdf())).ExitCode);
    }

    private static (int ExitCode, string Output) Qpdf(params string[] arguments)
    {
        using var qpdf = Process.Start(new ProcessStartInfo("qpdf", arguments) { RedirectStandardOutput = true, RedirectStandardError = true })
            ?? throw new InvalidOperationException("cannot start qpdf");
        var errors = qpdf.StandardError.ReadToEndAsync();
        var output = qpdf.StandardOutput.ReadToEnd();
        qpdf.WaitForExit();
        return (qpdf.ExitCode, output + errors.Result);
    }
}

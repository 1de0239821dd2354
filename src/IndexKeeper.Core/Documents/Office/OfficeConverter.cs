using IndexKeeper.Core.Documents.Tools;

namespace IndexKeeper.Core.Documents.Office;

/// <summary>
/// Renders an office file to PDF with LibreOffice headless, one process per file with a private profile
/// directory (two conversions never share state, and a damaged profile never outlives its run), a time
/// limit and an address-space cap.
/// </summary>
internal sealed class OfficeConverter(ReaderSettings settings)
{
    /// <summary>The Debian package that provides the converter, named in the quarantine reason when it is missing.</summary>
    public const string Package = "libreoffice-core-nogui (with libreoffice-writer-nogui, -calc-nogui, -impress-nogui)";

    /// <summary>The converter's version line, e.g. "LibreOffice 7.4.7.2 40(Build:2)": part of converted page keys.</summary>
    public string Version => Tool().Version;

    public byte[] ConvertToPdf(byte[] file, string extension, ReadLimits limits, CancellationToken cancellationToken)
    {
        var (program, _) = Tool();
        using var scratch = new ScratchDirectory();
        var input = scratch.File("document" + extension);
        File.WriteAllBytes(input, file);
        var output = scratch.File("out");
        var profile = new Uri(scratch.File("profile")).AbsoluteUri;
        string[] arguments =
        [
            "--headless", "--norestore", "--nologo", "--nodefault", "--nolockcheck", "--nofirststartwizard",
            "-env:UserInstallation=" + profile,
            "--convert-to", "pdf", "--outdir", output, input,
        ];
        ToolRun run;
        try
        {
            run = ToolRunner.Run(program, arguments, Shorter(settings.ConversionTimeout, limits.ReadTimeout), settings.ConversionMemoryBytes, 1 << 20, cancellationToken);
        }
        catch (TimeoutException e)
        {
            throw new DocumentReadException(QuarantineReason.ReadTimeout, $"the conversion to PDF did not finish: {e.Message}", e);
        }

        var pdf = Path.Combine(output, "document.pdf");
        if (run.ExitCode != 0 || !File.Exists(pdf))
        {
            var said = run.ErrorHead.Length > 0 ? run.ErrorHead : run.OutputText.Trim();
            throw new DocumentReadException(
                QuarantineReason.ConversionFailed,
                $"LibreOffice could not convert the {extension[1..]} file to PDF (exit code {run.ExitCode}{(said.Length > 0 ? ": " + said : string.Empty)}); it may be damaged or password-protected");
        }

        var length = new FileInfo(pdf).Length;
        if (length > limits.MaxFileBytes)
        {
            throw new DocumentReadException(QuarantineReason.TooLarge, $"the converted PDF has {length} bytes, more than the limit of {limits.MaxFileBytes}");
        }

        return File.ReadAllBytes(pdf);
    }

    /// <summary>How the converter's version line starts.</summary>
    internal const string VersionPrefix = "LibreOffice";

    private (string Path, string Version) Tool() =>
        ToolVersion.Require(settings.OfficeConverter, VersionPrefix, Package, "Reading office and OpenDocument files");

    private static TimeSpan Shorter(TimeSpan a, TimeSpan b) => b > TimeSpan.Zero && b < a ? b : a;
}

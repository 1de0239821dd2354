using IndexKeeper.Tests.Demo;

namespace IndexKeeper.Tests.Readers;

/// <summary>LibreOffice's own command-line PDF export, the reference for converted page counts.</summary>
internal static class LibreOffice
{
    /// <summary>Converts <paramref name="path"/> with <c>soffice --convert-to</c> into <paramref name="format"/>; returns the new file.</summary>
    public static string Convert(string path, string format)
    {
        var folder = Path.GetDirectoryName(path)!;
        var output = Path.Combine(folder, "export-" + Guid.NewGuid().ToString("N"));
        var profile = new Uri(Path.Combine(folder, "profile-" + Guid.NewGuid().ToString("N"))).AbsoluteUri;
        var (exitCode, said) = ExternalTool.Run("soffice", "--headless", "--norestore", "-env:UserInstallation=" + profile, "--convert-to", format, "--outdir", output, path);
        var converted = Directory.Exists(output) ? Directory.GetFiles(output).SingleOrDefault() : null;
        return exitCode == 0 && converted is not null ? converted : throw new InvalidOperationException($"soffice failed on {path}: {said}");
    }
}

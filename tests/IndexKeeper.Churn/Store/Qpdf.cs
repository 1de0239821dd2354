using System.Diagnostics;

namespace IndexKeeper.Churn.Store;

/// <summary>
/// Rewrites a PDF with qpdf from Debian (an independent tool): object streams or linearisation give new
/// bytes and a new structure while every page shows what it showed (qpdf's manual: these options change
/// how objects are stored, not page content).
/// </summary>
internal static class Qpdf
{
    public static byte[] Rewrite(byte[] pdf, PdfLayout layout, string scratchDirectory)
    {
        if (layout == PdfLayout.AsBuilt)
        {
            return pdf;
        }

        var input = Path.Combine(scratchDirectory, Guid.NewGuid().ToString("N") + ".in.pdf");
        var output = Path.ChangeExtension(input, ".out.pdf");
        File.WriteAllBytes(input, pdf);
        try
        {
            var start = new ProcessStartInfo("qpdf") { RedirectStandardError = true, RedirectStandardOutput = true, UseShellExecute = false };
            start.ArgumentList.Add(layout == PdfLayout.ObjectStreams ? "--object-streams=generate" : "--linearize");
            // Fixed file identifier, so the same input gives the same bytes on every run.
            start.ArgumentList.Add("--static-id");
            start.ArgumentList.Add(input);
            start.ArgumentList.Add(output);
            using var process = Process.Start(start) ?? throw new InvalidOperationException("qpdf did not start");
            var errors = process.StandardError.ReadToEnd();
            process.StandardOutput.ReadToEnd();
            process.WaitForExit();
            // qpdf exits 3 when it succeeded with warnings.
            if (process.ExitCode is not (0 or 3))
            {
                throw new InvalidOperationException($"qpdf exited {process.ExitCode}: {errors}");
            }

            return File.ReadAllBytes(output);
        }
        finally
        {
            File.Delete(input);
            File.Delete(output);
        }
    }
}

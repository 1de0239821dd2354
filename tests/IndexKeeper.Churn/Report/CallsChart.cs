using System.Globalization;
using SkiaSharp;

namespace IndexKeeper.Churn.Report;

/// <summary>
/// Encoder page calls per day of the three strategies as a PNG line chart, on a logarithmic scale of
/// (1 + calls) so the smallest series stays readable beside the largest and a day of no calls sits on 0. Text uses DejaVu Sans where Debian installs it.
/// </summary>
internal static class CallsChart
{
    private const int Width = 1200;
    private const int Height = 640;
    private const float Left = 90, Right = 30, Top = 60, Bottom = 90;

    public static void Write(string path, string title, IReadOnlyList<DayFigures> days)
    {
        (string Name, SKColor Colour, Func<DayFigures, long> Calls)[] series =
        [
            ("(a) nightly full re-embed", new SKColor(200, 70, 50), d => d.FullReembed.EncoderCalls),
            ("(b) re-embed files whose bytes changed", new SKColor(220, 160, 30), d => d.FileHashing.EncoderCalls),
            ("(c) IndexKeeper", new SKColor(30, 110, 170), d => d.IndexKeeper.EncoderCalls),
            ("truth: page contents new that day", new SKColor(30, 30, 30), d => d.NewContents),
        ];
        var top = Math.Max(10, days.Max(d => series.Max(s => s.Calls(d))));
        var decades = (int)Math.Ceiling(Math.Log10(top + 1));
        using var surface = SKSurface.Create(new SKImageInfo(Width, Height));
        var canvas = surface.Canvas;
        canvas.Clear(SKColors.White);
        using var typeface = Typeface();
        using var font = new SKFont(typeface, 15);
        using var bold = new SKFont(typeface, 19) { Embolden = true };
        using var ink = new SKPaint { Color = new SKColor(40, 40, 40), IsAntialias = true };
        using var grid = new SKPaint { Color = new SKColor(220, 220, 220), StrokeWidth = 1, IsAntialias = true };
        float plotWidth = Width - Left - Right, plotHeight = Height - Top - Bottom;
        float X(int index) => Left + plotWidth * index / Math.Max(1, days.Count - 1);
        float Y(long value) => Top + plotHeight * (1 - (float)(Math.Log10(1 + value) / decades));

        canvas.DrawText(title, Left, 32, SKTextAlign.Left, bold, ink);
        for (var decade = -1; decade <= decades; decade++)
        {
            var value = decade < 0 ? 0 : (long)Math.Pow(10, decade);
            canvas.DrawLine(Left, Y(value), Left + plotWidth, Y(value), grid);
            canvas.DrawText(value.ToString("N0", CultureInfo.InvariantCulture), Left - 8, Y(value) + 5, SKTextAlign.Right, font, ink);
        }

        for (var i = 0; i < days.Count; i++)
        {
            canvas.DrawLine(X(i), Top + plotHeight, X(i), Top + plotHeight + 5, ink);
            if (days.Count <= 12 || days[i].Day % 2 == 0)
            {
                canvas.DrawText(days[i].Day.ToString(CultureInfo.InvariantCulture), X(i), Top + plotHeight + 22, SKTextAlign.Center, font, ink);
            }
        }

        canvas.DrawText("day (0 = first build)", Left + plotWidth / 2, Top + plotHeight + 44, SKTextAlign.Center, font, ink);
        canvas.Save();
        canvas.RotateDegrees(-90, 24, Top + plotHeight / 2);
        canvas.DrawText("encoder page calls (log scale of 1 + calls)", 24, Top + plotHeight / 2 + 5, SKTextAlign.Center, font, ink);
        canvas.Restore();
        canvas.DrawLine(Left, Top, Left, Top + plotHeight, ink);
        canvas.DrawLine(Left, Top + plotHeight, Left + plotWidth, Top + plotHeight, ink);

        var legendX = Left;
        foreach (var (name, colour, calls) in series)
        {
            // The truth is drawn last, thin and dashed, so (c) lying on it stays visible.
            var truth = name.StartsWith("truth", StringComparison.Ordinal);
            using var dashes = truth ? SKPathEffect.CreateDash([6, 5], 0) : null;
            using var line = new SKPaint { Color = colour, StrokeWidth = truth ? 1.5f : 3, IsAntialias = true, Style = SKPaintStyle.Stroke, PathEffect = dashes };
            using var pathLine = new SKPath();
            for (var i = 0; i < days.Count; i++)
            {
                var point = new SKPoint(X(i), Y(calls(days[i])));
                if (i == 0)
                {
                    pathLine.MoveTo(point);
                }
                else
                {
                    pathLine.LineTo(point);
                }

                if (!truth)
                {
                    canvas.DrawCircle(point, 3.5f, line);
                }
            }

            canvas.DrawPath(pathLine, line);
            canvas.DrawLine(legendX, Height - 18, legendX + 26, Height - 18, line);
            canvas.DrawText(name, legendX + 32, Height - 13, SKTextAlign.Left, font, ink);
            legendX += 44 + font.MeasureText(name);
        }

        using var image = surface.Snapshot();
        using var png = image.Encode(SKEncodedImageFormat.Png, 100);
        Directory.CreateDirectory(Path.GetDirectoryName(Path.GetFullPath(path))!);
        using var file = File.Create(path);
        png.SaveTo(file);
    }

    private static SKTypeface Typeface()
    {
        const string DejaVu = "/usr/share/fonts/truetype/dejavu/DejaVuSans.ttf";
        return (File.Exists(DejaVu) ? SKTypeface.FromFile(DejaVu) : null) ?? SKTypeface.Default;
    }
}

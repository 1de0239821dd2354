namespace IndexKeeper.Demo;

/// <summary>
/// The second day at the Harrowmere Water Authority: the changes people make to a shared drive in a day,
/// each stating which pages truly changed. Documents are regenerated from the same plan, so a page that
/// is meant to stay the same is drawn from the same record and comes out the same.
/// </summary>
internal static class DayTwoScript
{
    private const string Shared = StorePlan.SharedDrive + "/";

    public static IReadOnlyList<DemoChange> Apply(string directory, StorePlan plan) =>
    [
        EditManualPage(directory, plan),
        CopyReportToFinal(directory, plan),
        RenameForm(directory, plan),
        MoveManual(directory, plan),
        DeleteDrawing(directory, plan),
        TouchScan(directory, plan),
        ResaveReportMetadata(directory, plan),
        AddReport(directory, plan),
        ReorderAndInsertPages(directory, plan),
    ];

    private static DemoChange EditManualPage(string directory, StorePlan plan)
    {
        var (spec, folder) = plan.Manuals[0];
        var pages = plan.ManualPages(spec).ToList();
        int index = pages.FindIndex(page => page.Kind == ManualPageKind.Text && page.Section >= 3);
        pages[index] = pages[index] with { Amended = true };
        string path = Shared + folder + "/" + StorePlan.ManualFileName(spec);
        // Written in place, as an editor that saves over the open file does: same file identity.
        DemoFiles.Write(directory, path, ManualBuilder.Render(spec, pages, ManualBuilder.Info(spec)));
        return new(
            DemoChangeKind.PageEdited,
            $"{spec.Code}: an amendment added to page {pages[index].Label} and the manual saved again",
            path,
            path,
            [index + 1],
            [index + 1]);
    }

    private static DemoChange CopyReportToFinal(string directory, StorePlan plan)
    {
        var (spec, folder) = plan.Reports[6];
        string from = Shared + folder + "/" + StorePlan.ReportFileName(spec);
        string to = Shared + "reports/final/" + StorePlan.ReportFileName(spec);
        DemoFiles.Copy(directory, from, to);
        return new(DemoChangeKind.Copied, $"{spec.Title} copied into reports/final", from, to, [], []);
    }

    private static DemoChange RenameForm(string directory, StorePlan plan)
    {
        var (spec, path) = plan.Forms[7];
        string from = Shared + path;
        string to = from[..^".pdf".Length] + " (checked).pdf";
        DemoFiles.Move(directory, from, to);
        return new(DemoChangeKind.Renamed, $"Inspection form {spec.Code} renamed to mark it checked", from, to, [], []);
    }

    private static DemoChange MoveManual(string directory, StorePlan plan)
    {
        var (spec, folder) = plan.Manuals[5];
        string from = Shared + folder + "/" + StorePlan.ManualFileName(spec);
        string to = Shared + "manuals/archive/" + StorePlan.ManualFileName(spec);
        DemoFiles.Move(directory, from, to);
        return new(DemoChangeKind.Moved, $"{spec.Code} moved from {folder} to manuals/archive", from, to, [], []);
    }

    private static DemoChange DeleteDrawing(string directory, StorePlan plan)
    {
        var spec = plan.Drawings[4];
        string path = Shared + "drawings/" + StorePlan.DrawingFileName(spec);
        File.Delete(DemoFiles.FullPath(directory, path));
        return new(DemoChangeKind.Deleted, $"Drawing {spec.Number} deleted (superseded)", path, null, [], Enumerable.Range(1, spec.Sheets).ToList());
    }

    private static DemoChange TouchScan(string directory, StorePlan plan)
    {
        var (spec, folder) = plan.Scans[2];
        string path = StorePlan.FieldScans + "/" + folder + "/" + spec.Name;
        string full = DemoFiles.FullPath(directory, path);
        // The new time only needs to differ from the old; at least two seconds later also holds on file
        // systems that keep times in two-second steps.
        var before = File.GetLastWriteTimeUtc(full);
        var now = DateTime.UtcNow;
        File.SetLastWriteTimeUtc(full, now > before.AddSeconds(2) ? now : before.AddSeconds(2));
        return new(DemoChangeKind.Touched, $"Scan {spec.Name} touched: new modification time, same bytes", path, path, [], []);
    }

    private static DemoChange ResaveReportMetadata(string directory, StorePlan plan)
    {
        var (spec, folder) = plan.Reports[4];
        var before = ReportBuilder.Info(spec);
        var after = before with
        {
            Title = before.Title + " (approved)",
            Author = "Operations directorate",
            ModifiedDate = "D:" + spec.Issued.AddDays(9).ToString("yyyyMMdd", System.Globalization.CultureInfo.InvariantCulture) + "113000Z",
        };
        string path = Shared + folder + "/" + StorePlan.ReportFileName(spec);
        DemoFiles.Replace(directory, path, plan.RenderReport(spec, after));
        return new(DemoChangeKind.MetadataResaved, $"{spec.Title} saved again with a new title, author and date; no page changed", path, path, [], []);
    }

    private static DemoChange AddReport(string directory, StorePlan plan)
    {
        var spec = StorePlan.Report(2026, 3, 8, 7);
        string path = Shared + StorePlan.ReportFolder(spec.Year) + "/" + StorePlan.ReportFileName(spec);
        DemoFiles.Write(directory, path, plan.RenderReport(spec, ReportBuilder.Info(spec)));
        return new(DemoChangeKind.Added, $"New report: {spec.Title}, {spec.PageCount} pages", null, path, Enumerable.Range(1, spec.PageCount).ToList(), []);
    }

    private static DemoChange ReorderAndInsertPages(string directory, StorePlan plan)
    {
        var (spec, folder) = plan.Manuals[6];
        var pages = plan.ManualPages(spec).ToList();
        // The appendices are moved to the front, behind the contents, and an addendum page follows 3-2.
        var appendices = pages.Where(page => page.Kind == ManualPageKind.Appendix).ToList();
        pages.RemoveAll(page => page.Kind == ManualPageKind.Appendix);
        pages.InsertRange(2, appendices);
        int after = pages.FindIndex(page => page.Label == ManualPlanner.SectionLabel(3, 2));
        var anchor = pages[after];
        var inserted = new ManualPage(anchor.Label + "A", ManualPageKind.Text, anchor.Section, anchor.SectionTitle, false, plan.Random("manual/" + spec.Code + "/addendum").NextUInt64());
        pages.Insert(after + 1, inserted);
        string path = Shared + folder + "/" + StorePlan.ManualFileName(spec);
        DemoFiles.Replace(directory, path, ManualBuilder.Render(spec, pages, ManualBuilder.Info(spec)));
        return new(
            DemoChangeKind.PagesReorderedAndInserted,
            $"{spec.Code}: appendices moved behind the contents and addendum page {inserted.Label} inserted",
            path,
            path,
            [after + 2],
            []);
    }
}

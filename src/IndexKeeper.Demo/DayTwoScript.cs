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
        string path = SaveManual(directory, spec, folder, pages, inPlace: true);
        string description = $"{spec.Code}: an amendment added to page {pages[index].Label} and the manual saved again";
        return new(DemoChangeKind.PageEdited, description, path, path, [index + 1], [index + 1]);
    }

    private static DemoChange CopyReportToFinal(string directory, StorePlan plan)
    {
        var (spec, folder) = plan.Reports[6];
        string name = StorePlan.ReportFileName(spec);
        return Relocate(directory, DemoChangeKind.Copied, Shared + folder + "/" + name, Shared + "reports/final/" + name, $"{spec.Title} copied into reports/final");
    }

    private static DemoChange RenameForm(string directory, StorePlan plan)
    {
        var (spec, path) = plan.Forms[7];
        string from = Shared + path;
        return Relocate(directory, DemoChangeKind.Renamed, from, from[..^".pdf".Length] + " (checked).pdf", $"Inspection form {spec.Code} renamed to mark it checked");
    }

    private static DemoChange MoveManual(string directory, StorePlan plan)
    {
        var (spec, folder) = plan.Manuals[5];
        return Relocate(directory, DemoChangeKind.Moved, ManualPath(folder, spec), Shared + "manuals/archive/" + StorePlan.ManualFileName(spec), $"{spec.Code} moved from {folder} to manuals/archive");
    }

    /// <summary>A copy, rename or move: the same bytes under another path, so no page appears or goes.</summary>
    private static DemoChange Relocate(string directory, DemoChangeKind kind, string from, string to, string description)
    {
        DemoFiles.Relocate(directory, from, to, keepSource: kind == DemoChangeKind.Copied);
        return new(kind, description, from, to, [], []);
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
            ModifiedDate = DemoPdfInfo.Date(spec.Issued.AddDays(9), new TimeOnly(11, 30)),
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
        string path = SaveManual(directory, spec, folder, pages, inPlace: false);
        string description = $"{spec.Code}: appendices moved behind the contents and addendum page {inserted.Label} inserted";
        return new(DemoChangeKind.PagesReorderedAndInserted, description, path, path, [after + 2], []);
    }

    /// <summary>Saves a manual again with another page list and returns its path: in place, as an editor that
    /// saves over the open file does (same file identity), or as a new file renamed over the old one.</summary>
    private static string SaveManual(string directory, ManualSpec spec, string folder, IReadOnlyList<ManualPage> pages, bool inPlace)
    {
        string path = ManualPath(folder, spec);
        byte[] bytes = ManualBuilder.Render(spec, pages);
        if (inPlace)
        {
            DemoFiles.Write(directory, path, bytes);
        }
        else
        {
            DemoFiles.Replace(directory, path, bytes);
        }

        return path;
    }

    private static string ManualPath(string folder, ManualSpec spec) => Shared + folder + "/" + StorePlan.ManualFileName(spec);
}

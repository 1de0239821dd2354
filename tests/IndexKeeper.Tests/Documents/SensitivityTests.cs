namespace IndexKeeper.Tests.Documents;

/// <summary>
/// Each visible edit changes the keys of exactly the pages that show it: edits of a page's own content,
/// size and rotation, and edits of resources it uses — a form XObject (also one nested inside a form),
/// a font's widths or program, an ExtGState transparency — while pages that do not use the edited
/// resource keep their keys, even when their resource dictionary lists it.
/// </summary>
public sealed class SensitivityTests : IDisposable
{
    private readonly TempFolder folder = new();

    public static TheoryData<string, int[]> Edits() => new()
    {
        { "word on page 1", [0] },
        { "text moved on page 3", [2] },
        { "page 3 wider", [2] },
        { "inherited rotation of page 1", [0] },
        { "rotation of page 5", [4] },
        { "text inside form Fm1", [0] },
        { "line inside nested form Fm2", [0] },
        { "width of a in font F1", [0, 3] },
        { "byte of font program of F1", [0, 3] },
        { "fill alpha of GS1", [0, 4] },
        { "pixel of image Im1", [1] },
        { "text of the stamp appearance", [1] },
        { "colour of a hidden annotation", [] },
        { "modification date of the stamp", [] },
    };

    [Theory]
    [MemberData(nameof(Edits))]
    public void Edit_changes_exactly_the_pages_that_show_it(string edit, int[] changedPages)
    {
        var before = folder.Keys(SampleDocuments.Rich());
        var after = folder.Keys(SampleDocuments.Rich(Options(edit)));
        var changed = Enumerable.Range(0, before.Count).Where(i => before[i] != after[i]).ToArray();
        Assert.Equal(changedPages, changed);
    }

    [Fact]
    public void Builder_edits_change_only_their_page()
    {
        var baseline = folder.Keys(SampleDocuments.Builder(5));

        var word = folder.Keys(SampleDocuments.Builder(5, p => p == 3 ? "Intake screen inspected" : SampleDocuments.BuilderLines[p - 1]));
        Assert.Equal([2], Differences(baseline, word));

        var image = folder.Keys(SampleDocuments.Builder(5, imageShade: 41));
        Assert.Equal([1], Differences(baseline, image));

        var same = folder.Keys(SampleDocuments.Builder(5));
        Assert.Empty(Differences(baseline, same));
    }

    public void Dispose() => folder.Dispose();

    private static int[] Differences(List<string> a, List<string> b) =>
        Enumerable.Range(0, a.Count).Where(i => a[i] != b[i]).ToArray();

    private static RichOptions Options(string edit) => edit switch
    {
        "word on page 1" => new() { Page1Word = "outlet" },
        "text moved on page 3" => new() { Page3TextX = 80 },
        "page 3 wider" => new() { Page3Width = 612 },
        "inherited rotation of page 1" => new() { NodeRotate = 0 },
        "rotation of page 5" => new() { Page5Rotate = 180 },
        "text inside form Fm1" => new() { FormText = "Screen 5 cleaned" },
        "line inside nested form Fm2" => new() { Form2LineEnd = 60 },
        "width of a in font F1" => new() { WidthOfA = 600 },
        "byte of font program of F1" => new() { FontProgramFlip = 1 },
        "fill alpha of GS1" => new() { FillAlpha = "0.6" },
        "pixel of image Im1" => new() { ImagePixelFlip = 1 },
        "text of the stamp appearance" => new() { StampText = "REVIEWED" },
        "colour of a hidden annotation" => new() { HiddenSquareColour = "1 0 0 rg" },
        "modification date of the stamp" => new() { StampModified = "D:20260202000000Z" },
        _ => throw new ArgumentOutOfRangeException(nameof(edit), edit, "unknown edit"),
    };
}

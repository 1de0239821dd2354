namespace IndexKeeper.Demo;

/// <summary>One monthly operations report.</summary>
internal sealed record ReportSpec(string Code, int Year, int Month, string Author, int PageCount)
{
    private static readonly string[] MonthNames =
    [
        "January", "February", "March", "April", "May", "June", "July", "August", "September", "October",
        "November", "December",
    ];

    public string MonthName => MonthNames[Month - 1];

    public string Title => "Monthly operations report, " + MonthName + " " + DemoNumber.Integer(Year);

    /// <summary>Issued on the fifth of the following month.</summary>
    public DateOnly Issued => new DateOnly(Year, Month, 1).AddMonths(1).AddDays(4);
}

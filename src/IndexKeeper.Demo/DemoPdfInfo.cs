using System.Globalization;

namespace IndexKeeper.Demo;

/// <summary>Document information dictionary of a demo PDF (ISO 32000-1 §14.3.3). Dates are fixed strings
/// in the PDF date format (§7.9.4), never read from the clock.</summary>
internal sealed record DemoPdfInfo(string Title, string Author, string Subject, string CreationDate, string ModifiedDate)
{
    /// <summary>Info of a document created and last modified at the same moment.</summary>
    public static DemoPdfInfo Issued(string title, string author, string subject, DateOnly day, TimeOnly time)
    {
        string date = Date(day, time);
        return new DemoPdfInfo(title, author, subject, date, date);
    }

    /// <summary>A moment in UTC as a PDF date: "D:" YYYYMMDDHHmmSS "Z".</summary>
    public static string Date(DateOnly day, TimeOnly time) =>
        "D:" + day.ToString("yyyyMMdd", CultureInfo.InvariantCulture) + time.ToString("HHmmss", CultureInfo.InvariantCulture) + "Z";
}

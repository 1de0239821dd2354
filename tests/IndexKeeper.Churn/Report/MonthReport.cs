namespace IndexKeeper.Churn.Report;

/// <summary>Everything one run of the simulator measured; written as JSON.</summary>
internal sealed record MonthReport(
    string Profile,
    int Seed,
    string Machine,
    string EncoderChange,
    double HashedTermSecondsPerPage,
    double MiniLmSecondsPerPage,
    int MiniLmSamplePages,
    IReadOnlyList<DayFigures> Days,
    RebuildComparison Rebuild,
    double GenerateSeconds,
    double TotalSeconds);

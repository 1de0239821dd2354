namespace IndexKeeper.Service.Querying;

/// <summary>For one query vector: the page vector it matched best, its similarity, the page region and the word there.</summary>
public sealed record SearchReportMatch(int QueryVector, int PageVector, double Similarity, float Left, float Bottom, float Right, float Top, string? Word);

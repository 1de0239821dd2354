namespace IndexKeeper.Service.Planning;

/// <summary>What <c>plan --calibrate</c> measured: seconds and vectors per page (weighted by kind), pages timed, and each kind's figure.</summary>
internal sealed record CalibrationResult(double SecondsPerPage, double VectorsPerPage, int PagesTimed, string ByKind);

using Microsoft.ML.OnnxRuntime;

namespace IndexKeeper.Core.Encoding;

/// <summary>How every model-based encoder runs its ONNX graphs: CPU only, sequential, all graph optimisations.</summary>
internal static class CpuSessionOptions
{
    public static SessionOptions Create(int intraOpThreads)
    {
        var options = new SessionOptions
        {
            ExecutionMode = ExecutionMode.ORT_SEQUENTIAL,
            GraphOptimizationLevel = GraphOptimizationLevel.ORT_ENABLE_ALL,
            InterOpNumThreads = 1,
        };
        if (intraOpThreads > 0)
        {
            options.IntraOpNumThreads = intraOpThreads;
        }

        // Idle worker threads sleep rather than spin: the machine is shared with the rest of the service.
        options.AddSessionConfigEntry("session.intra_op.allow_spinning", "0");
        return options;
    }
}

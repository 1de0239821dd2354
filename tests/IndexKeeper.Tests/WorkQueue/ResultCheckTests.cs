using IndexKeeper.Service.WorkQueue;

namespace IndexKeeper.Tests.WorkQueue;

/// <summary>The coordinator's decision on a handed-back job: no vector set of another encoder is ever committed.</summary>
public sealed class ResultCheckTests
{
    private const string Active = "aaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaa";
    private const string Other = "bbbbbbbbbbbbbbbbbbbbbbbbbbbbbbbbbbbbbbbbbbbbbbbbbbbbbbbbbbbbbbbb";

    private static FinishedJob Done(string jobEncoder, string resultEncoder) =>
        new(new PageJob(new string('c', 64), jobEncoder, "docs", "a.pdf", 1, new string('d', 64), 0), JobState.Done, "w1", resultEncoder, new ReadOnlyMemory<byte>([1]), null, null);

    private static FinishedJob Failed(JobFailure failure) =>
        new(new PageJob(new string('c', 64), Active, "docs", "a.pdf", 1, new string('d', 64), 0), JobState.Failed, "w1", null, null, failure, "why");

    [Fact]
    public void Matching_result_is_committed() =>
        Assert.Equal(ResultVerdict.Commit, ResultCheck.Decide(Done(Active, Active), Active, 128, pageNeedsVectors: true, decodedDimensions: 128).Verdict);

    [Fact]
    public void Result_of_another_encoder_is_rejected_even_for_a_page_that_needs_vectors() =>
        Assert.Equal(ResultVerdict.Reject, ResultCheck.Decide(Done(Active, Other), Active, 128, pageNeedsVectors: true, decodedDimensions: 128).Verdict);

    [Fact]
    public void Job_of_an_encoder_no_longer_active_is_dropped() =>
        Assert.Equal(ResultVerdict.Drop, ResultCheck.Decide(Done(Other, Other), Active, 128, pageNeedsVectors: true, decodedDimensions: 128).Verdict);

    [Fact]
    public void Page_with_vectors_already_is_dropped_not_committed_twice() =>
        Assert.Equal(ResultVerdict.Drop, ResultCheck.Decide(Done(Active, Active), Active, 128, pageNeedsVectors: false, decodedDimensions: 128).Verdict);

    [Theory]
    [InlineData(null)]
    [InlineData(256)]
    public void Bytes_that_are_not_a_vector_set_of_the_encoder_are_rejected(int? dimensions) =>
        Assert.Equal(ResultVerdict.Reject, ResultCheck.Decide(Done(Active, Active), Active, 128, pageNeedsVectors: true, decodedDimensions: dimensions).Verdict);

    [Fact]
    public void Failures_go_back_to_the_queue_by_kind()
    {
        Assert.Equal(ResultVerdict.Defer, ResultCheck.Decide(Failed(JobFailure.Changed), Active, 128, pageNeedsVectors: true, decodedDimensions: null).Verdict);
        Assert.Equal(ResultVerdict.Defer, ResultCheck.Decide(Failed(JobFailure.Unmapped), Active, 128, pageNeedsVectors: true, decodedDimensions: null).Verdict);
        Assert.Equal(ResultVerdict.Failure, ResultCheck.Decide(Failed(JobFailure.Failed), Active, 128, pageNeedsVectors: true, decodedDimensions: null).Verdict);
    }
}

using IndexKeeper.Core.Encoding.TextTokens;

namespace IndexKeeper.Tests.Encoding.TextTokens;

public sealed class TokenWindowPlanTests
{
    [Fact]
    public void Every_small_case_keeps_the_window_rules()
    {
        for (var capacity = 1; capacity <= 12; capacity++)
        {
            for (var overlap = 0; overlap < capacity; overlap++)
            {
                for (var count = 0; count <= 40; count++)
                {
                    Check(TokenWindowPlan.Create(count, capacity, overlap), count, capacity, overlap);
                }
            }
        }
    }

    [Fact]
    public void A_page_of_the_default_settings_is_cut_as_documented()
    {
        // 600 tokens, windows of 254 (256 with [CLS] and [SEP]), 32 shared: starts 0, 222, then the last aligned to the end.
        var plan = TokenWindowPlan.Create(600, 254, 32);
        Assert.Equal([new TokenWindow(0, 254), new TokenWindow(222, 254), new TokenWindow(346, 254)], plan.Windows);
        Assert.Equal(0, plan.WindowOfToken[0]);
        Assert.Equal(0, plan.WindowOfToken[237]); // 16 tokens of context on its near side in window 0, 15 in window 1
        Assert.Equal(1, plan.WindowOfToken[238]);
        Assert.Equal(2, plan.WindowOfToken[599]);
    }

    private static void Check(TokenWindowPlan plan, int count, int capacity, int overlap)
    {
        Assert.Equal(count, plan.WindowOfToken.Count);
        Assert.Equal(count == 0 ? 0 : 1, plan.Windows.Count > 0 ? 1 : 0);
        for (var w = 0; w < plan.Windows.Count; w++)
        {
            var window = plan.Windows[w];
            Assert.InRange(window.Length, 1, capacity);
            Assert.True(window.Start >= 0 && window.End <= count);
            if (count > capacity)
            {
                Assert.Equal(capacity, window.Length); // long sequences give full windows only (no padding)
            }

            if (w > 0)
            {
                Assert.True(window.Start > plan.Windows[w - 1].Start);
                Assert.True(plan.Windows[w - 1].End - window.Start >= overlap, "consecutive windows share at least the overlap");
            }
        }

        if (count > 0)
        {
            Assert.Equal(0, plan.Windows[0].Start);
            Assert.Equal(count, plan.Windows[^1].End);
        }

        for (var t = 0; t < count; t++)
        {
            var owner = plan.Windows[plan.WindowOfToken[t]];
            Assert.True(owner.Start <= t && t < owner.End);
            var margin = Math.Min(t - owner.Start, owner.End - 1 - t);
            for (var w = 0; w < plan.Windows.Count; w++)
            {
                var other = plan.Windows[w];
                if (other.Start <= t && t < other.End)
                {
                    var otherMargin = Math.Min(t - other.Start, other.End - 1 - t);
                    Assert.True(otherMargin < margin || (otherMargin == margin && w >= plan.WindowOfToken[t]), "the most central window, the earlier on a tie");
                }
            }
        }
    }
}

using Sweeps.Engine.Planning;

namespace Sweeps.Engine.Tests.Planning;

/// <summary>
/// How a grid is cut into chunks: enough chunks per worker to balance, none much shorter than the queue's per-job
/// cost warrants, none over the memory cap, and — for block analyzers — whole blocks of lanes (the rules are the
/// project's own; the figures come from ChunkPlan's documented constants).
/// </summary>
public sealed class ChunkPlanTests
{
    [Theory]
    [InlineData(400, 3.5e-3, 2, 4)]
    [InlineData(2000, 5e-4, 2, 4)]
    [InlineData(1_000_000, 8e-6, 2, 4)]
    [InlineData(1_000_000, 6e-7, 2, 32)]
    [InlineData(37, 1e-2, 3, 4)]
    [InlineData(10_000_000, 1e-7, 16, 32)]
    public void Chunks_HoldWholeBlocks_AndKeepTheBalanceAndTheCap(long points, double secondsPerPoint, int workers, int block)
    {
        var plain = ChunkPlan.For(points, secondsPerPoint, workers);
        var blocked = ChunkPlan.For(points, secondsPerPoint, workers, block);
        Assert.InRange(blocked.ChunkSize, 1, ChunkPlan.MaxChunk);
        Assert.True(blocked.ChunkSize % block == 0 || blocked.ChunkSize == points || plain.ChunkSize + block > ChunkPlan.MaxChunk, $"{blocked.ChunkSize} points per chunk");

        // Rounding up to whole blocks never adds chunks and takes at most a block more per chunk.
        Assert.True(blocked.ChunkCount <= plain.ChunkCount);
        Assert.InRange(blocked.ChunkSize - plain.ChunkSize, 0, block - 1);
    }

    [Fact]
    public void ForcedCaseOfTheBenchmarks_GetsEightChunksOfWholeBlocks()
    {
        // 400 points at 7 ms (run's quick estimate of the case) on two workers: balanced at 50 points (four chunks per
        // worker, each above a quarter second), rounded to 52.
        var plan = ChunkPlan.For(400, 7e-3, 2, 4);
        Assert.Equal(52, plan.ChunkSize);
        Assert.Equal(8, plan.ChunkCount);
        Assert.Equal(50, ChunkPlan.For(400, 7e-3, 2).ChunkSize);
    }

    [Fact]
    public void EmbeddedQueue_CutsAShortFlowSweepIntoFourChunksPerWorker()
    {
        // 2000 flow points at 0.414 ms (check's estimate of the Lorenz-type benchmark) on two workers, in blocks of four:
        // the embedded minimum of a tenth of a second leaves the balanced 250 points (rounded to 252), where a shared
        // queue's quarter second makes chunks of 604 — four chunks, the last a third as long, so one worker idles at the end.
        var embedded = ChunkPlan.For(2000, 4.14e-4, 2, 4, ChunkPlan.EmbeddedMinSeconds);
        Assert.Equal(252, embedded.ChunkSize);
        Assert.Equal(8, embedded.ChunkCount);

        var shared = ChunkPlan.For(2000, 4.14e-4, 2, 4);
        Assert.Equal(604, shared.ChunkSize);
        Assert.Equal(4, shared.ChunkCount);
    }
}

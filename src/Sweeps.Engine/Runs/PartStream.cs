using Sweeps.Engine.Runs.Columnar;

namespace Sweeps.Engine.Runs;

/// <summary>
/// A point part written while its chunk is computed: each batch of <see cref="GroupRows"/> rows goes into the file
/// (under a temporary name) as a row group as soon as it is complete, so a chunk's columns hold one row group at a time
/// instead of the whole chunk — memory that does not grow with the chunk or the samples per point, and stays warm in
/// the processor's cache between computing a row group and writing it. <see cref="Commit"/> adds the footer with the
/// part's counts and renames the file into place; a stream disposed before that leaves no file behind.
/// </summary>
internal sealed class PartStream : IDisposable
{
    private readonly string path;
    private readonly string temporary;
    private readonly PartSchema schema;
    private readonly FileStream stream;
    private readonly ColumnarFile file;
    private PartTally? tally;
    private bool closed;

    public PartStream(string path, PartSchema schema, int groupRows)
    {
        ArgumentOutOfRangeException.ThrowIfLessThan(groupRows, 1);
        (this.path, this.schema, GroupRows) = (path, schema, groupRows);
        temporary = PartWriter.TemporaryPath(path);
        stream = new FileStream(temporary, FileMode.CreateNew, FileAccess.Write, FileShare.None, 1 << 16);
        file = new ColumnarFile(stream);
    }

    /// <summary>Rows in a row group: the columns are handed over (<see cref="Append"/>) when they hold this many.</summary>
    public int GroupRows { get; }

    /// <summary>Writes the columns' rows as the part's next row group and empties the columns for the next rows.</summary>
    public void Append(ChunkColumns columns)
    {
        PartFile.WriteRowGroup(file, schema, columns);
        var counts = PartTally.Of(columns);
        tally = tally?.Plus(counts) ?? counts;
        columns.Clear();
    }

    /// <summary>Finishes the part (its footer carries <paramref name="metadata"/> and the counts) and puts it in place.</summary>
    public PartTally Commit(IReadOnlyDictionary<string, string> metadata)
    {
        var counts = tally ?? throw new InvalidOperationException("A part is committed after its first row group.");
        var withTally = metadata.ToDictionary();
        withTally[PartTally.Key] = counts.ToJson();
        file.Finish(withTally, PartFile.CreatedBy);
        Close();
        PartWriter.Publish(temporary, path);
        return counts;
    }

    /// <summary>Closes the file; a part not committed (or one another run of the chunk put in place first) is deleted.</summary>
    public void Dispose()
    {
        Close();
        File.Delete(temporary);
    }

    private void Close()
    {
        if (!closed)
        {
            file.Dispose();
            stream.Dispose();
            closed = true;
        }
    }
}

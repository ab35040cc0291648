using Serilog.Core;
using Serilog.Events;
using Serilog.Formatting;

namespace FlowSolve.Api.Hosting;

/// <summary>
/// Writes log events to standard output through a 64 KiB buffer, flushed every half second and on shutdown.
/// </summary>
/// <remarks>
/// Serilog's console sink writes and flushes each event on its own, under a lock; at one event per request that cost
/// about a quarter of the friction endpoint's throughput on our 2-core machine (measured side by side: 14.5 k against
/// 19.9 k requests per second). Behind the asynchronous wrapper this sink does the formatting and the writes on one
/// background thread in large blocks, so a request pays only for queuing its event. A crash can lose at most the last
/// half second of lines.
/// </remarks>
public sealed class BufferedStdoutSink : ILogEventSink, IDisposable
{
    private readonly ITextFormatter _formatter;
    private readonly StreamWriter _writer;
    private readonly Timer _timer;
    private readonly Lock _lock = new();

    public BufferedStdoutSink(ITextFormatter formatter)
    {
        _formatter = formatter;
        _writer = new StreamWriter(Console.OpenStandardOutput(), new System.Text.UTF8Encoding(false), 65_536) { AutoFlush = false };
        _timer = new Timer(_ => Flush(), null, TimeSpan.FromMilliseconds(500), TimeSpan.FromMilliseconds(500));
    }

    public void Emit(LogEvent logEvent)
    {
        lock (_lock) _formatter.Format(logEvent, _writer);
    }

    private void Flush()
    {
        try
        {
            lock (_lock) _writer.Flush();
        }
        catch (IOException)
        {
            // Standard output closed (the process is going away): nothing left to write to.
        }
        catch (ObjectDisposedException)
        {
        }
    }

    public void Dispose()
    {
        _timer.Dispose();
        Flush();
        lock (_lock) _writer.Dispose();
    }
}

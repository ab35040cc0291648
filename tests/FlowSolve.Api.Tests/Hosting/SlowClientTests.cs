using System.Diagnostics;
using System.Net.Sockets;
using System.Text;
using FlowSolve.Api.Tests.Samples;

namespace FlowSolve.Api.Tests.Hosting;

/// <summary>A client that sends its headers one byte a second is dropped once the configured header time
/// (FlowSolve:Limits:RequestHeadersTimeoutSeconds, 10 s by default) has passed, on the real server (Kestrel), not after
/// half a minute. A behaviour bound, not a speed measurement.</summary>
public sealed class SlowClientTests(LiveService service) : IClassFixture<LiveService>
{
    [Fact]
    public async Task HeaderSentOneByteASecond_ConnectionDroppedWithinTheHeaderTimeout()
    {
        var uri = new Uri(service.BaseUrl);
        using var tcp = new TcpClient();
        await tcp.ConnectAsync(uri.Host, uri.Port, TestContext.Current.CancellationToken);
        var stream = tcp.GetStream();
        byte[] request = Encoding.ASCII.GetBytes("GET /health/live HTTP/1.1\r\nHost: x\r\nX-Slow: " + new string('a', 40));
        var clock = Stopwatch.StartNew();
        bool dropped = false;
        foreach (byte b in request)
        {
            try
            {
                await stream.WriteAsync(new[] { b }, TestContext.Current.CancellationToken);
                await Task.Delay(1000, TestContext.Current.CancellationToken);
                if (tcp.Client.Poll(0, SelectMode.SelectRead) && tcp.Client.Available == 0) { dropped = true; break; }
            }
            catch (IOException) { dropped = true; break; }
            catch (SocketException) { dropped = true; break; }
            if (clock.Elapsed > TimeSpan.FromSeconds(25)) break;
        }
        // Either the server closed the connection, or it answered 408 and then closed it.
        if (!dropped && tcp.Client.Available > 0)
        {
            var buffer = new byte[256];
            int n = await stream.ReadAsync(buffer, TestContext.Current.CancellationToken);
            dropped = n == 0 || Encoding.ASCII.GetString(buffer, 0, n).Contains(" 408 ");
        }
        Assert.True(dropped, $"connection still open after {clock.Elapsed.TotalSeconds:F0} s");
        Assert.True(clock.Elapsed < TimeSpan.FromSeconds(15), $"dropped only after {clock.Elapsed.TotalSeconds:F0} s");
    }
}

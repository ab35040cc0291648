using System.Buffers;
using System.Text.Json;

namespace FlowSolve.Api.Hosting;

/// <summary>
/// A calculation's 200 answer written as one block: the value is serialised synchronously into a pooled buffer
/// and sent with its Content-Length, instead of streaming through the serializer's resumable asynchronous path into the
/// response pipe. Same bytes as <c>Ok&lt;T&gt;</c> with the pipeline's JSON options (a test compares them).
/// </summary>
/// <remarks>Measured on the friction-factor GET (1.7 KB answer): the asynchronous streaming write cost more than the
/// calculation itself, while the same answer serialised in memory for <c>format=text</c> ran at 1.7 times the rate.</remarks>
public sealed class JsonAnswer(object value, int statusCode) : IResult, IStatusCodeHttpResult, IValueHttpResult, INestedHttpResult
{
    [ThreadStatic] private static ArrayBufferWriter<byte>? t_buffer;
    [ThreadStatic] private static Utf8JsonWriter? t_writer;
    [ThreadStatic] private static Settings? t_writerFor;
    private static Settings? s_settings;

    public int? StatusCode => statusCode;
    public object? Value => value;

    /// <summary>The typed result this answer stands for, so callers that unwrap results see the original.</summary>
    public IResult Result { get; init; } = null!;

    public Task ExecuteAsync(HttpContext httpContext)
    {
        var buffer = t_buffer ??= new ArrayBufferWriter<byte>(4096);
        buffer.ResetWrittenCount();
        var settings = Settings.For(httpContext.RequestServices
            .GetRequiredService<Microsoft.Extensions.Options.IOptions<Microsoft.AspNetCore.Http.Json.JsonOptions>>().Value.SerializerOptions);
        if (t_writer is null || !ReferenceEquals(t_writerFor, settings))
        {
            t_writer = new Utf8JsonWriter(buffer, settings.Writer);
            t_writerFor = settings;
        }
        var writer = t_writer;
        writer.Reset(buffer);
        JsonSerializer.Serialize(writer, value, value.GetType(), settings.Serializer);
        writer.Flush();
        var response = httpContext.Response;
        response.StatusCode = statusCode;
        response.ContentType = "application/json; charset=utf-8";
        response.ContentLength = buffer.WrittenCount;
        // Copied into the response pipe before this thread can serve another request, so the buffer can be reused.
        // Not flushed here: the server flushes headers and body together when the request ends, one send for the answer.
        response.BodyWriter.Write(buffer.WrittenSpan);
        if (buffer.Capacity > 1 << 20) t_buffer = null; // do not keep a huge answer's buffer per thread
        return Task.CompletedTask;
    }

    /// <summary>
    /// What one host's JSON options (the HTTP pipeline's, which <c>Ok&lt;T&gt;</c> uses, with another encoder than
    /// <see cref="JsonSetup.Options"/>) give an answer: a writer with their encoder, since a writer's own options decide
    /// the escaping, and for the serializer the same options without an encoder. System.Text.Json uses the generated
    /// serialisation code of the catalogue's generated JSON context (straight-line writes, no per-property metadata walk) only when
    /// the options carry no encoder; ASP.NET Core's carry the relaxed one. The bytes do not change (a test compares them
    /// with <c>Ok&lt;T&gt;</c>'s, strings that the two encoders escape differently included).
    /// </summary>
    private sealed class Settings
    {
        private Settings(JsonSerializerOptions pipeline)
        {
            Pipeline = pipeline;
            Writer = new JsonWriterOptions
            {
                Encoder = pipeline.Encoder, Indented = pipeline.WriteIndented, MaxDepth = pipeline.MaxDepth, SkipValidation = true,
            };
            Serializer = new JsonSerializerOptions(pipeline) { Encoder = null };
            Serializer.MakeReadOnly();
        }

        public JsonSerializerOptions Pipeline { get; }
        public JsonWriterOptions Writer { get; }
        public JsonSerializerOptions Serializer { get; }

        /// <summary>Built once per options instance (one per host; several hosts share a test process).</summary>
        public static Settings For(JsonSerializerOptions pipeline)
        {
            var settings = s_settings;
            if (settings is not null && ReferenceEquals(settings.Pipeline, pipeline)) return settings;
            return s_settings = new Settings(pipeline);
        }
    }
}

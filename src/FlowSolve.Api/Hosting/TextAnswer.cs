using System.Text;

namespace FlowSolve.Api.Hosting;

/// <summary>
/// A plain-text answer for a spreadsheet cell (<c>format=text</c>): the cell's text as UTF-8 with its Content-Length,
/// written in one block, with the status of the answer it stands for (200, or the problem's status for an error line).
/// </summary>
public sealed class TextAnswer(string text, int statusCode) : IResult, IStatusCodeHttpResult, IValueHttpResult, IContentTypeHttpResult
{
    public const string MediaType = "text/plain; charset=utf-8";

    public int? StatusCode => statusCode;
    public object? Value => text;
    public string ContentType => MediaType;

    public Task ExecuteAsync(HttpContext httpContext)
    {
        var response = httpContext.Response;
        response.StatusCode = statusCode;
        response.ContentType = MediaType;
        int length = Encoding.UTF8.GetByteCount(text);
        response.ContentLength = length;
        // A cell's text is short: encoded straight into the response pipe, flushed with the headers when the request ends.
        var span = response.BodyWriter.GetSpan(length);
        Encoding.UTF8.GetBytes(text, span);
        response.BodyWriter.Advance(length);
        return Task.CompletedTask;
    }
}

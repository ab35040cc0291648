using System.Text.Json;
using System.Text.Json.Serialization;

namespace FlowSolve.Api.Hosting;

/// <summary>The API's JSON conventions, shared by the HTTP pipeline and by example rendering.</summary>
public static class JsonSetup
{
    public static JsonSerializerOptions Options { get; } = Configure(new JsonSerializerOptions(JsonSerializerDefaults.Web));

    /// <summary>camelCase names; nulls omitted; unknown fields rejected so a misspelt field name is a 400, not a silent default;
    /// numbers only as JSON numbers (no "NaN" strings); a nesting limit that stops hostile deeply nested bodies.</summary>
    public static JsonSerializerOptions Configure(JsonSerializerOptions o)
    {
        o.PropertyNamingPolicy = JsonNamingPolicy.CamelCase;
        o.DefaultIgnoreCondition = JsonIgnoreCondition.WhenWritingNull;
        o.UnmappedMemberHandling = JsonUnmappedMemberHandling.Disallow;
        o.NumberHandling = JsonNumberHandling.Strict;
        o.MaxDepth = 32;
        // A key given twice in one object is refused (400 naming it) rather than the last one silently winning.
        o.AllowDuplicateProperties = false;
        // Generated metadata first for the calculations' own types; reflection for everything else.
        if (!o.TypeInfoResolverChain.Contains(ApiJsonContext.Default))
        {
            if (o.TypeInfoResolverChain.Count == 0) o.TypeInfoResolverChain.Add(new System.Text.Json.Serialization.Metadata.DefaultJsonTypeInfoResolver());
            o.TypeInfoResolverChain.Insert(0, ApiJsonContext.Default);
        }
        return o;
    }
}

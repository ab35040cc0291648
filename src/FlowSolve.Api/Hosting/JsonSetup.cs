using System.Text.Json;
using System.Text.Json.Serialization;
using System.Text.Json.Serialization.Metadata;

namespace FlowSolve.Api.Hosting;

/// <summary>The API's JSON conventions, shared by the HTTP pipeline and by example rendering.</summary>
public static class JsonSetup
{
    // Declared before Options, whose initializer reads it.
    private static readonly GeneratedResolver GeneratedTypes = new();

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
        // Generated metadata first for the calculations' own types (registered by the catalogue); reflection for everything else.
        if (!o.TypeInfoResolverChain.Contains(GeneratedTypes))
        {
            if (o.TypeInfoResolverChain.Count == 0) o.TypeInfoResolverChain.Add(new DefaultJsonTypeInfoResolver());
            o.TypeInfoResolverChain.Insert(0, GeneratedTypes);
        }
        return o;
    }

    /// <summary>Adds compile-time JSON metadata (a source-generated context) for the calculations' requests and answers:
    /// writing an answer then takes the generated fast path. The catalogue calls this at start-up; the output is the same
    /// bytes either way (the reflection resolver stands behind it).</summary>
    public static void UseGenerated(IJsonTypeInfoResolver resolver) => GeneratedTypes.Add(resolver);

    /// <summary>Asks each registered context in turn; registering after options are in use is safe (a type already
    /// resolved by reflection stays so, with the same output).</summary>
    private sealed class GeneratedResolver : IJsonTypeInfoResolver
    {
        private IJsonTypeInfoResolver[] _resolvers = [];
        private readonly Lock _gate = new();

        public void Add(IJsonTypeInfoResolver resolver)
        {
            lock (_gate)
                if (!_resolvers.Contains(resolver)) _resolvers = [.. _resolvers, resolver];
        }

        public JsonTypeInfo? GetTypeInfo(Type type, JsonSerializerOptions options)
        {
            foreach (var r in _resolvers)
                if (r.GetTypeInfo(type, options) is { } info) return info;
            return null;
        }
    }
}

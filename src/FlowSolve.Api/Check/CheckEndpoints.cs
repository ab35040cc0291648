using System.Globalization;
using System.Text.Json;
using System.Text.Json.Nodes;
using FlowSolve.Api.Hosting;
using FlowSolve.Api.Problems;
using Microsoft.AspNetCore.Http.HttpResults;

namespace FlowSolve.Api.Check;

/// <summary>
/// <c>POST /v1/check/{calculation}</c>: a reviewer pastes a spreadsheet's inputs and its claimed outputs and is told,
/// per claimed field, the exact value, the deviation, pass or fail, and what the claim matches instead when that can be
/// identified (an explicit friction approximation; the value at another water temperature).
/// </summary>
public static class CheckEndpoints
{
    public const double DefaultTolerancePercent = 0.5;

    /// <summary>The least tolerance for naming an alternative as the likely cause: 0.01 percent. A claim written with
    /// fewer digits gets half a unit in its last digit (0.0486 matches anything from 0.04855 to 0.04865).</summary>
    private const double CauseMatchPercent = 0.01;

    /// <summary>How close an alternative must be to the claim, in percent: half a unit in the claim's last written digit
    /// relative to the claim (0.0486: 0.00005 / 0.0486 = 0.103 percent), at least <see cref="CauseMatchPercent"/> and
    /// at most 1 percent.</summary>
    public static double MatchPercent(string claimText)
    {
        string text = claimText.Trim().TrimStart('-', '+');
        int e = text.IndexOfAny(['e', 'E']);
        int exponent = e >= 0 && int.TryParse(text[(e + 1)..], System.Globalization.NumberStyles.AllowLeadingSign, CultureInfo.InvariantCulture, out int x) ? x : 0;
        string mantissa = e >= 0 ? text[..e] : text;
        int point = mantissa.IndexOf('.');
        int decimals = point < 0 ? 0 : mantissa.Length - point - 1;
        if (!double.TryParse(text, System.Globalization.NumberStyles.Float, CultureInfo.InvariantCulture, out double value) || value == 0)
            return CauseMatchPercent;
        double halfUnit = 0.5 * Math.Pow(10, exponent - decimals);
        double percent = halfUnit / Math.Abs(value) * 100;
        // At least the fixed 0.01 percent; at most 1 percent, so a claim of one or two digits is not matched to anything near.
        return double.IsFinite(percent) ? Math.Clamp(percent, CauseMatchPercent, 1.0) : CauseMatchPercent;
    }

    /// <summary>Water temperatures a spreadsheet commonly uses by mistake (degrees C): the usual table rows.</summary>
    private static readonly double[] CommonTemperatures = [0, 4, 5, 10, 12, 15, 16, 20, 25, 30, 35, 40, 50, 60, 70, 80, 90, 100];

    public static IEndpointRouteBuilder MapCheckEndpoints(this IEndpointRouteBuilder routes)
    {
        routes.MapPost("/v1/check/{**calculation}", Check)
            .WithTags("Check")
            .WithName("PostCheck")
            .WithSummary("Check claimed outputs of a calculation against the exact values")
            .WithDescription(
                "calculation is the calculation's route below /v1 (friction-factor, pipes/head-loss, channels/normal-depth, ...). " +
                "The body holds that calculation's inputs plus claimed, an object of claimed outputs keyed by output field name " +
                "(for example {\"frictionFactor\": 0.0191}), and optionally tolerancePercent (default 0.5). The answer gives, for " +
                "each claim, the exact value, the deviation (absolute and percent), pass or fail, and the likely cause where one can " +
                "be identified: a friction factor that matches an explicit approximation (Swamee-Jain, Haaland, Churchill, " +
                "Serghides) to 0.01 percent, or a value that matches the same calculation at another water temperature. The batch " +
                "form POST /v1/batch/check/{calculation} takes claims as columns such as claimed.frictionFactor.\n\n" +
                OpenApiSetup.Cautions)
            .WithMetadata(new RequestExample([], JsonNode.Parse("""{"reynolds": 5000, "relativeRoughness": 0.01, "claimed": {"frictionFactor": 0.0486}}""")))
            .Accepts<CheckRequestShape>("application/json")
            .Produces<CheckResponse>()
            .ProducesValidationProblem()
            .ProducesProblem(404)
            .ProducesProblem(422);

        var catalog = routes.ServiceProvider.GetRequiredService<CalculationCatalog>();
        foreach (var c in catalog.All.ToArray())
        {
            var target = c;
            catalog.Add<JsonObject, CheckResponse>("check/" + c.Name, "passed", body => Run(target, body));
        }
        return routes;
    }

    private static async Task<IResult> Check(
        [System.ComponentModel.Description("The calculation's route below /v1, for example friction-factor or pipes/head-loss.")] string calculation,
        HttpContext http, CalculationCatalog catalog)
    {
        if (!catalog.TryGet(calculation, out var descriptor) || calculation.StartsWith("check/", StringComparison.OrdinalIgnoreCase))
            return TypedResults.Problem(statusCode: 404, title: "No such calculation.",
                detail: $"'{calculation}' is not a calculation. Available: {string.Join(", ", catalog.All.Where(c => !c.Name.StartsWith("check/", StringComparison.Ordinal)).Select(c => c.Name).Order())}.");
        if (!http.Request.HasJsonContentType())
            return TypedResults.Problem(statusCode: 415, title: "Unsupported media type.",
                detail: "The body must be JSON with Content-Type: application/json.");
        JsonObject? body;
        try
        {
            // Read whole (the body-size limit bounds it) so that a key given twice is refused, naming it, before parsing.
            using var buffer = new MemoryStream();
            await http.Request.Body.CopyToAsync(buffer, http.RequestAborted);
            var bytes = new ReadOnlySpan<byte>(buffer.GetBuffer(), 0, (int)buffer.Length);
            if (JsonDuplicates.Find(bytes) is { } repeated)
                return ProblemResults.BadInput(repeated, "is given more than once in the same JSON object; give each key once");
            body = JsonSerializer.Deserialize<JsonObject>(bytes, JsonSetup.Options);
        }
        catch (JsonException e)
        {
            var (field, message) = BadRequestProblems.DescribeJson(e);
            return ProblemResults.BadInput(field, message);
        }
        if (body is null) return ProblemResults.BadInput("body", "must be a JSON object of the calculation's inputs plus claimed");
        return Run(descriptor, body);
    }

    /// <summary>Runs the check on a body of inputs plus <c>claimed</c> and <c>tolerancePercent</c>.</summary>
    public static IResult Run(CalculationDescriptor descriptor, JsonObject body)
    {
        var errors = new FieldErrors();
        var inputs = (JsonObject)body.DeepClone();
        var claimed = inputs["claimed"] as JsonObject;
        inputs.Remove("claimed");
        double tolerance = DefaultTolerancePercent;
        if (inputs["tolerancePercent"] is JsonNode t)
        {
            tolerance = t.GetValueKind() == JsonValueKind.Number ? errors.Required("tolerancePercent", t.GetValue<double>(), 0, 100) : double.NaN;
            if (double.IsNaN(tolerance) && !errors.Has("tolerancePercent")) errors.Add("tolerancePercent", "must be a number of percent, 0 to 100");
            inputs.Remove("tolerancePercent");
        }
        if (claimed is null || claimed.Count == 0) errors.Add("claimed", "is required: an object of claimed outputs keyed by output field name");
        if (errors.Any) return ProblemResults.BadInput(errors);

        var (status, value, problem) = Calculate(descriptor, inputs);
        if (problem is not null) return problem;
        if (status >= 300 || value is null) return TypedResults.Problem(statusCode: status, title: "The calculation has no answer.");

        var result = JsonSerializer.SerializeToElement(value, value.GetType(), JsonSetup.Options);
        var checks = new List<ClaimCheckDto>();
        foreach (var (field, claim) in claimed!)
        {
            if (!TryField(result, field, out var exact) || exact.ValueKind is JsonValueKind.Object or JsonValueKind.Array)
            {
                errors.Add("claimed." + field, "is not a scalar output field of " + descriptor.Name);
                continue;
            }
            if (exact.ValueKind == JsonValueKind.Number)
            {
                // A numeric output takes a finite JSON number only: not a string ("NaN", "0.0486"), not true or false.
                if (claim is null || claim.GetValueKind() != JsonValueKind.Number || !double.IsFinite(claim.GetValue<double>()))
                {
                    errors.Add("claimed." + field, "must be a finite JSON number (not a string, boolean or null)");
                    continue;
                }
                double c = claim.GetValue<double>(), x = exact.GetDouble();
                double? percent = x == 0 ? null : (c / x - 1) * 100;
                if (percent is double q && !double.IsFinite(q)) percent = null; // a claim some 1e300 times the value
                bool pass = percent is double p ? Math.Abs(p) <= tolerance : c == x;
                string? cause = pass ? null : LikelyCause(descriptor, inputs, result, field, c, MatchPercent(claim.ToJsonString()));
                checks.Add(new ClaimCheckDto(field, c, x, c - x, percent, pass, cause));
            }
            else
            {
                if (claim is null || claim.GetValueKind() != JsonValueKind.String)
                {
                    errors.Add("claimed." + field, "must be a JSON string: this output is text");
                    continue;
                }
                string c = claim.GetValue<string>();
                string x = exact.ValueKind == JsonValueKind.String ? exact.GetString()! : exact.GetRawText();
                checks.Add(new ClaimCheckDto(field, c, x, null, null, string.Equals(c, x, StringComparison.OrdinalIgnoreCase), null));
            }
        }
        if (errors.Any) return ProblemResults.BadInput(errors);
        return TypedResults.Ok(new CheckResponse(descriptor.Name, tolerance, checks.All(c => c.Pass), checks, value));
    }

    private static (int Status, object? Value, IResult? Problem) Calculate(CalculationDescriptor descriptor, JsonObject inputs)
    {
        object? request;
        try
        {
            request = JsonSerializer.Deserialize(inputs, descriptor.RequestType, JsonSetup.Options);
        }
        catch (JsonException e)
        {
            var (field, message) = BadRequestProblems.DescribeJson(e);
            return (400, null, ProblemResults.BadInput(field, message));
        }
        if (request is null) return (400, null, ProblemResults.BadInput("body", "must be a JSON object"));
        var result = descriptor.Invoke(request);
        var (status, value) = result.Unwrap();
        return status >= 300 ? (status, null, result) : (status, value, null);
    }

    private static bool TryField(JsonElement json, string path, out JsonElement value)
    {
        value = json;
        foreach (var part in path.Split('.'))
            if (value.ValueKind != JsonValueKind.Object || !value.TryGetProperty(part, out value)) return false;
        return true;
    }

    /// <summary>What a wrong claim matches instead, tried in order of how often spreadsheets make the mistake.</summary>
    private static string? LikelyCause(CalculationDescriptor descriptor, JsonObject inputs, JsonElement result, string field, double claim,
        double matchPercent)
    {
        bool Near(double a, double b) => b != 0 && Math.Abs(a / b - 1) * 100 <= matchPercent;
        var c = CultureInfo.InvariantCulture;

        // An explicit approximation in place of the exact friction factor (the response lists them all).
        if (field.EndsWith("rictionFactor", StringComparison.Ordinal) && result.TryGetProperty("approximations", out var approximations))
        {
            foreach (var a in approximations.EnumerateArray())
                if (a.TryGetProperty("frictionFactor", out var f) && f.ValueKind == JsonValueKind.Number && Near(claim, f.GetDouble()))
                    return string.Format(c, "the claim matches the {0} approximation ({1:G6}) to {2:G2} percent (the claim's own precision): the exact Colebrook-White value was not used",
                        a.GetProperty("method").GetString(), f.GetDouble(), matchPercent);
            if (result.TryGetProperty("reynolds", out var re) && Near(claim, 64 / re.GetDouble()))
                return "the claim matches the laminar law 64/Re, which does not apply at this Reynolds number";
        }

        // Water at another temperature: re-run the same calculation at the common table temperatures.
        bool hasTemperature = inputs["temperature"] is JsonNode;
        bool hasViscosity = inputs["kinematicViscosity"] is JsonNode;
        if (!hasTemperature && hasViscosity) return null;
        bool us = string.Equals(inputs["units"]?.GetValue<string>(), "us", StringComparison.OrdinalIgnoreCase);
        double? stated = hasTemperature && inputs["temperature"]!.GetValueKind() == JsonValueKind.Number ? inputs["temperature"]!.GetValue<double>() : null;
        foreach (double celsius in CommonTemperatures)
        {
            double t = us ? Units.CelsiusToFahrenheit(celsius) : celsius;
            if (stated is double s && Math.Abs(s - t) < 1e-9) continue;
            var trial = (JsonObject)inputs.DeepClone();
            trial.Remove("density");
            trial["temperature"] = t;
            var (status, value, _) = Calculate(descriptor, trial);
            if (status >= 300 || value is null) continue;
            var json = JsonSerializer.SerializeToElement(value, value.GetType(), JsonSetup.Options);
            if (TryField(json, field, out var other) && other.ValueKind == JsonValueKind.Number && Near(claim, other.GetDouble()))
                return string.Format(c, "the claim matches the value for water at {0:0.#} degrees {1} ({2:G6}) rather than at the stated {3}",
                    t, us ? "F" : "C", other.GetDouble(), stated is double st ? st.ToString("0.#", c) + (us ? " F" : " C") : "default temperature");
        }
        return null;
    }
}

using System.Globalization;
using System.Text;
using System.Text.Json;
using System.Text.Json.Nodes;
using CsCheck;
using FlowSolve.Api.Tests.Reliability;

namespace FlowSolve.Api.Tests.Hosting;

/// <summary>
/// Input is understood exactly or refused: decimal commas, repeated, unknown and misplaced parameters, and duplicate
/// JSON keys answer 400 naming the parameter; warnings reach a spreadsheet cell through select=warnings and strict=true.
/// </summary>
public sealed class StrictInputTests(ApiFixture api)
{
    private const string HeadLoss = "/v1/pipes/head-loss?flow=0.12&diameter=0.35&length=500&roughness=0.00026";

    private async Task<(int Status, string? Media, string Text)> Get(string url)
    {
        using var response = await api.Client.GetAsync(url, TestContext.Current.CancellationToken);
        return ((int)response.StatusCode, response.Content.Headers.ContentType?.MediaType,
            await response.Content.ReadAsStringAsync(TestContext.Current.CancellationToken));
    }

    private static string Message((int Status, string? ContentType, JsonElement Body) r, string field) =>
        r.Body.GetProperty("errors").GetProperty(field)[0].GetString()!;

    // --- the cases a new user met -----------------------------------------------------------------------------------

    [Theory]
    [InlineData("/v1/pipes/head-loss?flow=0,12&diameter=0.35&length=500&roughness=0.00026", "flow")]
    [InlineData("/v1/pipes/head-loss?flow=0.12&diameter=0,35&length=500&roughness=0.00026", "diameter")]
    [InlineData("/v1/friction-factor?reynolds=1,5e5&relativeRoughness=0.005", "reynolds")]
    [InlineData("/v1/friction-factor?reynolds=150,000&relativeRoughness=0.005", "reynolds")]
    [InlineData("/v1/friction-factor?reynolds=150%20000&relativeRoughness=0.005", "reynolds")]
    [InlineData("/v1/friction-factor?reynolds=1.500.000&relativeRoughness=0.005", "reynolds")]
    [InlineData("/v1/friction-factor?reynolds=1E+5&relativeRoughness=0.005", "reynolds")] // '+' is a space in a query
    public async Task Query_NumberNotInInvariantGrammar_Answers400NamingItAndSayingUseAPoint(string url, string field)
    {
        var r = await api.GetJson(url);
        ProblemAssert.NamesField(r, 400, field);
        Assert.Contains("use a point as the decimal separator", Message(r, field));
        Assert.Contains("SUBSTITUTE", Message(r, field));
    }

    [Theory]
    [InlineData("OPTIONS")]
    [InlineData("HEAD")]
    [InlineData("PUT")]
    public async Task OtherMethods_MeetTheRoutings405_NotAQueryError(string method)
    {
        // A spreadsheet's web function sends OPTIONS and HEAD before its GET: they must not be refused for the query.
        using var request = new HttpRequestMessage(new HttpMethod(method), "/v1/friction-factor?reynolds=75000&relativeRoughness=0.005&format=text");
        using var response = await api.Client.SendAsync(request, TestContext.Current.CancellationToken);
        Assert.Equal(System.Net.HttpStatusCode.MethodNotAllowed, response.StatusCode);
    }

    [Fact]
    public async Task Query_DecimalCommaWithFormatText_AnswersOneErrorLine()
    {
        var (status, media, text) = await Get("/v1/pipes/head-loss?flow=0,12&diameter=0.35&length=500&roughness=0.00026&format=text");
        Assert.Equal(400, status);
        Assert.Equal("text/plain", media);
        Assert.StartsWith("error: flow: '0,12' holds a comma", text);
    }

    [Fact]
    public async Task Query_ParameterGivenTwice_Answers400NamingIt()
    {
        var r = await api.GetJson("/v1/friction-factor?reynolds=75000&relativeRoughness=0.005&reynolds=8000");
        ProblemAssert.NamesField(r, 400, "reynolds");
        Assert.Contains("given 2 times", Message(r, "reynolds"));
    }

    [Theory]
    [InlineData("methd", "haaland", "method")]
    [InlineData("temprature", "60", "temperature")]
    [InlineData("minorLoss", "5", "minorLossCoefficient")]
    [InlineData("unit", "us", "units")]
    [InlineData("lenght", "500", "length")]
    public async Task Query_MisspeltParameter_Answers400WithTheClosestName(string misspelt, string value, string meant)
    {
        var r = await api.GetJson($"{HeadLoss}&{misspelt}={value}");
        ProblemAssert.NamesField(r, 400, misspelt);
        Assert.Contains($"did you mean '{meant}'", Message(r, misspelt));
    }

    [Fact]
    public async Task Query_UnknownParameterFarFromEveryName_Answers400ListingTheNames()
    {
        var r = await api.GetJson($"{HeadLoss}&xyzzy=1");
        ProblemAssert.NamesField(r, 400, "xyzzy");
        Assert.Contains("flow, diameter, length", Message(r, "xyzzy"));
    }

    [Fact]
    public async Task Query_EmptyValue_Answers400RatherThanTheDefault()
    {
        var r = await api.GetJson($"{HeadLoss}&temperature=");
        ProblemAssert.NamesField(r, 400, "temperature");
    }

    [Fact]
    public async Task Query_ParameterNamesAreCaseInsensitive_AsTheBinderReadsThem()
    {
        // Property: a known name in other letter case is the same parameter (understood exactly), not a misspelling.
        var a = await api.GetJson("/v1/friction-factor?reynolds=75000&relativeRoughness=0.005");
        var b = await api.GetJson("/v1/friction-factor?Reynolds=75000&RELATIVEROUGHNESS=0.005");
        Assert.Equal(200, b.Status);
        Assert.Equal(a.Body.GetProperty("frictionFactor").GetDouble(), b.Body.GetProperty("frictionFactor").GetDouble());
    }

    [Fact]
    public async Task Query_InvariantNumberForms_AreAccepted()
    {
        // Property: every spelling of the same number in the invariant grammar gives the same answer.
        double? reference = null;
        foreach (var text in new[] { "75000", "75000.0", "7.5e4", "7.5E4", "7.5e+4", "0.75e5", "+75000", "75000." })
        {
            var r = await api.GetJson("/v1/friction-factor?relativeRoughness=0.005&reynolds=" + Uri.EscapeDataString(text));
            Assert.Equal(200, r.Status);
            double f = r.Body.GetProperty("frictionFactor").GetDouble();
            reference ??= f;
            Assert.Equal(reference.Value, f);
        }
    }

    public static TheoryData<string, string> PostRoutes => new()
    {
        { "/v1/pipes/head-loss", """{"flow": 0.12, "diameter": 0.35, "length": 500, "roughness": 0.00026}""" },
        { "/v1/pipes/flow", """{"headLoss": 5, "diameter": 0.35, "length": 500, "roughness": 0.00026}""" },
        { "/v1/pipes/diameter", """{"flow": 0.12, "headLoss": 5, "length": 500, "roughness": 0.00026}""" },
        { "/v1/channels/normal-depth", """{"section": {"shape": "rectangular", "bottomWidth": 5}, "flow": 9.548, "slope": 0.0025, "manningN": 0.015}""" },
        { "/v1/channels/critical-depth", """{"section": {"shape": "rectangular", "bottomWidth": 5}, "flow": 9.548}""" },
        { "/v1/pumps/duty-point", """{"pump": {"coefficients": [40, 0, -5000]}, "system": {"staticHead": 15, "resistance": 3000}}""" },
    };

    [Theory]
    [MemberData(nameof(PostRoutes))]
    public async Task Post_UnitsInTheQuery_Answers400SayingItBelongsInTheBody(string route, string body)
    {
        var ok = await api.PostRaw(route, body, "application/json");
        Assert.Equal(200, ok.Status);
        var r = await api.PostRaw(route + "?units=us", body, "application/json");
        ProblemAssert.NamesField(r, 400, "units");
        Assert.Contains("belongs in the JSON body", Message(r, "units"));
    }

    [Fact]
    public async Task Post_QueryParameterThatIsNoInputAnywhere_Answers400()
    {
        // Friction takes no units at all: in the query of its POST it is neither an input nor an output option.
        var r = await api.PostRaw("/v1/friction-factor?units=us", """{"reynolds": 75000, "relativeRoughness": 0.005}""", "application/json");
        ProblemAssert.NamesField(r, 400, "units");
    }

    [Theory]
    [MemberData(nameof(PostRoutes))]
    public async Task Post_DuplicateKeyInTheBody_Answers400NamingIt(string route, string body)
    {
        var doc = JsonNode.Parse(body)!.AsObject();
        var (key, value) = doc.First();
        string twice = body.TrimEnd()[..^1] + $", \"{key}\": {value!.ToJsonString()}}}";
        var r = await api.PostRaw(route, twice, "application/json");
        ProblemAssert.NamesField(r, 400, key);
        Assert.Contains("more than once", Message(r, key));
    }

    [Fact]
    public async Task Post_TraceInTheQuery_IsAnOutputOptionAndIsApplied()
    {
        const string body = """{"reynolds": 75000, "relativeRoughness": 0.005}""";
        var plain = await api.PostRaw("/v1/friction-factor", body, "application/json");
        var traced = await api.PostRaw("/v1/friction-factor?trace=true", body, "application/json");
        Assert.Equal(200, traced.Status);
        Assert.False(plain.Body.TryGetProperty("trace", out _));
        // The record has one row per iteration the solve reports.
        Assert.Equal(traced.Body.GetProperty("iterations").GetInt32(), traced.Body.GetProperty("trace").GetArrayLength());
    }

    [Fact]
    public async Task Post_MisspeltBodyField_NamesItWithTheClosestField()
    {
        var r = await api.PostRaw("/v1/pipes/head-loss", """{"flow": 0.12, "diameter": 0.35, "length": 500, "roughness": 0.00026, "temprature": 60}""", "application/json");
        ProblemAssert.NamesField(r, 400, "temprature");
        Assert.Contains("did you mean 'temperature'", Message(r, "temprature"));
    }

    // --- warnings a cell can see --------------------------------------------------------------------------------------

    [Fact]
    public async Task Text_SelectWarnings_GivesTheCodesOfTheJsonAnswer()
    {
        // flow=80 typed in L/s where m3/s is meant: the JSON answer's warnings, as codes in a cell.
        const string url = "/v1/pipes/head-loss?flow=80&diameter=0.35&length=500&roughness=0.00026";
        var json = await api.GetJson(url);
        var expected = json.Body.GetProperty("warnings").EnumerateArray().Select(w => w.GetProperty("code").GetString()).ToArray();
        Assert.Contains("velocity-above-design-range", expected);
        var (status, media, text) = await Get(url + "&format=text&select=warnings");
        Assert.Equal(200, status);
        Assert.Equal("text/plain", media);
        Assert.Equal(string.Join(",", expected), text);
    }

    [Fact]
    public async Task Text_SelectWarnings_IsEmptyWhenThereAreNone()
    {
        var json = await api.GetJson(HeadLoss);
        Assert.Equal(0, json.Body.GetProperty("warnings").GetArrayLength());
        var (status, _, text) = await Get(HeadLoss + "&format=text&select=warnings");
        Assert.Equal(200, status);
        Assert.Equal("", text);
    }

    [Fact]
    public async Task Strict_AnswerWithWarnings_Is422NamingTheCodes_AsTextAndAsProblem()
    {
        const string url = "/v1/pipes/head-loss?flow=80&diameter=0.35&length=500&roughness=0.00026";
        var json = await api.GetJson(url);
        var codes = json.Body.GetProperty("warnings").EnumerateArray().Select(w => w.GetProperty("code").GetString()!).Distinct().ToArray();

        var (status, media, text) = await Get(url + "&format=text&strict=true");
        Assert.Equal(422, status);
        Assert.Equal("text/plain", media);
        Assert.Equal("error: strict: the answer carries warnings: " + string.Join(",", codes), text);

        var problem = await api.GetJson(url + "&strict=true");
        Assert.Equal(422, problem.Status);
        Assert.Equal("application/problem+json", problem.ContentType);
        Assert.Equal(codes, problem.Body.GetProperty("warnings").EnumerateArray().Select(w => w.GetString()!).ToArray());
    }

    [Fact]
    public async Task Strict_AnswerWithoutWarnings_IsTheNumber()
    {
        var (_, _, plain) = await Get(HeadLoss + "&format=text");
        var (status, _, strict) = await Get(HeadLoss + "&format=text&strict=true");
        Assert.Equal(200, status);
        Assert.Equal(plain, strict);
    }

    [Fact]
    public async Task Text_PrimaryOutput_EqualsTheJsonAnswerDigitForDigit()
    {
        // The text path reads the answer without serialising it; its digits must still be the JSON answer's.
        foreach (var (url, field) in new[]
        {
            ("/v1/friction-factor?reynolds=75000&relativeRoughness=0.005", "frictionFactor"),
            (HeadLoss, "headLoss"),
            ("/v1/channels/normal-depth?shape=trapezoidal&bottomWidth=20&sideSlope=2&flow=400&slope=0.0016&manningN=0.025&units=us", "normalDepth"),
            ("/v1/fluids/water?temperature=12", "kinematicViscosity"),
        })
        {
            using var response = await api.Client.GetAsync(url, TestContext.Current.CancellationToken);
            string raw = await response.Content.ReadAsStringAsync(TestContext.Current.CancellationToken);
            using var doc = JsonDocument.Parse(raw);
            var (_, _, text) = await Get(url + "&format=text");
            Assert.Equal(doc.RootElement.GetProperty(field).GetRawText(), text);
        }
    }

    // --- flow units -------------------------------------------------------------------------------------------------

    [Theory]
    [InlineData("l/s", 120.0)]
    [InlineData("m3/h", 432.0)]
    public async Task FlowUnit_LitresPerSecondAndCubicMetresPerHour_GiveTheSameHeadLoss(string unit, double flow)
    {
        // 0.12 m3/s = 120 L/s = 432 m3/h exactly (1 L = 1e-3 m3; 1 h = 3600 s).
        var si = await api.GetJson(HeadLoss);
        var other = await api.GetJson($"/v1/pipes/head-loss?flow={flow.ToString(CultureInfo.InvariantCulture)}&flowUnit={Uri.EscapeDataString(unit)}&diameter=0.35&length=500&roughness=0.00026");
        Assert.Equal(200, other.Status);
        Assert.Equal(unit, other.Body.GetProperty("flowUnit").GetString());
        Assert.Equal(flow, other.Body.GetProperty("flow").GetDouble(), 1e-12);
        Assert.Equal(si.Body.GetProperty("headLoss").GetDouble(), other.Body.GetProperty("headLoss").GetDouble(), 1e-12);
    }

    [Fact]
    public async Task FlowUnit_PumpDutyPointInLitresPerSecond_IsTheSameDutyPoint()
    {
        // H = 40 - 5000 Q^2 (Q in m3/s) is H = 40 - 0.005 q^2 with q in L/s; the system 15 + 3000 Q^2 is 15 + 0.003 q^2.
        // The duty point in closed form: Q = sqrt(25 / 8000) m3/s.
        var r = await api.GetJson("/v1/pumps/duty-point?c0=40&c2=-0.005&staticHead=15&resistance=0.003&flowUnit=l/s");
        Assert.Equal(200, r.Status);
        Assert.Equal(1000 * Math.Sqrt(25.0 / 8000), r.Body.GetProperty("flow").GetDouble(), 1e-9);
        var bad = await api.GetJson("/v1/pumps/duty-point?c0=40&c2=-0.005&staticHead=15&resistance=0.003&flowUnit=gpm");
        ProblemAssert.NamesField(bad, 400, "flowUnit");
    }

    // --- unit slips get caught -----------------------------------------------------------------------------------------

    [Fact]
    public async Task Channel_SlopeTypedAsPercent_WarnsOnVelocityAndFroude()
    {
        // Rectangular channel, b = 5 m, n = 0.015, S = 0.0025, Q = 9.548 m3/s runs at y = 0.8 m (Ponce, SDSU CIVE 530
        // examination solutions): V = 9.548 / 4 = 2.39 m/s, no velocity warning. The same slope typed as a percent (0.25)
        // is a hundred times steeper.
        var design = await api.GetJson("/v1/channels/normal-depth?shape=rectangular&bottomWidth=5&flow=9.548&slope=0.0025&manningN=0.015");
        Assert.Equal(0.8, design.Body.GetProperty("normalDepth").GetDouble(), 2e-3);
        Assert.DoesNotContain(design.Body.GetProperty("warnings").EnumerateArray(), w => w.GetProperty("code").GetString()!.Contains("design-range"));

        var slip = await api.GetJson("/v1/channels/normal-depth?shape=rectangular&bottomWidth=5&flow=9.548&slope=0.25&manningN=0.015");
        Assert.Equal(200, slip.Status);
        double v = slip.Body.GetProperty("velocity").GetDouble(), fr = slip.Body.GetProperty("froudeNumber").GetDouble();
        var codes = slip.Body.GetProperty("warnings").EnumerateArray().Select(w => w.GetProperty("code").GetString()).ToArray();
        Assert.True(v > 6 && fr > 2, $"V {v}, Fr {fr}");
        Assert.Contains("velocity-above-design-range", codes);
        Assert.Contains("froude-above-design-range", codes);
    }

    [Fact]
    public async Task Channel_VelocityWarning_FollowsTheReportedVelocity()
    {
        // Property: the warning is present exactly when the reported velocity is outside 0.3 to 6 m/s.
        await Gen.Double[-5, 0].Select(Gen.Double[-2, 2]).SampleAsync(async t =>
        {
            double slope = Math.Pow(10, t.Item1), flow = Math.Pow(10, t.Item2);
            var r = await api.GetJson(string.Create(CultureInfo.InvariantCulture,
                $"/v1/channels/normal-depth?shape=rectangular&bottomWidth=3&flow={flow:R}&slope={slope:R}&manningN=0.02"));
            Assert.Equal(200, r.Status);
            double v = r.Body.GetProperty("velocity").GetDouble();
            var codes = r.Body.GetProperty("warnings").EnumerateArray().Select(w => w.GetProperty("code").GetString()).ToArray();
            Assert.Equal(v > 6, codes.Contains("velocity-above-design-range"));
            Assert.Equal(v < 0.3, codes.Contains("velocity-below-design-range"));
        }, iter: 40, threads: 1);
    }

    [Fact]
    public async Task Pump_DutyPointAtASliverOfTheCurve_Warns()
    {
        // Catalogue in m3/s up to 0.1; the system's resistance typed for L/s flows is far too steep in m3/s: 15 + 3e6 Q^2
        // meets 40 - 5000 Q^2 at Q = sqrt(25 / 3005000) = 0.00288 m3/s, 2.9 percent of the curve's largest flow.
        const string curve = "\"points\": [{\"flow\": 0, \"head\": 40}, {\"flow\": 0.05, \"head\": 27.5}, {\"flow\": 0.08, \"head\": 8}, {\"flow\": 0.1, \"head\": 0.1}]";
        var r = await api.PostRaw("/v1/pumps/duty-point", "{\"pump\": {" + curve + "}, \"system\": {\"staticHead\": 15, \"resistance\": 3000000}}", "application/json");
        Assert.Equal(200, r.Status);
        double q = r.Body.GetProperty("flow").GetDouble();
        Assert.True(q < 0.05 * 0.1, $"duty flow {q}");
        Assert.Contains(r.Body.GetProperty("warnings").EnumerateArray(), w => w.GetProperty("code").GetString() == "duty-point-near-shut-off");
        var normal = await api.PostRaw("/v1/pumps/duty-point", "{\"pump\": {" + curve + "}, \"system\": {\"staticHead\": 15, \"resistance\": 3000}}", "application/json");
        Assert.DoesNotContain(normal.Body.GetProperty("warnings").EnumerateArray(), w => w.GetProperty("code").GetString() == "duty-point-near-shut-off");
    }

    // --- every calculation in the catalogue: no misread input answers 200 ------------------------------------------------

    private async Task<IReadOnlyList<Operation>> Operations() =>
        OperationCatalog.Read(JsonNode.Parse(await api.Client.GetStringAsync("/openapi/v1.json", TestContext.Current.CancellationToken))!);

    /// <summary>A misspelling of a name: a letter dropped, doubled, swapped with the next or replaced.</summary>
    private static Gen<string> Misspelling(string name) =>
        Gen.Select(Gen.Int[0, 3], Gen.Int[0, Math.Max(0, name.Length - 2)], Gen.Char['a', 'z']).Select((kind, i, c) => kind switch
        {
            0 => name.Remove(i, 1),
            1 => name.Insert(i, name[i].ToString()),
            2 => name[..i] + name[i + 1] + name[i] + name[(i + 2)..],
            _ => name[..i] + c + name[(i + 1)..],
        });

    /// <summary>The decimal-comma and thousands-separator forms a spreadsheet in another locale writes for a number.</summary>
    private static Gen<string> CommaForm(string number) =>
        Gen.Int[0, 2].Select(kind => kind switch
        {
            0 when number.Contains('.') => number.Replace('.', ','),
            0 or 1 => number.Length > 3 && !number.Contains('e') && !number.Contains('.') ? number[..^3] + "," + number[^3..] : number + ",0",
            _ => number.Contains('.') ? number.Replace(".", ",", StringComparison.Ordinal) + "0" : "1 " + number,
        });

    [Fact]
    public async Task EveryCalculation_RandomMisspellingsRepeatsAndCommaDecimals_NeverAnswer200()
    {
        var ops = (await Operations()).Where(o => o.Method == "GET" && o.QueryExample.Count > 0).ToArray();
        Assert.True(ops.Length >= 8, $"only {ops.Length} GET calculations with examples");
        foreach (var op in ops)
        {
            string baseline = op.Path + "?" + string.Join("&", op.QueryExample.Select(kv => kv.Key + "=" + Uri.EscapeDataString(kv.Value)));
            Assert.Equal(200, (await api.GetJson(baseline)).Status);
            var names = op.QueryExample.Keys.ToArray();
            var known = op.Query.Select(q => q.Name).ToHashSet(StringComparer.OrdinalIgnoreCase);
            var numeric = op.QueryExample.Where(kv => double.TryParse(kv.Value, NumberStyles.Float, CultureInfo.InvariantCulture, out _)).Select(kv => kv.Key).ToArray();

            var mutation = Gen.Select(Gen.Int[0, 2], Gen.Int[0, names.Length - 1], Gen.Int[0, 1_000_000]).SelectMany((kind, i, seed) =>
            {
                string name = names[i];
                return kind switch
                {
                    0 => Misspelling(name).Where(m => !known.Contains(m)).Select(m => (Url: baseline + "&" + m + "=" + Uri.EscapeDataString(op.QueryExample[name]), Field: m)),
                    1 => Gen.Const((Url: baseline + "&" + name + "=" + Uri.EscapeDataString(op.QueryExample[name]), Field: name)),
                    _ when numeric.Length > 0 => CommaForm(op.QueryExample[numeric[seed % numeric.Length]]).Select(v =>
                        (Url: op.Path + "?" + string.Join("&", op.QueryExample.Select(kv => kv.Key + "=" + Uri.EscapeDataString(kv.Key == numeric[seed % numeric.Length] ? v : kv.Value))),
                         Field: numeric[seed % numeric.Length])),
                    _ => Gen.Const((Url: baseline + "&" + name + "=" + Uri.EscapeDataString(op.QueryExample[name]), Field: name)),
                };
            });
            await mutation.SampleAsync(async m =>
            {
                var r = await api.GetJson(m.Url);
                Assert.True(r.Status == 400, $"{m.Url} answered {r.Status}");
                ProblemAssert.NamesField(r, 400, m.Field);
            }, iter: 60, threads: 1);
        }
    }

    [Fact]
    public async Task EveryCalculation_PostWithDuplicateKeysMisspeltKeysOrQueryInputs_NeverAnswers200()
    {
        var ops = (await Operations()).Where(o => o.Method == "POST" && o.BodyExample is JsonObject { Count: > 0 }).ToArray();
        Assert.True(ops.Length >= 8, $"only {ops.Length} POST calculations with examples");
        foreach (var op in ops)
        {
            var example = (JsonObject)op.BodyExample!;
            string body = example.ToJsonString();
            Assert.Equal(200, (await api.PostRaw(op.Path, body, "application/json")).Status);
            var keys = example.Select(kv => kv.Key).ToArray();
            var fields = op.Body!.Select(f => f.Name).ToHashSet(StringComparer.OrdinalIgnoreCase);

            var mutation = Gen.Select(Gen.Int[0, 2], Gen.Int[0, keys.Length - 1]).SelectMany((kind, i) =>
            {
                string key = keys[i];
                string value = example[key]!.ToJsonString();
                return kind switch
                {
                    0 => Gen.Const((Path: op.Path, Body: body[..^1] + $",\"{key}\":{value}}}", Field: key)),
                    1 => Misspelling(key).Where(m => !fields.Contains(m)).Select(m => (Path: op.Path, Body: body[..^1] + $",\"{m}\":{value}}}", Field: m)),
                    _ => Gen.Const((Path: op.Path + "?" + key + "=1", Body: body, Field: key)),
                };
            });
            await mutation.SampleAsync(async m =>
            {
                var r = await api.PostRaw(m.Path, m.Body, "application/json");
                Assert.True(r.Status == 400, $"POST {m.Path} {m.Body} answered {r.Status}");
                ProblemAssert.NamesField(r, 400, m.Field);
            }, iter: 40, threads: 1);
        }
    }

    // --- batches follow the same rules per row ----------------------------------------------------------------------

    [Fact]
    public async Task BatchCsv_DecimalCommaCell_IsThatRowsError_NamingTheField()
    {
        const string csv = "reynolds,relativeRoughness\r\n75000,0.005\r\n\"1,5e5\",0.005\r\n250000,0.005\r\n";
        using var content = new StringContent(csv, Encoding.UTF8, "text/csv");
        using var response = await api.Client.PostAsync("/v1/batch/friction-factor", content, TestContext.Current.CancellationToken);
        var lines = (await response.Content.ReadAsStringAsync(TestContext.Current.CancellationToken)).Split("\r\n", StringSplitOptions.RemoveEmptyEntries);
        Assert.Equal(200, (int)response.StatusCode);
        Assert.StartsWith("1,200,", lines[1]);
        Assert.StartsWith("2,400,", lines[2]);
        Assert.Contains("reynolds: '1,5e5' holds a comma", lines[2]);
        Assert.StartsWith("3,200,", lines[3]);
    }

    [Fact]
    public async Task BatchCsv_RepeatedHeaderColumn_Answers400NamingIt()
    {
        var r = await api.PostRaw("/v1/batch/friction-factor", "reynolds,relativeRoughness,reynolds\r\n75000,0.005,8000\r\n", "text/csv");
        ProblemAssert.NamesField(r, 400, "reynolds");
    }

    [Fact]
    public async Task BatchJson_RowWithDuplicateKey_IsThatRowsError()
    {
        var r = await api.PostRaw("/v1/batch/friction-factor",
            """[{"reynolds": 75000, "relativeRoughness": 0.005}, {"reynolds": 75000, "reynolds": 8000, "relativeRoughness": 0.005}]""", "application/json");
        Assert.Equal(200, r.Status);
        Assert.Equal(200, r.Body[0].GetProperty("status").GetInt32());
        Assert.Equal(400, r.Body[1].GetProperty("status").GetInt32());
        Assert.True(r.Body[1].GetProperty("problem").GetProperty("errors").TryGetProperty("reynolds", out _));
    }

    [Fact]
    public async Task Batch_BodyNotAnArray_AnswersInOurOwnWords()
    {
        var r = await api.PostRaw("/v1/batch/friction-factor", """{"reynolds": 75000}""", "application/json");
        ProblemAssert.NamesField(r, 400, "body");
        string message = Message(r, "body");
        Assert.Contains("must be a JSON array", message);
        Assert.DoesNotContain("System", message);
    }
}

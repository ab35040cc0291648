namespace FlowSolve.Api.Tests.Fluids;

public sealed class FluidEndpointsTests(ApiFixture api)
{
    [Fact]
    public async Task Get_20C_MatchesIsoTr3666Viscosity()
    {
        var r = await api.GetJson("/v1/fluids/water?temperature=20");
        Assert.Equal(200, r.Status);
        // 1.0016 mPa s at 20 C (ISO/TR 3666; from memory); density 998.2 kg/m3 (common practice tables).
        Assert.Equal(1.0016e-3, r.Body.GetProperty("dynamicViscosity").GetDouble(), 0.0005 * 1.0016e-3);
        Assert.Equal(998.2, r.Body.GetProperty("density").GetDouble(), 0.05);
        double nu = r.Body.GetProperty("kinematicViscosity").GetDouble();
        Assert.Equal(r.Body.GetProperty("dynamicViscosity").GetDouble() / r.Body.GetProperty("density").GetDouble(), nu, 1e-18);
    }

    [Fact]
    public async Task Get_UsUnits_68F_IsHandConversionOf20C()
    {
        var si = await api.GetJson("/v1/fluids/water?temperature=20");
        var us = await api.GetJson("/v1/fluids/water?temperature=68&units=us");
        Assert.Equal(200, us.Status);
        // Hand conversions: 1 ft = 0.3048 m, 1 lb = 0.45359237 kg (NIST SP 811), so 1 lb/ft3 = 16.018463 kg/m3,
        // 1 ft2/s = 0.09290304 m2/s, 1 psi = 6894.757 Pa.
        Assert.Equal(si.Body.GetProperty("density").GetDouble() / 16.018463373960138, us.Body.GetProperty("density").GetDouble(), 1e-9);
        Assert.Equal(si.Body.GetProperty("kinematicViscosity").GetDouble() / 0.09290304, us.Body.GetProperty("kinematicViscosity").GetDouble(), 1e-15);
        Assert.Equal(si.Body.GetProperty("vapourPressure").GetDouble() / 6894.757293168361, us.Body.GetProperty("vapourPressure").GetDouble(), 1e-9);
        Assert.Equal(14.6959, us.Body.GetProperty("pressure").GetDouble(), 1e-3); // 1 atm = 14.696 psi (common practice)
    }

    [Fact]
    public async Task Get_AboveAtmosphericBoilingPoint_Warns()
    {
        var r = await api.GetJson("/v1/fluids/water?temperature=99.99");
        Assert.Equal(200, r.Status);
        Assert.Contains(r.Body.GetProperty("warnings").EnumerateArray(), w => w.GetProperty("code").GetString() == "above-boiling-point");
    }

    [Theory]
    [InlineData("temperature=101")]
    [InlineData("temperature=-1")]
    [InlineData("temperature=NaN")]
    [InlineData("temperature=warm")]
    [InlineData("")]
    [InlineData("temperature=220&units=us")]
    public async Task Get_BadTemperature_400NamesField(string query) =>
        ProblemAssert.NamesField(await api.GetJson("/v1/fluids/water?" + query), 400, "temperature");

    [Fact]
    public async Task Get_BadUnits_400NamesField() =>
        ProblemAssert.NamesField(await api.GetJson("/v1/fluids/water?temperature=20&units=metric"), 400, "units");
}

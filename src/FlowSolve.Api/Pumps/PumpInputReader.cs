using System.Globalization;
using FlowSolve.Api.Contracts;
using FlowSolve.Api.Problems;
using FlowSolve.Core.Fluids;
using FlowSolve.Core.Pipes;
using FlowSolve.Core.Pumps;

namespace FlowSolve.Api.Pumps;

/// <summary>A validated pump request, in SI, ready for the Core.</summary>
internal sealed record PumpProblem(
    PumpUnits Units, PumpCurve Curve, PumpCurveFit? Fit, SystemCurve System, PumpArrangement Arrangement,
    DutyPointData Data, FluidProperties Fluid, string Method, bool Trace,
    List<AssumptionDto> Assumptions, List<WarningDto> Warnings, List<ValidityDto> Validity, double? WaterCelsius = null,
    EfficiencyCurveFit? EfficiencyFit = null);

/// <summary>A pump's curves as read from a request, in SI; with efficiency points, the efficiency fit's quality too.</summary>
internal sealed record PumpCurveReading(PumpCurve Curve, PumpCurveFit? Fit, EfficiencyCurve? Efficiency, NpshCurve? Npsh,
    EfficiencyCurveFit? EfficiencyFit = null);

/// <summary>
/// Reads and validates a pump request: every bad field is reported at once under its wire name (dotted for nested
/// fields, or the GET form's own name), and nothing reaches the Core that it would reject.
/// </summary>
internal static class PumpInputReader
{
    private const int MaximumPoints = 1000;
    private const int MaximumPipes = 1000;
    private const int MaximumPumps = 100;
    private const double DefaultTemperature = 20.0;

    public static PumpProblem? Read(DutyPointRequest request, FieldErrors errors, IReadOnlyDictionary<string, string>? names)
    {
        string N(string field) => names is not null && names.TryGetValue(field, out var n) ? n : field;
        var assumptions = new List<AssumptionDto>();
        var warnings = new List<WarningDto>();
        var validity = new List<ValidityDto>();
        var method = new List<string> { "safeguarded Newton on pump-set head minus system head, bracketed by zero flow and the set's zero-head flow" };

        // Units first: every other field is read in them.
        bool us = false;
        if (request.Units is null) assumptions.Add(new("units", "si", "SI units (default)"));
        else if (request.Units.Equals("us", StringComparison.OrdinalIgnoreCase)) us = true;
        else if (!request.Units.Equals("si", StringComparison.OrdinalIgnoreCase)) errors.Add("units", "must be si or us");
        var flowUnit = Hosting.FlowUnit.Parse(request.FlowUnit, new Hosting.UnitSystem(us), errors.Add);
        var u = new PumpUnits(us, flowUnit);
        string hu = u.HeadUnit, qu = u.FlowUnit;

        // Arrangement.
        int parallel = ReadCount(errors, "pumpsInParallel", request.PumpsInParallel);
        int series = ReadCount(errors, "pumpsInSeries", request.PumpsInSeries);
        if (parallel > 1 && series > 1)
        {
            const string both = "pumpsInParallel and pumpsInSeries cannot both be above 1 (mixed arrangements are not supported)";
            errors.Add("pumpsInSeries", both);
            errors.Add("pumpsInParallel", both);
        }
        double speed = errors.Optional("speedRatio", request.SpeedRatio, 0, PumpArrangement.MaximumSpeedRatio, minExclusive: true) ?? 1.0;
        if (request.SpeedRatio is null) assumptions.Add(new("speedRatio", "1", "the pumps run at rated speed (default)"));

        // Fluid: water at a temperature, or kinematic viscosity and density.
        double? waterCelsius = null;
        FluidProperties fluid = default;
        if (request.KinematicViscosity is not null || request.Density is not null)
        {
            if (request.Temperature is not null)
                errors.Add("temperature", "give either temperature (water) or kinematicViscosity and density, not both");
            double nu = errors.Required("kinematicViscosity", request.KinematicViscosity, 0, double.PositiveInfinity, minExclusive: true);
            double rho = errors.Required("density", request.Density, 0, double.PositiveInfinity, minExclusive: true);
            fluid = new FluidProperties(u.KinematicViscosityToSi(nu), u.DensityToSi(rho));
            if (double.IsFinite(nu) && !(fluid.KinematicViscosity > 0)) errors.Add("kinematicViscosity", "is too small to use");
            if (double.IsFinite(rho) && !double.IsFinite(fluid.Density!.Value)) errors.Add("density", "is too large once converted to SI");
        }
        else
        {
            double t;
            if (request.Temperature is null)
            {
                t = DefaultTemperature;
                assumptions.Add(new("temperature", us ? "68" : "20",
                    "water at 20 degrees C (68 degrees F): IAPWS-IF97 density and vapour pressure, IAPWS 2008 viscosity, at 1 atm (default fluid)"));
            }
            else if (us) t = u.TemperatureToCelsius(errors.Required("temperature", request.Temperature, 32, 212, unit: "degrees F"));
            else t = errors.Required("temperature", request.Temperature, Water.MinimumTemperature, Water.MaximumTemperature, unit: "degrees C");
            if (double.IsFinite(t))
            {
                t = Math.Clamp(t, Water.MinimumTemperature, Water.MaximumTemperature);
                waterCelsius = t;
                var w = Water.At(t);
                fluid = new FluidProperties(w.KinematicViscosity, w.Density);
                method.Add("water properties from IAPWS-IF97 and the IAPWS 2008 viscosity release");
                validity.Add(new ValidityDto("iapws-if97-region-1", "temperature", us ? 32 : 0,
                    us ? ToFahrenheit(Water.SaturationTemperatureAtmospheric) : Water.SaturationTemperatureAtmospheric,
                    us ? ToFahrenheit(t) : t, !Water.IsAboveAtmosphericBoiling(t), "IAPWS-IF97 (1997), region 1: liquid up to the saturation line"));
                if (Water.IsAboveAtmosphericBoiling(t))
                    warnings.Add(new("above-boiling-point", "The water temperature is above its boiling point at 1 atm; the properties are those of saturated liquid."));
            }
        }

        // Pump curve.
        var reading = ReadCurve(request.Pump, "pump", u, errors, N, method, assumptions);
        bool curveOk = reading is not null;
        PumpCurve curve = reading?.Curve ?? default;
        PumpCurveFit? fit = reading?.Fit;
        EfficiencyCurve? efficiency = reading?.Efficiency;
        EfficiencyCurveFit? efficiencyFit = reading?.EfficiencyFit;
        NpshCurve? npsh = reading?.Npsh;

        // System curve.
        SystemCurve system = default;
        var s = request.System;
        if (s is null) errors.Add(N("system"), "is required");
        else
        {
            double hs = u.HeadToSi(errors.Required(N("system.staticHead"), s.StaticHead, double.NegativeInfinity, double.PositiveInfinity, unit: hu));
            double? k = errors.Optional(N("system.resistance"), s.Resistance, 0, double.PositiveInfinity);
            double ksi = k is double kv ? u.CoefficientToSi(kv, 2) : 0;
            PipeGeometry[]? pipes = null;
            if (s.Pipes is null && s.Resistance is null)
                errors.Add(N("system"), "give a resistance, pipes (length, diameter, roughness), or both");
            else if (s.Pipes is { } list)
            {
                if (list.Count == 0) errors.Add(N("system.pipes"), "must hold at least one pipe (or leave it out and give resistance)");
                else if (list.Count > MaximumPipes) errors.Add(N("system.pipes"), $"at most {MaximumPipes} pipes are accepted");
                else
                {
                    pipes = new PipeGeometry[list.Count];
                    for (int i = 0; i < list.Count; i++)
                    {
                        string at = $"system.pipes[{i}]";
                        var pipe = list[i];
                        if (pipe is null) { errors.Add(N(at), "must be an object {length, diameter, roughness}"); continue; }
                        double l = errors.Required(N(at + ".length"), pipe.Length, 0, double.PositiveInfinity, minExclusive: true, unit: hu);
                        double d = errors.Required(N(at + ".diameter"), pipe.Diameter, 0, double.PositiveInfinity, minExclusive: true, unit: hu);
                        double e = errors.Required(N(at + ".roughness"), pipe.Roughness, 0, double.PositiveInfinity, unit: hu);
                        double km = errors.Optional(N(at + ".minorLossCoefficient"), pipe.MinorLossCoefficient, 0, double.PositiveInfinity) ?? 0;
                        if (double.IsFinite(d) && double.IsFinite(e) && !(e < d))
                            errors.Add(N(at + ".roughness"), "must be smaller than the diameter");
                        pipes[i] = new PipeGeometry(u.HeadToSi(l), u.HeadToSi(d), u.HeadToSi(e), km);
                    }
                }
            }
            if (!errors.Any)
            {
                if (pipes is not null)
                {
                    system = SystemCurve.FromPipes(hs, pipes, fluid, ksi);
                    method.Add("pipes by Darcy-Weisbach with the exact Colebrook-White friction factor (laminar 64/Re below Re 2000, Churchill 1977 in transition), minor losses K V^2/(2g)");
                }
                else system = SystemCurve.Quadratic(hs, ksi);
                if (k is not null) method.Add("system losses K Q^2" + (pipes is null ? "" : " added to the pipes'"));
            }
        }

        // Suction side.
        SuctionConditions? suction = null;
        if (request.Suction is { } sc)
        {
            double zs = u.HeadToSi(errors.Required(N("suction.staticSuctionHead"), sc.StaticSuctionHead, double.NegativeInfinity, double.PositiveInfinity, unit: hu));
            double loss = u.HeadToSi(errors.Optional(N("suction.lossHead"), sc.LossHead, 0, double.PositiveInfinity, unit: hu) ?? 0);
            double? ps = errors.Optional(N("suction.surfacePressure"), sc.SurfacePressure, 0, double.PositiveInfinity, minExclusive: true);
            double? pv = errors.Optional(N("suction.vapourPressure"), sc.VapourPressure, 0, double.PositiveInfinity);
            double surface = ps is double psv ? u.PressureToSi(psv) : Water.AtmosphericPressure;
            if (!double.IsFinite(surface)) errors.Add(N("suction.surfacePressure"), "is too large once converted to SI");
            if (ps is null)
                assumptions.Add(new(N("suction.surfacePressure"), us ? "14.696 psi" : "101325 Pa", "1 standard atmosphere on the liquid surface: an open tank at sea level (default)"));
            double vapour = double.NaN;
            if (pv is double pvv)
            {
                vapour = u.PressureToSi(pvv);
                if (!double.IsFinite(vapour)) errors.Add(N("suction.vapourPressure"), "is too large once converted to SI");
            }
            else if (waterCelsius is double tc && sc.VapourPressure is null)
            {
                vapour = Water.VapourPressure(tc);
                assumptions.Add(new(N("suction.vapourPressure"), string.Create(CultureInfo.InvariantCulture, $"{u.Pressure(vapour):G6} {(us ? "psi" : "Pa")}"),
                    "vapour pressure of water at the temperature, IAPWS-IF97 region 4"));
            }
            else if (sc.VapourPressure is null)
                errors.Add(N("suction.vapourPressure"), "is required when the fluid is given by kinematicViscosity and density");
            if (!errors.Any) suction = new SuctionConditions(surface, vapour, zs, loss);
            method.Add("NPSH available = (surface pressure - vapour pressure)/(rho g) + static suction head - suction losses, g = 9.80665 m/s2");
        }

        if (errors.Any || !curveOk) return null;

        // The friction-factor relations hold up to Reynolds 1e15; the solve and the plot reach 1.2 x the set's
        // zero-head flow (or search limit), so a pipe must stay below that there (it does unless the inputs are absurd).
        double reach = OperatingCurves.RangeFactor * parallel * speed * (curve.ZeroHeadFlow ?? curve.SearchLimit);
        for (int i = 0; i < system.Pipes.Count; i++)
        {
            var pipe = system.Pipes[i];
            double re = 4 * reach / (Math.PI * pipe.Diameter * fluid.KinematicViscosity);
            if (!(re <= FlowSolve.Core.Friction.DarcyFriction.MaximumReynolds))
                errors.Add(N($"system.pipes[{i}].diameter"), string.Create(CultureInfo.InvariantCulture,
                    $"with this diameter and viscosity the Reynolds number reaches {re:G3} within the pump's flow range, beyond the friction-factor relations (at most 1e15)"));
        }
        if (errors.Any) return null;
        if (request.PumpsInParallel is null && request.PumpsInSeries is null)
            assumptions.Add(new("pumpsInParallel", "1", "one pump (default)"));

        return new PumpProblem(u, curve, fit, system, new PumpArrangement(parallel, series, speed),
            new DutyPointData(efficiency, npsh, suction, fluid), fluid, string.Join("; ", method), request.Trace == true,
            assumptions, warnings, validity, waterCelsius, efficiencyFit);

        static double ToFahrenheit(double celsius) => celsius * 9.0 / 5.0 + 32;
    }

    /// <summary>The head curve of one pump at rated speed from points or coefficients, in SI, with the efficiency and
    /// NPSH-required curves where the points carry them; every bad field is reported under <paramref name="prefix"/>
    /// (through <paramref name="N"/>, the GET form's names). Shared by the duty point and the network pumps.</summary>
    /// <returns>The curves, or null when an error was recorded.</returns>
    internal static PumpCurveReading? ReadCurve(PumpInput? p, string prefix, PumpUnits u, FieldErrors errors,
        Func<string, string> N, List<string> method, List<AssumptionDto> assumptions)
    {
        string hu = u.HeadUnit, qu = u.FlowUnit;
        PumpCurve curve = default;
        PumpCurveFit? fit = null;
        EfficiencyCurve? efficiency = null;
        EfficiencyCurveFit? efficiencyFit = null;
        NpshCurve? npsh = null;
        bool curveOk = false;
        var degree = CurveDegree.Quadratic;
        if (p?.CurveDegree is string cd)
        {
            if (cd.Equals("cubic", StringComparison.OrdinalIgnoreCase)) degree = CurveDegree.Cubic;
            else if (!cd.Equals("quadratic", StringComparison.OrdinalIgnoreCase)) errors.Add(N(prefix + ".curveDegree"), "must be quadratic or cubic");
        }
        if (p is null) errors.Add(N(prefix), "is required");
        else if (p.Points is not null && p.Coefficients is not null) errors.Add(N(prefix), "give either points or coefficients, not both");
        else if (p.Points is null && p.Coefficients is null) errors.Add(N(prefix), "give points (flow and head) or coefficients [c0, c1, c2]");
        else if (p.Coefficients is { } c)
        {
            int before = Count(errors);
            if (c.Count is not (3 or 4)) errors.Add(N(prefix + ".coefficients"), "must hold 3 numbers [c0, c1, c2] or 4 [c0, c1, c2, c3]");
            else
            {
                if (p.CurveDegree is not null && (degree == CurveDegree.Cubic) != (c.Count == 4))
                    errors.Add(N(prefix + ".curveDegree"), $"is {p.CurveDegree} but {c.Count} coefficients were given");
                var si = new double[4];
                for (int i = 0; i < c.Count; i++)
                {
                    string f = N($"{prefix}.coefficients[{i}]");
                    double v = i == 0
                        ? errors.Required(f, c[i], 0, double.PositiveInfinity, minExclusive: true, unit: hu)
                        : errors.Required(f, c[i], double.NegativeInfinity, double.PositiveInfinity);
                    si[i] = i == 0 ? u.HeadToSi(v) : u.CoefficientToSi(v, i);
                    if (double.IsFinite(v) && !double.IsFinite(si[i])) errors.Add(f, "is too large once converted to SI");
                }
                if (c.Count > 0 && errors.Has(N(prefix + ".coefficients[0]")) && c[0] <= 0)
                {
                    // Say what c0 is, so the message is actionable.
                    errors.Add(N(prefix + ".coefficients[0]"), "c0 is the shut-off head H(0); a pump curve needs it above 0");
                }
                double? qmax = errors.Optional(N(prefix + ".maximumFlow"), p.MaximumFlow, 0, double.PositiveInfinity, minExclusive: true, unit: qu);
                if (Count(errors) == before)
                {
                    if (qmax is null && !double.IsFinite(CauchyBound(si[0], si[1], si[2], si[3])))
                        errors.Add(N(prefix + ".coefficients"), "the coefficients span too many orders of magnitude for double precision (the zero-head flow would overflow); rescale them, for example with another flow unit");
                    else if (OverflowingTerm(si, qmax is double mq ? u.FlowToSi(mq) : CauchyBound(si[0], si[1], si[2], si[3])) is int k)
                        errors.Add(N($"{prefix}.coefficients[{k}]"), string.Create(CultureInfo.InvariantCulture,
                            $"c{k} is so large against the other coefficients that the head overflows double precision within the flow range searched for the zero-head flow (up to {u.Flow(qmax is double mq2 ? u.FlowToSi(mq2) : CauchyBound(si[0], si[1], si[2], si[3])):G3} {qu}); rescale the coefficients, for example with another flow unit"));
                    else if (qmax is null && !ReachesZeroHead(si[0], si[1], si[2], si[3]))
                        errors.Add(N(prefix + ".coefficients"), "the curve never falls to zero head, so the search for a duty point has no end; give " + N(prefix + ".maximumFlow"));
                    else
                    {
                        try
                        {
                            curve = PumpCurve.FromCoefficients(si[0], si[1], si[2], si[3], qmax is double m ? u.FlowToSi(m) : null);
                            curveOk = true;
                            method.Add("pump curve from the coefficients given");
                        }
                        catch (ArgumentException)
                        {
                            // The checks above mirror the Core's; should rounding still part them, say so on the field.
                            errors.Add(N(prefix + ".coefficients"), "the zero-head flow of these coefficients cannot be found in double precision; rescale them, for example with another flow unit, or give " + N(prefix + ".maximumFlow"));
                        }
                    }
                }
            }
        }
        else if (p.Points is { } points)
        {
            int before = Count(errors);
            if (p.MaximumFlow is not null) errors.Add(N(prefix + ".maximumFlow"), "only with coefficients (points give their own range)");
            int needed = degree == CurveDegree.Cubic ? 4 : 3;
            if (points.Count < needed)
                errors.Add(prefix + ".points", $"at least {needed} points are needed for a {(degree == CurveDegree.Cubic ? "cubic" : "quadratic")} fit, {points.Count} given");
            else if (points.Count > MaximumPoints)
                errors.Add(prefix + ".points", $"at most {MaximumPoints} points are accepted");
            else
            {
                var flows = new double[points.Count];
                var heads = new double[points.Count];
                var effFlows = new List<double>();
                var effs = new List<double>();
                var npshFlows = new List<double>();
                var npshs = new List<double>();
                for (int i = 0; i < points.Count; i++)
                {
                    var pt = points[i];
                    string at = $"{prefix}.points[{i}]";
                    if (pt is null) { errors.Add(at, "must be an object {flow, head}"); continue; }
                    flows[i] = u.FlowToSi(errors.Required(at + ".flow", pt.Flow, 0, double.PositiveInfinity, unit: qu));
                    heads[i] = u.HeadToSi(errors.Required(at + ".head", pt.Head, 0, double.PositiveInfinity, unit: hu));
                    if (!errors.Has(at + ".flow"))
                    {
                        for (int j = 0; j < i; j++)
                            if (flows[j] == flows[i] && !errors.Has($"{prefix}.points[{j}].flow"))
                            {
                                errors.Add(at + ".flow", string.Create(CultureInfo.InvariantCulture,
                                    $"duplicates pump.points[{j}].flow ({pt.Flow} {qu}): each flow may appear once"));
                                break;
                            }
                    }
                    if (pt.Efficiency is double e)
                    {
                        if (double.IsFinite(e) && e > 1)
                            errors.Add(at + ".efficiency", "must be a fraction from 0 to 1 (write 0.78 for 78 percent)");
                        else
                        {
                            double ev = errors.Required(at + ".efficiency", e, 0, 1);
                            effFlows.Add(flows[i]);
                            effs.Add(ev);
                        }
                    }
                    if (pt.NpshRequired is double nr)
                    {
                        npshFlows.Add(flows[i]);
                        npshs.Add(u.HeadToSi(errors.Required(at + ".npshRequired", nr, 0, double.PositiveInfinity, unit: hu)));
                    }
                }
                if (effs.Count is > 0 and < 3)
                    errors.Add(prefix + ".points", $"efficiency is given at {effs.Count} points; at least 3 are needed for an efficiency curve (or give it at none)");
                if (npshs.Count is > 0 and < 3)
                    errors.Add(prefix + ".points", $"npshRequired is given at {npshs.Count} points; at least 3 are needed for an NPSH-required curve (or give it at none)");
                if (Count(errors) == before)
                {
                    var f = PumpCurve.Fit(flows, heads, degree);
                    if (!IsFinite(f.Curve))
                        errors.Add(prefix + ".points", "the points could not be fitted (the least-squares solve is singular)");
                    else if (!f.Accepted)
                        errors.Add(prefix + ".points", string.Create(CultureInfo.InvariantCulture,
                            $"the fitted {(degree == CurveDegree.Cubic ? "cubic" : "quadratic")} head rises with flow within the data: dH/dQ = {f.MaximumSlope * u.FlowFactor / u.HeadFactor:G4} {hu} per {qu} at {u.Flow(f.MaximumSlopeFlow):G4} {qu} (data from 0 to {u.Flow(f.Curve.DataMaximumFlow ?? 0):G4} {qu}); a stable pump curve falls with flow. Check the points{(degree == CurveDegree.Cubic ? " or fit a quadratic" : "")}"));
                    else
                    {
                        fit = f;
                        curve = f.Curve;
                        curveOk = true;
                        method.Add($"pump curve fitted to {points.Count} points by least squares ({(degree == CurveDegree.Cubic ? "cubic" : "quadratic")}, Householder QR)");
                        if (p.CurveDegree is null) assumptions.Add(new(prefix + ".curveDegree", "quadratic", "a quadratic fit (default)"));
                        if (effs.Count >= 3)
                        {
                            efficiencyFit = EfficiencyCurve.Fit(effFlows.ToArray(), effs.ToArray(), degree, throughOrigin: true);
                            efficiency = efficiencyFit.Value.Curve;
                            method.Add("efficiency curve fitted through the origin (no flow, no useful work)");
                        }
                        if (npshs.Count >= 3)
                        {
                            npsh = NpshCurve.Interpolate(npshFlows.ToArray(), npshs.ToArray());
                            method.Add("NPSH required interpolated linearly between the points");
                        }
                    }
                }
            }
        }
        return curveOk ? new PumpCurveReading(curve, fit, efficiency, npsh, efficiencyFit) : null;
    }

    /// <summary>How many messages are recorded (to tell whether one section of the request added any).</summary>
    private static int Count(FieldErrors errors) => errors.Any ? errors.ToDictionary().Sum(e => e.Value.Length) : 0;

    private static int ReadCount(FieldErrors errors, string field, int? value)
    {
        if (value is null) return 1;
        if (value < 1 || value > MaximumPumps)
        {
            errors.Add(field, $"must be 1 to {MaximumPumps}");
            return 1;
        }
        return value.Value;
    }

    private static bool IsFinite(in PumpCurve c) =>
        double.IsFinite(c.C0) && double.IsFinite(c.C1) && double.IsFinite(c.C2) && double.IsFinite(c.C3);

    /// <summary>Cauchy's bound on the polynomial's real roots, 1 + max |c_k / c_n| for the leading coefficient c_n: where
    /// the Core searches for the zero-head flow, so it must be finite.</summary>
    private static double CauchyBound(double c0, double c1, double c2, double c3)
    {
        double lead = c3 != 0 ? c3 : c2 != 0 ? c2 : c1;
        if (lead == 0) return 1.0;
        return 1.0 + Math.Max(Math.Abs(c0 / lead), Math.Max(c3 != 0 ? Math.Abs(c1 / lead) : 0, c3 != 0 ? Math.Abs(c2 / lead) : c2 != 0 ? Math.Abs(c1 / lead) : 0));
    }

    /// <summary>The coefficient to blame when a term c_k x^k overflows (beyond an eighth of the largest double, so the
    /// polynomial's sum stays finite) somewhere on [0, <paramref name="reach"/>]: the one with the largest ratio to the
    /// leading coefficient, which sets the reach; null when every term stays finite. The Core searches the zero-head
    /// flow up to that reach, and an overflow there leaves it unable to find a zero the curve does have.</summary>
    private static int? OverflowingTerm(double[] c, double reach)
    {
        const double limit = double.MaxValue / 8;
        bool overflow = !double.IsFinite(reach);
        for (int k = 1; k < 4 && !overflow; k++)
            overflow = !(Math.Abs(c[k]) * Math.Pow(reach, k) < limit);
        if (!overflow) return null;
        int lead = c[3] != 0 ? 3 : c[2] != 0 ? 2 : 1;
        int worst = 0;
        double ratio = -1;
        for (int k = 0; k < lead; k++)
        {
            double r = Math.Abs(c[k] / c[lead]);
            if (r > ratio) (ratio, worst) = (r, k);
        }
        return worst;
    }

    /// <summary>True when c0 + c1 Q + c2 Q^2 + c3 Q^3 (c0 &gt; 0) falls clearly below zero for some Q &gt; 0, so the Core's
    /// zero-head search finds the flow; a curve that only grazes zero (within 1e-9 c0) is treated as not reaching it.</summary>
    internal static bool ReachesZeroHead(double c0, double c1, double c2, double c3)
    {
        if (c3 < 0) return true;
        double margin = -1e-9 * c0;
        if (c3 > 0)
        {
            double disc = c2 * c2 - 3 * c3 * c1;
            if (disc < 0) return false;                        // the slope never vanishes: rising throughout
            double x = (-c2 + Math.Sqrt(disc)) / (3 * c3);     // the local minimum
            return x > 0 && c0 + x * (c1 + x * (c2 + x * c3)) < margin;
        }
        if (c2 < 0) return true;
        if (c2 > 0)
        {
            double x = -c1 / (2 * c2);
            return x > 0 && c0 + x * (c1 + x * c2) < margin;
        }
        return c1 < 0;
    }
}

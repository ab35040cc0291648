using System.ComponentModel;
using System.Globalization;
using FlowSolve.Api.Contracts;
using FlowSolve.Api.Hosting;
using FlowSolve.Api.Problems;
using FlowSolve.Core;
using FlowSolve.Core.Fluids;
using FlowSolve.Core.Friction;
using FlowSolve.Core.Numerics;
using FlowSolve.Core.Pipes;
using FlowSolve.Core.Pumps;
using Microsoft.AspNetCore.Http.HttpResults;
using Microsoft.AspNetCore.Mvc;

namespace FlowSolve.Api.Pumps;

/// <summary>The duty point and the operating curves from a body or the compact query form (whose problems and
/// sensitivities name the parameters as typed: <c>c0</c> rather than <c>pump.coefficients[0]</c>).</summary>
internal static class PumpDutyPoints
{
    /// <summary>The GET form's names for the nested fields, so a spreadsheet user is told about the parameter they typed.</summary>
    private static readonly Dictionary<string, string> QueryNames = new(StringComparer.Ordinal)
    {
        ["pump"] = "c0", ["pump.coefficients"] = "c0", ["pump.coefficients[0]"] = "c0", ["pump.coefficients[1]"] = "c1",
        ["pump.coefficients[2]"] = "c2", ["pump.coefficients[3]"] = "c3", ["pump.maximumFlow"] = "maximumFlow", ["pump.curveDegree"] = "c3",
        ["system"] = "resistance", ["system.staticHead"] = "staticHead", ["system.resistance"] = "resistance",
        ["system.pipes"] = "length", ["system.pipes[0].length"] = "length", ["system.pipes[0].diameter"] = "diameter",
        ["system.pipes[0].roughness"] = "roughness", ["system.pipes[0].minorLossCoefficient"] = "minorLossCoefficient",
        ["suction"] = "staticSuctionHead", ["suction.staticSuctionHead"] = "staticSuctionHead", ["suction.lossHead"] = "suctionLossHead",
        ["suction.surfacePressure"] = "surfacePressure", ["suction.vapourPressure"] = "vapourPressure",
    };

    /// <summary>The GET form as the body it stands for: one pump curve as coefficients, one pipe or a lumped
    /// resistance, the suction fields. Shared with the calculation sheet.</summary>
    internal static DutyPointRequest ToRequest(DutyPointQuery q)
    {
        PumpInput? pump = q.C0 is null ? null : new PumpInput(
            Coefficients: q.C3 is null ? [q.C0.Value, q.C1 ?? 0, q.C2 ?? 0] : [q.C0.Value, q.C1 ?? 0, q.C2 ?? 0, q.C3.Value],
            MaximumFlow: q.MaximumFlow);
        bool pipe = q.Length is not null || q.Diameter is not null || q.Roughness is not null || q.MinorLossCoefficient is not null;
        SystemInput? system = q.StaticHead is null && q.Resistance is null && !pipe ? null : new SystemInput(
            q.StaticHead, q.Resistance, pipe ? [new PipeInput(q.Length, q.Diameter, q.Roughness, q.MinorLossCoefficient)] : null);
        SuctionInput? suction = q.StaticSuctionHead is null && q.SuctionLossHead is null && q.SurfacePressure is null && q.VapourPressure is null
            ? null : new SuctionInput(q.StaticSuctionHead, q.SuctionLossHead, q.SurfacePressure, q.VapourPressure);
        return new DutyPointRequest(pump, system, q.PumpsInParallel, q.PumpsInSeries, q.SpeedRatio, q.Temperature,
            q.KinematicViscosity, q.Density, suction, q.Units, q.FlowUnit, q.Trace);
    }

    public static Outcome<DutyPointResponse> FromQuery(DutyPointQuery q, in CalculationContext context)
    {
        var request = ToRequest(q);
        var system = request.System;
        // With no system at all, the first thing to say is that the static head is missing.
        var names = system is null ? new Dictionary<string, string>(QueryNames) { ["system"] = "staticHead" } : QueryNames;
        return Calculate(request, names, context);
    }

    public static Outcome<DutyPointResponse> Calculate(DutyPointRequest request, IReadOnlyDictionary<string, string>? names,
        in CalculationContext context)
    {
        if (context.Trace && request.Trace != true) request = request with { Trace = true };
        var errors = new FieldErrors();
        var input = PumpInputReader.Read(request, errors, names);
        if (errors.Any || input is null) return ProblemResults.BadInput(errors);
        var (result, trace) = Solve(input);
        if (!result.Status.HasAnswer() && result.Status != DutyStatus.NotConverged) return NoAnswer(result, input.Units);
        if (!IsFinite(result)) return OutOfRange();
        var response = Response(input, result, trace);
        if (context.Sensitivities && result.Status == DutyStatus.Solved) response = response with { Sensitivities = Sensitivities(request, input, result, names) };
        return response;
    }

    public static Outcome<PumpCurvesResponse> Curves(DutyPointRequest request, in CalculationContext context)
    {
        bool sensitivities = context.Sensitivities;
        if (context.Trace && request.Trace != true) request = request with { Trace = true };
        var errors = new FieldErrors();
        var input = PumpInputReader.Read(request, errors, null);
        int? samplePoints = context.Integer(PumpCurvesCalculation.SamplePoints.Name);
        if (samplePoints is int n && (n < 2 || n > OperatingCurves.MaximumPoints)
            || samplePoints is null && context.Raw(PumpCurvesCalculation.SamplePoints.Name) is not null)
            errors.Add("samplePoints", "must be a whole number in 2 to 10001");
        if (errors.Any || input is null) return ProblemResults.BadInput(errors);

        var (result, trace) = Solve(input);
        var u = input.Units;
        DutyPointResponse? duty = result.Status is DutyStatus.Solved or DutyStatus.NotConverged && IsFinite(result) ? Response(input, result, trace) : null;
        if (sensitivities && duty is not null && result.Status == DutyStatus.Solved) duty = duty with { Sensitivities = Sensitivities(request, input, result, null) };
        var curves = OperatingCurves.Sample(input.Curve, input.System, input.Arrangement, duty is null ? null : result.Flow,
            samplePoints ?? OperatingCurves.DefaultPoints, input.Data.Efficiency, input.Data.NpshRequired);
        var warnings = new List<WarningDto>(duty?.Warnings ?? input.Warnings);
        if (duty is null)
            warnings.Insert(0, result.Status is DutyStatus.ShutOffBelowStaticHead or DutyStatus.CurvesDoNotMeet
                ? new WarningDto(result.Status.Code(), NoAnswerDetail(result, u))
                : new WarningDto("not-finite", "The duty-point solve met values too large for double precision; there is no duty point to show."));
        return new PumpCurvesResponse(
            Convert(curves.Flow, u.Flow), Convert(curves.PumpHead, u.Head), Convert(curves.SetHead, u.Head), Convert(curves.SystemHead, u.Head),
            curves.Efficiency is null ? null : Convert(curves.Efficiency, x => x),
            curves.NpshRequired is null ? null : Convert(curves.NpshRequired, u.Head),
            result.Status.Code(), result.Status.Reason(), duty, duty?.Iterations ?? 0, result.Status.HasAnswer(),
            u.Code, u.FlowUnit, u.HeadUnit, warnings, input.Assumptions);
    }

    /// <summary>The duty point's flow and head against every numeric input they depend on (<see cref="DutyPointSensitivity"/>),
    /// keyed by the request's field names (the GET form's names for the GET form), in SI.</summary>
    private static IReadOnlyDictionary<string, IReadOnlyDictionary<string, SensitivityDto>>? Sensitivities(
        DutyPointRequest request, PumpProblem input, in DutyPointResult r, IReadOnlyDictionary<string, string>? names)
    {
        string N(string field) => names is not null && names.TryGetValue(field, out var n) ? n : field;
        var pipes = input.System.Pipes;
        var perPipe = new DutyPipeDerivatives[pipes.Count];
        var d = DutyPointSensitivity.At(input.Curve, input.System, input.Arrangement, r.Flow, perPipe);
        var b = new SensitivityBuilder();
        double q = r.Flow, h = r.Head;
        void Add(string field, double value, DutyOutputDerivatives e)
        {
            b.Add("flow", q, N(field), value, e.Flow);
            b.Add("head", h, N(field), value, e.Head);
        }
        var curve = input.Curve;
        if (input.Fit is null && request.Pump?.Coefficients is { } given)
        {
            // The coefficients as the Core holds them (SI), whatever units the request used.
            (double C, DutyOutputDerivatives D)[] c = [(curve.C0, d.C0), (curve.C1, d.C1), (curve.C2, d.C2), (curve.C3, d.C3)];
            for (int k = 0; k < Math.Min(given.Count, 4); k++) Add($"pump.coefficients[{k}]", c[k].C, c[k].D);
        }
        Add("speedRatio", input.Arrangement.SpeedRatio, d.SpeedRatio);
        Add("system.staticHead", input.System.StaticHead, d.StaticHead);
        if (request.System?.Resistance is not null) Add("system.resistance", input.System.Coefficient, d.Resistance);
        for (int i = 0; i < pipes.Count; i++)
        {
            var p = pipes[i];
            Add($"system.pipes[{i}].length", p.Length, perPipe[i].Length);
            Add($"system.pipes[{i}].diameter", p.Diameter, perPipe[i].Diameter);
            Add($"system.pipes[{i}].roughness", p.Roughness, perPipe[i].Roughness);
            Add($"system.pipes[{i}].minorLossCoefficient", p.MinorLossCoefficient, perPipe[i].MinorLossCoefficient);
        }
        if (pipes.Count > 0)
        {
            if (input.WaterCelsius is double t)
            {
                double dnu = SensitivityBuilder.KinematicViscosityPerKelvin(t);
                Add("temperature", t, new DutyOutputDerivatives(d.KinematicViscosity.Flow * dnu, d.KinematicViscosity.Head * dnu));
            }
            else Add("kinematicViscosity", input.System.KinematicViscosity, d.KinematicViscosity);
        }
        return b.Build();
    }

    private static double[] Convert(IReadOnlyList<double> values, Func<double, double> to)
    {
        var a = new double[values.Count];
        // A polynomial far beyond its data can overflow; JSON has no infinity, so clip to the largest double.
        for (int i = 0; i < a.Length; i++) a[i] = Math.Clamp(to(values[i]), double.MinValue, double.MaxValue);
        return a;
    }

    private static (DutyPointResult Result, SolverTrace? Trace) Solve(PumpProblem input)
    {
        SolverTrace? trace = input.Trace ? new SolverTrace() : null;
        var result = DutyPoint.Solve(input.Curve, input.System, input.Arrangement, input.Data, null, trace);
        return (result, trace);
    }

    private static string NoAnswerDetail(in DutyPointResult r, PumpUnits u)
    {
        var c = CultureInfo.InvariantCulture;
        if (r.Status == DutyStatus.ShutOffBelowStaticHead)
            return string.Format(c, "The pump set's shut-off head, {0:G6} {3}, is {1:G6} {3} below the static head, {2:G6} {3}: it cannot start " +
                "flow. Raise the speed, add pumps in series or choose a larger pump.", u.Head(r.ShutOffHead), u.Head(r.HeadShortfall), u.Head(r.StaticHead), u.HeadUnit);
        return string.Format(c, "From zero flow to {0:G6} {3} ({4}) the pump-set head stays above the system head; they come closest, " +
            "{1:G6} {5} apart, at {2:G6} {3}. The system needs less head than the pumps give even at their largest flow (a falling " +
            "static head?); there is no duty point on the pump curve.", u.Flow(r.BracketUpperFlow), u.Head(r.ClosestApproach),
            u.Flow(r.ClosestApproachFlow), u.FlowUnit, r.ZeroHeadFlow is null ? "the end of the search: the curve does not reach zero head" : "the set's zero-head flow",
            u.HeadUnit);
    }

    private static ProblemHttpResult NoAnswer(in DutyPointResult r, PumpUnits u)
    {
        var extensions = new Dictionary<string, object?>
        {
            // Not "status": RFC 9457's status member is the numeric HTTP status, and an extension of that name would
            // write the key a second time. The network endpoint's networkStatus is the model.
            ["dutyPointStatus"] = r.Status.Code(),
            ["shutOffHead"] = Finite(u.Head(r.ShutOffHead)),
            ["staticHead"] = Finite(u.Head(r.StaticHead)),
            ["headShortfall"] = Finite(u.Head(r.HeadShortfall)),
            ["closestApproach"] = Finite(u.Head(r.ClosestApproach)),
            ["closestApproachFlow"] = Finite(u.Flow(r.ClosestApproachFlow)),
            ["bracketUpperFlow"] = Finite(u.Flow(r.BracketUpperFlow)),
            ["headUnit"] = u.HeadUnit,
            ["flowUnit"] = u.FlowUnit,
        };
        if (r.ZeroHeadFlow is double z) extensions["zeroHeadFlow"] = Finite(u.Flow(z));
        string title = r.Status == DutyStatus.ShutOffBelowStaticHead
            ? "The pump set cannot reach the static head."
            : "The pump and system curves do not meet.";
        return ProblemResults.NoAnswer(title, NoAnswerDetail(r, u), extensions);
    }

    /// <summary>True when the values a response must carry are finite (they are unless the inputs are extreme enough for a
    /// polynomial or the losses to overflow a double).</summary>
    private static bool IsFinite(in DutyPointResult r) =>
        double.IsFinite(r.Flow) && double.IsFinite(r.Head) && double.IsFinite(r.Residual) && double.IsFinite(r.RatedSpeedFlow);

    private static ProblemHttpResult OutOfRange() => ProblemResults.NoAnswer("The duty point lies outside the range of the arithmetic.",
        "The solve met values too large for double precision (the inputs are extreme in magnitude); rescale them, for example with another flow unit.",
        new Dictionary<string, object?> { ["dutyPointStatus"] = "not-finite" });

    /// <summary>null for a value JSON cannot carry (a ratio over a zero best-efficiency flow, for instance).</summary>
    private static double? Finite(double? v) => v is double d && double.IsFinite(d) ? d : null;

    /// <summary>The trace, unless a step holds a value JSON cannot carry (an overflowed end of the bracket).</summary>
    private static IReadOnlyList<TraceStepDto>? Trace(SolverTrace? trace, List<WarningDto> warnings)
    {
        var steps = TraceStepDto.From(trace);
        if (steps is null || steps.All(t => double.IsFinite(t.X) && double.IsFinite(t.Residual) && double.IsFinite(t.Derivative)
            && double.IsFinite(t.Step) && double.IsFinite(t.Lower) && double.IsFinite(t.Upper))) return steps;
        warnings.Add(new("trace-omitted", "The solver trace holds values beyond double range and is left out."));
        return null;
    }

    /// <summary>Below this fraction of the curve's largest flow a duty point warns <c>duty-point-near-shut-off</c>: 5 percent
    /// (a band chosen here, well below the usual minimum continuous stable flow of a centrifugal pump).</summary>
    public const double TinyFractionOfRange = 0.05;

    private static DutyPointResponse Response(PumpProblem input, in DutyPointResult r, SolverTrace? trace)
    {
        var u = input.Units;
        var curve = input.Curve;
        var warnings = new List<WarningDto>(input.Warnings);
        warnings.AddRange(r.DescribeWarnings().Select(WarningDto.From));
        var validity = new List<ValidityDto>(input.Validity);

        if (curve.DataMaximumFlow is double qmax)
        {
            double qmin = curve.DataMinimumFlow ?? 0;
            validity.Add(new ValidityDto("pump-curve", "ratedSpeedFlow", u.Flow(qmin), u.Flow(qmax), u.Flow(r.RatedSpeedFlow),
                r.RatedSpeedFlow >= qmin && r.RatedSpeedFlow <= qmax,
                input.Fit is null ? "pump.maximumFlow as given" : "the flow range of the catalogue points given"));
            // A duty point at a sliver of the curve's flow range is almost always a unit slip (a system resistance for
            // flows in l/s applied to a curve in m3/s, say) or a pump far too large for the system.
            if (r.RatedSpeedFlow > 0 && r.RatedSpeedFlow < TinyFractionOfRange * qmax)
                warnings.Add(new("duty-point-near-shut-off", string.Create(CultureInfo.InvariantCulture,
                    $"The duty point's flow at rated speed, {u.Flow(r.RatedSpeedFlow):G4} {u.FlowUnit}, is {r.RatedSpeedFlow / qmax:P2} of the curve's largest flow ({u.Flow(qmax):G4} {u.FlowUnit}): a pump does not run there for long (overheating, recirculation, below its minimum stable flow, common practice). Check the units of the system curve and the pump data, or choose a smaller pump.")));
        }
        var pipes = input.System.Pipes;
        for (int i = 0; i < pipes.Count; i++)
        {
            var p = pipes[i];
            double re = 4 * Math.Abs(r.Flow) / (Math.PI * p.Diameter * input.Fluid.KinematicViscosity);
            var friction = input.System.Friction;
            if (re >= friction.LaminarLimit && re < friction.TurbulentLimit)
                warnings.Add(new("transitional-flow", string.Create(CultureInfo.InvariantCulture,
                    $"system.pipes[{i}]: Reynolds number {re:G4} lies in the transition zone ({friction.LaminarLimit:G4} to {friction.TurbulentLimit:G4}); its friction factor (Churchill 1977) is uncertain.")));
            // The ranges of the relation the pipe's friction factor came from, as the Core states them.
            string prefix = $"system.pipes[{i}].";
            foreach (var v in DarcyFriction.ValidityAt(re, p.RelativeRoughness, friction))
                validity.Add(ValidityDto.From(v with { Quantity = prefix + v.Quantity }));
        }

        if (input.EfficiencyFit is { } ef && (ef.PeakAboveData || r.Efficiency > ef.DataMaximumEfficiency + EfficiencyCurveFit.AboveDataMargin))
        {
            // The fit through the origin can overshoot the catalogue; the shaft power computed from it then comes out low.
            double highest = ef.DataMaximumEfficiency;
            string atDuty = r.Efficiency is double eta && eta > highest
                ? string.Create(CultureInfo.InvariantCulture, $" At the duty it gives {eta:G3}, so the shaft power is {(1 - highest / eta) * 100:G2} percent below what the highest catalogue efficiency would give.")
                : "";
            warnings.Add(new("efficiency-above-data", string.Create(CultureInfo.InvariantCulture,
                $"The efficiency curve fitted to the points peaks at {ef.Curve.BestEfficiency:G3} (at {u.Flow(ef.Curve.BestEfficiencyFlow):G4} {u.FlowUnit} per pump at rated speed), above the highest catalogue efficiency, {highest:G3}.{atDuty} The fit (through the origin) does not follow the points near their peak: check the efficiency at the duty against the catalogue (efficiencyMaxDeviation is the fit's largest miss).")));
        }
        double? ratio = Finite(r.BestEfficiencyRatio);
        if (r.BestEfficiencyRatio is not null && ratio is null)
            warnings.Add(new("best-efficiency-flow-zero", "The efficiency data peak at zero flow, so the duty flow cannot be given as a fraction of the best-efficiency flow; check the efficiency points."));

        return new DutyPointResponse(
            u.Flow(r.Flow), u.Head(r.Head), u.Flow(r.FlowPerPump), u.Head(r.HeadPerPump), u.Flow(r.RatedSpeedFlow),
            r.Iterations, r.Converged, u.Head(r.Residual), r.Status.Code(), r.SolverStatus.Code(), "set flow Q (m3/s)",
            input.Method, u.Code, u.FlowUnit, u.HeadUnit, u.PowerUnit,
            input.Arrangement.Parallel, input.Arrangement.Series, input.Arrangement.SpeedRatio, u.Head(r.ShutOffHead), u.Head(r.StaticHead),
            new PumpCurveDto(
                [u.Head(curve.C0), u.CoefficientFromSi(curve.C1, 1), u.CoefficientFromSi(curve.C2, 2), u.CoefficientFromSi(curve.C3, 3)],
                curve.Degree, input.Fit is null ? "given" : input.Fit.Value.Status.Code(), u.Head(curve.ShutOffHead),
                curve.ZeroHeadFlow is double z ? u.Flow(z) : null),
            input.Fit is { } fit ? u.Head(fit.RmsDeviation) : null,
            input.Fit is { } fit2 ? u.Head(fit2.MaxDeviation) : null,
            r.CatalogueRange is var (lo, hi) ? new FlowRangeDto(u.Flow(lo), u.Flow(hi)) : null,
            Finite(r.Efficiency),
            Finite(r.HydraulicPower) is double ph ? u.Power(ph) : null,
            Finite(r.ShaftPower) is double ps ? u.Power(ps) : null,
            Finite(r.ShaftPowerPerPump) is double pp ? u.Power(pp) : null,
            Finite(r.BestEfficiencyFlow) is double qb ? u.Flow(qb) : null,
            ratio,
            Finite(r.NpshAvailable) is double na ? u.Head(na) : null,
            Finite(r.SuctionLoss) is double sl ? u.Head(sl) : null,
            Finite(r.NpshRequired) is double nr ? u.Head(nr) : null,
            Finite(r.NpshMargin) is double nm ? u.Head(nm) : null,
            Finite(r.NpshRatio),
            validity, warnings, input.Assumptions, Trace(trace, warnings))
        {
            EfficiencyRmsDeviation = input.EfficiencyFit?.RmsDeviation,
            EfficiencyMaxDeviation = input.EfficiencyFit?.MaxDeviation,
            BestEfficiency = input.EfficiencyFit is { } bestFit ? Finite(bestFit.Curve.BestEfficiency) : null,
            UnstableFlow = r.UnstableFlow is double low ? u.Flow(low) : null,
        };
    }
}

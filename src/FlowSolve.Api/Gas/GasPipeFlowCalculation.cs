using System.Globalization;
using FlowSolve.Api.Contracts;
using FlowSolve.Api.Hosting;
using FlowSolve.Api.Problems;
using FlowSolve.Api.Sheets;
using FlowSolve.Core.Gas;
using FlowSolve.Core.Numerics;

namespace FlowSolve.Api.Gas;

/// <summary>Steady isothermal gas flow in a horizontal pipe: <c>GET</c> and <c>POST /v1/gas/pipe-flow</c>.</summary>
public sealed class GasPipeFlowCalculation : Calculation<GasPipeFlowRequest, GasPipeFlowResponse>
{
    internal const string Method =
        "isothermal flow in a horizontal pipe, p1^2 - p2^2 = (Z R T G^2 / M) (f L/D + 2 ln(p1/p2)), G = mass flow / area, " +
        "R = 8.314462618 J/(mol K); Darcy friction factor at Re = G D / mu by Colebrook-White (1939), 64/Re below Re 2000, " +
        "Churchill (1977) between 2000 and 4000; solved by safeguarded Newton";

    private static readonly CultureInfo C = CultureInfo.InvariantCulture;

    public override CalculationInfo Info { get; } = new("gas/pipe-flow", "Gas", "GasPipeFlow", "result",
        "Gas line: steady isothermal flow in a horizontal pipe", GasDocs.Description);

    public override IReadOnlyList<(string Name, string Value)> QueryExample { get; } =
        [("inletPressure", "5000000"), ("massFlow", "15"), ("temperature", "15"), ("specificGravity", "0.6"),
         ("compressibilityFactor", "0.9"), ("dynamicViscosity", "0.000011"), ("length", "50000"), ("diameter", "0.3"),
         ("roughness", "0.000045")];

    public override GasPipeFlowRequest BodyExample { get; } = new(InletPressure: 700_000, OutletPressure: 550_000, Temperature: 10,
        MolarMass: 0.01738, DynamicViscosity: 1.08e-5, Length: 4200, Diameter: 0.2, Roughness: 0.00005);

    public override Sheet Sheet(GasPipeFlowRequest request, GasPipeFlowResponse answer) => GasSheet.Build(request, answer);

    public override Outcome<GasPipeFlowResponse> Solve(GasPipeFlowRequest request, in CalculationContext context)
    {
        var errors = new FieldErrors();
        var u = UnitSystem.Parse(request.Units, errors);
        var assumptions = new List<AssumptionDto>();
        string pUnit = u.IsUs ? "psi" : "Pa";

        double p1 = Si(errors, "inletPressure", errors.Required("inletPressure", request.InletPressure, 0, double.MaxValue, minExclusive: true, unit: pUnit), PressureFactor(u));
        bool givenOutlet = request.OutletPressure is not null, givenFlow = request.MassFlow is not null;
        if (givenOutlet == givenFlow)
        {
            string why = givenOutlet ? "give either outletPressure (to solve for massFlow) or massFlow (to solve for outletPressure), not both"
                : "give outletPressure (to solve for massFlow) or massFlow (to solve for outletPressure)";
            errors.Add("outletPressure", why);
            errors.Add("massFlow", why);
        }
        double p2 = double.NaN, massFlow = double.NaN;
        if (givenOutlet && !givenFlow)
        {
            p2 = Si(errors, "outletPressure", errors.Required("outletPressure", request.OutletPressure, 0, double.MaxValue, minExclusive: true, unit: pUnit), PressureFactor(u));
            if (!errors.Has("outletPressure") && !errors.Has("inletPressure") && !(p2 < p1))
                errors.Add("outletPressure", "must be below inletPressure (both absolute): gas flows from the inlet to the outlet");
        }
        if (givenFlow && !givenOutlet)
            massFlow = Si(errors, "massFlow", errors.Required("massFlow", request.MassFlow, 0, double.MaxValue, minExclusive: true, unit: u.IsUs ? "lb/s" : "kg/s"), u.IsUs ? Units.Pound : 1);

        double temperature = double.NaN;
        double t = errors.Required("temperature", request.Temperature, double.MinValue, double.MaxValue, unit: u.TemperatureUnit);
        if (!errors.Has("temperature"))
        {
            temperature = u.TemperatureToCelsius(t);
            if (!(temperature > -GasConstants.ZeroCelsius) || !double.IsFinite(temperature))
                errors.Add("temperature", u.IsUs ? "must be above absolute zero (-459.67 degrees F)" : "must be above absolute zero (-273.15 degrees C)");
        }

        double molarMass = double.NaN;
        if ((request.MolarMass is null) == (request.SpecificGravity is null))
        {
            string why = request.MolarMass is null ? "give molarMass (kg/mol) or specificGravity (relative to dry air)"
                : "give either molarMass or specificGravity, not both";
            errors.Add("molarMass", why);
            errors.Add("specificGravity", why);
        }
        else if (request.MolarMass is not null)
        {
            molarMass = errors.Required("molarMass", request.MolarMass, 0.001, 1, unit: "kg/mol");
            if (errors.Has("molarMass") && request.MolarMass is > 1 and <= 1000)
                errors.Add("molarMass", "is in kg/mol (methane is 0.01604): a value in g/mol is 1000 times too large");
        }
        else
        {
            double sg = errors.Required("specificGravity", request.SpecificGravity, 0.03, 35);
            molarMass = sg * GasConstants.MolarMassOfAir;
            if (!errors.Has("specificGravity"))
                assumptions.Add(new("molarMass", molarMass.ToString("R", C), "specificGravity x 0.0289647 kg/mol (dry air)"));
        }

        double z = errors.Optional("compressibilityFactor", request.CompressibilityFactor, 0.05, 5) ?? 1.0;
        if (request.CompressibilityFactor is null)
            assumptions.Add(new("compressibilityFactor", "1", "ideal gas (default); Z is taken as constant along the line"));
        double k = errors.Optional("heatCapacityRatio", request.HeatCapacityRatio, 1, 1.7) ?? 1.3;
        if (request.HeatCapacityRatio is null)
            assumptions.Add(new("heatCapacityRatio", "1.3", "default; used only for the speed of sound and the Mach numbers"));
        double viscosityFactor = u.IsUs ? Units.PoundForce / (Units.Foot * Units.Foot) : 1;
        double mu = Si(errors, "dynamicViscosity", errors.Required("dynamicViscosity", request.DynamicViscosity, 0, 1 / viscosityFactor,
            minExclusive: true, unit: u.IsUs ? "lbf s/ft2" : "Pa s"), viscosityFactor);
        double lengthFactor = u.IsUs ? Units.Foot : 1;
        double length = Si(errors, "length", errors.Required("length", request.Length, 0, double.MaxValue, minExclusive: true, unit: u.LengthUnit), lengthFactor);
        double diameter = Si(errors, "diameter", errors.Required("diameter", request.Diameter, 0, double.MaxValue, minExclusive: true, unit: u.LengthUnit), lengthFactor);
        double roughness = Si(errors, "roughness", errors.Required("roughness", request.Roughness, 0, double.MaxValue, unit: u.LengthUnit), lengthFactor);
        if (!errors.Has("roughness") && !errors.Has("diameter") && !(roughness < diameter))
            errors.Add("roughness", "must be smaller than the diameter");
        if (errors.Any) return ProblemResults.BadInput(errors);

        if (request.Units is null) assumptions.Add(new("units", "si", "SI units (default)"));
        assumptions.Add(new("standardConditions", "15 degrees C, 101325 Pa", "standardVolumeFlow is at 15 degrees C and 101 325 Pa with the gas taken as ideal there (Z = 1)"));
        assumptions.Add(new("profile", "horizontal, isothermal", "no elevation change, constant temperature, Z and viscosity along the line; no fittings or minor losses"));

        var line = new GasLine(length, diameter, roughness);
        var gas = new GasProperties(molarMass, temperature, z, mu, k);
        var trace = context.Trace ? new SolverTrace() : null;
        var r = givenFlow
            ? GasPipeFlow.SolveOutletPressure(line, gas, p1, massFlow, trace)
            : GasPipeFlow.SolveMassFlow(line, gas, p1, p2, trace);

        if (r.Status == GasFlowStatus.Choked) return Choked(r, u, givenFlow);
        if (r.Status == GasFlowStatus.OutsideRange)
            return ProblemResults.NoAnswer("No answer inside the friction relations' range.", string.Create(C,
                $"The Reynolds number of this flow lies outside 1e-3 to 1e15, the range of the friction relations, or the inputs lie beyond double precision: check the orders of magnitude of the pressures, the length, the diameter and the viscosity, and their units."),
                new Dictionary<string, object?> { ["gasStatus"] = "outside-range" });

        double pressure(double pa) => pa / PressureFactor(u);
        double mass(double kg) => u.IsUs ? kg / Units.Pound : kg;
        double flowOut = mass(r.MassFlow), p2Out = pressure(r.OutletPressure);
        bool limitFound = r.Limit.Found;
        return new GasPipeFlowResponse(
            givenFlow ? p2Out : flowOut, givenFlow ? "outletPressure" : "massFlow", flowOut, pressure(p1), p2Out,
            pressure(p1 - r.OutletPressure), u.Velocity(r.InletVelocity), u.Velocity(r.OutletVelocity), r.InletMachNumber, r.OutletMachNumber,
            u.Density(r.InletDensity), u.Density(r.OutletDensity), r.Reynolds, r.Friction.FrictionFactor, r.Friction.Relation,
            line.RelativeRoughness, u.IsUs ? r.StandardVolumeFlow / Units.CubicFoot : r.StandardVolumeFlow,
            limitFound ? mass(r.LargestMassFlow) : null, limitFound ? pressure(r.Limit.OutletPressure) : null,
            u.Velocity(gas.LimitVelocity), u.Velocity(gas.SpeedOfSound), molarMass, u.Code,
            r.Iterations, r.Converged, r.Residual, r.SolverStatus.Code(),
            givenFlow ? "delta = (p1 - p2)/p1" : "ln(G), G = mass flow / area in kg/(m2 s)", Method,
            r.Validity().Select(ValidityDto.From).ToArray(), r.DescribeWarnings().Select(WarningDto.From).ToArray(), assumptions)
        {
            Trace = TraceStepDto.From(trace),
            Sensitivities = context.Sensitivities && r.Status == GasFlowStatus.Solved ? Sensitivities(r, givenFlow, request) : null,
        };
    }

    /// <summary>d(solved output)/d(input) in SI by implicit differentiation (<see cref="GasSensitivity"/>).</summary>
    private static IReadOnlyDictionary<string, IReadOnlyDictionary<string, SensitivityDto>>? Sensitivities(in GasFlowResult r, bool outletSolved,
        GasPipeFlowRequest request)
    {
        var d = GasSensitivity.Of(r, outletSolved);
        var b = new SensitivityBuilder();
        string output = outletSolved ? "outletPressure" : "massFlow";
        double y = outletSolved ? r.OutletPressure : r.MassFlow;
        b.Add(output, y, "inletPressure", r.InletPressure, d.InletPressure);
        if (outletSolved) b.Add(output, y, "massFlow", r.MassFlow, d.Given);
        else b.Add(output, y, "outletPressure", r.OutletPressure, d.Given);
        b.Add(output, y, "length", r.Line.Length, d.Length);
        b.Add(output, y, "diameter", r.Line.Diameter, d.Diameter);
        b.Add(output, y, "roughness", r.Line.Roughness, d.Roughness);
        b.Add(output, y, "temperature", r.Gas.Temperature, d.Temperature); // the field as given (degrees C), as the pipe answers do
        b.Add(output, y, "dynamicViscosity", r.Gas.DynamicViscosity, d.DynamicViscosity);
        if (request.CompressibilityFactor is not null) b.Add(output, y, "compressibilityFactor", r.Gas.CompressibilityFactor, d.CompressibilityFactor);
        if (request.MolarMass is not null) b.Add(output, y, "molarMass", r.Gas.MolarMass, d.MolarMass);
        else b.Add(output, y, "specificGravity", r.Gas.MolarMass / GasConstants.MolarMassOfAir, d.MolarMass * GasConstants.MolarMassOfAir);
        return b.Build();
    }

    /// <summary>The 422 of a flow beyond the isothermal limit, with the largest mass flow (and its outlet pressure) in the body.</summary>
    private static Outcome<GasPipeFlowResponse> Choked(in GasFlowResult r, UnitSystem u, bool givenFlow)
    {
        string pUnit = u.IsUs ? "psi" : "Pa", mUnit = u.IsUs ? "lb/s" : "kg/s";
        double? largest = r.Limit.Found ? (u.IsUs ? r.LargestMassFlow / Units.Pound : r.LargestMassFlow) : null;
        double? pLimit = r.Limit.Found ? r.Limit.OutletPressure / PressureFactor(u) : null;
        string limit = largest is double m
            ? string.Create(C, $"The largest mass flow this line passes from this inlet pressure is {m:G6} {mUnit}, reached with an outlet pressure of {pLimit:G6} {pUnit} (absolute), where the outlet velocity is sqrt(Z R T / M) = {u.Velocity(r.Gas.LimitVelocity):G5} {u.VelocityUnit} (outlet Mach number 1/sqrt(k)).")
            : "The largest mass flow lies outside the friction relations' range (Reynolds number 1e-3 to 1e15), so it is not given.";
        string detail = givenFlow
            ? "massFlow exceeds what the line can carry: an isothermal line chokes when its outlet velocity reaches sqrt(Z R T / M), and no outlet pressure passes more. " + limit + " Raise the inlet pressure or the diameter, or shorten the line."
            : "outletPressure is below the pressure at which the line chokes: the relation would put the outlet velocity above the isothermal limit sqrt(Z R T / M), which a subsonic line cannot pass (the flow chokes at the outlet, and a lower outlet pressure does not raise it). " + limit;
        var extensions = new Dictionary<string, object?>
        {
            ["gasStatus"] = "choked",
            ["largestMassFlow"] = largest,
            ["outletPressureAtLimit"] = pLimit,
            ["massFlowUnit"] = mUnit,
            ["pressureUnit"] = pUnit,
        };
        return ProblemResults.NoAnswer("The line is choked: the flow would exceed the isothermal limit.", detail, extensions);
    }

    private static double PressureFactor(UnitSystem u) => u.IsUs ? Units.Psi : 1;

    /// <summary>A value read in the request's unit, in SI; a value that overflows in SI is an error on its field.</summary>
    private static double Si(FieldErrors errors, string field, double value, double factor)
    {
        if (errors.Has(field)) return double.NaN;
        double si = value * factor;
        if (!double.IsFinite(si)) errors.Add(field, "is too large for a double once converted to SI units");
        return si;
    }
}

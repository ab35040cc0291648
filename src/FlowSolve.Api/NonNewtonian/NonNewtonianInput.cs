using System.Globalization;
using FlowSolve.Api.Contracts;
using FlowSolve.Api.Hosting;
using FlowSolve.Api.Problems;
using FlowSolve.Core;
using FlowSolve.Core.Friction;
using FlowSolve.Core.NonNewtonian;
using Microsoft.AspNetCore.Http.HttpResults;

namespace FlowSolve.Api.NonNewtonian;

/// <summary>
/// The inputs the three non-Newtonian calculations share (model, fluid, units), read once, checked and converted to SI,
/// with the conversions of their answers. A field of the model not chosen is refused under its own name. Bounds (SI)
/// keep every value the Core computes finite or turn it into a 422; they lie far outside practice.
/// </summary>
internal sealed class NonNewtonianInput
{
    public const double MinDensity = 1e-3, MaxDensity = 1e5, MaxConsistencyIndex = 1e6, MaxYieldStress = 1e6, MaxPlasticViscosity = 1e4;
    public const double MinDiameter = 1e-6, MaxDiameter = 100, MaxLength = 1e7, MaxFlow = 1e7, MaxHead = 1e7, MaxMinorLoss = 1e6;

    /// <summary>1 lbf/ft2 in Pa (exact: NIST SP 811 factors of <see cref="Hosting.Units"/>); also lbf s/ft2 in Pa s and lbf s^n/ft2 in Pa s^n.</summary>
    public const double PoundForcePerSquareFoot = Hosting.Units.PoundForce / (Hosting.Units.Foot * Hosting.Units.Foot);

    private static readonly CultureInfo C = CultureInfo.InvariantCulture;

    public required UnitSystem Units { get; init; }
    public required NonNewtonianFluid Fluid { get; init; }
    public required List<AssumptionDto> Assumptions { get; init; }

    public string ModelCode => ModelName(Fluid.Model);

    public static string ModelName(RheologyModel model) => model == RheologyModel.PowerLaw ? "power-law" : "bingham-plastic";

    /// <summary>Reads model, fluid and units; errors go to <paramref name="errors"/> under their wire names.</summary>
    public static NonNewtonianInput Read(INonNewtonianRequest r, FieldErrors errors)
    {
        var units = UnitSystem.Parse(r.Units, errors);
        var assumptions = new List<AssumptionDto>();
        if (r.Units is null) assumptions.Add(new("units", "si", "SI units (default)"));
        assumptions.Add(new("gravity", "9.80665 m/s2", "standard gravity (3rd CGPM, 1901), used everywhere in FlowSolve"));
        assumptions.Add(new("wall", "smooth", "the pipe wall is taken as hydraulically smooth: neither Dodge-Metzner nor Darby's correlation has a roughness term"));

        double stress = units.IsUs ? PoundForcePerSquareFoot : 1.0;
        string stressUnit = units.IsUs ? "lbf/ft2" : "Pa";
        double rho = units.DensityToSi(errors.Required("density", r.Density, units.Density(MinDensity), units.Density(MaxDensity), unit: units.DensityUnit));

        RheologyModel model = RheologyModel.PowerLaw;
        bool known = true;
        if (r.Model is null) { errors.Add("model", "is required: power-law or bingham-plastic"); known = false; }
        else if (r.Model.Equals("power-law", StringComparison.OrdinalIgnoreCase)) model = RheologyModel.PowerLaw;
        else if (r.Model.Equals("bingham-plastic", StringComparison.OrdinalIgnoreCase)) model = RheologyModel.BinghamPlastic;
        else { errors.Add("model", "must be power-law or bingham-plastic"); known = false; }

        var fluid = default(NonNewtonianFluid);
        if (known && model == RheologyModel.PowerLaw)
        {
            double k = stress * errors.Required("consistencyIndex", r.ConsistencyIndex, 0, MaxConsistencyIndex / stress, minExclusive: true,
                unit: units.IsUs ? "lbf s^n/ft2" : "Pa s^n");
            double n = errors.Required("flowBehaviorIndex", r.FlowBehaviorIndex, NonNewtonianFluid.MinimumFlowBehaviorIndex, NonNewtonianFluid.MaximumFlowBehaviorIndex);
            if (r.YieldStress is not null) errors.Add("yieldStress", "applies only with model=bingham-plastic");
            if (r.PlasticViscosity is not null) errors.Add("plasticViscosity", "applies only with model=bingham-plastic");
            fluid = NonNewtonianFluid.PowerLaw(rho, k, n);
        }
        else if (known)
        {
            double tau0 = stress * errors.Required("yieldStress", r.YieldStress, 0, MaxYieldStress / stress, unit: stressUnit);
            double mu = stress * errors.Required("plasticViscosity", r.PlasticViscosity, 0, MaxPlasticViscosity / stress, minExclusive: true,
                unit: units.IsUs ? "lbf s/ft2" : "Pa s");
            if (r.ConsistencyIndex is not null) errors.Add("consistencyIndex", "applies only with model=power-law");
            if (r.FlowBehaviorIndex is not null) errors.Add("flowBehaviorIndex", "applies only with model=power-law");
            fluid = NonNewtonianFluid.BinghamPlastic(rho, tau0, mu);
            if (tau0 == 0 && !errors.Any)
                assumptions.Add(new("yieldStress", "0", "no yield stress: the fluid is Newtonian with viscosity plasticViscosity (Buckingham-Reiner reduces to 16/Re)"));
        }
        return new NonNewtonianInput { Units = units, Fluid = fluid, Assumptions = assumptions };
    }

    public double ReadDiameter(FieldErrors errors, double? value) =>
        Units.LengthToSi(errors.Required("diameter", value, Units.Length(MinDiameter), Units.Length(MaxDiameter), unit: Units.LengthUnit));

    public double ReadLength(FieldErrors errors, double? value) =>
        Units.LengthToSi(errors.Required("length", value, 0, Units.Length(MaxLength), minExclusive: true, unit: Units.LengthUnit));

    public double ReadVelocity(FieldErrors errors, double? value) =>
        Units.LengthToSi(errors.Required("velocity", value, 0, Units.Velocity(NonNewtonianPipe.MaximumVelocity), minExclusive: true, unit: Units.VelocityUnit));

    public double ReadHead(FieldErrors errors, double? value) =>
        Units.LengthToSi(errors.Required("headLoss", value, 0, Units.Length(MaxHead), minExclusive: true, unit: Units.LengthUnit));

    public double ReadMinorLoss(FieldErrors errors, double? value)
    {
        if (value is null)
        {
            Assumptions.Add(new("minorLossCoefficient", "0", "no fittings: friction loss only (default)"));
            return 0;
        }
        return errors.Required("minorLossCoefficient", value, 0, MaxMinorLoss);
    }

    /// <summary>The sensitivities table: each output (name, value in SI, partials from <see cref="NonNewtonianSensitivity"/>),
    /// then each input field given: the given quantity, diameter, length (pipe routes), minorLossCoefficient (when given),
    /// density and the model's rheology fields, all in SI.</summary>
    public IReadOnlyDictionary<string, IReadOnlyDictionary<string, SensitivityDto>>? Sensitivities(
        ReadOnlySpan<(string Output, double Value, NonNewtonianPartials Partials)> outputs, string given, double givenValue, double diameter,
        double length = double.NaN, double? minorLossCoefficient = null)
    {
        var b = new SensitivityBuilder();
        bool power = Fluid.Model == RheologyModel.PowerLaw;
        foreach (var (name, y, p) in outputs)
        {
            b.Add(name, y, given, givenValue, p.Given);
            b.Add(name, y, "diameter", diameter, p.Diameter);
            if (!double.IsNaN(length)) b.Add(name, y, "length", length, p.Length);
            if (minorLossCoefficient is double k) b.Add(name, y, "minorLossCoefficient", k, p.MinorLossCoefficient);
            b.Add(name, y, "density", Fluid.Density, p.Density);
            if (power)
            {
                b.Add(name, y, "consistencyIndex", Fluid.ConsistencyIndex, p.ConsistencyIndex);
                b.Add(name, y, "flowBehaviorIndex", Fluid.FlowBehaviorIndex, p.FlowBehaviorIndex);
            }
            else
            {
                b.Add(name, y, "yieldStress", Fluid.YieldStress, p.YieldStress);
                b.Add(name, y, "plasticViscosity", Fluid.PlasticViscosity, p.PlasticViscosity);
            }
        }
        return b.Build();
    }

    public double Stress(double pa) => Units.IsUs ? pa / PoundForcePerSquareFoot : pa;

    public static string RegimeCode(FlowRegime regime) => regime == FlowRegime.Laminar ? "laminar" : "turbulent";

    public static double? Present(double value) => double.IsNaN(value) ? null : value;

    public static IReadOnlyList<WarningDto> Warnings(in NonNewtonianFrictionResult f) => f.Describe().Select(WarningDto.From).ToArray();

    public static IReadOnlyList<ValidityDto> Validity(in NonNewtonianFrictionResult f) => f.Validity().Select(ValidityDto.From).ToArray();

    /// <summary>The 422 for a Reynolds number outside what the relations evaluate (the Core's <c>reynolds</c> guard), or
    /// an overflowing Hedstrom number.</summary>
    public static ProblemHttpResult OutsideRange(ArgumentOutOfRangeException e) =>
        ProblemResults.NoAnswer("No answer inside the relations' range.", string.Create(C,
            $"The {(e.ParamName == "hedstrom" ? "Hedstrom" : "Reynolds")} number of this flow is {e.ActualValue}, outside what the relations evaluate (Reynolds numbers {NonNewtonianFriction.MinimumReynolds:G3} to {NonNewtonianFriction.MaximumReynolds:G3}): check the orders of magnitude and units of the rheology, velocity and diameter."),
            new Dictionary<string, object?> { ["parameter"] = e.ParamName });
}

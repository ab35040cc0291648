using System.Globalization;
using FlowSolve.Api.Contracts;
using FlowSolve.Api.Hosting;
using FlowSolve.Api.Problems;
using FlowSolve.Core;
using FlowSolve.Core.Fluids;
using FlowSolve.Core.Pipes;

namespace FlowSolve.Api.Pipes;

/// <summary>
/// The inputs every pipe calculation shares, read once, checked, and converted to SI; every default that was applied
/// is recorded in <see cref="Assumptions"/>. Bounds (in SI) keep every value the Core computes finite; they lie far
/// outside engineering practice.
/// </summary>
internal sealed class PipeProblem
{
    public const double MaxLength = 1e7;
    public const double MinDiameter = 1e-6;
    public const double MaxDiameter = 100;
    public const double MaxFlow = 1e7;
    public const double MaxRoughness = 1;
    public const double MaxMinorLoss = 1e6;
    public const double MaxFittingCount = 1e4;
    public const double MaxHead = 1e7;
    public const double MinViscosity = 1e-9;
    public const double MaxViscosity = 10;
    public const double MinDensity = 1e-3;
    public const double MaxDensity = 1e5;
    public const double MaxHazenWilliamsC = 1000;
    public const double DefaultWaterTemperature = 20;

    private static readonly CultureInfo C = CultureInfo.InvariantCulture;

    // The assumptions whose texts never vary, made once: a batch reads thousands of rows that default the same fields,
    // and the answer carries the same records (immutable) either way.
    private static readonly AssumptionDto UnitsDefault = new("units", "si", "SI units (default)");
    private static readonly AssumptionDto Gravity = new("gravity", "9.80665 m/s2", "standard gravity (3rd CGPM, 1901), used everywhere in FlowSolve");
    private static readonly AssumptionDto SurfaceConditionDefault = new("surfaceCondition", "new", "new pipe (default)");
    private static readonly AssumptionDto ElevationDefault = new("elevationChange", "0", "outlet at the inlet's elevation (default)");
    private static readonly AssumptionDto MethodDefault = new("method", "darcy-weisbach", "Darcy-Weisbach with the exact Colebrook-White friction factor (default)");
    private static readonly AssumptionDto MinorLossDefault = new("minorLossCoefficient", "0", "no fittings: friction loss only (default)");
    private static readonly AssumptionDto WaterGiven = new("fluid", "water", "liquid water at 1 atm at the given temperature, IAPWS-IF97 and IAPWS 2008");
    private static readonly AssumptionDto WaterDefaultSi = WaterByDefault("20 degrees C");
    private static readonly AssumptionDto WaterDefaultUs = WaterByDefault("68 degrees F");

    private static AssumptionDto WaterByDefault(string at) => new("fluid", "water at " + at,
        "no kinematicViscosity, density or temperature given: liquid water at 1 atm, IAPWS-IF97 and IAPWS 2008 (default)");

    public required UnitSystem Units { get; init; }
    public required FlowUnit FlowUnit { get; init; }
    public required double Length { get; init; }
    /// <summary>Roughness in m; NaN when invalid.</summary>
    public required double Roughness { get; init; }
    /// <summary>The wire field that supplied the roughness: roughness or material.</summary>
    public required string RoughnessField { get; init; }
    public required double MinorLossCoefficient { get; init; }
    public required double ElevationRise { get; init; }
    public required FluidProperties Fluid { get; init; }
    public required bool HazenWilliams { get; init; }
    public required double HazenWilliamsC { get; init; }
    public required List<AssumptionDto> Assumptions { get; init; }
    /// <summary>The water temperature in degrees C when the fluid is water (given or by default); null for a fluid given by
    /// kinematicViscosity.</summary>
    public double? WaterCelsius { get; init; }
    /// <summary>The material whose table gave the roughness, when one was named.</summary>
    public RoughnessMaterial? Material { get; init; }
    /// <summary>The caller's aged or condition-assessed roughness in m (agedRoughness), when given; NaN when invalid.</summary>
    public double? AgedRoughness { get; init; }

    public string MethodCode => HazenWilliams ? "hazen-williams" : "darcy-weisbach";

    /// <summary>Reads the shared fields; errors go to <paramref name="errors"/> under their wire names.</summary>
    public static PipeProblem Read(IPipeRequest r, FieldErrors errors, bool allowHazenWilliams = true)
    {
        var units = UnitSystem.Parse(r.Units, errors);
        // Without a flowUnit the parse answers the system's default before it could record an error: taken directly, no
        // error callback is made for the row.
        var flowUnit = r.FlowUnit is null ? FlowUnit.DefaultFor(units) : FlowUnit.Parse(r.FlowUnit, units, errors);
        // Room for the usual defaults (units, gravity, minor losses, elevation, fluid, method) without growing.
        var assumptions = new List<AssumptionDto>(6);
        if (r.Units is null) assumptions.Add(UnitsDefault);
        assumptions.Add(Gravity);

        double length = units.LengthToSi(errors.Required("length", r.Length, 0, units.Length(MaxLength), minExclusive: true, unit: units.LengthUnit));

        double roughness = double.NaN;
        string roughnessField = "roughness";
        if (r.Roughness is not null)
        {
            roughness = units.LengthToSi(errors.Required("roughness", r.Roughness, 0, units.Length(MaxRoughness), unit: units.LengthUnit));
            if (r.Material is not null) errors.Add("roughness", "give either roughness or material, not both");
            if (r.SurfaceCondition is not null) errors.Add("surfaceCondition", "applies only with material");
        }
        else if (r.Material is not null)
        {
            roughnessField = "material";
            var condition = SurfaceCondition.New;
            if (r.SurfaceCondition is null) { }
            else if (r.SurfaceCondition.Equals("new", StringComparison.OrdinalIgnoreCase)) condition = SurfaceCondition.New;
            else if (r.SurfaceCondition.Equals("aged", StringComparison.OrdinalIgnoreCase)) condition = SurfaceCondition.Aged;
            else errors.Add("surfaceCondition", "must be new or aged");

            if (!RoughnessTable.TryGet(r.Material, out var material))
                errors.Add("material", "unknown material; known: " + string.Join(", ", RoughnessTable.All.Select(m => m.Name)));
            else if (!errors.Has("surfaceCondition") && !material.TryGet(condition, out roughness))
                errors.Add("surfaceCondition", $"the table gives no aged roughness for {material.Name}; use new, or give roughness");
            else if (!errors.Has("surfaceCondition"))
            {
                assumptions.Add(new("roughness", string.Create(C, $"{units.Length(roughness):R} {units.LengthUnit}"),
                    $"{material.Description} ({(condition == SurfaceCondition.New ? "new" : "aged")}), from {RoughnessTable.Source} ({RoughnessTable.Provenance})"));
                if (r.SurfaceCondition is null)
                    assumptions.Add(SurfaceConditionDefault);
            }
        }
        else
        {
            errors.Add("roughness", "is required (or give material)");
        }

        double? agedRoughness = r.AgedRoughness is null ? null
            : units.LengthToSi(errors.Required("agedRoughness", r.AgedRoughness, 0, units.Length(MaxRoughness), unit: units.LengthUnit));

        double minorLoss = ReadMinorLosses(r, errors, assumptions);

        double elevation = 0;
        if (r.ElevationChange is null) assumptions.Add(ElevationDefault);
        else elevation = units.LengthToSi(errors.Required("elevationChange", r.ElevationChange, -units.Length(MaxHead), units.Length(MaxHead), unit: units.LengthUnit));

        var fluid = ReadFluid(r, units, errors, assumptions, out double? waterCelsius);

        bool hazenWilliams = false;
        double c = double.NaN;
        if (r.Method is null || r.Method.Equals("darcy-weisbach", StringComparison.OrdinalIgnoreCase))
        {
            if (r.Method is null) assumptions.Add(MethodDefault);
            if (r.HazenWilliamsC is not null) errors.Add("hazenWilliamsC", "applies only with method=hazen-williams");
        }
        else if (r.Method.Equals("hazen-williams", StringComparison.OrdinalIgnoreCase))
        {
            if (!allowHazenWilliams) errors.Add("method", "hazen-williams is offered for head-loss and flow; the diameter is solved with darcy-weisbach");
            hazenWilliams = true;
            c = errors.Required("hazenWilliamsC", r.HazenWilliamsC, 0, MaxHazenWilliamsC, minExclusive: true);
        }
        else
        {
            errors.Add("method", allowHazenWilliams ? "must be darcy-weisbach or hazen-williams" : "must be darcy-weisbach");
        }

        return new PipeProblem
        {
            Units = units, FlowUnit = flowUnit, Length = length, Roughness = roughness, RoughnessField = roughnessField,
            MinorLossCoefficient = minorLoss, ElevationRise = elevation, Fluid = fluid,
            HazenWilliams = hazenWilliams, HazenWilliamsC = c, Assumptions = assumptions,
            WaterCelsius = waterCelsius, AgedRoughness = agedRoughness, Material = r.Material is not null && RoughnessTable.TryGet(r.Material, out var m) ? m : null,
        };
    }

    /// <summary>A flow in the request's flow unit, checked and converted to m3/s.</summary>
    public double ReadFlow(FieldErrors errors, double? value) =>
        FlowUnit.ToSi(errors.Required("flow", value, 0, FlowUnit.FromSi(MaxFlow), minExclusive: true, unit: FlowUnit.Code));

    /// <summary>A diameter, checked (also against the roughness) and converted to m.</summary>
    public double ReadDiameter(FieldErrors errors, double? value)
    {
        double d = Units.LengthToSi(errors.Required("diameter", value, Units.Length(MinDiameter), Units.Length(MaxDiameter), unit: Units.LengthUnit));
        if (!errors.Has("diameter") && !double.IsNaN(Roughness) && !(Roughness < d))
            errors.Add(RoughnessField, "the roughness must be smaller than the inside diameter");
        if (!errors.Has("diameter") && AgedRoughness is double aged && !double.IsNaN(aged) && !(aged < d))
            errors.Add("agedRoughness", "the aged roughness must be smaller than the inside diameter");
        return d;
    }

    /// <summary>The headLoss field of the inverse problems, in the request's length unit, to m.</summary>
    public double ReadHead(FieldErrors errors, double? value, bool positive) =>
        Units.LengthToSi(positive
            ? errors.Required("headLoss", value, 0, Units.Length(MaxHead), minExclusive: true, unit: Units.LengthUnit)
            : errors.Required("headLoss", value, -Units.Length(MaxHead), Units.Length(MaxHead), unit: Units.LengthUnit));

    private static double ReadMinorLosses(IPipeRequest r, FieldErrors errors, List<AssumptionDto> assumptions)
    {
        if (r.Fittings is null)
        {
            if (r.MinorLossCoefficient is null)
            {
                assumptions.Add(MinorLossDefault);
                return 0;
            }
            return errors.Required("minorLossCoefficient", r.MinorLossCoefficient, 0, MaxMinorLoss);
        }
        if (r.MinorLossCoefficient is not null)
            errors.Add("minorLossCoefficient", "give either minorLossCoefficient or fittings, not both");
        if (r.Fittings.Count == 0) errors.Add("fittings", "must list at least one fitting (or leave it out)");

        var counts = new FittingCount[r.Fittings.Count];
        bool ok = r.Fittings.Count > 0;
        for (int i = 0; i < r.Fittings.Count; i++)
        {
            var item = r.Fittings[i];
            string field = $"fittings[{i}]";
            if (string.IsNullOrWhiteSpace(item?.Name))
            {
                errors.Add(field + ".name", "is required");
                ok = false;
                continue;
            }
            if (!MinorLossTable.TryGet(item.Name, out _))
            {
                errors.Add(field + ".name", $"unknown fitting '{item.Name}'; GET /v1/pipes/fittings lists the names");
                ok = false;
            }
            double count = item.Count is null ? 1 : errors.Required(field + ".count", item.Count, 0, MaxFittingCount);
            if (double.IsNaN(count)) ok = false;
            counts[i] = new FittingCount(item.Name, count);
        }
        if (!ok) return double.NaN;
        MinorLossTable.TrySum(counts, out double total, out _);
        assumptions.Add(new("minorLossCoefficient", total.ToString("R", C),
            $"sum of count x K over the fittings, from {MinorLossTable.Source} ({MinorLossTable.Provenance})"));
        return total;
    }

    private static FluidProperties ReadFluid(IPipeRequest r, UnitSystem units, FieldErrors errors, List<AssumptionDto> assumptions,
        out double? waterCelsius)
    {
        waterCelsius = null;
        if (r.Temperature is not null)
        {
            if (r.KinematicViscosity is not null || r.Density is not null)
                errors.Add("temperature", "give either temperature (water) or kinematicViscosity and density, not both");
            double t = units.IsUs
                ? errors.Required("temperature", r.Temperature, 32, 212, unit: "degrees F")
                : errors.Required("temperature", r.Temperature, Water.MinimumTemperature, Water.MaximumTemperature, unit: "degrees C");
            if (errors.Has("temperature")) return default;
            waterCelsius = Math.Clamp(units.TemperatureToCelsius(t), Water.MinimumTemperature, Water.MaximumTemperature);
            return WaterAt(units.TemperatureToCelsius(t), assumptions, WaterGiven);
        }
        if (r.KinematicViscosity is null && r.Density is null)
        {
            waterCelsius = DefaultWaterTemperature;
            return WaterAt(DefaultWaterTemperature, assumptions, units.IsUs ? WaterDefaultUs : WaterDefaultSi);
        }
        double nu = units.KinematicViscosityToSi(errors.Required("kinematicViscosity", r.KinematicViscosity,
            units.KinematicViscosity(MinViscosity), units.KinematicViscosity(MaxViscosity), unit: units.KinematicViscosityUnit));
        double? rho = r.Density is null ? null
            : units.DensityToSi(errors.Required("density", r.Density, units.Density(MinDensity), units.Density(MaxDensity), unit: units.DensityUnit));
        return new FluidProperties(nu, rho);
    }

    private static FluidProperties WaterAt(double celsius, List<AssumptionDto> assumptions, AssumptionDto assumption)
    {
        // Clamp only against rounding of the F to C conversion at the ends of the range (212 F is exactly 100 C).
        celsius = Math.Clamp(celsius, Water.MinimumTemperature, Water.MaximumTemperature);
        var p = Water.At(celsius);
        assumptions.Add(assumption);
        return new FluidProperties(p.KinematicViscosity, p.Density);
    }

    /// <summary>The Core's regime as a wire code.</summary>
    public static string RegimeCode(Core.Friction.FlowRegime regime) => regime switch
    {
        Core.Friction.FlowRegime.Laminar => "laminar",
        Core.Friction.FlowRegime.Transitional => "transitional",
        _ => "turbulent",
    };

    /// <summary>A validity check in the response's units (lengths, velocities, viscosities converted).</summary>
    public ValidityDto Validity(ValidityCheck v)
    {
        return new ValidityDto(v.Method, v.Quantity, Convert(v.Quantity, v.Minimum),
            double.IsPositiveInfinity(v.Maximum) ? null : Convert(v.Quantity, v.Maximum), Convert(v.Quantity, v.Value), v.InRange, v.Source);
    }

    /// <summary>The checks in the response's units, in their order (a loop rather than a query: a batch builds these for
    /// every row).</summary>
    public List<ValidityDto> Validity(IReadOnlyList<ValidityCheck> checks)
    {
        var list = new List<ValidityDto>(checks.Count);
        for (int i = 0; i < checks.Count; i++) list.Add(Validity(checks[i]));
        return list;
    }

    /// <summary>A value of a validity check's quantity in the response's unit (numbers without a unit as they are).</summary>
    private double Convert(string quantity, double x) => quantity switch
    {
        "diameter" => Units.Length(x),
        "velocity" => Units.Velocity(x),
        "kinematicViscosity" => Units.KinematicViscosity(x),
        _ => x,
    };

    /// <summary>ρ g h in the response's pressure unit, or null without a density.</summary>
    public double? Pressure(double? si) => si is double p ? Units.Pressure(p) : null;

    /// <summary>The density in the response's unit, or null.</summary>
    public double? DensityOut => Fluid.Density is double rho ? Units.Density(rho) : null;

    /// <summary>The Core's coded warnings as wire records (their messages quote SI values).</summary>
    public static List<WarningDto> Warnings(IEnumerable<CalculationWarning> warnings)
    {
        if (warnings is not IReadOnlyList<CalculationWarning> list) return warnings.Select(WarningDto.From).ToList();
        var dtos = new List<WarningDto>(list.Count);
        for (int i = 0; i < list.Count; i++) dtos.Add(WarningDto.From(list[i]));
        return dtos;
    }
}

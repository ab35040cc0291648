using System.ComponentModel;
using System.Globalization;
using FlowSolve.Api.Contracts;
using FlowSolve.Api.Hosting;
using FlowSolve.Api.Problems;
using FlowSolve.Api.Sheets;
using FlowSolve.Core.Fluids;
using Microsoft.AspNetCore.Http.HttpResults;
using Microsoft.AspNetCore.Mvc;

namespace FlowSolve.Api.Fluids;

/// <summary>Inputs of the water-properties lookup.</summary>
public sealed record WaterRequest(
    [property: Description("Water temperature, degrees Celsius (0 to 100; degrees Fahrenheit, 32 to 212, with units=us).")]
    [FromQuery(Name = "temperature")] double? Temperature,
    [property: Description("Unit system of the request and response: si (default) or us.")]
    [FromQuery(Name = "units")] string? Units = null);

/// <summary>Properties of liquid water at atmospheric pressure.</summary>
/// <param name="Temperature">Temperature as given (degrees C, or degrees F with units=us).</param>
/// <param name="Density">Density, kg/m3 (lb/ft3 with units=us). IAPWS-IF97 region 1.</param>
/// <param name="DynamicViscosity">Dynamic viscosity, Pa s (lbf s/ft2 with units=us). IAPWS 2008, industrial form.</param>
/// <param name="KinematicViscosity">Kinematic viscosity, m2/s (ft2/s with units=us).</param>
/// <param name="VapourPressure">Saturation (vapour) pressure, Pa (psi with units=us). IAPWS-IF97 region 4.</param>
/// <param name="Pressure">The pressure the properties are evaluated at, Pa (psi with units=us): 1 standard atmosphere.</param>
/// <param name="Units">si or us.</param>
/// <param name="Method">The formulations used.</param>
/// <param name="Validity">The formulations' ranges beside the input.</param>
/// <param name="Warnings">Warnings with stable codes.</param>
/// <param name="Assumptions">Defaults that were applied.</param>
public sealed record WaterResponse(
    double Temperature, double Density, double DynamicViscosity, double KinematicViscosity, double VapourPressure,
    double Pressure, string Units, string Method,
    IReadOnlyList<ValidityDto> Validity, IReadOnlyList<WarningDto> Warnings, IReadOnlyList<AssumptionDto> Assumptions) : IWarned, ISensitive
{
    /// <summary>Present only with sensitivities=true: output field name, then input field name, then {derivative, elasticity}; see the sensitivities query parameter. Derivatives in SI units whatever the request's units; elasticity absent when the output or the input is zero.</summary>
    public IReadOnlyDictionary<string, IReadOnlyDictionary<string, SensitivityDto>>? Sensitivities { get; init; }
}


/// <summary>Properties of liquid water: <c>GET /v1/fluids/water</c>.</summary>
public sealed class WaterCalculation : Calculation<WaterRequest, WaterResponse>
{
    private const string Method = "IAPWS-IF97 region 1 (density) and region 4 (vapour pressure); IAPWS 2008 viscosity release, industrial form";

    public override CalculationInfo Info { get; } = new("fluids/water", "Fluids", "Water", "kinematicViscosity",
        "Properties of liquid water at atmospheric pressure",
        "Density, dynamic and kinematic viscosity and vapour pressure of liquid water at 1 standard atmosphere " +
        "(101325 Pa), 0 to 100 degrees C, from IAPWS-IF97 and the IAPWS 2008 viscosity release. At 1 atm water boils at " +
        "99.974 degrees C: from there to 100 degrees C the properties are those of saturated liquid, with a warning.");

    public override IReadOnlyList<(string Name, string Value)> QueryExample { get; } = [("temperature", "20")];

    public override Sheet Sheet(WaterRequest request, WaterResponse answer) => WaterSheet.Build(request, answer);

    public override Outcome<WaterResponse> Solve(WaterRequest request, in CalculationContext context)
    {
        var errors = new FieldErrors();
        var units = UnitSystem.Parse(request.Units, errors);
        double? t = request.Temperature;
        if (units.IsUs && t is double f) t = Units.FahrenheitToCelsius(f);
        // Validate in the caller's own unit so the message quotes the range they can act on.
        if (units.IsUs) errors.Required("temperature", request.Temperature, 32, 212, unit: "degrees F");
        else errors.Required("temperature", request.Temperature, Water.MinimumTemperature, Water.MaximumTemperature, unit: "degrees C");
        if (errors.Any) return ProblemResults.BadInput(errors);

        double celsius = Math.Clamp(t!.Value, Water.MinimumTemperature, Water.MaximumTemperature);
        var p = Water.At(celsius);
        var warnings = new List<WarningDto>();
        if (Water.IsAboveAtmosphericBoiling(celsius))
            warnings.Add(new("above-boiling-point", string.Create(CultureInfo.InvariantCulture,
                $"{celsius:0.###} degrees C is above the boiling point at 1 atm ({Water.SaturationTemperatureAtmospheric:0.###} degrees C): the properties are those of saturated liquid; a real system at this temperature needs a higher pressure or will flash.")));

        var assumptions = new List<AssumptionDto>
        {
            new("pressure", "101325 Pa", "liquid water at 1 standard atmosphere"),
        };
        if (request.Units is null) assumptions.Add(new("units", "si", "SI units (default)"));

        // The Core's ranges in degrees C, shown in the request's unit beside the temperature as given.
        var validity = Water.Validity(celsius).Select(v => new ValidityDto(v.Method, v.Quantity, units.Temperature(v.Minimum),
            units.Temperature(v.Maximum), request.Temperature!.Value, v.InRange, v.Source)).ToArray();

        var response = new WaterResponse(
            request.Temperature!.Value, units.Density(p.Density), units.DynamicViscosity(p.DynamicViscosity),
            units.KinematicViscosity(p.KinematicViscosity), units.Pressure(p.VapourPressure), units.Pressure(Water.AtmosphericPressure),
            units.Code, Method, validity, warnings, assumptions);
        if (context.Sensitivities)
        {
            // Analytic temperature derivatives (WaterSensitivity), per kelvin, in SI; elasticities against degrees C.
            var d = WaterSensitivity.At(celsius);
            var b = new SensitivityBuilder();
            b.Add("density", p.Density, "temperature", celsius, d.DensityDerivative);
            b.Add("dynamicViscosity", p.DynamicViscosity, "temperature", celsius, d.DynamicViscosityDerivative);
            b.Add("kinematicViscosity", p.KinematicViscosity, "temperature", celsius, d.KinematicViscosityDerivative);
            b.Add("vapourPressure", p.VapourPressure, "temperature", celsius, d.VapourPressureDerivative);
            response = response with { Sensitivities = b.Build() };
        }
        return response;
    }
}

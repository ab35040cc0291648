using FlowSolve.Api.Hosting;

namespace FlowSolve.Api.Channels;

/// <summary>
/// Length, area, flow and velocity conversions for the channel endpoints, both ways, with the exact foot of
/// <see cref="Units.Foot"/> (0.3048 m). Manning n is not converted: Manning's n is quoted in s m^-1/3 in both systems,
/// and converting lengths exactly is what turns the SI equation (k = 1) into the customary one with k = 1.486.
/// </summary>
internal readonly record struct ChannelUnits(UnitSystem System)
{
    public bool IsUs => System.IsUs;

    public string LengthUnit => IsUs ? "ft" : "m";

    public string FlowUnit => IsUs ? "ft3/s" : "m3/s";

    /// <summary>A length in the request's unit to m.</summary>
    public double LengthToSi(double value) => System.LengthToSi(value);

    /// <summary>A flow in the request's unit to m3/s.</summary>
    public double FlowToSi(double value) => IsUs ? value * Units.CubicFoot : value;

    /// <summary>m to the response unit (ft for US).</summary>
    public double Length(double si) => System.Length(si);

    /// <summary>m2 to the response unit (ft2 for US).</summary>
    public double Area(double si) => System.Area(si);

    /// <summary>m3/s to the response unit (ft3/s for US).</summary>
    public double Flow(double si) => IsUs ? si / Units.CubicFoot : si;

    /// <summary>m/s to the response unit (ft/s for US).</summary>
    public double Velocity(double si) => System.Velocity(si);
}

using System.Runtime.CompilerServices;
using FlowSolve.Core.Friction;

namespace FlowSolve.Core.Pipes;

/// <summary>A straight pipe of constant inside diameter, with its fittings lumped into one loss coefficient.</summary>
/// <param name="Length">Pipe length L in m; finite and positive.</param>
/// <param name="Diameter">Inside diameter D in m; finite and positive.</param>
/// <param name="Roughness">Absolute roughness e in m; finite, 0 (smooth) or more, and below <paramref name="Diameter"/>.</param>
/// <param name="MinorLossCoefficient">Sum of the fittings' loss coefficients K (dimensionless, 0 or more), each applied
/// to the pipe's velocity head V^2/(2g); see <see cref="MinorLossTable"/>.</param>
public readonly record struct PipeGeometry(double Length, double Diameter, double Roughness, double MinorLossCoefficient = 0)
{
    /// <summary>Relative roughness e/D.</summary>
    public double RelativeRoughness => Roughness / Diameter;

    /// <summary>Flow area pi D^2 / 4 in m2.</summary>
    public double Area => 0.25 * Math.PI * Diameter * Diameter;

    /// <summary>The same pipe with another inside diameter (the diameter solve and size selection use it).</summary>
    /// <param name="diameter">Inside diameter in m.</param>
    public PipeGeometry WithDiameter(double diameter) => this with { Diameter = diameter };
}

/// <summary>The fluid as the pipe relations need it. Water at a temperature is resolved to these values by the caller.</summary>
/// <param name="KinematicViscosity">Kinematic viscosity nu in m2/s; finite and positive (water at 20 degrees C: about 1.004e-6).</param>
/// <param name="Density">Density rho in kg/m3; finite and positive, or null when unknown (pressures are then not reported).</param>
public readonly record struct FluidProperties(double KinematicViscosity, double? Density = null);

/// <summary>Settings shared by the pipe calculations.</summary>
/// <param name="Friction">Laminar and turbulent Reynolds-number limits handed to <see cref="DarcyFriction"/>.</param>
/// <param name="MinimumDesignVelocity">Lowest mean velocity in m/s not warned about (0.6 m/s: common practice for water
/// mains, to keep sediment moving).</param>
/// <param name="MaximumDesignVelocity">Highest mean velocity in m/s not warned about (3.0 m/s: common practice for water
/// mains, against erosion, noise and surge).</param>
public readonly record struct PipeOptions(FrictionOptions Friction, double MinimumDesignVelocity, double MaximumDesignVelocity)
{
    /// <summary>Regime limits 2000 and 4000, design velocities 0.6 to 3.0 m/s (all common practice).</summary>
    public static PipeOptions Default { get; } = new(FrictionOptions.Default, 0.6, 3.0);
}

/// <summary>Argument checks shared by the pipe calculations; the throws sit outside the hot methods.</summary>
internal static class PipeGuard
{
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static void Geometry(in PipeGeometry pipe)
    {
        if (!(pipe.Length > 0) || !double.IsFinite(pipe.Length)) Throw("length", pipe.Length, "must be finite and positive");
        Section(pipe.Diameter, pipe.Roughness, pipe.MinorLossCoefficient);
    }

    /// <summary>Length, roughness and minor losses without a diameter (the diameter solve).</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static void WithoutDiameter(in PipeGeometry pipe)
    {
        if (!(pipe.Length > 0) || !double.IsFinite(pipe.Length)) Throw("length", pipe.Length, "must be finite and positive");
        if (!(pipe.Roughness >= 0) || !double.IsFinite(pipe.Roughness)) Throw("roughness", pipe.Roughness, "must be finite and 0 or more");
        if (!(pipe.MinorLossCoefficient >= 0) || !double.IsFinite(pipe.MinorLossCoefficient))
            Throw("minorLossCoefficient", pipe.MinorLossCoefficient, "must be finite and 0 or more");
    }

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static void Section(double diameter, double roughness, double minorLossCoefficient)
    {
        if (!(diameter > 0) || !double.IsFinite(diameter)) Throw("diameter", diameter, "must be finite and positive");
        if (!(roughness >= 0) || !double.IsFinite(roughness)) Throw("roughness", roughness, "must be finite and 0 or more");
        if (!(roughness < diameter)) Throw("roughness", roughness, "must be smaller than the inside diameter");
        if (!(minorLossCoefficient >= 0) || !double.IsFinite(minorLossCoefficient))
            Throw("minorLossCoefficient", minorLossCoefficient, "must be finite and 0 or more");
    }

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static void Fluid(in FluidProperties fluid)
    {
        if (!(fluid.KinematicViscosity > 0) || !double.IsFinite(fluid.KinematicViscosity))
            Throw("kinematicViscosity", fluid.KinematicViscosity, "must be finite and positive");
        if (fluid.Density is double rho && (!(rho > 0) || !double.IsFinite(rho)))
            Throw("density", rho, "must be finite and positive");
    }

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static void Positive(double value, string name)
    {
        if (!(value > 0) || !double.IsFinite(value)) Throw(name, value, "must be finite and positive");
    }

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static void Finite(double value, string name)
    {
        if (!double.IsFinite(value)) Throw(name, value, "must be finite");
    }

    [MethodImpl(MethodImplOptions.NoInlining)]
    private static void Throw(string name, double value, string why) =>
        throw new ArgumentOutOfRangeException(name, value, why);
}

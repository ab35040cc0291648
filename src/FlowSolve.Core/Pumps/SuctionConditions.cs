using FlowSolve.Core.Fluids;
using FlowSolve.Core.Pipes;

namespace FlowSolve.Core.Pumps;

/// <summary>The suction side of a pump, for the net positive suction head available.</summary>
/// <param name="SurfacePressure">Absolute pressure on the liquid surface in Pa (an open tank: the atmospheric pressure,
/// 101325 Pa at sea level); finite and positive.</param>
/// <param name="VapourPressure">Vapour pressure of the liquid at its temperature in Pa; finite, 0 or more
/// (for water use <see cref="ForWater"/>, which takes it from <see cref="Water.VapourPressure"/>).</param>
/// <param name="StaticSuctionHead">Height of the liquid level above the pump's datum (impeller eye) in m: positive for a
/// flooded suction, negative for a suction lift; finite.</param>
/// <param name="LossHead">Suction losses given as a head in m (entrance, fittings, friction); finite, 0 or more.
/// Added to the loss of <paramref name="SuctionPipe"/> when both are given.</param>
/// <param name="SuctionPipe">A suction pipe whose Darcy-Weisbach loss (exact friction factor, its minor losses) is
/// computed at the flow per pump; null for none. Each pump is taken to have its own suction pipe.</param>
public readonly record struct SuctionConditions(
    double SurfacePressure, double VapourPressure, double StaticSuctionHead, double LossHead = 0, PipeGeometry? SuctionPipe = null)
{
    /// <summary>Suction conditions for water, the vapour pressure from IAPWS-IF97 region 4 (<see cref="Water.VapourPressure"/>).</summary>
    /// <param name="temperatureCelsius">Water temperature in degrees C, 0 to 100.</param>
    /// <param name="staticSuctionHead">Level above the pump in m (negative for a lift).</param>
    /// <param name="surfacePressure">Absolute surface pressure in Pa; the standard atmosphere, 101325 Pa, when omitted.</param>
    /// <param name="lossHead">Suction losses as a head in m, 0 or more.</param>
    /// <param name="suctionPipe">Optional suction pipe.</param>
    /// <exception cref="ArgumentOutOfRangeException">The temperature is outside 0..100 degrees C.</exception>
    public static SuctionConditions ForWater(double temperatureCelsius, double staticSuctionHead,
        double surfacePressure = Water.AtmosphericPressure, double lossHead = 0, PipeGeometry? suctionPipe = null) =>
        new(surfacePressure, Water.VapourPressure(temperatureCelsius), staticSuctionHead, lossHead, suctionPipe);

    internal void Validate()
    {
        PumpGuard.Positive(SurfacePressure, "surfacePressure");
        PumpGuard.NonNegative(VapourPressure, "vapourPressure");
        PumpGuard.Finite(StaticSuctionHead, "staticSuctionHead");
        PumpGuard.NonNegative(LossHead, "lossHead");
        if (SuctionPipe is PipeGeometry pipe)
        {
            try { PipeGuard.Geometry(pipe); }
            catch (ArgumentOutOfRangeException e)
            {
                throw new ArgumentOutOfRangeException($"suctionPipe.{e.ParamName}", e.ActualValue, e.Message);
            }
        }
    }
}

/// <summary>Net positive suction head available.</summary>
public static class NpshAvailable
{
    /// <summary>NPSHa = (p_surface - p_vapour)/(rho g) + z_s - h_losses, in m, with g = standard gravity.</summary>
    /// <param name="surfacePressure">Absolute pressure on the liquid surface in Pa; finite and positive.</param>
    /// <param name="vapourPressure">Vapour pressure in Pa; finite, 0 or more.</param>
    /// <param name="density">Liquid density in kg/m3; finite and positive.</param>
    /// <param name="staticSuctionHead">Liquid level above the pump in m (negative for a lift); finite.</param>
    /// <param name="lossHead">Suction losses in m; finite, 0 or more.</param>
    /// <returns>NPSH available in m (may be negative: the liquid would boil before reaching the pump).</returns>
    /// <exception cref="ArgumentOutOfRangeException">An argument is outside its domain.</exception>
    public static double Compute(double surfacePressure, double vapourPressure, double density, double staticSuctionHead, double lossHead)
    {
        PumpGuard.Positive(surfacePressure, nameof(surfacePressure));
        PumpGuard.NonNegative(vapourPressure, nameof(vapourPressure));
        PumpGuard.Positive(density, nameof(density));
        PumpGuard.Finite(staticSuctionHead, nameof(staticSuctionHead));
        PumpGuard.NonNegative(lossHead, nameof(lossHead));
        return (surfacePressure - vapourPressure) / (density * Physical.StandardGravity) + staticSuctionHead - lossHead;
    }

    /// <summary>NPSH available for suction conditions at a flow per pump.</summary>
    /// <param name="suction">The suction side.</param>
    /// <param name="fluid">The fluid: density required; kinematic viscosity when there is a suction pipe.</param>
    /// <param name="flowPerPump">Flow through each pump's suction in m3/s; finite, 0 or more.</param>
    /// <returns>NPSHa in m, and the suction loss used in m (LossHead plus the pipe's loss).</returns>
    /// <exception cref="ArgumentException">An argument is outside its domain or the fluid has no density.</exception>
    public static (double NpshAvailable, double SuctionLoss) Compute(in SuctionConditions suction, in FluidProperties fluid, double flowPerPump)
    {
        suction.Validate();
        if (fluid.Density is not double rho) throw new ArgumentException("the fluid's density is needed for NPSH available", "density");
        PumpGuard.NonNegative(flowPerPump, nameof(flowPerPump));
        double loss = suction.LossHead;
        if (suction.SuctionPipe is PipeGeometry pipe)
        {
            PumpGuard.Positive(fluid.KinematicViscosity, "kinematicViscosity");
            loss += PipeHeadLoss.WithDerivative(pipe, fluid.KinematicViscosity, flowPerPump).HeadLoss;
        }
        return (Compute(suction.SurfacePressure, suction.VapourPressure, rho, suction.StaticSuctionHead, loss), loss);
    }
}

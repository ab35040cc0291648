using System.Runtime.CompilerServices;

namespace FlowSolve.Core.NonNewtonian;

/// <summary>The rheological model of a time-independent non-Newtonian fluid.</summary>
public enum RheologyModel
{
    /// <summary>Power law (Ostwald-de Waele): tau = K gamma^n.</summary>
    PowerLaw,

    /// <summary>Bingham plastic: no flow below the yield stress tau0, then tau = tau0 + mu_p gamma.</summary>
    BinghamPlastic,
}

/// <summary>A non-Newtonian fluid as the pipe relations need it. Build one with <see cref="PowerLaw"/> or
/// <see cref="BinghamPlastic"/>; the fields of the other model are NaN.</summary>
/// <param name="Model">The rheological model.</param>
/// <param name="Density">Density rho in kg/m3; finite and positive.</param>
/// <param name="ConsistencyIndex">Power law: consistency index K in Pa s^n; finite and positive.</param>
/// <param name="FlowBehaviorIndex">Power law: flow behaviour index n (dimensionless); in
/// [<see cref="NonNewtonianFluid.MinimumFlowBehaviorIndex"/>, <see cref="NonNewtonianFluid.MaximumFlowBehaviorIndex"/>].</param>
/// <param name="YieldStress">Bingham plastic: yield stress tau0 in Pa; finite, 0 or more (0 is a Newtonian fluid).</param>
/// <param name="PlasticViscosity">Bingham plastic: plastic viscosity mu_p in Pa s; finite and positive.</param>
/// <remarks>The rheological constants hold only over the shear rates at which they were measured: they must come from
/// measurements of the actual fluid (a rotational or tube viscometer) over the shear rates of the pipe.</remarks>
public readonly record struct NonNewtonianFluid(RheologyModel Model, double Density, double ConsistencyIndex,
    double FlowBehaviorIndex, double YieldStress, double PlasticViscosity)
{
    /// <summary>Smallest flow behaviour index accepted. Below it 4/n^0.75 and 0.4/n^1.2 in Dodge-Metzner grow past any
    /// practical meaning (real shear-thinning fluids have n of about 0.1 and more: common practice).</summary>
    public const double MinimumFlowBehaviorIndex = 0.01;

    /// <summary>Largest flow behaviour index accepted: for n &gt; 2 Dodge-Metzner, written in 1/sqrt(f), is no longer
    /// monotone and may have two roots or none, and the Metzner-Reed Reynolds number falls as the velocity rises.</summary>
    public const double MaximumFlowBehaviorIndex = 2.0;

    /// <summary>A power-law fluid.</summary>
    /// <param name="density">rho in kg/m3.</param>
    /// <param name="consistencyIndex">K in Pa s^n.</param>
    /// <param name="flowBehaviorIndex">n (dimensionless).</param>
    public static NonNewtonianFluid PowerLaw(double density, double consistencyIndex, double flowBehaviorIndex) =>
        new(RheologyModel.PowerLaw, density, consistencyIndex, flowBehaviorIndex, double.NaN, double.NaN);

    /// <summary>A Bingham plastic.</summary>
    /// <param name="density">rho in kg/m3.</param>
    /// <param name="yieldStress">tau0 in Pa.</param>
    /// <param name="plasticViscosity">mu_p in Pa s.</param>
    public static NonNewtonianFluid BinghamPlastic(double density, double yieldStress, double plasticViscosity) =>
        new(RheologyModel.BinghamPlastic, density, double.NaN, double.NaN, yieldStress, plasticViscosity);

    /// <summary>Throws <see cref="ArgumentOutOfRangeException"/> naming the first field outside its domain.</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    internal void Validate()
    {
        if (!(Density > 0) || !double.IsFinite(Density)) Throw(nameof(Density), Density, "must be finite and positive");
        if (Model == RheologyModel.PowerLaw)
        {
            if (!(ConsistencyIndex > 0) || !double.IsFinite(ConsistencyIndex))
                Throw(nameof(ConsistencyIndex), ConsistencyIndex, "must be finite and positive");
            if (!(FlowBehaviorIndex >= MinimumFlowBehaviorIndex && FlowBehaviorIndex <= MaximumFlowBehaviorIndex))
                Throw(nameof(FlowBehaviorIndex), FlowBehaviorIndex, "must be in [0.01, 2]");
        }
        else if (Model == RheologyModel.BinghamPlastic)
        {
            if (!(YieldStress >= 0) || !double.IsFinite(YieldStress)) Throw(nameof(YieldStress), YieldStress, "must be finite and 0 or more");
            if (!(PlasticViscosity > 0) || !double.IsFinite(PlasticViscosity))
                Throw(nameof(PlasticViscosity), PlasticViscosity, "must be finite and positive");
        }
        else
        {
            Throw(nameof(Model), (double)Model, "unknown model");
        }
    }

    [MethodImpl(MethodImplOptions.NoInlining)]
    internal static void Throw(string name, double value, string why) => throw new ArgumentOutOfRangeException(name, value, why);
}

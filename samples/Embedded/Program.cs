// FlowSolve.Core embedded in-process: the Vandrel Vale water scheme solved without a service.
// The scheme and all its data are invented for the demo (no real place, firm or person). Every result is an
// engineering estimate to be checked by a qualified engineer; local codes, standards and licensed practice govern.
//
// Run: dotnet run --project samples/Embedded
using System.Globalization;
using FlowSolve.Core;
using FlowSolve.Core.Channels;
using FlowSolve.Core.Fluids;
using FlowSolve.Core.Numerics;
using FlowSolve.Core.Friction;
using FlowSolve.Core.Pipes;
using FlowSolve.Core.Pumps;

CultureInfo.CurrentCulture = CultureInfo.InvariantCulture;
int failures = 0;

Console.WriteLine("Vandrel Vale water scheme (invented for the demo), solved in-process with FlowSolve.Core");
Console.WriteLine("Engineering estimates: to be checked by a qualified engineer; local codes govern.");

// --- the fluid: river water at 12 degrees C --------------------------------------------------------------------------
const double temperature = 12.0;
var water = Water.At(temperature);
var fluid = new FluidProperties(water.KinematicViscosity, water.Density);
Heading("Water at 12 C (IAPWS-IF97, IAPWS 2008)");
Console.WriteLine($"  density {water.Density:F3} kg/m3, kinematic viscosity {water.KinematicViscosity:0.0000E+00} m2/s, " +
                  $"vapour pressure {water.VapourPressure:F0} Pa");

// --- the pumping main: intake wet well (42.0 m) to Orvex reservoir (TWL 118.5 m) ----------------------------------
const double mainFlow = 0.12, lift = 118.5 - 42.0;
double k = MinorLossTable.Sum([
    new FittingCount("elbow-90-flanged-long-radius", 8), new FittingCount("gate-valve-open", 2),
    new FittingCount("swing-check-valve-forward", 1), new FittingCount("exit", 1)]);
var main = new PipeGeometry(Length: 2350, Diameter: 0.35, Roughness: RoughnessTable.Roughness("commercial-steel"), MinorLossCoefficient: k);
var mainLoss = PipeHeadLoss.Compute(main, fluid, mainFlow, elevationRise: lift);
Heading("Pumping main: 2350 m of 350 mm steel at 0.12 m3/s");
Console.WriteLine($"  K of the fittings {k:G4}; V {mainLoss.State.Velocity:F3} m/s, Re {mainLoss.State.Reynolds:F0}, " +
                  $"e/D {main.RelativeRoughness:0.000E+00}");
Console.WriteLine($"  head loss {mainLoss.HeadLoss:F3} m (friction {mainLoss.State.FrictionHeadLoss:F3}, fittings " +
                  $"{mainLoss.State.MinorHeadLoss:F3}); head with the {lift} m lift {mainLoss.TotalHead:F2} m");
Report(mainLoss.Converged, mainLoss.Iterations, mainLoss.Status.Code(), mainLoss.DescribeWarnings());

var friction = ColebrookWhite.Solve(mainLoss.State.Reynolds, main.RelativeRoughness);
Heading("Colebrook-White friction factor at the main's Reynolds number");
Console.WriteLine($"  f = {friction.FrictionFactor:F8}, residual of the equation {ColebrookWhite.Residual(friction.FrictionFactor, mainLoss.State.Reynolds, main.RelativeRoughness):0.00E+00}");
Report(friction.Converged, friction.Iterations, friction.Status.Code(), []);

// --- the intake pumps: two in parallel, one pump H = 98 - 2400 Q^2 (invented curve, no real product's) --------------
var pump = PumpCurve.FromCoefficients(98, 0, -2400);
var system = SystemCurve.FromPipes(lift, [main], fluid);
var duty = DutyPoint.Solve(pump, system, PumpArrangement.InParallel(2));
Heading("Duty point: two pumps in parallel on the pumping main");
if (duty.Converged)
{
    Console.WriteLine($"  flow {duty.Flow:F4} m3/s at {duty.Head:F2} m; per pump {duty.FlowPerPump:F4} m3/s at {duty.HeadPerPump:F2} m");
}
Report(duty.Converged, duty.Iterations, duty.Status.Code(), duty.DescribeWarnings());

// --- the gravity line: Orvex (TWL 118.5 m) to Tazmerin village tank (TWL 96.0 m), 4800 m of PE --------------------
const double villageFlow = 0.045, levels = 118.5 - 96.0, gravityLength = 4800;
double pe = RoughnessTable.Roughness("drawn-plastic-tubing");
var size = PipeDiameter.SelectSize("iso-4427-pe-sdr-11", gravityLength, pe, 0, fluid, villageFlow, levels);
Heading("Gravity line: smallest ISO 4427 PE SDR 11 size for 0.045 m3/s within 22.5 m");
Console.WriteLine($"  minimum bore {size.Minimum.Diameter * 1000:F1} mm after {size.Minimum.Iterations} Newton steps in ln D " +
                  $"({size.Minimum.FrictionIterations} Colebrook-White iterations in all)");
if (size.Size is PipeSize chosen)
{
    Console.WriteLine($"  chosen {chosen.Name}: bore {chosen.InsideDiameter * 1000:F1} mm, loss {size.AtSize.HeadLoss:F2} m, " +
                      $"V {size.AtSize.State.Velocity:F2} m/s");
    var capacity = PipeFlow.Solve(new PipeGeometry(gravityLength, chosen.InsideDiameter, pe), fluid, levels);
    Console.WriteLine($"  {chosen.Name} carries {capacity.Flow:F4} m3/s with both tanks at top water level " +
                      $"({capacity.Iterations} Newton steps in ln Q)");
    Report(capacity.Converged, capacity.Iterations, capacity.Status.Code(), capacity.DescribeWarnings());
}
else
{
    Report(false, size.Minimum.Iterations, size.Status.Code(), size.Minimum.DescribeWarnings());
}

// --- the Brevix lined canal and the Pegwhistle Lane culvert, 1.8 m3/s -----------------------------------------------
const double canalFlow = 1.8;
var canal = new TrapezoidalSection(bottomWidth: 1.2, sideSlope: 1.5);
var canalDepth = ManningSolver.NormalDepth(canal, canalFlow, slope: 0.0005, manningN: 0.015);
Heading("Brevix canal: trapezoid 1.2 m, 1.5 : 1, n 0.015, S 0.0005");
Console.WriteLine($"  normal depth {canalDepth.NormalDepth:F3} m, V {canalDepth.Velocity:F3} m/s, Fr {canalDepth.FroudeNumber:F3} " +
                  $"({canalDepth.Regime.ToString().ToLowerInvariant()}), critical depth {canalDepth.CriticalDepth:F3} m");
Report(canalDepth.Converged, canalDepth.Iterations, canalDepth.Status.Code(), ChannelWarnings(canalDepth.Warnings));

var critical = CriticalFlow.CriticalDepth(canal, canalFlow, manningN: 0.015);
Console.WriteLine($"  critical depth on its own: {critical.CriticalDepth:F3} m, critical slope {critical.CriticalSlope:F5}");
Report(critical.Converged, critical.Iterations, critical.Status.Code(), ChannelWarnings(critical.Warnings));

var culvert = ManningSolver.NormalDepth(new CircularSection(1.5), canalFlow, slope: 0.002, manningN: 0.013);
Heading("Pegwhistle Lane culvert: 1.5 m pipe, n 0.013, S 0.002, part full");
Console.WriteLine($"  normal depth {culvert.NormalDepth:F3} m ({culvert.NormalDepth / 1.5:P1} of the diameter), " +
                  $"V {culvert.Velocity:F3} m/s, Fr {culvert.FroudeNumber:F3}; full-pipe flow {culvert.Capacity?.FullFlow:F3} m3/s");
Report(culvert.Converged, culvert.Iterations, culvert.Status.Code(), ChannelWarnings(culvert.Warnings));

// --- a caller's own Newton iteration with the head loss and its derivative ------------------------------------------
// A network tool that embeds FlowSolve runs its own Newton iteration; PipeHeadLoss.WithDerivative gives each pipe's
// loss with dh/dQ including the friction factor's own dependence on flow (Simpson and Elhay 2011, J. Hydraul. Eng.
// 137(6): dropping that term slows convergence to linear). Here: the flow the 22.5 m fall between Orvex and
// Tazmerin drives through the gravity line, solved by plain Newton on h(Q) - 22.5 = 0 with the exact derivative.
{
    var line = new PipeGeometry(Length: 4800, Diameter: 0.2292, Roughness: 1.5e-6, MinorLossCoefficient: 6.0);
    const double fall = 118.5 - 96.0;
    double q = 0.01;
    Heading("Caller-side Newton step with dh/dQ (gravity line, 22.5 m fall)");
    for (int iteration = 1; iteration <= 20; iteration++)
    {
        var (h, dhdq) = PipeHeadLoss.WithDerivative(line, fluid.KinematicViscosity, q);
        double step = (h - fall) / dhdq;
        q -= step;
        Console.WriteLine($"  iteration {iteration}: Q {q:0.000000000} m3/s, residual {h - fall:0.000E+00} m");
        if (Math.Abs(step) <= 1e-13 * q) break;
    }
    var check = PipeFlow.Solve(line, fluid, fall);
    Console.WriteLine($"  FlowSolve's own flow solve: {check.Flow:0.000000000} m3/s ({check.Iterations} iterations)");
    if (Math.Abs(check.Flow / q - 1) > 1e-9) failures++;
}

Console.WriteLine();
Console.WriteLine(failures == 0 ? "every calculation converged" : $"{failures} calculation(s) did not converge");
return failures == 0 ? 0 : 1;

static void Heading(string text)
{
    Console.WriteLine();
    Console.WriteLine(text);
}

void Report(bool converged, int iterations, string status, IReadOnlyList<CalculationWarning> warnings)
{
    if (!converged) failures++;
    Console.WriteLine($"  converged {converged} after {iterations} iterations ({status}); warnings: " +
                      (warnings.Count == 0 ? "none" : string.Join("; ", warnings.Select(w => $"{w.Code}: {w.Message}"))));
}

static IReadOnlyList<CalculationWarning> ChannelWarnings(IReadOnlyList<ChannelWarning> warnings) =>
    warnings.Select(w => new CalculationWarning(w.Code.Code(), w.Message)).ToList();

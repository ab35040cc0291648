using System.ComponentModel;
using FlowSolve.Api.Contracts;
using FlowSolve.Api.Hosting;
using FlowSolve.Api.Problems;
using FlowSolve.Core.Pipes;
using Microsoft.AspNetCore.Http.HttpResults;
using Microsoft.AspNetCore.Mvc;

namespace FlowSolve.Api.Pipes;

/// <summary>Inputs of the size-table listing.</summary>
public sealed record PipeSizesRequest(
    [property: Description("A table name, for example asme-b36.10m-schedule-40, to list its sizes; leave out to list the tables.")]
    [FromQuery(Name = "table")] string? Table = null,
    [property: Description("Unit system of the response: si (default; diameters in m) or us (ft).")]
    [FromQuery(Name = "units")] string? Units = null);

/// <summary>Inputs of the roughness-material listing.</summary>
public sealed record PipeMaterialsRequest(
    [property: Description("A material name, for example cast-iron, to list only that one; leave out to list all.")]
    [FromQuery(Name = "name")] string? Name = null,
    [property: Description("Unit system of the response: si (default; roughness in m) or us (ft).")]
    [FromQuery(Name = "units")] string? Units = null);

/// <summary>Inputs of the fittings listing.</summary>
public sealed record PipeFittingsRequest(
    [property: Description("A fitting name, for example gate-valve-open, to list only that one; leave out to list all.")]
    [FromQuery(Name = "name")] string? Name = null);

/// <summary>One listed pipe size.</summary>
/// <param name="Name">The size's name, for example <c>NPS 4</c> or <c>DN 110</c>.</param>
/// <param name="InsideDiameter">Inside diameter, m (ft with units=us): outside diameter - 2 x wall thickness.</param>
/// <param name="OutsideDiameter">Outside diameter, m (ft with units=us).</param>
/// <param name="WallThickness">Wall thickness, m (ft with units=us).</param>
public sealed record PipeSizeDto(string Name, double InsideDiameter, double OutsideDiameter, double WallThickness);

/// <summary>A pipe size table.</summary>
/// <param name="Name">Table name to pass as sizeTable or table, for example <c>asme-b36.10m-schedule-40</c>.</param>
/// <param name="Standard">The standard's title.</param>
/// <param name="Edition">The edition.</param>
/// <param name="Series">The series within the standard.</param>
/// <param name="Provenance">Whether the values were read from the standard or recalled ("from memory").</param>
/// <param name="Note">How the inside diameter is obtained.</param>
/// <param name="Count">Number of sizes.</param>
/// <param name="SmallestInsideDiameter">Smallest inside diameter, m (ft with units=us).</param>
/// <param name="LargestInsideDiameter">Largest inside diameter, m (ft with units=us).</param>
/// <param name="Sizes">The sizes, smallest inside diameter first; only when this table was asked for.</param>
public sealed record PipeSizeTableDto(string Name, string Standard, string Edition, string Series, string Provenance, string Note,
    int Count, double SmallestInsideDiameter, double LargestInsideDiameter, IReadOnlyList<PipeSizeDto>? Sizes);

/// <summary>The pipe size tables.</summary>
/// <param name="Units">si or us.</param>
/// <param name="Tables">Every table (without sizes), or the one asked for (with its sizes).</param>
public sealed record PipeSizesResponse(string Units, IReadOnlyList<PipeSizeTableDto> Tables);

/// <summary>A pipe material and its absolute roughness.</summary>
/// <param name="Name">Material name to pass as material, for example <c>cast-iron</c>.</param>
/// <param name="Description">The material as the source describes it.</param>
/// <param name="New">Absolute roughness of new pipe, m (ft with units=us).</param>
/// <param name="Aged">Absolute roughness of aged pipe, m (ft with units=us); absent where the source gives none.</param>
/// <param name="AgedDescription">The aged surface as the source describes it; absent where none.</param>
/// <param name="UncertaintyPercent">The uncertainty the source states beside the new value, percent (recalled, from memory);
/// absent where it states none. The scatter of new surfaces, not ageing; pipe calculations with sensitivities=true use it
/// for roughnessSpread when there is no aged value.</param>
public sealed record RoughnessMaterialDto(string Name, string Description, double New, double? Aged, string? AgedDescription,
    double? UncertaintyPercent);

/// <summary>The roughness table.</summary>
/// <param name="Source">The handbook the values come from.</param>
/// <param name="Provenance">Whether the values were read or recalled ("from memory").</param>
/// <param name="Units">si or us.</param>
/// <param name="Materials">The materials, in the source's order.</param>
public sealed record PipeMaterialsResponse(string Source, string Provenance, string Units, IReadOnlyList<RoughnessMaterialDto> Materials);

/// <summary>A fitting and its loss coefficient.</summary>
/// <param name="Name">Fitting name to pass in fittings, for example <c>gate-valve-open</c>.</param>
/// <param name="Description">The fitting as the source describes it.</param>
/// <param name="LossCoefficient">K (dimensionless), applied to the pipe's velocity head V^2/(2g).</param>
public sealed record FittingDto(string Name, string Description, double LossCoefficient);

/// <summary>The fittings table.</summary>
/// <param name="Source">The book the values come from.</param>
/// <param name="Provenance">Whether the values were read or recalled ("from memory").</param>
/// <param name="Fittings">The fittings, in the source's order.</param>
public sealed record PipeFittingsResponse(string Source, string Provenance, IReadOnlyList<FittingDto> Fittings);

/// <summary><c>GET /v1/pipes/sizes</c>, <c>/materials</c> and <c>/fittings</c>: the tables the pipe calculations draw on.</summary>
public static class PipeTableEndpoints
{
    private const string TableCaution = " Values marked \"from memory\" in provenance were recalled, not read from the source: check them before relying on them.";

    /// <summary>Maps the pipe tables below <c>/v1/pipes</c>. The pipe calculations themselves (head-loss, flow, diameter)
    /// are in <see cref="Catalogue"/>.</summary>
    public static IEndpointRouteBuilder MapPipeEndpoints(this IEndpointRouteBuilder routes)
    {
        routes.MapGroup("/v1/pipes").WithTags("Pipes").MapPipeTableEndpoints();
        return routes;
    }

    public static RouteGroupBuilder MapPipeTableEndpoints(this RouteGroupBuilder group)
    {
        group.MapGet("/sizes", ([AsParameters] PipeSizesRequest request) => Sizes(request))
            .WithName("GetPipeSizes")
            .WithSummary("Pipe size tables, or one table's sizes")
            .WithDescription("Lists the embedded pipe size tables (standard, edition, series, range of inside diameters), or with table= the sizes of one (name, outside diameter, wall thickness, inside diameter), smallest bore first. /v1/pipes/diameter picks from these with sizeTable." + TableCaution)
            .WithQueryExample(("table", "asme-b36.10m-schedule-40"));
        group.MapGet("/materials", ([AsParameters] PipeMaterialsRequest request) => Materials(request))
            .WithName("GetPipeMaterials")
            .WithSummary("Absolute roughness of pipe materials")
            .WithDescription("The roughness table behind the material field of the pipe calculations: new and, where the source gives one, aged absolute roughness." + TableCaution)
            .WithQueryExample(("name", "cast-iron"), ("units", "si"));
        group.MapGet("/fittings", ([AsParameters] PipeFittingsRequest request) => Fittings(request))
            .WithName("GetPipeFittings")
            .WithSummary("Loss coefficients of pipe fittings")
            .WithDescription("The loss coefficients K behind the fittings field of the pipe calculations (typical values for turbulent flow; they vary with size and make)." + TableCaution)
            .WithQueryExample(("name", "gate-valve-open"));
        return group;
    }

    public static Results<Ok<PipeSizesResponse>, ValidationProblem> Sizes(PipeSizesRequest request)
    {
        var errors = new FieldErrors();
        var u = UnitSystem.Parse(request.Units, errors);
        PipeSizeTable? one = null;
        if (request.Table is not null && !PipeSizeTables.TryGet(request.Table, out one))
            errors.Add("table", "unknown table; known: " + string.Join(", ", PipeSizeTables.Names));
        if (errors.Any) return ProblemResults.BadInput(errors);

        var tables = (one is null ? PipeSizeTables.All : [one]).Select(t => new PipeSizeTableDto(
            t.Name, t.Standard, t.Edition, t.Series, t.Provenance, t.Note, t.Sizes.Count,
            u.Length(t.Sizes[0].InsideDiameter), u.Length(t.Sizes[^1].InsideDiameter),
            one is null ? null : t.Sizes.Select(s => new PipeSizeDto(s.Name, u.Length(s.InsideDiameter), u.Length(s.OutsideDiameter), u.Length(s.WallThickness))).ToArray()))
            .ToArray();
        return TypedResults.Ok(new PipeSizesResponse(u.Code, tables));
    }

    public static Results<Ok<PipeMaterialsResponse>, ValidationProblem> Materials(PipeMaterialsRequest request)
    {
        var errors = new FieldErrors();
        var u = UnitSystem.Parse(request.Units, errors);
        if (request.Name is not null && !RoughnessTable.TryGet(request.Name, out _))
            errors.Add("name", "unknown material; known: " + string.Join(", ", RoughnessTable.All.Select(m => m.Name)));
        if (errors.Any) return ProblemResults.BadInput(errors);

        var materials = RoughnessTable.All
            .Where(m => request.Name is null || string.Equals(m.Name, request.Name, StringComparison.OrdinalIgnoreCase))
            .Select(m => new RoughnessMaterialDto(m.Name, m.Description, u.Length(m.New), m.Aged is double a ? u.Length(a) : null, m.AgedDescription,
                m.UncertaintyPercent))
            .ToArray();
        return TypedResults.Ok(new PipeMaterialsResponse(RoughnessTable.Source, RoughnessTable.Provenance, u.Code, materials));
    }

    public static Results<Ok<PipeFittingsResponse>, ValidationProblem> Fittings(PipeFittingsRequest request)
    {
        if (request.Name is not null && !MinorLossTable.TryGet(request.Name, out _))
            return ProblemResults.BadInput("name", "unknown fitting; known: " + string.Join(", ", MinorLossTable.All.Select(f => f.Name)));
        var fittings = MinorLossTable.All
            .Where(f => request.Name is null || string.Equals(f.Name, request.Name, StringComparison.OrdinalIgnoreCase))
            .Select(f => new FittingDto(f.Name, f.Description, f.LossCoefficient))
            .ToArray();
        return TypedResults.Ok(new PipeFittingsResponse(MinorLossTable.Source, MinorLossTable.Provenance, fittings));
    }
}

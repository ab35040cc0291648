using FlowSolve.Api.Contracts;

namespace FlowSolve.Api.Sheets;

/// <summary>One line of a table of quantities: name, value as text, unit, and a note (where it came from).</summary>
public sealed record SheetRow(string Name, string Value, string Unit = "", string Note = "");

/// <summary>A relation used, by name, with its equation in words or symbols and its published source.</summary>
public sealed record SheetMethod(string Name, string Equation, string Source);

/// <summary>A figure: an inline SVG element and its caption.</summary>
public sealed record SheetFigure(string Id, string Svg, string Caption);

/// <summary>A table of results with its own columns (a network's pipes, junctions, convergence record).</summary>
/// <param name="Id">Element id suffix: the table's section is <c>table-{Id}</c>.</param>
/// <param name="Title">The section heading.</param>
/// <param name="Columns">Column headings, units included.</param>
/// <param name="Rows">One array of cell texts per row, as many as there are columns.</param>
/// <param name="Note">A line below the table (empty for none).</param>
/// <param name="InInputs">True for a table of inputs (the network as understood): shown in the inputs section, after
/// the input rows, rather than after the results.</param>
public sealed record SheetTable(string Id, string Title, IReadOnlyList<string> Columns, IReadOnlyList<string[]> Rows, string Note = "", bool InInputs = false);

/// <summary>The solver's record for the sheet: the summary the response gave, and the iterations behind it.</summary>
/// <param name="Iterations">Iterations the response reports.</param>
/// <param name="Converged">Whether the response's solve converged.</param>
/// <param name="FinalResidual">The response's final residual.</param>
/// <param name="ResidualMeaning">What the residual measures.</param>
/// <param name="Status">The stop status code.</param>
/// <param name="StopReason">The stop reason in words.</param>
/// <param name="SolveVariable">The variable iterated on.</param>
/// <param name="Steps">Each iteration (may be empty for an explicit relation).</param>
/// <param name="Note">Where the iterations come from (the response's own trace, or a re-solve for the record).</param>
public sealed record SolverRecord(
    int Iterations, bool Converged, double FinalResidual, string ResidualMeaning, string Status, string StopReason,
    string SolveVariable, IReadOnlyList<TraceStepDto> Steps, string Note);

/// <summary>Everything a calculation sheet shows; <see cref="SheetHtml"/> renders it.</summary>
public sealed class Sheet
{
    public required string Title { get; init; }

    /// <summary>The calculation's route below /v1.</summary>
    public required string Calculation { get; init; }

    /// <summary>The inputs as understood, with units (defaults appear here too, marked in the note).</summary>
    public List<SheetRow> Inputs { get; } = [];

    public List<SheetMethod> Methods { get; } = [];

    public List<SheetRow> Results { get; } = [];

    /// <summary>Result tables shown after the results (empty for a single-value calculation).</summary>
    public List<SheetTable> Tables { get; } = [];

    public SolverRecord? Solver { get; set; }

    public List<ValidityDto> Validity { get; } = [];

    public List<WarningDto> Warnings { get; } = [];

    public List<AssumptionDto> Assumptions { get; } = [];

    public List<SheetFigure> Figures { get; } = [];

    /// <summary>The response's sensitivities (sensitivities=true), shown as a table; null otherwise.</summary>
    public IReadOnlyDictionary<string, IReadOnlyDictionary<string, SensitivityDto>>? Sensitivities { get; set; }

    /// <summary>The response's roughness spread, when it has one.</summary>
    public RoughnessSpreadDto? RoughnessSpread { get; set; }
}

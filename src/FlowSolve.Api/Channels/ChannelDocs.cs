namespace FlowSolve.Api.Channels;

/// <summary>The channel endpoints' OpenAPI descriptions.</summary>
public static class ChannelDocs
{
    private const string Sections =
        "The section is an object with a shape and its dimensions (in a GET its fields stand at the top level of the query): " +
        "rectangular (bottomWidth), trapezoidal (bottomWidth and sideSlope, or leftSideSlope and rightSideSlope; side slopes are " +
        "horizontal per unit vertical), triangular (sideSlope, or leftSideSlope and rightSideSlope), circular (diameter; a pipe " +
        "running part full) or surveyed (points, left to right, each {station, elevation} with an optional manningN for the segment " +
        "that starts at that point; in a GET, points=station:elevation[:manningN],... separated by commas). A dimension that does not " +
        "belong to the shape is rejected with a 400 naming it. Surveyed stations must not decrease (equal stations make a vertical " +
        "wall), and the section holds water up to the lower of its two end points. Where segments carry their own n, the section's n " +
        "is the Horton-Einstein composite.\n\n";

    private const string UnitsText =
        "SI by default (m, m2, m3/s, m/s); units=us takes and returns ft, ft2, ft3/s and ft/s. Manning n is the same number in both: " +
        "the Core works in SI (k = 1) and converting lengths exactly at 0.3048 m/ft is what gives the customary k = 1.486. Gravity is " +
        "standard gravity, 9.80665 m/s2. Bad input answers 400 with each bad field named (section.bottomWidth, " +
        "section.points[1].station in a body; bottomWidth, points[1].station in a query).\n\n";

    private const string SensitivityNote =
        "With sensitivities=true: the depth, velocity (and for the normal depth the Froude number) against flow, slope and " +
        "manningN where they apply, and the section's own dimensions (bottomWidth, sideSlope or leftSideSlope and rightSideSlope, " +
        "diameter; named as in the request, section.* in a body); a surveyed section's points and segment n are not differentiated.\n\n";

    private const string Caution = "Results are engineering estimates to be checked by a qualified engineer; local codes and licensed practice govern.";

    public const string NormalDepth =
        "Normal (uniform-flow) depth from Manning's equation Q = (1/n) A R^(2/3) S^(1/2), solved by safeguarded Newton iteration on " +
        "ln K(y) = ln(Q/sqrt(S)), with the flow at that depth: area, wetted perimeter, hydraulic radius, top width, velocity, Froude " +
        "number, regime, specific energy, and the critical depth and critical slope of the same flow.\n\n" +
        "A part-full circle carries most at about 0.938 D, about 1.076 times its full-pipe flow: a flow between the two has two normal " +
        "depths (both are returned, the lower as normalDepth, with a two-normal-depths warning that says why the lower is the design " +
        "answer), and a flow above the peak has none. A surveyed section can have several normal depths where the water spreads onto " +
        "flat overbanks. Circular and surveyed sections report their capacity (maximumFlow, depthAtMaximumFlow, fullFlow). A flow " +
        "above a pipe's peak, or one that overtops a surveyed section, answers 422 with the capacity in the request's units.\n\n" +
        Sections + UnitsText + SensitivityNote + Caution;

    public const string CriticalDepth =
        "Critical depth from Q^2 T = g A^3 (Froude number 1 on the hydraulic depth A/T), solved by safeguarded Newton iteration, with " +
        "the area, top width, velocity and specific energy at that depth (the least specific energy with which the section passes the " +
        "flow), and the critical slope when a Manning n is given. A surveyed compound section can have several critical depths (all " +
        "are returned, the lowest first); a flow whose critical depth would lie above a surveyed section answers 422.\n\n" +
        Sections + UnitsText + SensitivityNote + Caution;
}

namespace ModelWatch.Numerics;

/// <summary>Constants of IEEE double precision.</summary>
public static class Precision
{
    /// <summary>Machine epsilon, 2⁻⁵²: the gap between 1 and the next larger double.</summary>
    public const double MachineEpsilon = 2.220446049250313e-16;
}

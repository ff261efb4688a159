namespace ModelWatch.Cli.Demo;

/// <summary>
/// Generates the demo's deliveries, one every <see cref="Spacing"/>, from a fixed seed so every run of the demo sees
/// the same data. The true relationship is
/// <c>minutes = 6 + 2.2·route_km + 4·stops + 0.15·parcel_kg + 0.35·traffic_index + ε</c>, ε ~ N(0, 5²),
/// changed inside each incident as <see cref="DemoScenario"/> describes.
/// </summary>
internal static class DeliveryGenerator
{
    /// <summary>Time between deliveries: 25 an hour, 150 per 6-hour window.</summary>
    public static readonly TimeSpan Spacing = TimeSpan.FromSeconds(144);

    public const double NoiseSd = 5.0;
    public const double Intercept = 6.0;
    public const double PerKm = 2.2;
    public const double PerStop = 4.0;
    public const double PerKg = 0.15;
    public const double PerTrafficPoint = 0.35;

    /// <summary>Extra minutes per traffic point above 50 during the coefficient incident.</summary>
    public const double TrafficSurcharge = 0.15;

    /// <summary>Minutes the scanners add to every recorded duration during the sensor incident.</summary>
    public const double SensorBias = 4.0;

    private const int Seed = 20260302;

    public static IEnumerable<Delivery> Generate(DateTimeOffset from, DateTimeOffset to)
    {
        var random = new Random(Seed);
        for (DateTimeOffset t = from; t < to; t += Spacing)
        {
            double routeKm = 2 + (38 * random.NextDouble());
            // Stops are drawn independently with the same spread as route_km / 2, so the collinearity incident can
            // tie them together without changing either feature's distribution.
            int stops = (int)Math.Round((2 + (38 * random.NextDouble())) / 2, MidpointRounding.AwayFromZero);
            double parcelKg = 0.5 + (39.5 * random.NextDouble());
            double traffic = 100 * random.NextDouble();
            double noise = NoiseSd * Gaussian(random);
            double wobble = Gaussian(random);
            if (DemoScenario.Collinearity.Covers(t))
            {
                stops = Math.Clamp((int)Math.Round((routeKm / 2) + (0.8 * wobble), MidpointRounding.AwayFromZero), 1, 20);
            }

            double minutes = Intercept + (PerKm * routeKm) + (PerStop * stops) + (PerKg * parcelKg) + (PerTrafficPoint * traffic) + noise;
            if (DemoScenario.CoefficientChange.Covers(t))
            {
                // Centred at 50 so the average duration stays where it was: only the slope moves.
                minutes += TrafficSurcharge * (traffic - 50);
            }

            if (DemoScenario.SensorBias.Covers(t))
            {
                minutes += SensorBias;
            }

            yield return new Delivery(t, routeKm, stops, parcelKg, traffic, minutes);
        }
    }

    private static double Gaussian(Random random)
    {
        // Box–Muller; 1 − u keeps the logarithm's argument above zero.
        double u = 1.0 - random.NextDouble();
        double v = random.NextDouble();
        return Math.Sqrt(-2.0 * Math.Log(u)) * Math.Cos(2.0 * Math.PI * v);
    }
}

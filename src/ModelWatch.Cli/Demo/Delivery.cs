namespace ModelWatch.Cli.Demo;

/// <summary>One invented delivery of the demo's courier: the features, and the minutes it took.</summary>
internal readonly record struct Delivery(DateTimeOffset DeliveredAt, double RouteKm, int Stops, double ParcelKg, double TrafficIndex, double Minutes);

namespace ModelWatch.Checks.Evaluation;

/// <summary>
/// One share of a model's false-alarm budget: a test or a family of tests that can page on its own. The budget
/// (<see cref="Policy.FalseAlarmBudget"/>) gives every registered channel an equal share, F*/K false critical alerts a
/// year; tests within a channel split its share again (Bonferroni).
/// </summary>
/// <param name="Name">Dotted name, <c>check.channel</c>.</param>
/// <param name="Description">What spends it, for the docs and <c>model validate</c>.</param>
public sealed record AlarmChannel(string Name, string Description);

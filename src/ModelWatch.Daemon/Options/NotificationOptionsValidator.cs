using System.ComponentModel.DataAnnotations;
using Microsoft.Extensions.Options;

namespace ModelWatch.Daemon.Options;

/// <summary>Validates every webhook target (data annotations do not look inside dictionaries), listing every problem.</summary>
internal sealed class NotificationOptionsValidator : IValidateOptions<NotificationOptions>
{
    public ValidateOptionsResult Validate(string? name, NotificationOptions options)
    {
        var problems = new List<string>();
        foreach ((string target, NotificationTargetOptions settings) in options.Targets)
        {
            var results = new List<ValidationResult>();
            if (!Validator.TryValidateObject(settings, new ValidationContext(settings), results, validateAllProperties: true))
            {
                problems.AddRange(results.Select(r => $"Notifications:Targets:{target}: {r.ErrorMessage}"));
            }
        }

        return problems.Count == 0 ? ValidateOptionsResult.Success : ValidateOptionsResult.Fail(problems);
    }
}

using System.ComponentModel.DataAnnotations;
using Microsoft.Extensions.Options;

namespace ModelWatch.Daemon.Options;

/// <summary>Validates the queue settings and every webhook target (data annotations do not look inside dictionaries), listing every problem.</summary>
internal sealed class NotificationOptionsValidator : IValidateOptions<NotificationOptions>
{
    public ValidateOptionsResult Validate(string? name, NotificationOptions options)
    {
        var problems = new List<string>();
        var own = new List<ValidationResult>();
        if (!Validator.TryValidateObject(options, new ValidationContext(options), own, validateAllProperties: true))
        {
            problems.AddRange(own.Select(r => $"Notifications: {r.ErrorMessage}"));
        }

        foreach ((string target, NotificationTargetOptions settings) in options.Targets)
        {
            var results = new List<ValidationResult>();
            if (!Validator.TryValidateObject(settings, new ValidationContext(settings), results, validateAllProperties: true))
            {
                problems.AddRange(results.Select(r => $"Notifications:Targets:{target}: {r.ErrorMessage}"));
            }
            else if (!Uri.TryCreate(settings.Url, UriKind.Absolute, out Uri? url) || (url.Scheme != Uri.UriSchemeHttps && url.Scheme != Uri.UriSchemeHttp))
            {
                problems.Add($"Notifications:Targets:{target}: Url '{settings.Url}' is not an http:// or https:// address");
            }
        }

        return problems.Count == 0 ? ValidateOptionsResult.Success : ValidateOptionsResult.Fail(problems);
    }
}

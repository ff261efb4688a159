using System.Globalization;

namespace ModelWatch.Daemon.Options;

/// <summary>
/// The read-only evidence pages on the daemon's HTTP endpoint (configuration section <c>Web</c>): <c>/</c> the fleet,
/// <c>/models/{key}</c> a model, <c>/alerts/{id}</c> an alert's evidence report. Off unless enabled; needs
/// <c>Http:Enabled</c>. <see cref="PublicBaseUrl"/> alone (without the pages) still puts evidence links into webhooks
/// and alert events, for a fleet where another replica serves the pages.
/// </summary>
public sealed class WebOptions
{
    /// <summary>The configuration section.</summary>
    public const string Section = "Web";

    /// <summary>The shortest access token accepted: shorter ones are guessable.</summary>
    public const int MinimumTokenLength = 16;

    /// <summary>Serve the pages. Default false.</summary>
    public bool Enabled { get; set; }

    /// <summary>
    /// When set, every page asks for <c>Authorization: Bearer TOKEN</c> and answers 401 without it. The health and
    /// scrape paths stay open. Default none (anyone who reaches the endpoint reads the pages).
    /// </summary>
    public string? AccessToken { get; set; }

    /// <summary>
    /// The absolute http or https URL under which people reach the pages (e.g. behind a TLS-terminating proxy):
    /// webhooks and alert events then carry <c>evidence_url</c> = this + <c>/alerts/{id}</c>. Default none.
    /// </summary>
    public string? PublicBaseUrl { get; set; }

    /// <summary>The evidence page of an alert under <see cref="PublicBaseUrl"/>, or null when it is not set.</summary>
    public string? EvidenceUrl(long alertId) =>
        string.IsNullOrWhiteSpace(PublicBaseUrl) ? null : PublicBaseUrl.TrimEnd('/') + "/alerts/" + alertId.ToString(CultureInfo.InvariantCulture);

    /// <summary>Settings that contradict each other or cannot work, each as a message naming its key.</summary>
    public IEnumerable<string> Problems(bool httpEnabled)
    {
        if (Enabled && !httpEnabled)
        {
            yield return "Web:Enabled needs Http:Enabled: the pages are served on Http:Urls";
        }

        if (!string.IsNullOrWhiteSpace(PublicBaseUrl)
            && (!Uri.TryCreate(PublicBaseUrl, UriKind.Absolute, out Uri? url) || url.Scheme is not ("http" or "https") || !string.IsNullOrEmpty(url.Query) || !string.IsNullOrEmpty(url.Fragment) || !string.IsNullOrEmpty(url.UserInfo)))
        {
            yield return $"Web:PublicBaseUrl must be an absolute http:// or https:// URL without query, fragment or user name (e.g. https://modelwatch.example.org), not '{PublicBaseUrl}'";
        }

        if (AccessToken is { } token && (token.Length < MinimumTokenLength || token.Any(c => char.IsWhiteSpace(c) || char.IsControl(c))))
        {
            // The token itself is never echoed: this message may end up in logs.
            yield return $"Web:AccessToken must be at least {MinimumTokenLength.ToString(CultureInfo.InvariantCulture)} characters without spaces or control characters (e.g. 'openssl rand -hex 24')";
        }
    }
}

using System.Globalization;
using System.Net;

namespace ModelWatch.Daemon.Options;

/// <summary>One parsed entry of <see cref="HttpOptions.Urls"/>: where Kestrel listens.</summary>
/// <param name="Url">The entry as written.</param>
/// <param name="Address">The IP address, or null for <c>localhost</c> (both loopbacks) or <c>*</c> (every interface).</param>
/// <param name="AnyAddress">True for <c>*</c> or <c>+</c>.</param>
/// <param name="Port">The port.</param>
public sealed record ListenAddress(string Url, IPAddress? Address, bool AnyAddress, int Port)
{
    /// <summary>Parses <see cref="HttpOptions.Urls"/>; every problem is listed.</summary>
    public static IReadOnlyList<ListenAddress> ParseAll(string urls, List<string> problems)
    {
        ArgumentNullException.ThrowIfNull(problems);
        var parsed = new List<ListenAddress>();
        string[] entries = (urls ?? string.Empty).Split(';', StringSplitOptions.RemoveEmptyEntries | StringSplitOptions.TrimEntries);
        if (entries.Length == 0)
        {
            problems.Add("Http:Urls: no address; give one such as http://127.0.0.1:9464");
        }

        foreach (string url in entries)
        {
            if (TryParse(url, out ListenAddress? address, out string error))
            {
                parsed.Add(address!);
            }
            else
            {
                problems.Add($"Http:Urls: '{url}' {error}");
            }
        }

        return parsed;
    }

    private static bool TryParse(string url, out ListenAddress? address, out string error)
    {
        address = null;
        const string Example = "; write http://ADDRESS:PORT, e.g. http://127.0.0.1:9464, http://0.0.0.0:9464 or http://[::]:9464";
        if (!url.StartsWith("http://", StringComparison.OrdinalIgnoreCase))
        {
            error = "is not served: only http:// is (put TLS in front with a proxy)" + Example;
            return false;
        }

        string rest = url["http://".Length..].TrimEnd('/');
        int colon = rest.LastIndexOf(':');
        if (colon <= 0 || rest.EndsWith(']'))
        {
            error = "has no port" + Example;
            return false;
        }

        string host = rest[..colon];
        if (!int.TryParse(rest[(colon + 1)..], NumberStyles.None, CultureInfo.InvariantCulture, out int port) || port is < 1 or > 65535)
        {
            error = "has no port between 1 and 65535" + Example;
            return false;
        }

        if (host is "*" or "+")
        {
            address = new ListenAddress(url, null, true, port);
        }
        else if (host.Equals("localhost", StringComparison.OrdinalIgnoreCase))
        {
            address = new ListenAddress(url, null, false, port);
        }
        else if (IPAddress.TryParse(host.Trim('[', ']'), out IPAddress? ip) && (host[0] == '[') == (ip.AddressFamily == System.Net.Sockets.AddressFamily.InterNetworkV6))
        {
            address = new ListenAddress(url, ip, false, port);
        }
        else
        {
            error = "does not name an IP address, localhost or * (a host name is not bound: give the address)" + Example;
            return false;
        }

        error = string.Empty;
        return true;
    }
}

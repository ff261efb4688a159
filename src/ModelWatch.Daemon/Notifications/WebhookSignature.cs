using System.Security.Cryptography;
using System.Text;

namespace ModelWatch.Daemon.Notifications;

/// <summary>
/// HMAC-SHA256 over the exact request body with the target's shared secret, sent as
/// <c>X-ModelWatch-Signature: sha256=&lt;lowercase hex&gt;</c>. A receiver recomputes it over the raw bytes it got and
/// compares in constant time.
/// </summary>
public static class WebhookSignature
{
    /// <summary>The header carrying the signature.</summary>
    public const string HeaderName = "X-ModelWatch-Signature";

    /// <summary>Returns the header value for a body.</summary>
    public static string Sign(ReadOnlySpan<byte> body, string secret)
    {
        ArgumentException.ThrowIfNullOrEmpty(secret);
        byte[] mac = HMACSHA256.HashData(Encoding.UTF8.GetBytes(secret), body);
        return "sha256=" + Convert.ToHexStringLower(mac);
    }

    /// <summary>Checks a header value against a body in constant time.</summary>
    public static bool Verify(ReadOnlySpan<byte> body, string secret, string? header)
    {
        if (header is null)
        {
            return false;
        }

        string expected = Sign(body, secret);
        return CryptographicOperations.FixedTimeEquals(Encoding.ASCII.GetBytes(expected), Encoding.ASCII.GetBytes(header));
    }
}

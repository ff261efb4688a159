using System.Globalization;
using System.Security.Cryptography;
using System.Text;

namespace ModelWatch.Daemon.Notifications;

/// <summary>
/// Each delivery attempt is signed: HMAC-SHA256 with the target's shared secret over <c>TIMESTAMP + "." + BODY</c>,
/// where TIMESTAMP is the attempt's Unix time in seconds, sent as <c>X-ModelWatch-Timestamp: TIMESTAMP</c> and
/// <c>X-ModelWatch-Signature: sha256=&lt;lowercase hex&gt;</c>. The body carries the attempt number and the send time,
/// so both are signed too. A receiver recomputes the signature over the raw bytes it got, compares in constant time,
/// refuses a timestamp outside its tolerance (a captured request cannot be replayed later), and deduplicates on the
/// body's <c>event_id</c> (a request replayed within the tolerance, or a delivery sent twice).
/// </summary>
public static class WebhookSignature
{
    /// <summary>The header carrying the signature.</summary>
    public const string HeaderName = "X-ModelWatch-Signature";

    /// <summary>The header carrying the signed timestamp (Unix seconds).</summary>
    public const string TimestampHeaderName = "X-ModelWatch-Timestamp";

    /// <summary>The tolerance the documentation recommends to receivers.</summary>
    public static readonly TimeSpan RecommendedTolerance = TimeSpan.FromMinutes(5);

    /// <summary>HMAC-SHA256 of <paramref name="message"/> as <c>sha256=&lt;hex&gt;</c>.</summary>
    public static string Mac(ReadOnlySpan<byte> message, string secret)
    {
        ArgumentException.ThrowIfNullOrEmpty(secret);
        byte[] mac = HMACSHA256.HashData(Encoding.UTF8.GetBytes(secret), message);
        return "sha256=" + Convert.ToHexStringLower(mac);
    }

    /// <summary>The signature header value of a body sent at <paramref name="timestamp"/> (Unix seconds).</summary>
    public static string Sign(long timestamp, ReadOnlySpan<byte> body, string secret) => Mac(SignedMessage(timestamp.ToString(CultureInfo.InvariantCulture), body), secret);

    /// <summary>
    /// Checks a delivery: the timestamp is within <paramref name="tolerance"/> of <paramref name="now"/> and the signature
    /// matches the timestamp and the body (compared in constant time).
    /// </summary>
    public static bool Verify(ReadOnlySpan<byte> body, string secret, string? timestampHeader, string? signatureHeader, DateTimeOffset now, TimeSpan tolerance)
    {
        if (timestampHeader is null || signatureHeader is null
            || !long.TryParse(timestampHeader, NumberStyles.None, CultureInfo.InvariantCulture, out long timestamp)
            || Math.Abs(now.ToUnixTimeSeconds() - timestamp) > tolerance.TotalSeconds)
        {
            return false;
        }

        string expected = Mac(SignedMessage(timestampHeader, body), secret);
        return CryptographicOperations.FixedTimeEquals(Encoding.ASCII.GetBytes(expected), Encoding.ASCII.GetBytes(signatureHeader));
    }

    private static byte[] SignedMessage(string timestamp, ReadOnlySpan<byte> body)
    {
        byte[] message = new byte[timestamp.Length + 1 + body.Length];
        Encoding.ASCII.GetBytes(timestamp, message);
        message[timestamp.Length] = (byte)'.';
        body.CopyTo(message.AsSpan(timestamp.Length + 1));
        return message;
    }
}

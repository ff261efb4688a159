using System.Security.Cryptography;
using System.Text;
using Microsoft.AspNetCore.Http;

namespace ModelWatch.Daemon.Web;

/// <summary>
/// Checks <c>Authorization: Bearer TOKEN</c> against the configured token in constant time (a byte-by-byte compare
/// that stops early would let a caller find the token one character at a time from response times).
/// </summary>
internal sealed class BearerToken(string token)
{
    private readonly byte[] _expected = SHA256.HashData(Encoding.UTF8.GetBytes(token));

    /// <summary>Whether the request carries the token.</summary>
    public bool Admits(HttpRequest request)
    {
        string header = request.Headers.Authorization.ToString();
        const string Scheme = "Bearer ";
        if (!header.StartsWith(Scheme, StringComparison.OrdinalIgnoreCase))
        {
            return false;
        }

        // Hashing both sides first gives equal lengths, so the comparison time says nothing about the token's length either.
        byte[] given = SHA256.HashData(Encoding.UTF8.GetBytes(header[Scheme.Length..].Trim()));
        return CryptographicOperations.FixedTimeEquals(given, _expected);
    }
}

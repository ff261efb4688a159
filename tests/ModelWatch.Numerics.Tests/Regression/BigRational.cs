using System.Numerics;

namespace ModelWatch.Numerics.Tests.Regression;

/// <summary>Exact rational numbers over <see cref="BigInteger"/>, for reference solutions free of rounding.</summary>
internal readonly struct BigRational
{
    public BigRational(BigInteger numerator, BigInteger denominator)
    {
        if (denominator.IsZero)
        {
            throw new DivideByZeroException();
        }

        if (denominator.Sign < 0)
        {
            numerator = -numerator;
            denominator = -denominator;
        }

        BigInteger g = BigInteger.GreatestCommonDivisor(numerator, denominator);
        Numerator = g.IsOne || g.IsZero ? numerator : numerator / g;
        Denominator = g.IsOne || g.IsZero ? denominator : denominator / g;
    }

    public BigInteger Numerator { get; }

    public BigInteger Denominator { get; }

    public static BigRational Zero => new(BigInteger.Zero, BigInteger.One);

    public bool IsZero => Numerator.IsZero;

    /// <summary>The exact value of a finite double (mantissa × 2^exponent).</summary>
    public static BigRational FromDouble(double value)
    {
        if (!double.IsFinite(value))
        {
            throw new ArgumentException("Only finite doubles have a rational value.", nameof(value));
        }

        long bits = BitConverter.DoubleToInt64Bits(value);
        bool negative = bits < 0;
        int exponent = (int)((bits >> 52) & 0x7FF);
        long mantissa = bits & 0xFFFFFFFFFFFFFL;
        if (exponent == 0)
        {
            exponent++;
        }
        else
        {
            mantissa |= 1L << 52;
        }

        exponent -= 1075;
        BigInteger numerator = negative ? -(BigInteger)mantissa : mantissa;
        return exponent >= 0
            ? new BigRational(numerator * BigInteger.Pow(2, exponent), BigInteger.One)
            : new BigRational(numerator, BigInteger.Pow(2, -exponent));
    }

    public static BigRational operator +(BigRational a, BigRational b) =>
        new((a.Numerator * b.Denominator) + (b.Numerator * a.Denominator), a.Denominator * b.Denominator);

    public static BigRational operator -(BigRational a, BigRational b) =>
        new((a.Numerator * b.Denominator) - (b.Numerator * a.Denominator), a.Denominator * b.Denominator);

    public static BigRational operator *(BigRational a, BigRational b) =>
        new(a.Numerator * b.Numerator, a.Denominator * b.Denominator);

    public static BigRational operator /(BigRational a, BigRational b) =>
        new(a.Numerator * b.Denominator, a.Denominator * b.Numerator);

    /// <summary>The nearest double (to within one rounding; plenty for comparing 16-digit results).</summary>
    public double ToDouble()
    {
        if (Numerator.IsZero)
        {
            return 0.0;
        }

        // Scale so the quotient carries 64 significant bits before converting.
        long shift = (long)(Numerator.GetBitLength() - Denominator.GetBitLength()) - 64;
        BigInteger q = shift >= 0 ? Numerator / (Denominator << (int)shift) : (Numerator << (int)-shift) / Denominator;
        return (double)q * Math.Pow(2, shift);
    }
}

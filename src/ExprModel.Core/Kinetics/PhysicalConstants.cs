namespace ExprModel.Core.Kinetics;

/// <summary>Physical constants, CODATA 2018 (exact in the 2019 SI).</summary>
public static class PhysicalConstants
{
    /// <summary>Molar gas constant R, J/(mol K).</summary>
    public const double GasConstant = 8.314462618;
    /// <summary>Faraday constant F, C/mol.</summary>
    public const double Faraday = 96485.33212;
    /// <summary>0 deg C in kelvin.</summary>
    public const double ZeroCelsiusInKelvin = 273.15;
}

//! Stress units and sign conventions.

use std::fmt;
use std::str::FromStr;

use serde::{Deserialize, Serialize};

/// Pascals in one pound-force per square inch (NIST SP 811, 2008, appendix B.8: 6.894 757 E+03,
/// exact through the definitions of the pound-force and the inch).
pub const PA_PER_PSI: f64 = 6_894.757_293_168;

/// A unit of stress. Every stress is stored in pascals; a unit only scales what is shown or typed.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, Serialize, Deserialize, Default)]
pub enum StressUnit {
    /// Pascal, N/m².
    Pa,
    /// Kilopascal, 1e3 Pa.
    KPa,
    /// Megapascal, 1e6 Pa (= N/mm²).
    #[default]
    MPa,
    /// Gigapascal, 1e9 Pa.
    GPa,
    /// Bar, 1e5 Pa (exact by definition; NIST SP 811, 2008, appendix B.8).
    Bar,
    /// Pound-force per square inch, 6894.757293168 Pa.
    Psi,
    /// Kilopound-force per square inch, 1e3 psi.
    Ksi,
}

impl StressUnit {
    /// Every unit, in the order menus list them.
    pub const ALL: [Self; 7] = [
        Self::Pa,
        Self::KPa,
        Self::MPa,
        Self::GPa,
        Self::Bar,
        Self::Psi,
        Self::Ksi,
    ];

    /// Pascals in one of this unit.
    #[must_use]
    pub fn pascals(self) -> f64 {
        match self {
            Self::Pa => 1.0,
            Self::KPa => 1e3,
            Self::MPa => 1e6,
            Self::GPa => 1e9,
            Self::Bar => 1e5,
            Self::Psi => PA_PER_PSI,
            Self::Ksi => PA_PER_PSI * 1e3,
        }
    }

    /// A value in this unit, converted to pascals.
    #[must_use]
    pub fn to_pa(self, value: f64) -> f64 {
        value * self.pascals()
    }

    /// A value in pascals, converted to this unit.
    #[must_use]
    pub fn from_pa(self, value_pa: f64) -> f64 {
        value_pa / self.pascals()
    }

    /// The unit's symbol as printed (`MPa`, `psi`, …).
    #[must_use]
    pub fn symbol(self) -> &'static str {
        match self {
            Self::Pa => "Pa",
            Self::KPa => "kPa",
            Self::MPa => "MPa",
            Self::GPa => "GPa",
            Self::Bar => "bar",
            Self::Psi => "psi",
            Self::Ksi => "ksi",
        }
    }
}

impl fmt::Display for StressUnit {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(self.symbol())
    }
}

/// The unit text was none of Pa, kPa, MPa, GPa, bar, psi, ksi (or N/mm² for MPa). The message
/// suggests the unit a wrong case was likely meant as (`Mpa` → MPa), except that `mPa` is
/// millipascals, said as such and never read as MPa.
#[derive(Debug, Clone, PartialEq, Eq, thiserror::Error)]
#[error("unknown stress unit '{0}': {hint}", hint = self.hint())]
pub struct UnknownUnit(pub String);

impl UnknownUnit {
    fn hint(&self) -> String {
        let t = self.0.trim();
        let expected =
            "the units are Pa, kPa, MPa or N/mm², GPa, bar, psi and ksi, written exactly so";
        if t == "mPa" {
            return format!(
                "mPa is millipascals, which Planewise does not take; megapascals are MPa. {expected}"
            );
        }
        match StressUnit::ALL
            .into_iter()
            .find(|u| u.symbol().eq_ignore_ascii_case(t))
        {
            Some(u) => format!("did you mean {u}? Unit symbols are case-sensitive; {expected}"),
            None => expected.to_owned(),
        }
    }
}

impl FromStr for StressUnit {
    type Err = UnknownUnit;

    /// Parses a unit symbol exactly as SI writes it (`mPa` would be millipascals, so it is not
    /// read as MPa); `N/mm²`, `N/mm2` and `N/mm^2` are read as MPa.
    fn from_str(text: &str) -> Result<Self, Self::Err> {
        let unit = match text.trim() {
            "Pa" => Self::Pa,
            "kPa" => Self::KPa,
            "MPa" | "N/mm²" | "N/mm2" | "N/mm^2" => Self::MPa,
            "GPa" => Self::GPa,
            "bar" => Self::Bar,
            "psi" => Self::Psi,
            "ksi" => Self::Ksi,
            _ => return Err(UnknownUnit(text.to_owned())),
        };
        Ok(unit)
    }
}

/// Which sign a compressive stress carries when shown or typed.
///
/// Internally every stress is tension-positive. Geomechanics usually counts compression as
/// positive; in that convention every displayed stress is negated, so σ1 is the most compressive
/// principal stress.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, Serialize, Deserialize, Default)]
pub enum SignConvention {
    /// Tension positive (solid mechanics, finite-element output).
    #[default]
    TensionPositive,
    /// Compression positive (rock and soil mechanics, structural geology).
    CompressionPositive,
}

impl SignConvention {
    /// +1 for tension-positive, −1 for compression-positive: multiply a tension-positive stress by
    /// this to express it in the convention (and back: the factor is its own inverse).
    #[must_use]
    pub fn sign(self) -> f64 {
        match self {
            Self::TensionPositive => 1.0,
            Self::CompressionPositive => -1.0,
        }
    }

    /// The short name used in JSON and file keys.
    #[must_use]
    pub fn key(self) -> &'static str {
        match self {
            Self::TensionPositive => "tension-positive",
            Self::CompressionPositive => "compression-positive",
        }
    }
}

impl fmt::Display for SignConvention {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(self.key())
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn psi_factor_matches_nist_sp811() {
        // NIST SP 811 (2008) B.8: 1 psi = 6.894 757 E+03 Pa; 1 ksi = 6.894 757 E+06 Pa.
        assert!((StressUnit::Psi.pascals() - 6.894_757e3).abs() < 1e-3);
        assert!((StressUnit::Ksi.pascals() - 6.894_757e6).abs() < 1.0);
        // Exact value from the definitions: 0.45359237 kg · 9.80665 m/s² / (0.0254 m)².
        let exact = 0.453_592_37 * 9.806_65 / (0.0254 * 0.0254);
        assert!((PA_PER_PSI - exact).abs() < 1e-9);
    }

    #[test]
    fn units_round_trip_and_parse() {
        for unit in StressUnit::ALL {
            assert_eq!(unit.symbol().parse::<StressUnit>(), Ok(unit));
            let back = unit.from_pa(unit.to_pa(123.456));
            assert!((back - 123.456).abs() < 1e-12);
        }
        // NIST SP 811 (2008) B.8: 1 bar = 1.0 E+05 Pa (exact).
        assert_eq!("bar".parse::<StressUnit>(), Ok(StressUnit::Bar));
        assert_eq!(StressUnit::Bar.pascals(), 1e5);
        assert!("Bar".parse::<StressUnit>().is_err());
        // Exact symbols only: mPa is a millipascal, not MPa.
        for wrong in ["mPa", "mpa", "MPA", "kpa", "PSI", "Ksi", "gpa"] {
            assert!(wrong.parse::<StressUnit>().is_err(), "{wrong}");
        }
        assert_eq!("N/mm²".parse::<StressUnit>(), Ok(StressUnit::MPa));
        assert_eq!("N/mm2".parse::<StressUnit>(), Ok(StressUnit::MPa));
    }
}

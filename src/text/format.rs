//! Number formatting shared by the text output, the GUI and the reports.

/// Formats `value` with `significant` significant digits, in plain notation for magnitudes from
/// 1e-4 to 1e9 and in scientific notation outside, without trailing zeros. Negative zero prints
/// as 0.
#[must_use]
pub fn sig(value: f64, significant: usize) -> String {
    if !value.is_finite() {
        return "undefined".to_owned();
    }
    if value == 0.0 {
        return "0".to_owned();
    }
    let significant = significant.max(1);
    let magnitude = value.abs().log10().floor() as i32;
    if !(-4..9).contains(&magnitude) {
        return format!("{:.*e}", significant - 1, value);
    }
    let digits = i32::try_from(significant).unwrap_or(17);
    let decimals = (digits - 1 - magnitude).max(0) as usize;
    let text = format!("{value:.decimals$}");
    let text = if text.contains('.') {
        text.trim_end_matches('0').trim_end_matches('.').to_owned()
    } else {
        text
    };
    if text == "-0" { "0".to_owned() } else { text }
}

/// [`sig`] with a true minus sign (U+2212), for numbers a person reads in the window, the
/// figures and the walk-through; copies and files meant for other programs keep [`sig`]'s
/// hyphen-minus, which spreadsheets read. Fields that take typed numbers read both.
#[must_use]
pub fn readable(value: f64, significant: usize) -> String {
    sig(value, significant).replace('-', "−")
}

/// `value` rounded to 15 significant digits: what a converted number can be trusted to, so
/// that 30 ksi typed and converted to pascals and back reads 30, not 30.000000000000004.
/// Used on every number the JSON output carries.
#[must_use]
pub fn clean(value: f64) -> f64 {
    if !value.is_finite() || value == 0.0 {
        return value;
    }
    format!("{value:.14e}").parse().unwrap_or(value)
}

/// `value` with round-off removed: zero when its magnitude is below 1e-9 × `scale` (the
/// magnitude of the state it belongs to, in the same unit), never −0, else [`clean`]. What is
/// left below that is eigenvalue and conversion round-off, not a result.
#[must_use]
pub fn clean_relative(value: f64, scale: f64) -> f64 {
    if value.abs() <= crate::mechanics::criteria::RELATIVE_TOLERANCE * scale.abs() || value == 0.0 {
        return 0.0;
    }
    clean(value)
}

/// An angle in degrees as the searches resolve it: rounded to 1e-6°, −0 as 0, and (with
/// `wrap`) 360° as 0°. The numerical searches locate a plane to about 1e-7°; more digits are
/// noise (`dip 60.0000000821544`).
#[must_use]
pub fn angle(deg: f64, wrap: bool) -> f64 {
    if !deg.is_finite() {
        return deg;
    }
    let mut a = (deg * 1e6).round() / 1e6;
    if wrap && a >= 360.0 {
        a -= 360.0;
    }
    if a == 0.0 { 0.0 } else { a }
}

/// `value` to the nine significant digits a numerical plane search resolves (the plane is found
/// to about 1e-7°, so stresses on it are good to about 1e-9 of the state): `-14.2`, not
/// `-14.2000000426836`.
#[must_use]
pub fn resolved(value: f64) -> f64 {
    if !value.is_finite() || value == 0.0 {
        return value;
    }
    format!("{value:.8e}").parse().unwrap_or(value)
}

/// Significant digits that tell every neighbour in `values` apart (at least `min_digits`, at
/// most 15): for axis ticks and colour-bar labels, so that no two neighbouring labels read the
/// same unless their values are the same.
#[must_use]
pub fn distinct_digits(values: &[f64], min_digits: usize) -> usize {
    (min_digits..=15)
        .find(|&d| {
            values
                .windows(2)
                .all(|w| w[0] == w[1] || sig(w[0], d) != sig(w[1], d))
        })
        .unwrap_or(15)
}

/// "dip D° / dip direction A°", each to four significant digits: how every picture names a
/// plane.
#[must_use]
pub fn dip_text(dip_deg: f64, dip_direction_deg: f64) -> String {
    format!(
        "dip {}° / dip direction {}°",
        sig(dip_deg, 4),
        sig(dip_direction_deg, 4)
    )
}

/// `sig` with the unit appended, or "undefined" for `None`.
#[must_use]
pub fn with_unit(value: Option<f64>, unit: &str) -> String {
    match value {
        // Degrees follow the number without a space (SI writes 30°, but 30 MPa).
        Some(v) if v.is_finite() && unit == "°" => format!("{}°", sig(v, 6)),
        Some(v) if v.is_finite() => format!("{} {unit}", sig(v, 6)),
        _ => "undefined".to_owned(),
    }
}

/// The round step (1, 2 or 5 × 10ᵏ) at or just below `x`, for scale bars and chart ticks; 0 for
/// a non-positive or non-finite `x`.
#[must_use]
pub fn round_step(x: f64) -> f64 {
    if !(x > 0.0 && x.is_finite()) {
        return 0.0;
    }
    let p = 10f64.powf(x.log10().floor());
    let m = x / p;
    let step = if m >= 5.0 {
        5.0
    } else if m >= 2.0 {
        2.0
    } else {
        1.0
    };
    step * p
}

/// Items as a sentence lists them: `a`, `a and b`, `a, b and c`.
#[must_use]
pub fn series(items: &[String]) -> String {
    match items {
        [] => String::new(),
        [one] => one.clone(),
        [rest @ .., last] => format!("{} and {last}", rest.join(", ")),
    }
}

impl crate::mechanics::criteria::StressBasis {
    /// What it means, in words (the pore pressure in `unit`, for outputs).
    #[must_use]
    pub fn text(self, unit: crate::mechanics::StressUnit) -> String {
        match self {
            Self::Total => "total stress (no pore pressure given)".to_owned(),
            Self::Effective { pore_pressure_pa } => format!(
                "effective stress σ′ = σ + p·I (tension positive), p = {} {unit}",
                sig(unit.from_pa(pore_pressure_pa), 6)
            ),
            Self::Unaffected => {
                "unaffected by the pore pressure (depends only on the deviatoric stress)".to_owned()
            }
        }
    }
}

#[cfg(test)]
mod tests {
    use super::sig;

    #[test]
    fn significant_digits() {
        assert_eq!(sig(120.0, 6), "120");
        assert_eq!(sig(12.990_381_056_766_58, 6), "12.9904");
        assert_eq!(sig(-0.000_123_456_7, 3), "-0.000123");
        assert_eq!(sig(1.5e12, 3), "1.50e12");
        assert_eq!(sig(-1e-20, 6), "-1.00000e-20");
        assert_eq!(sig(-0.000_000_1, 1), "-1e-7");
        assert_eq!(sig(f64::NAN, 3), "undefined");
    }

    #[test]
    fn clean_and_distinct() {
        use super::{clean, distinct_digits};
        // 30 ksi to pascals and back (NIST SP 811 factor) is 30.000000000000004 in f64.
        let pa = 30.0 * 6_894_757.293_168;
        assert_ne!(pa / 6_894_757.293_168, 30.0);
        assert_eq!(clean(pa / 6_894_757.293_168), 30.0);
        assert_eq!(clean(-0.1 - 0.2), -0.3);
        let ticks = [99.98, 99.99, 100.0, 100.01];
        let d = distinct_digits(&ticks, 4);
        assert_eq!(d, 5);
        assert_eq!(distinct_digits(&[1.0, 2.0, 3.0], 4), 4);
    }
}

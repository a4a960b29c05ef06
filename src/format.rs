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
        Some(v) if v.is_finite() => format!("{} {unit}", sig(v, 6)),
        _ => "undefined".to_owned(),
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
}

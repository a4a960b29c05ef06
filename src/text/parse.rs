//! Reading numbers and lists typed by users (grid cells, command-line arguments, pasted text).
//! Every error says what was wrong with which piece, so the caller can add where it came from.

use crate::mechanics::Component;

/// Why a piece of text is not a usable number.
#[derive(Debug, Clone, PartialEq, Eq, thiserror::Error)]
pub enum NumberError {
    /// Nothing was typed.
    #[error("is empty")]
    Empty,
    /// The text is not a decimal number.
    #[error("'{0}' is not a number")]
    NotANumber(String),
    /// The number is too large for f64 and would become infinity.
    #[error("'{0}' is too large (it overflows to infinity)")]
    Overflow(String),
    /// The text names NaN or infinity.
    #[error("'{0}' is not a finite number")]
    NonFinite(String),
    /// A non-zero number so small that it becomes zero in f64.
    #[error("'{0}' is too small (it underflows to zero)")]
    Underflow(String),
    /// A number with a unit written after it.
    #[error(
        "'{text}' has a unit in it: write {number} alone and give {unit} once as the unit of every stress, with --unit or the window's unit picker"
    )]
    UnitInside {
        /// As typed.
        text: String,
        /// The number part.
        number: String,
        /// The unit as Planewise spells it.
        unit: String,
    },
}

/// `275MPa`, `120 kpa`: a number followed by a stress unit's symbol (any case), split.
fn unit_inside(t: &str) -> Option<NumberError> {
    let symbols = crate::mechanics::StressUnit::ALL
        .into_iter()
        .map(|u| (u.symbol(), u.symbol()))
        .chain(["N/mm²", "N/mm2", "N/mm^2"].map(|n| (n, "MPa")));
    for (written, unit) in symbols {
        let Some(cut) = t.len().checked_sub(written.len()) else {
            continue;
        };
        let (Some(number), Some(suffix)) = (t.get(..cut), t.get(cut..)) else {
            continue;
        };
        let number = number.trim();
        if suffix.eq_ignore_ascii_case(written) && number.parse::<f64>().is_ok() {
            return Some(NumberError::UnitInside {
                text: t.to_owned(),
                number: number.to_owned(),
                unit: unit.to_owned(),
            });
        }
    }
    None
}

/// Parses one finite decimal number; surrounding white space is ignored.
pub fn number(text: &str) -> Result<f64, NumberError> {
    // The true minus sign the window shows reads as the hyphen-minus it stands for (copied
    // only when there is one).
    let t = text.trim();
    let minus;
    let t = if t.contains('−') {
        minus = t.replace('−', "-");
        minus.as_str()
    } else {
        t
    };
    if t.is_empty() {
        return Err(NumberError::Empty);
    }
    let value: f64 = t
        .parse()
        .map_err(|_| unit_inside(t).unwrap_or_else(|| NumberError::NotANumber(t.to_owned())))?;
    if value == 0.0 {
        // "1e-400" parses to 0; a non-zero digit before the exponent means the user meant
        // something else than zero.
        let mantissa = t.split(['e', 'E']).next().unwrap_or("");
        if mantissa.chars().any(|c| ('1'..='9').contains(&c)) {
            return Err(NumberError::Underflow(t.to_owned()));
        }
        return Ok(value);
    }
    if value.is_finite() {
        return Ok(value);
    }
    // Rust accepts "inf", "infinity" and "nan" as f64; none is a value a user means.
    let lower = t.to_ascii_lowercase();
    if lower.contains("inf") || lower.contains("nan") {
        Err(NumberError::NonFinite(t.to_owned()))
    } else {
        Err(NumberError::Overflow(t.to_owned()))
    }
}

/// A number typed in a field that holds one number: as [`number`], and a single decimal comma
/// with no point (`12,5`) reads as the decimal point it is (a field of one number has no list
/// separator to confuse it with).
pub fn cell_number(text: &str) -> Result<f64, NumberError> {
    let t = text.trim();
    if t.matches(',').count() == 1 && !t.contains('.') {
        number(&t.replace(',', "."))
    } else {
        number(t)
    }
}

/// Why a `key=value,…` stress list is unusable.
#[derive(Debug, Clone, PartialEq, Eq, thiserror::Error)]
pub enum StressListError {
    /// Nothing was given.
    #[error("no components given (expected key=value pairs such as xx=120,xy=-35)")]
    Empty,
    /// An item has no `=`.
    #[error("item '{0}' is not of the form key=value")]
    NotKeyValue(String),
    /// Bare numbers, as other tools write a tensor: their order is not known.
    #[error(
        "{0} bare numbers: components are named, since tools order them differently (xx yy zz xy yz zx, or Voigt's xx yy zz yz zx xy); write xx=…,yy=…,zz=…,xy=…,yz=…,zx=… (omitted ones are 0)"
    )]
    BareNumbers(usize),
    /// A key is none of xx yy zz xy yz zx (or yx zy xz).
    #[error("unknown component '{0}' (expected xx, yy, zz, xy, yz, zx)")]
    UnknownKey(String),
    /// A component is given twice, perhaps under its mirrored name.
    #[error("component {0} is given more than once")]
    Repeated(&'static str),
    /// A value is not a finite number.
    #[error("value of {key} {error}")]
    Value {
        /// The key as typed.
        key: String,
        /// What is wrong with the value.
        error: NumberError,
    },
}

/// Parses `xx=120,yy=-35,zz=15,xy=48,yz=-12,zx=22` into xx, yy, zz, xy, yz, zx. Omitted
/// components are zero; `yx`, `zy`, `xz` stand for `xy`, `yz`, `zx`; keys ignore case.
pub fn stress_list(text: &str) -> Result<[f64; 6], StressListError> {
    let mut values = [0.0; 6];
    let mut seen = [false; 6];
    if text.split(',').all(|s| s.trim().is_empty()) {
        return Err(StressListError::Empty);
    }
    let items: Vec<&str> = text
        .split([',', ';', ' ', '\t'])
        .map(str::trim)
        .filter(|s| !s.is_empty())
        .collect();
    if items.len() > 1 && items.iter().all(|i| i.parse::<f64>().is_ok()) {
        return Err(StressListError::BareNumbers(items.len()));
    }
    for item in text.split(',').map(str::trim).filter(|s| !s.is_empty()) {
        let Some((key, value)) = item.split_once('=') else {
            return Err(StressListError::NotKeyValue(item.to_owned()));
        };
        let key = key.trim();
        let Some(comp) = Component::parse_key(key) else {
            return Err(StressListError::UnknownKey(key.to_owned()));
        };
        let i = comp as usize;
        if seen[i] {
            return Err(StressListError::Repeated(comp.key()));
        }
        seen[i] = true;
        values[i] = number(value).map_err(|error| StressListError::Value {
            key: key.to_owned(),
            error,
        })?;
    }
    Ok(values)
}

/// Why a list of numbers is unusable.
#[derive(Debug, Clone, PartialEq, Eq, thiserror::Error)]
pub enum ListError {
    /// Wrong count.
    #[error("expected {expected} numbers, found {found}")]
    Count {
        /// How many were wanted.
        expected: usize,
        /// How many were found.
        found: usize,
    },
    /// One item is not a number.
    #[error("number {position} {error}")]
    Item {
        /// 1-based position in the list.
        position: usize,
        /// What is wrong with it.
        error: NumberError,
    },
}

/// Parses exactly `N` numbers separated by commas, semicolons, spaces or tabs (any mix).
pub fn numbers<const N: usize>(text: &str) -> Result<[f64; N], ListError> {
    let items: Vec<&str> = text
        .split(|c: char| c == ',' || c == ';' || c.is_whitespace())
        .filter(|s| !s.is_empty())
        .collect();
    if items.len() != N {
        return Err(ListError::Count {
            expected: N,
            found: items.len(),
        });
    }
    let mut out = [0.0; N];
    for (i, item) in items.iter().enumerate() {
        out[i] = number(item).map_err(|error| ListError::Item {
            position: i + 1,
            error,
        })?;
    }
    Ok(out)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn numbers_and_their_errors() {
        assert_eq!(number(" -3.5e2 "), Ok(-350.0));
        assert_eq!(number(""), Err(NumberError::Empty));
        assert_eq!(number("abc"), Err(NumberError::NotANumber("abc".into())));
        assert_eq!(number("1e999"), Err(NumberError::Overflow("1e999".into())));
        assert_eq!(number("NaN"), Err(NumberError::NonFinite("NaN".into())));
        assert_eq!(number("-inf"), Err(NumberError::NonFinite("-inf".into())));
        assert_eq!(
            number("1e-400"),
            Err(NumberError::Underflow("1e-400".into()))
        );
        assert_eq!(number("0e-400"), Ok(0.0));
        assert_eq!(number("-0.000"), Ok(0.0));
    }

    #[test]
    fn stress_lists() {
        assert_eq!(
            stress_list("xx=1, YX=-2,zz=3"),
            Ok([1.0, 0.0, 3.0, -2.0, 0.0, 0.0])
        );
        assert_eq!(
            stress_list("xy=1,yx=2"),
            Err(StressListError::Repeated("xy"))
        );
        assert_eq!(
            stress_list("xw=1"),
            Err(StressListError::UnknownKey("xw".into()))
        );
        assert_eq!(
            stress_list("xx"),
            Err(StressListError::NotKeyValue("xx".into()))
        );
        assert_eq!(stress_list(""), Err(StressListError::Empty));
        assert_eq!(stress_list(" , "), Err(StressListError::Empty));
        assert!(matches!(
            stress_list("zz=nan"),
            Err(StressListError::Value { .. })
        ));
    }

    #[test]
    fn separated_lists() {
        assert_eq!(
            numbers::<6>("1\t2 ; 3,4  5;6"),
            Ok([1.0, 2.0, 3.0, 4.0, 5.0, 6.0])
        );
        assert_eq!(
            numbers::<3>("1,2"),
            Err(ListError::Count {
                expected: 3,
                found: 2
            })
        );
    }
}

/// Why a `key=value,…` list with fixed keys cannot be read.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum KeyListError {
    /// An item without '='.
    #[error("'{0}' is not key=value")]
    NotKeyValue(String),
    /// A key not in the list.
    #[error("unknown key '{key}' (expected {expected})")]
    UnknownKey {
        /// The key.
        key: String,
        /// The keys it may be.
        expected: String,
    },
    /// A key given twice.
    #[error("'{0}' is given twice")]
    Repeated(String),
    /// A key left out.
    #[error("'{0}' is missing")]
    Missing(String),
    /// A value that is not a number.
    #[error("{key}: {error}")]
    Value {
        /// The key.
        key: String,
        /// What is wrong.
        error: NumberError,
    },
}

/// Reads `key=value,…` where every one of `keys` must be given once (case-sensitive), in any
/// order; values in the order of `keys`.
pub fn key_list<const N: usize>(text: &str, keys: [&str; N]) -> Result<[f64; N], KeyListError> {
    let mut values: [Option<f64>; N] = [None; N];
    for item in text.split(',').map(str::trim).filter(|s| !s.is_empty()) {
        let Some((key, value)) = item.split_once('=') else {
            return Err(KeyListError::NotKeyValue(item.to_owned()));
        };
        let key = key.trim();
        let Some(i) = keys.iter().position(|k| *k == key) else {
            return Err(KeyListError::UnknownKey {
                key: key.to_owned(),
                expected: keys.join(", "),
            });
        };
        if values[i].is_some() {
            return Err(KeyListError::Repeated(key.to_owned()));
        }
        values[i] = Some(number(value).map_err(|error| KeyListError::Value {
            key: key.to_owned(),
            error,
        })?);
    }
    let mut out = [0.0; N];
    for (i, v) in values.iter().enumerate() {
        out[i] = v.ok_or_else(|| KeyListError::Missing(keys[i].to_owned()))?;
    }
    Ok(out)
}

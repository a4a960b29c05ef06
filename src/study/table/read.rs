//! Reading a table: the header (separator, component columns by name or by `--columns`), the
//! fields of a line, comment and blank lines, and the preview the window shows.

use std::io::Read;

use super::{BadRow, COMPONENTS, Delimiter, Header, Row, TableError, TableOptions};
use crate::mechanics::criteria::Condition;
use crate::mechanics::{SignConvention, StressTensor};

/// The normalised header name: lower case, letters and digits only.
pub(super) fn normalise(name: &str) -> String {
    name.chars()
        .filter(char::is_ascii_alphanumeric)
        .map(|c| c.to_ascii_lowercase())
        .collect()
}

/// The component a header name stands for, if any.
#[must_use]
pub fn component_of(name: &str) -> Option<usize> {
    let n = normalise(name);
    // A unit in the name ("xx_MPa", "S11 (psi)"), as `planewise batch` writes them.
    let n = ["mpa", "kpa", "gpa", "ksi", "psi", "bar", "nmm2", "pa"]
        .iter()
        .find_map(|u| {
            n.strip_suffix(u)
                .filter(|rest| component_core(rest).is_some())
        })
        .map_or(n.clone(), str::to_owned);
    component_core(&n)
}

/// The component of a normalised name without a unit.
pub(super) fn component_core(n: &str) -> Option<usize> {
    let core = ["sigma", "stress", "tau", "s"]
        .iter()
        .find_map(|p| n.strip_prefix(p).filter(|rest| rest.len() == 2))
        .unwrap_or(n);
    match core {
        "xx" | "11" => Some(0),
        "yy" | "22" => Some(1),
        "zz" | "33" => Some(2),
        "xy" | "yx" | "12" | "21" => Some(3),
        "yz" | "zy" | "23" | "32" => Some(4),
        "zx" | "xz" | "13" | "31" => Some(5),
        _ => None,
    }
}

/// The fields of one line.
pub(super) fn split<'a>(
    line: &'a [u8],
    delimiter: Delimiter,
    out: &mut Vec<std::borrow::Cow<'a, [u8]>>,
) {
    out.clear();
    match delimiter {
        Delimiter::Whitespace => {
            out.extend(
                line.split(|b| *b == b' ' || *b == b'\t')
                    .filter(|f| !f.is_empty())
                    .map(std::borrow::Cow::Borrowed),
            );
        }
        Delimiter::Byte(d) => {
            if line.contains(&b'"') {
                // Quoted fields: let the csv crate read the line.
                let mut reader = csv::ReaderBuilder::new()
                    .has_headers(false)
                    .delimiter(d)
                    .flexible(true)
                    .from_reader(line);
                let mut record = csv::ByteRecord::new();
                if reader.read_byte_record(&mut record).unwrap_or(false) {
                    out.extend(record.iter().map(|f| std::borrow::Cow::Owned(f.to_vec())));
                }
            } else {
                out.extend(line.split(|b| *b == d).map(std::borrow::Cow::Borrowed));
            }
        }
    }
}

/// Trims ASCII spaces and a trailing carriage return.
pub(super) fn trim(bytes: &[u8]) -> &[u8] {
    let start = bytes
        .iter()
        .position(|b| !b.is_ascii_whitespace())
        .unwrap_or(bytes.len());
    let end = bytes
        .iter()
        .rposition(|b| !b.is_ascii_whitespace())
        .map_or(start, |e| e + 1);
    &bytes[start..end.max(start)]
}

/// Whether a line is to be skipped (blank or a comment).
pub(super) fn skipped(line: &[u8]) -> bool {
    let t = trim(line);
    t.is_empty() || t[0] == b'#'
}

/// Reads the header line and finds the components.
/// The out-of-plane components zz, yz, zx, by their place in [`COMPONENTS`].
const OUT_OF_PLANE: [usize; 3] = [2, 4, 5];

pub(super) fn header(
    line: &[u8],
    number: u64,
    options: &TableOptions,
    file: &str,
) -> Result<Header, TableError> {
    let text = String::from_utf8_lossy(line);
    let text = text
        .trim_start_matches('\u{feff}')
        .trim_end_matches(['\r', '\n']);
    let delimiter = if text.contains('\t') {
        Delimiter::Byte(b'\t')
    } else if text.contains(';') {
        Delimiter::Byte(b';')
    } else if text.contains(',') {
        Delimiter::Byte(b',')
    } else {
        Delimiter::Whitespace
    };
    let mut fields = Vec::new();
    split(text.as_bytes(), delimiter, &mut fields);
    let names: Vec<String> = fields
        .iter()
        .map(|f| {
            String::from_utf8_lossy(trim(f))
                .trim_matches('"')
                .to_owned()
        })
        .collect();
    // A header can be any length (a file that is not a table): messages quote at most 200
    // characters of it.
    let listed = {
        let all = names.join(", ");
        if all.chars().count() > 200 {
            format!("{}…", all.chars().take(200).collect::<String>())
        } else {
            all
        }
    };
    let bad = |message: String| TableError::Header {
        file: file.to_owned(),
        line: number,
        message,
    };
    let mut components = [usize::MAX; 6];
    for (k, name) in &options.columns {
        let i = names
            .iter()
            .position(|n| n.eq_ignore_ascii_case(name.trim()))
            .ok_or_else(|| {
                bad(format!(
                    "--columns names '{name}' for {}, but the header has no such column (it has: {listed})",
                    COMPONENTS[*k],
                ))
            })?;
        components[*k] = i;
    }
    let mapped = components;
    for (i, name) in names.iter().enumerate() {
        let Some(k) = component_of(name) else {
            continue;
        };
        if mapped[k] != usize::MAX || mapped.contains(&i) {
            continue;
        }
        if components[k] != usize::MAX {
            return Err(bad(format!(
                "columns {} ('{}') and {} ('{name}') both name {}; say which with --columns {}=NAME",
                components[k] + 1,
                names[components[k]],
                i + 1,
                COMPONENTS[k],
                COMPONENTS[k]
            )));
        }
        components[k] = i;
    }
    // Plane stress: the user said zz, yz and zx are zero; a column for one of them says
    // otherwise, and is refused rather than read or dropped.
    if options.plane_stress
        && let Some(&k) = OUT_OF_PLANE.iter().find(|&&k| components[k] != usize::MAX)
    {
        return Err(bad(format!(
            "plane stress says {} is zero, but column {} ('{}') holds it; leave out the plane-stress option or that column",
            COMPONENTS[k],
            components[k] + 1,
            names[components[k]]
        )));
    }
    let missing: Vec<&str> = (0..6)
        .filter(|&k| components[k] == usize::MAX)
        .filter(|k| !(options.plane_stress && OUT_OF_PLANE.contains(k)))
        .map(|k| COMPONENTS[k])
        .collect();
    if !missing.is_empty() {
        return Err(bad(format!(
            "no column for {} in the header ({} separated: {listed}); name them with --columns xx=NAME,…",
            missing.join(", "),
            delimiter.name(),
        )));
    }
    let carried = (0..names.len())
        .filter(|i| !components.contains(i))
        .collect();
    let group = match &options.group_by {
        None => None,
        Some(wanted) => {
            let wanted = wanted.trim();
            let Some(i) = names.iter().position(|n| n.eq_ignore_ascii_case(wanted)) else {
                return Err(bad(format!(
                    "no column '{wanted}' to group by in the header ({} separated: {listed})",
                    delimiter.name()
                )));
            };
            if components.contains(&i) {
                return Err(bad(format!(
                    "column '{}' holds a stress component; group by a column of names (an element set, a part)",
                    names[i]
                )));
            }
            Some(i)
        }
    };
    Ok(Header {
        names,
        delimiter,
        components,
        carried,
        group,
        line: number,
    })
}

/// The header and the first rows' fields of a table, for the window's column-mapping preview
/// (reads at most `limit` bytes).
pub fn preview(
    source: impl Read,
    file: &str,
    options: &TableOptions,
    limit: u64,
) -> Result<(Header, Vec<Vec<String>>), TableError> {
    let mut bytes = Vec::new();
    source
        .take(limit)
        .read_to_end(&mut bytes)
        .map_err(|cause| TableError::Io {
            file: file.to_owned(),
            cause,
        })?;
    let text = bytes.strip_prefix("\u{feff}".as_bytes()).unwrap_or(&bytes);
    let mut lines = text.split(|b| *b == b'\n').enumerate();
    let header = loop {
        let Some((i, line)) = lines.next() else {
            return Err(TableError::Header {
                file: file.to_owned(),
                line: 1,
                message: "no header row: the table is empty".to_owned(),
            });
        };
        if !skipped(line) {
            break self::header(line, i as u64 + 1, options, file)?;
        }
    };
    let mut rows = Vec::new();
    let mut fields = Vec::new();
    for (_, line) in lines.filter(|(_, l)| !skipped(l)).take(8) {
        split(line, header.delimiter, &mut fields);
        rows.push(
            fields
                .iter()
                .map(|f| String::from_utf8_lossy(trim(f)).into_owned())
                .collect(),
        );
    }
    Ok((header, rows))
}

/// One row's fields read: the components converted to pascals, tension positive, and (with
/// `carry`) the carried columns' text; the measure is not yet evaluated.
pub(super) fn read_row(
    fields: &[std::borrow::Cow<'_, [u8]>],
    number: u64,
    header: &Header,
    options: &TableOptions,
    convention: SignConvention,
    carry: bool,
) -> Result<Row, BadRow> {
    let width = header.names.len();
    let to_pa = |v: f64| convention.sign() * options.unit.to_pa(v);
    let fail = |column: Option<usize>, message: String| BadRow {
        line: number,
        column,
        message,
    };
    if fields.len() != width {
        return Err(fail(
            None,
            format!("{} fields, but the header has {width}", fields.len()),
        ));
    }
    let mut c = [0.0; 6];
    for (k, &i) in header.components.iter().enumerate() {
        // An out-of-plane component of a plane-stress table: zero, as the user stated.
        if i == usize::MAX {
            continue;
        }
        let raw = trim(&fields[i]);
        let raw = raw
            .strip_prefix(b"\"")
            .and_then(|r| r.strip_suffix(b"\""))
            .unwrap_or(raw);
        let parsed = if options.decimal_comma {
            let swapped: Vec<u8> = raw
                .iter()
                .map(|&b| if b == b',' { b'.' } else { b })
                .collect();
            fast_float2::parse::<f64, _>(&swapped)
        } else {
            fast_float2::parse::<f64, _>(raw)
        };
        let text = || String::from_utf8_lossy(raw).into_owned();
        match parsed {
            Ok(v) if v.is_finite() => c[k] = to_pa(v),
            Ok(_) => {
                return Err(fail(
                    Some(i + 1),
                    format!("{} = \"{}\" is not a finite number", COMPONENTS[k], text()),
                ));
            }
            Err(_) if raw.is_empty() => {
                return Err(fail(Some(i + 1), format!("{} is empty", COMPONENTS[k])));
            }
            Err(_) => {
                return Err(fail(Some(i + 1), format!("\"{}\" is not a number", text())));
            }
        }
    }
    let tensor = StressTensor::from_pa(c).map_err(|e| fail(None, e.to_string()))?;
    Ok(Row {
        line: number,
        carried: if carry {
            header
                .carried
                .iter()
                .map(|&i| String::from_utf8_lossy(trim(&fields[i])).into_owned())
                .collect()
        } else {
            Vec::new()
        },
        tensor,
        value: None,
        standing: Condition::Undefined,
        plane: None,
    })
}

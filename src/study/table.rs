//! Finite-element result tables: one stress state per row, read as a stream and ranked by a
//! measure, keeping only the top N when that is all that is asked (so a file larger than
//! memory ranks in bounded memory). No egui here; `planewise batch` and the window's import both
//! use [`rank`].
//!
//! The text is CSV (the `csv` crate: quoted fields, CRLF), tab-, semicolon- or
//! whitespace-separated, with a header row; a UTF-8 byte-order mark, comment lines starting with
//! `#` and blank lines are skipped. Numbers are parsed by `fast-float2`; `decimal_comma` reads
//! `1,5` as 1.5 (then the fields must be separated by `;`, tabs or spaces). The six components
//! are found by their header names (xx, yy, zz, xy, yz, zx, case-insensitive, with or without
//! an `s`, `sigma` or `stress` prefix, `yx`/`zy`/`xz` for the shear pairs, or `s11`…`s13`), or
//! as the user maps them; every other column is carried along as text. The unit and the sign
//! convention are the user's to state, never guessed.
//!
//! The stream is read in blocks; each block is cut at line ends and its parts parsed in
//! parallel (rayon). Quoted fields may hold delimiters and quotes but not line breaks.

use std::collections::BinaryHeap;
use std::io::{Read, Seek};

use rayon::prelude::*;

use crate::mechanics::criteria::Condition;
use crate::mechanics::{SignConvention, StressTensor, StressUnit};
use crate::study::envelope::{ConditionCounts, RankKey, Ranking};

/// How the fields of a row are separated.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Delimiter {
    /// A single byte (`,`, `;`, tab).
    Byte(u8),
    /// Runs of spaces or tabs.
    Whitespace,
}

impl Delimiter {
    /// A name for messages.
    #[must_use]
    pub fn name(self) -> &'static str {
        match self {
            Self::Byte(b',') => "comma",
            Self::Byte(b';') => "semicolon",
            Self::Byte(b'\t') => "tab",
            Self::Byte(_) => "single character",
            Self::Whitespace => "whitespace",
        }
    }
}

/// The six component names in stored order.
pub const COMPONENTS: [&str; 6] = ["xx", "yy", "zz", "xy", "yz", "zx"];

/// What the user says about the table.
#[derive(Clone, Debug, PartialEq)]
pub struct TableOptions {
    /// Component → header name, for the components the user names (others by header name).
    pub columns: Vec<(usize, String)>,
    /// Unit of the components.
    pub unit: StressUnit,
    /// Sign convention of the components.
    pub convention: SignConvention,
    /// Numbers are written with a decimal comma.
    pub decimal_comma: bool,
    /// Go on past bad rows (count them, keep the first few) instead of stopping at the first.
    pub skip_bad_rows: bool,
    /// Keep only the N worst rows (`None`: all, sorted).
    pub top: Option<usize>,
    /// With `top: None`: keep of each row only its key and where it is in the file (40 bytes a
    /// row, [`Place`]) instead of the row itself; [`Ranked::ordered`] then reads the rows again
    /// from the file, worst first. For rankings of every row of tables larger than memory.
    pub by_place: bool,
    /// Keep only the rows at or beyond this value (the measure's value: Pa for stresses, in the
    /// table's convention; else dimensionless); rows failing at any scale or without frictional
    /// capacity always are.
    pub above: Option<f64>,
}

impl TableOptions {
    /// Components found by header name in `unit` and `convention`, plain decimal points,
    /// stopping at the first bad row, every row kept.
    #[must_use]
    pub fn new(unit: StressUnit, convention: SignConvention) -> Self {
        Self {
            columns: Vec::new(),
            unit,
            convention,
            decimal_comma: false,
            skip_bad_rows: false,
            top: None,
            by_place: false,
            above: None,
        }
    }
}

/// The header as read: names, the delimiter, where the components are and what is carried.
#[derive(Clone, Debug, PartialEq)]
pub struct Header {
    /// Column names as written (trimmed).
    pub names: Vec<String>,
    /// The delimiter found in the header line.
    pub delimiter: Delimiter,
    /// Column index of each component, in [`COMPONENTS`] order.
    pub components: [usize; 6],
    /// Column indices carried along as text (ids, coordinates, load step…).
    pub carried: Vec<usize>,
    /// Line number of the header (1-based; after comments and blank lines).
    pub line: u64,
}

/// One ranked row.
#[derive(Clone, Debug, PartialEq)]
pub struct Row {
    /// Line number in the file (1-based).
    pub line: u64,
    /// The carried columns' text, in [`Header::carried`] order.
    pub carried: Vec<String>,
    /// The stress (pascals, tension positive).
    pub tensor: StressTensor,
    /// The ranked measure's value (Pa for stresses, in the table's convention; else
    /// dimensionless); `None` where it is not a number (see `standing`).
    pub value: Option<f64>,
    /// How the value reads: a number, or why not (fails at any scale, no frictional capacity,
    /// never reaches the surface, undefined).
    pub standing: Condition,
    /// For worst-plane measures: the first worst plane's dip and dip direction, degrees, as
    /// the ranking found it (so no output searches again).
    pub plane: Option<[f64; 2]>,
}

impl Row {
    /// Takes the measure's value, standing and first worst plane from `evaluated`.
    fn take(&mut self, evaluated: &crate::study::envelope::MeasureValue) {
        self.value = evaluated.value;
        self.standing = evaluated.standing();
        self.plane = evaluated.planes.first().map(|w| {
            [
                crate::text::format::angle(w.dip_deg, false),
                crate::text::format::angle(w.dip_direction_deg, true),
            ]
        });
    }
}

/// Where a kept row is in the file, with its rank key: all that a full ranking holds per row
/// with [`TableOptions::by_place`] (40 bytes).
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Place {
    key: RankKey,
    /// Line number (1-based).
    line: u64,
    /// Byte offset of the line's start in the file.
    offset: u64,
    /// The line's length in bytes (without its line end).
    len: u32,
}

/// A row that could not be read.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct BadRow {
    /// Line number (1-based).
    pub line: u64,
    /// Field number (1-based), where one field is at fault.
    pub column: Option<usize>,
    /// What is wrong.
    pub message: String,
}

impl BadRow {
    /// `file:line:column: message`, as compilers write it.
    #[must_use]
    pub fn located(&self, file: &str) -> String {
        match self.column {
            Some(c) => format!("{file}:{}:{c}: {}", self.line, self.message),
            None => format!("{file}:{}: {}", self.line, self.message),
        }
    }
}

/// Why a table cannot be ranked.
#[derive(Debug, thiserror::Error)]
pub enum TableError {
    /// Reading failed.
    #[error("{file}: {cause}")]
    Io {
        /// The file's name as given.
        file: String,
        /// The operating system's error.
        cause: std::io::Error,
    },
    /// The header is missing or does not name the components.
    #[error("{file}:{line}: {message}")]
    Header {
        /// The file's name as given.
        file: String,
        /// Line number.
        line: u64,
        /// What is wrong.
        message: String,
    },
    /// A bad row (and `skip_bad_rows` was not asked for).
    #[error("{}", .row.located(.file))]
    Row {
        /// The file's name as given.
        file: String,
        /// The row.
        row: BadRow,
    },
    /// The ranking measure cannot be evaluated (for example a criterion without strengths).
    #[error("{0}")]
    Measure(String),
    /// Stopped by the caller.
    #[error("cancelled")]
    Cancelled,
    /// A row read again for the output no longer reads as it did when it was ranked.
    #[error(
        "{file}:{line}: the file changed while it was ranked (this row now reads differently); the output is incomplete"
    )]
    Changed {
        /// The file's name as given.
        file: String,
        /// Line number.
        line: u64,
    },
}

/// The outcome of ranking a table.
#[derive(Clone, Debug, PartialEq)]
pub struct Ranked {
    /// The header.
    pub header: Header,
    /// Rows, worst first (the top N, or all); empty with [`TableOptions::by_place`], where
    /// [`Ranked::ordered`] reads them.
    pub rows: Vec<Row>,
    /// With [`TableOptions::by_place`]: where every kept row is, worst first.
    pub places: Vec<Place>,
    /// Rows read (good ones).
    pub total_rows: u64,
    /// Bad rows skipped (with `skip_bad_rows`).
    pub bad_count: u64,
    /// The first bad rows, by line (at most [`KEEP_BAD`]).
    pub bad: Vec<BadRow>,
    /// How many good rows stand in each condition (all rows read, not only those kept).
    pub counts: ConditionCounts,
    /// With [`TableOptions::above`]: how many rows are at or beyond the threshold.
    pub at_or_beyond: u64,
    /// The last line has no line end: the file may have been cut short (its last row was read
    /// as it stands).
    pub unterminated: bool,
}

impl Ranked {
    /// How many rows are kept (the top N, or all).
    #[must_use]
    pub fn kept(&self) -> usize {
        self.rows.len() + self.places.len()
    }

    /// The kept rows, worst first. With [`TableOptions::by_place`] each is read again from
    /// `source` (the file that was ranked, `file` in messages) and checked against its rank key;
    /// otherwise they are the rows held.
    pub fn ordered<'a>(
        &'a self,
        source: Option<&'a std::fs::File>,
        file: &'a str,
        options: &'a TableOptions,
        measure: &'a Measure<'a>,
    ) -> impl Iterator<Item = Result<Row, TableError>> + 'a {
        let held = self.rows.iter().cloned().map(Ok);
        let mut bytes = Vec::new();
        let read_again = self.places.iter().map(move |p| {
            let changed = || TableError::Changed {
                file: file.to_owned(),
                line: p.line,
            };
            let io = |cause| TableError::Io {
                file: file.to_owned(),
                cause,
            };
            let mut f = source.ok_or_else(changed)?;
            bytes.resize(p.len as usize, 0);
            f.seek(std::io::SeekFrom::Start(p.offset)).map_err(io)?;
            f.read_exact(&mut bytes).map_err(io)?;
            let mut fields = Vec::new();
            split(&bytes, self.header.delimiter, &mut fields);
            let mut row = read_row(
                &fields,
                p.line,
                &self.header,
                options,
                measure.convention,
                true,
            )
            .map_err(|_| changed())?;
            let evaluated = measure
                .evaluate(&row.tensor)
                .map_err(|e| TableError::Measure(e.to_string()))?;
            if measure.key(&evaluated) != p.key {
                return Err(changed());
            }
            row.take(&evaluated);
            Ok(row)
        });
        held.chain(read_again)
    }
}

/// How many bad rows are kept to report.
pub const KEEP_BAD: usize = 20;

/// The ranking measure with what it needs: the study's one [`Ranking`].
pub type Measure<'a> = Ranking<'a>;

/// A row in the heap, ordered by its key then by line (earlier first among equals).
struct Keyed {
    key: RankKey,
    row: Row,
}

impl PartialEq for Keyed {
    fn eq(&self, other: &Self) -> bool {
        self.cmp(other) == std::cmp::Ordering::Equal
    }
}
impl Eq for Keyed {}
impl PartialOrd for Keyed {
    fn partial_cmp(&self, other: &Self) -> Option<std::cmp::Ordering> {
        Some(self.cmp(other))
    }
}
impl Ord for Keyed {
    /// Reversed: the heap's top is the row that goes first when the heap is over its size
    /// (the least bad, and among equals the latest line).
    fn cmp(&self, other: &Self) -> std::cmp::Ordering {
        other
            .key
            .cmp(&self.key)
            .then(self.row.line.cmp(&other.row.line))
    }
}

/// Rows kept so far: a bounded heap for the top N, every row, or every row's place.
struct Kept {
    limit: Option<usize>,
    heap: BinaryHeap<Keyed>,
    places: Vec<Place>,
}

impl Kept {
    fn new(limit: Option<usize>) -> Self {
        Self {
            limit,
            heap: BinaryHeap::new(),
            places: Vec::new(),
        }
    }

    fn push(&mut self, item: Keyed) {
        match self.limit {
            Some(0) => {}
            Some(n) if self.heap.len() >= n => {
                if let Some(mut top) = self.heap.peek_mut()
                    && item.cmp(&top) == std::cmp::Ordering::Less
                {
                    *top = item;
                }
            }
            _ => self.heap.push(item),
        }
    }

    fn merge(&mut self, other: Kept) {
        for item in other.heap {
            self.push(item);
        }
        self.places.extend(other.places);
    }

    /// Worst first (and among equals the earlier line first): the rows, and the places.
    fn into_ranked(mut self) -> (Vec<Row>, Vec<Place>) {
        self.places
            .sort_unstable_by(|a, b| b.key.cmp(&a.key).then(a.line.cmp(&b.line)));
        let rows = self
            .heap
            .into_sorted_vec()
            .into_iter()
            .map(|k| k.row)
            .collect();
        (rows, self.places)
    }
}

/// The normalised header name: lower case, letters and digits only.
fn normalise(name: &str) -> String {
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
fn component_core(n: &str) -> Option<usize> {
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
fn split<'a>(line: &'a [u8], delimiter: Delimiter, out: &mut Vec<std::borrow::Cow<'a, [u8]>>) {
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
fn trim(bytes: &[u8]) -> &[u8] {
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
fn skipped(line: &[u8]) -> bool {
    let t = trim(line);
    t.is_empty() || t[0] == b'#'
}

/// Reads the header line and finds the components.
fn header(
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
    let missing: Vec<&str> = (0..6)
        .filter(|&k| components[k] == usize::MAX)
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
    Ok(Header {
        names,
        delimiter,
        components,
        carried,
        line: number,
    })
}

/// What one part of a block gave.
struct Part {
    kept: Kept,
    rows: u64,
    bad: Vec<BadRow>,
    bad_count: u64,
    counts: ConditionCounts,
    at_or_beyond: u64,
}

/// One row's fields read: the components converted to pascals, tension positive, and (with
/// `carry`) the carried columns' text; the measure is not yet evaluated.
fn read_row(
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

/// Parses the lines of `bytes` (whole lines), the first being line `first_line` at byte
/// `base` of the file.
fn parse_part(
    bytes: &[u8],
    first_line: u64,
    base: u64,
    header: &Header,
    options: &TableOptions,
    measure: &Measure<'_>,
) -> Result<Part, String> {
    let mut part = Part {
        kept: Kept::new(options.top),
        rows: 0,
        bad: Vec::new(),
        bad_count: 0,
        counts: ConditionCounts::default(),
        at_or_beyond: 0,
    };
    let threshold = options
        .above
        .map(|v| RankKey::threshold(measure.measure, v));
    let mut fields = Vec::new();
    let by_place = options.by_place && options.top.is_none();
    for (k, line) in bytes.split(|b| *b == b'\n').enumerate() {
        let number = first_line + k as u64;
        if skipped(line) {
            continue;
        }
        split(line, header.delimiter, &mut fields);
        let mut result = read_row(
            &fields,
            number,
            header,
            options,
            measure.convention,
            !by_place,
        );
        // Where the line is (its line end, a '\r' included, is left out when it is read again).
        let offset = base + (line.as_ptr() as usize - bytes.as_ptr() as usize) as u64;
        let len = u32::try_from(line.len()).unwrap_or(u32::MAX);
        if by_place && len == u32::MAX {
            result = Err(BadRow {
                line: number,
                column: None,
                message: "the line is longer than 4 GiB".to_owned(),
            });
        }
        match result {
            Ok(mut row) => {
                let evaluated = measure.evaluate(&row.tensor).map_err(|e| e.to_string())?;
                let key = measure.key(&evaluated);
                row.take(&evaluated);
                part.rows += 1;
                part.counts.add(row.standing);
                if let Some(t) = &threshold {
                    if !key.at_or_beyond(t) {
                        continue;
                    }
                    part.at_or_beyond += 1;
                }
                if by_place {
                    part.kept.places.push(Place {
                        key,
                        line: number,
                        offset,
                        len,
                    });
                } else {
                    part.kept.push(Keyed { key, row });
                }
            }
            Err(bad) => {
                part.bad_count += 1;
                if part.bad.len() < KEEP_BAD {
                    part.bad.push(bad);
                }
                if !options.skip_bad_rows {
                    break;
                }
            }
        }
    }
    Ok(part)
}

/// Bytes read per block.
const BLOCK: usize = 8 << 20;

/// Ranks the table read from `source` (named `file` in messages). `progress` is told the bytes
/// read so far and returns `false` to stop (then [`TableError::Cancelled`]).
pub fn rank(
    mut source: impl Read,
    file: &str,
    options: &TableOptions,
    measure: &Measure<'_>,
    mut progress: impl FnMut(u64) -> bool,
) -> Result<Ranked, TableError> {
    let io = |cause| TableError::Io {
        file: file.to_owned(),
        cause,
    };
    let mut buffer: Vec<u8> = Vec::with_capacity(BLOCK + 4096);
    let mut read_total = 0u64;
    // Bytes of the source before the buffer's first byte.
    let mut drained = 0u64;
    let mut next_line = 1u64;
    let mut header_found: Option<Header> = None;
    let mut kept = Kept::new(options.top);
    let (mut total_rows, mut bad_count, mut at_or_beyond) = (0u64, 0u64, 0u64);
    let mut counts = ConditionCounts::default();
    let mut bad: Vec<BadRow> = Vec::new();
    let mut eof = false;
    let mut unterminated = false;
    let threads = rayon::current_num_threads().max(1);
    while !eof {
        // Fill the buffer up to a block.
        let start = buffer.len();
        buffer.resize(start + BLOCK, 0);
        let mut filled = start;
        while filled < buffer.len() {
            let n = source.read(&mut buffer[filled..]).map_err(io)?;
            if n == 0 {
                eof = true;
                break;
            }
            filled += n;
        }
        buffer.truncate(filled);
        read_total += (filled - start) as u64;
        if !progress(read_total) {
            return Err(TableError::Cancelled);
        }
        // Whole lines only; the rest waits for the next block.
        if eof && buffer.last().is_some_and(|b| *b != b'\n') {
            unterminated = true;
        }
        let end = if eof {
            buffer.len()
        } else {
            match memchr::memrchr(b'\n', &buffer) {
                Some(i) => i + 1,
                None => continue,
            }
        };
        let mut block: &[u8] = &buffer[..end];
        // The header: the first line that is not blank or a comment.
        if header_found.is_none() {
            if next_line == 1 && block.starts_with("\u{feff}".as_bytes()) {
                block = &block[3..];
            }
            while !block.is_empty() {
                let cut = memchr::memchr(b'\n', block).map_or(block.len(), |i| i + 1);
                let (line, rest) = block.split_at(cut);
                let number = next_line;
                next_line += 1;
                block = rest;
                if !skipped(line) {
                    header_found = Some(header(line, number, options, file)?);
                    break;
                }
            }
        }
        let Some(h) = &header_found else {
            buffer.drain(..end);
            drained += end as u64;
            continue;
        };
        // Parts of about equal size, cut at line ends, with their first line numbers and where
        // they start in the source.
        let mut parts: Vec<(&[u8], u64, u64)> = Vec::new();
        let target = (block.len() / (threads * 4)).max(64 << 10);
        let mut rest = block;
        let mut line = next_line;
        while !rest.is_empty() {
            let cut = if rest.len() <= target {
                rest.len()
            } else {
                memchr::memchr(b'\n', &rest[target..]).map_or(rest.len(), |i| target + i + 1)
            };
            let (part, tail) = rest.split_at(cut);
            // A part ends with '\n', so its last split piece is empty: lines = count of '\n'.
            let lines = memchr::memchr_iter(b'\n', part).count() as u64;
            let part = part.strip_suffix(b"\n").unwrap_or(part);
            let at = drained + (part.as_ptr() as usize - buffer.as_ptr() as usize) as u64;
            parts.push((part, line, at));
            line += lines.max(1);
            rest = tail;
        }
        next_line = line;
        let results: Vec<Result<Part, String>> = parts
            .par_iter()
            .map(|(bytes, first, at)| parse_part(bytes, *first, *at, h, options, measure))
            .collect();
        for r in results {
            let part = r.map_err(TableError::Measure)?;
            total_rows += part.rows;
            bad_count += part.bad_count;
            at_or_beyond += part.at_or_beyond;
            counts.merge(&part.counts);
            bad.extend(part.bad);
            kept.merge(part.kept);
        }
        bad.sort_by_key(|b| b.line);
        bad.truncate(KEEP_BAD);
        if !options.skip_bad_rows
            && let Some(first) = bad.first()
        {
            return Err(TableError::Row {
                file: file.to_owned(),
                row: first.clone(),
            });
        }
        buffer.drain(..end);
        drained += end as u64;
    }
    let header = header_found.ok_or_else(|| TableError::Header {
        file: file.to_owned(),
        line: next_line.saturating_sub(1).max(1),
        message: "no header row: the table is empty".to_owned(),
    })?;
    let (rows, places) = kept.into_ranked();
    Ok(Ranked {
        header,
        rows,
        places,
        total_rows,
        bad_count,
        bad,
        counts,
        at_or_beyond,
        unterminated,
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

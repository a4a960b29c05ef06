//! Load cases as tables: one table per load case (`CASE=FILE`), or one long table with a
//! load-case column, joined on the id columns the user names (element, integration point,
//! section point…) into points that hold one tensor per case.
//!
//! Rows may come in any order in each table; a point is known by its ids' text (trimmed), in
//! the order it is first met. An id missing from a case, or met twice in one case, is an error
//! naming the table, the line and the id, unless the user asks to count and skip such points.
//!
//! Memory: per point and case one tensor (48 bytes), per point its ids' text, a 4-byte end and
//! a 4-byte slot in the hash table (about 8 bytes with the table's spare room), and with groups
//! a 4-byte group number.

use std::io::Read;

use hashbrown::HashTable;

use super::read::{normalise, read_row, skipped, split, trim};
use super::stream::{Parsed, Streamed, note_bad, stream};
use super::{BadRow, Header, TableError, TableOptions};

/// One load-case table to read.
pub struct CaseTable<R> {
    /// The load case's name (with a case column: unused, the column names the cases).
    pub case: String,
    /// The file's name, for messages.
    pub file: String,
    /// Its text.
    pub source: R,
}

/// How the tables are joined.
#[derive(Clone, Debug, PartialEq, Eq, Default)]
pub struct JoinOptions {
    /// The id columns (one or more), by header name (case-insensitive).
    pub ids: Vec<String>,
    /// One long table: the column that names each row's load case.
    pub case_column: Option<String>,
    /// Count and skip points missing from a case or met twice in one (default: stop at the
    /// first, naming it).
    pub skip_unmatched: bool,
}

/// How many unmatched points are kept to report.
pub const KEEP_UNMATCHED: usize = 20;

/// What was read from one table.
#[derive(Clone, Debug, PartialEq)]
pub struct TableRead {
    /// The file's name.
    pub file: String,
    /// The load case (with a case column: empty).
    pub case: String,
    /// Good rows read.
    pub rows: u64,
    /// Bad rows skipped (with `skip_bad_rows`).
    pub bad_count: u64,
    /// The first bad rows.
    pub bad: Vec<BadRow>,
    /// The last line has no line end.
    pub unterminated: bool,
}

/// The points of joined tables, each with one tensor per load case.
#[derive(Debug)]
pub struct Points {
    /// The id columns' names, as the user gave them.
    pub id_names: Vec<String>,
    /// The load cases, in the order given (or, with a case column, first met).
    pub cases: Vec<String>,
    /// Each table read.
    pub tables: Vec<TableRead>,
    /// The ids' text of every point, fields separated by [`ID_SEPARATOR`].
    ids: Vec<u8>,
    /// Where each point's ids end in `ids`.
    ends: Vec<u32>,
    /// Per case, per point: the tensor (pascals, tension positive); `[NaN; 6]` until read.
    tensors: Vec<Vec<[f64; 6]>>,
    /// With a group column: the group names and each point's group.
    pub group_column: Option<String>,
    group_names: Vec<String>,
    groups: Vec<u32>,
    /// Points left out (with `skip_unmatched`): missing from a case or met twice in one.
    left_out: Vec<bool>,
    /// How many points were left out.
    pub unmatched_count: u64,
    /// The first unmatched points, as messages naming the table and the id.
    pub unmatched: Vec<String>,
}

/// Separates the id fields of a point in its stored text.
const ID_SEPARATOR: u8 = 0x1f;

/// An absent tensor (a table's numbers are always finite).
const ABSENT: [f64; 6] = [f64::NAN; 6];

impl Points {
    /// How many points there are (those left out included).
    #[must_use]
    pub fn len(&self) -> usize {
        self.ends.len()
    }

    /// Whether there are none.
    #[must_use]
    pub fn is_empty(&self) -> bool {
        self.ends.is_empty()
    }

    /// The stored id text of point `p`.
    fn id_bytes(&self, p: usize) -> &[u8] {
        let start = if p == 0 { 0 } else { self.ends[p - 1] as usize };
        &self.ids[start..self.ends[p] as usize]
    }

    /// The id fields of point `p`.
    #[must_use]
    pub fn ids(&self, p: usize) -> Vec<String> {
        self.id_bytes(p)
            .split(|b| *b == ID_SEPARATOR)
            .map(|f| String::from_utf8_lossy(f).into_owned())
            .collect()
    }

    /// Point `p`'s ids for messages: `element=12, point=3`.
    #[must_use]
    pub fn id_text(&self, p: usize) -> String {
        id_text(&self.id_names, self.id_bytes(p))
    }

    /// Point `p`'s tensor in case `c` (pascals, tension positive).
    #[must_use]
    pub fn tensor(&self, c: usize, p: usize) -> [f64; 6] {
        self.tensors[c][p]
    }

    /// Whether point `p` was left out (missing from a case or met twice in one).
    #[must_use]
    pub fn left_out(&self, p: usize) -> bool {
        self.left_out.get(p).copied().unwrap_or(false)
    }

    /// Point `p`'s group (with a group column).
    #[must_use]
    pub fn group(&self, p: usize) -> Option<(u32, &str)> {
        let g = *self.groups.get(p)?;
        Some((g, self.group_names[g as usize].as_str()))
    }

    /// The group names, by group number.
    #[must_use]
    pub fn group_names(&self) -> &[String] {
        &self.group_names
    }

    /// The first point (in the order met) whose ids' text is `ids`, fields in
    /// [`Points::id_names`] order.
    #[must_use]
    pub fn find(&self, ids: &[&str]) -> Option<usize> {
        let wanted = ids.join(&char::from(ID_SEPARATOR).to_string());
        (0..self.len()).find(|&p| self.id_bytes(p) == wanted.as_bytes())
    }

    /// Bytes held for the points (tensors, ids, their ends, groups; the hash table of ids is
    /// let go once the tables are joined), for the run's memory figure.
    #[must_use]
    pub fn bytes_held(&self) -> usize {
        self.tensors.iter().map(Vec::capacity).sum::<usize>() * 48
            + self.ids.capacity()
            + self.ends.capacity() * 4
            + self.groups.capacity() * 4
            + self.left_out.capacity()
    }
}

/// `element=12, point=3` from the names and the stored text.
fn id_text(names: &[String], bytes: &[u8]) -> String {
    names
        .iter()
        .zip(bytes.split(|b| *b == ID_SEPARATOR))
        .map(|(n, v)| format!("{n}={}", String::from_utf8_lossy(v)))
        .collect::<Vec<_>>()
        .join(", ")
}

/// The header with where the ids, the case and the group are.
struct JoinHeader {
    header: Header,
    ids: Vec<usize>,
    case: Option<usize>,
}

/// One row as a part read it: its line, where its ids (and case, group) are in the part's
/// text, and its tensor.
struct JoinRow {
    line: u64,
    id: (u32, u32),
    case: (u32, u32),
    group: (u32, u32),
    tensor: [f64; 6],
}

/// The rows of one part and the text they point into.
struct JoinPart {
    text: Vec<u8>,
    rows: Vec<JoinRow>,
}

/// Finds the id, case and group columns in a table's header.
fn join_header(header: Header, join: &JoinOptions, file: &str) -> Result<JoinHeader, TableError> {
    let bad = |message: String| TableError::Header {
        file: file.to_owned(),
        line: header.line,
        message,
    };
    let find = |name: &str, what: &str| -> Result<usize, TableError> {
        let i = header
            .names
            .iter()
            .position(|n| n.eq_ignore_ascii_case(name.trim()))
            .or_else(|| {
                header
                    .names
                    .iter()
                    .position(|n| normalise(n) == normalise(name))
            })
            .ok_or_else(|| {
                bad(format!(
                    "no {what} column '{}' (the header has: {})",
                    name.trim(),
                    header.names.join(", ")
                ))
            })?;
        if header.components.contains(&i) {
            return Err(bad(format!(
                "column '{}' holds a stress component; it cannot be an {what} column",
                header.names[i]
            )));
        }
        Ok(i)
    };
    let mut ids = Vec::new();
    for name in &join.ids {
        let i = find(name, "id")?;
        if ids.contains(&i) {
            return Err(bad(format!(
                "the id column '{}' is named twice",
                name.trim()
            )));
        }
        ids.push(i);
    }
    let case = join
        .case_column
        .as_deref()
        .map(|c| find(c, "load-case"))
        .transpose()?;
    if let Some(c) = case
        && ids.contains(&c)
    {
        return Err(bad(format!(
            "'{}' is named both as an id and as the load-case column",
            header.names[c]
        )));
    }
    Ok(JoinHeader { header, ids, case })
}

/// Reads one part's rows: the tensor, the ids' text, the case and group.
fn parse_join_part(
    bytes: &[u8],
    first_line: u64,
    h: &JoinHeader,
    options: &TableOptions,
) -> Parsed<JoinPart> {
    let mut part = Parsed {
        value: JoinPart {
            text: Vec::with_capacity(bytes.len() / 4),
            rows: Vec::new(),
        },
        bad: Vec::new(),
        bad_count: 0,
    };
    let mut fields = Vec::new();
    for (k, line) in bytes.split(|b| *b == b'\n').enumerate() {
        let number = first_line + k as u64;
        if skipped(line) {
            continue;
        }
        split(line, h.header.delimiter, &mut fields);
        let row = read_row(
            &fields,
            number,
            &h.header,
            options,
            options.convention,
            false,
        );
        let row = row.and_then(|row| {
            let start = text_len(&part.value.text);
            for (n, &i) in h.ids.iter().enumerate() {
                if n > 0 {
                    part.value.text.push(ID_SEPARATOR);
                }
                put_field(
                    &mut part.value.text,
                    &fields,
                    i,
                    number,
                    &h.header,
                    "id column",
                )?;
            }
            let id = (start, text_len(&part.value.text));
            let case = match h.case {
                Some(i) => {
                    let s = text_len(&part.value.text);
                    put_field(
                        &mut part.value.text,
                        &fields,
                        i,
                        number,
                        &h.header,
                        "load-case column",
                    )?;
                    (s, text_len(&part.value.text))
                }
                None => (0, 0),
            };
            let group = match h.header.group {
                Some(i) => {
                    let s = text_len(&part.value.text);
                    part.value.text.extend_from_slice(trim(&fields[i]));
                    (s, text_len(&part.value.text))
                }
                None => (0, 0),
            };
            Ok(JoinRow {
                line: number,
                id,
                case,
                group,
                tensor: row.tensor.components_pa(),
            })
        });
        match row {
            Ok(r) => part.value.rows.push(r),
            Err(bad) => {
                if !note_bad(&mut part, bad, options) {
                    break;
                }
            }
        }
    }
    part
}

/// The length of a part's text as a 32-bit offset (a part is at most a block, 8 MB).
fn text_len(text: &[u8]) -> u32 {
    u32::try_from(text.len()).unwrap_or(u32::MAX)
}

/// Appends field `i` (trimmed) to `text`; an empty id or case is a bad row.
fn put_field(
    text: &mut Vec<u8>,
    fields: &[std::borrow::Cow<'_, [u8]>],
    i: usize,
    line: u64,
    header: &Header,
    what: &str,
) -> Result<(), BadRow> {
    let field = trim(&fields[i]);
    if field.is_empty() {
        return Err(BadRow {
            line,
            column: Some(i + 1),
            message: format!("the {what} '{}' is empty", header.names[i]),
        });
    }
    text.extend_from_slice(field);
    Ok(())
}

/// Points as they are gathered.
struct Gather<'a> {
    points: Points,
    slots: HashTable<u32>,
    hasher: hashbrown::DefaultHashBuilder,
    group_of: std::collections::HashMap<Vec<u8>, u32>,
    join: &'a JoinOptions,
}

impl Gather<'_> {
    /// Adds one row of `file` at `line`: case `case`'s tensor of the point `id`.
    fn add(
        &mut self,
        case: usize,
        id: &[u8],
        group: Option<&[u8]>,
        tensor: [f64; 6],
        file: &str,
        line: u64,
    ) -> Result<(), TableError> {
        use std::hash::BuildHasher as _;
        let hash = self.hasher.hash_one(id);
        let points = &self.points;
        let found = self
            .slots
            .find(hash, |&p| points.id_bytes(p as usize) == id)
            .copied();
        let p = if let Some(p) = found {
            p as usize
        } else {
            let p = self.points.ends.len();
            let p32 = u32::try_from(p).map_err(|_| TableError::Join {
                place: format!("{file}:{line}"),
                message: "more than 4,294,967,295 points".to_owned(),
            })?;
            self.points.ids.extend_from_slice(id);
            let end = u32::try_from(self.points.ids.len()).map_err(|_| TableError::Join {
                place: format!("{file}:{line}"),
                message: "the points' ids take more than 4 GiB of text".to_owned(),
            })?;
            self.points.ends.push(end);
            let (points, hasher) = (&self.points, &self.hasher);
            self.slots
                .insert_unique(hash, p32, |&q| hasher.hash_one(points.id_bytes(q as usize)));
            if let Some(g) = group {
                let next = u32::try_from(self.group_of.len()).unwrap_or(u32::MAX);
                let n = *self.group_of.entry(g.to_vec()).or_insert_with(|| {
                    self.points
                        .group_names
                        .push(String::from_utf8_lossy(g).into_owned());
                    next
                });
                self.points.groups.push(n);
            }
            p
        };
        let column = &mut self.points.tensors[case];
        if column.len() <= p {
            column.resize(p + 1, ABSENT);
        }
        if column[p][0].is_nan() {
            column[p] = tensor;
            return Ok(());
        }
        let message = format!(
            "{} appears a second time in load case '{}'",
            self.points.id_text(p),
            self.points.cases[case]
        );
        self.leave_out(p, format!("{file}:{line}"), message)
    }

    /// Leaves point `p` out with `message` (with `skip_unmatched`), or stops there.
    fn leave_out(&mut self, p: usize, place: String, message: String) -> Result<(), TableError> {
        if !self.join.skip_unmatched {
            return Err(TableError::Join { place, message });
        }
        let left = &mut self.points.left_out;
        if left.len() <= p {
            left.resize(p + 1, false);
        }
        if !left[p] {
            left[p] = true;
            self.points.unmatched_count += 1;
            if self.points.unmatched.len() < KEEP_UNMATCHED {
                self.points.unmatched.push(format!("{place}: {message}"));
            }
        }
        Ok(())
    }

    /// The index of load case `name` (a case column's text), added when new.
    fn case_index(&mut self, name: &[u8]) -> usize {
        let cases = &mut self.points.cases;
        if let Some(c) = cases.iter().position(|c| c.as_bytes() == name) {
            return c;
        }
        cases.push(String::from_utf8_lossy(name).into_owned());
        self.points.tensors.push(Vec::new());
        cases.len() - 1
    }
}

/// Reads and joins the load-case tables: each table's header must name the id columns (and
/// the case column, with a long table); the components are read as [`super::rank`] reads them
/// (`options`' columns, unit, convention, decimal comma, plane stress, bad rows; its ranking
/// fields are not used here). `progress` is told the bytes read over all tables and returns
/// `false` to stop.
pub fn join<R: Read>(
    tables: Vec<CaseTable<R>>,
    options: &TableOptions,
    join: &JoinOptions,
    mut progress: impl FnMut(u64) -> bool,
) -> Result<Points, TableError> {
    if join.ids.is_empty() {
        return Err(TableError::Join {
            place: "ids".to_owned(),
            message: "name the id columns the tables are joined on (element, point…)".to_owned(),
        });
    }
    let long = join.case_column.is_some();
    let mut gather = Gather {
        points: Points {
            id_names: join.ids.iter().map(|n| n.trim().to_owned()).collect(),
            cases: Vec::new(),
            tables: Vec::new(),
            ids: Vec::new(),
            ends: Vec::new(),
            tensors: Vec::new(),
            group_column: options.group_by.clone(),
            group_names: Vec::new(),
            groups: Vec::new(),
            left_out: Vec::new(),
            unmatched_count: 0,
            unmatched: Vec::new(),
        },
        slots: HashTable::new(),
        hasher: hashbrown::DefaultHashBuilder::default(),
        group_of: std::collections::HashMap::new(),
        join,
    };
    if !long {
        for (i, t) in tables.iter().enumerate() {
            if tables[..i].iter().any(|u| u.case == t.case) {
                return Err(TableError::Join {
                    place: t.file.clone(),
                    message: format!("the load case '{}' is given twice", t.case),
                });
            }
            gather.points.cases.push(t.case.clone());
            gather.points.tensors.push(Vec::new());
        }
    }
    let mut read_before = 0u64;
    for (table_index, table) in tables.into_iter().enumerate() {
        let file = table.file.clone();
        let mut rows = 0u64;
        let mut read_here = 0u64;
        let streamed: Streamed<JoinHeader> = stream(
            table.source,
            &file,
            options,
            |h| join_header(h, join, &file),
            |n| {
                read_here = n;
                progress(read_before + n)
            },
            |bytes, first, _, h| Ok(parse_join_part(bytes, first, h, options)),
            |part| {
                for r in &part.rows {
                    let text = &part.text;
                    let id = &text[r.id.0 as usize..r.id.1 as usize];
                    let case = if long {
                        gather.case_index(&text[r.case.0 as usize..r.case.1 as usize])
                    } else {
                        table_index
                    };
                    let group = gather
                        .points
                        .group_column
                        .is_some()
                        .then(|| &text[r.group.0 as usize..r.group.1 as usize]);
                    gather.add(case, id, group, r.tensor, &file, r.line)?;
                }
                rows += part.rows.len() as u64;
                Ok(())
            },
        )?;
        read_before += read_here;
        gather.points.tables.push(TableRead {
            file,
            case: if long { String::new() } else { table.case },
            rows,
            bad_count: streamed.bad_count,
            bad: streamed.bad,
            unterminated: streamed.unterminated,
        });
    }
    // Every point in every case: the first absence names the table that lacks it and one
    // that has it.
    let n = gather.points.len();
    for column in &mut gather.points.tensors {
        column.resize(n, ABSENT);
    }
    for p in 0..n {
        let points = &gather.points;
        let Some(missing) = (0..points.cases.len()).find(|&c| points.tensors[c][p][0].is_nan())
        else {
            continue;
        };
        let has = (0..points.cases.len())
            .find(|&c| !points.tensors[c][p][0].is_nan())
            .unwrap_or(missing);
        let file_of = |c: usize| {
            if long {
                points.tables[0].file.clone()
            } else {
                points.tables[c].file.clone()
            }
        };
        let place = file_of(missing);
        let message = if long {
            format!(
                "no row for {} in load case '{}' (it has rows in '{}')",
                points.id_text(p),
                points.cases[missing],
                points.cases[has]
            )
        } else {
            format!(
                "no row for {} (load case '{}'; it is in {})",
                points.id_text(p),
                points.cases[missing],
                file_of(has)
            )
        };
        gather.leave_out(p, place, message)?;
    }
    let points = &mut gather.points;
    for column in &mut points.tensors {
        column.shrink_to_fit();
    }
    points.ids.shrink_to_fit();
    points.ends.shrink_to_fit();
    points.groups.shrink_to_fit();
    if gather.points.cases.is_empty() || gather.points.is_empty() {
        return Err(TableError::Join {
            place: gather
                .points
                .tables
                .first()
                .map_or_else(|| "tables".to_owned(), |t| t.file.clone()),
            message: "no points: the tables have no rows".to_owned(),
        });
    }
    Ok(gather.points)
}

/// The load cases of point `p`: one per table case, named as the case, its tensor in `unit`
/// and `convention` as typed, remembering the table and the point's ids.
#[must_use]
pub fn point_load_cases(
    points: &Points,
    p: usize,
    unit: crate::mechanics::StressUnit,
    convention: crate::mechanics::SignConvention,
) -> Vec<crate::study::LoadCase> {
    use crate::study::{CaseInput, LoadCase, TableRowInput, TypedTensor};
    let id = points.id_text(p);
    let sign = convention.sign();
    points
        .cases
        .iter()
        .enumerate()
        .map(|(c, case)| {
            // A table per case, or one long table for all.
            let file = points
                .tables
                .get(c)
                .filter(|t| !t.case.is_empty())
                .or(points.tables.first())
                .map(|t| t.file.clone())
                .unwrap_or_default();
            LoadCase {
                unknown: crate::study::unknown::UnknownKeys::new(),
                name: case.clone(),
                description: format!("Load case '{case}' at {id}, from {file}"),
                input: CaseInput::TableRow(TableRowInput {
                    file,
                    line: 0,
                    id: id.clone(),
                    stress: TypedTensor {
                        unit: unit.symbol().to_owned(),
                        compression_positive: convention
                            == crate::mechanics::SignConvention::CompressionPositive,
                        components: points.tensor(c, p).map(|v| sign * unit.from_pa(v)),
                    },
                }),
            }
        })
        .collect()
}

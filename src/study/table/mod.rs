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

mod combine;
mod join;
mod rank;
mod read;
mod stream;

pub use combine::{
    PointCombination, PointGroup, PointRow, RankedPoints, combined, point_combinations, point_row,
    rank_points,
};
pub use join::{CaseTable, JoinOptions, KEEP_UNMATCHED, Points, TableRead, join, point_load_cases};
pub use rank::rank;
pub use read::{component_of, preview};
use read::{read_row, split};

use std::io::{Read, Seek};

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
#[expect(
    clippy::struct_excessive_bools,
    reason = "independent reading options, each a yes/no the user sets"
)]
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
    /// The table holds xx, yy and xy only, and the user states that zz, yz and zx are zero
    /// (plane stress, as shell results are). Never assumed: a table without those columns is
    /// refused unless this is set, and a table with them is refused when it is.
    pub plane_stress: bool,
    /// Rank within groups named by this column (an element set, a part): each group's worst
    /// row and its counts, instead of the rows.
    pub group_by: Option<String>,
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
            plane_stress: false,
            group_by: None,
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
    /// Column index of each component, in [`COMPONENTS`] order; [`usize::MAX`] for the
    /// out-of-plane components of a plane-stress table (read as zero).
    pub components: [usize; 6],
    /// Column indices carried along as text (ids, coordinates, load step…).
    pub carried: Vec<usize>,
    /// With [`TableOptions::group_by`]: the column naming each row's group.
    pub group: Option<usize>,
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

/// One group of a table ranked by groups: its worst row and how many rows it has.
#[derive(Clone, Debug, PartialEq)]
pub struct Group {
    /// The group's name, as the group column writes it.
    pub name: String,
    /// Good rows in the group.
    pub rows: u64,
    /// With [`TableOptions::above`]: the group's rows at or beyond the threshold.
    pub at_or_beyond: u64,
    /// The group's worst row (the earliest line among equals).
    pub worst: Row,
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
    /// Tables that do not join: an id missing from a load case, or met twice in one.
    #[error("{place}: {message}")]
    Join {
        /// Where: `file:line` or `file`.
        place: String,
        /// What is wrong, naming the id.
        message: String,
    },
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
    /// With [`TableOptions::group_by`]: the groups, worst first (the top N with
    /// [`TableOptions::top`]); the rows are then not kept.
    pub groups: Vec<Group>,
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

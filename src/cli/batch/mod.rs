//! `planewise batch`: a finite-element result table ranked by a measure, worst first — the top N
//! or every row — as CSV or JSON, streaming through files larger than memory.

use std::fmt::Write as _;
use std::io::Write as _;
use std::path::PathBuf;
use std::time::Instant;

use clap::Args;
use serde::Serialize;

use super::args::StrengthArgs;
use super::{ArgError, CliError, values};
use crate::mechanics::criteria::MohrCoulomb;
use crate::mechanics::search::{Measure as PlaneMeasure, SearchSettings};
use crate::mechanics::{SignConvention, StressUnit};
use crate::study::EnvelopeMeasure;
use crate::study::table::{self, COMPONENTS, Ranked, TableError, TableOptions};
use crate::text::format::clean;

mod cases;

/// Arguments of `planewise batch`.
#[derive(Debug, Clone, Args)]
#[expect(
    clippy::struct_excessive_bools,
    reason = "command-line flags, each independent"
)]
pub struct BatchArgs {
    /// The table: CSV, TSV, semicolon- or whitespace-separated text with a header row; `-` reads
    /// standard input. Load cases as tables: one CASE=FILE per case (with --ids), or one long
    /// table with --case-column.
    #[arg(value_name = "FILE", required_unless_present = "project")]
    pub files: Vec<String>,
    /// Read the load-case tables the project file names (its files, ids, unit, convention and
    /// column mapping, as the window's Table tab saved them) and apply its combinations.
    #[arg(
        long,
        value_name = "PROJECT",
        conflicts_with_all = ["files", "ids", "case_column", "combinations_from", "unit", "compression_positive", "columns", "plane_stress", "decimal_comma"]
    )]
    pub project: Option<PathBuf>,
    /// Load-case tables: the id columns that name a point in every table, comma-separated (one
    /// or more: element, integration point, section point); the tables are joined on them in
    /// any row order.
    #[arg(long, value_name = "COLUMN,…", value_delimiter = ',')]
    pub ids: Vec<String>,
    /// One long table of load cases: the column naming each row's load case.
    #[arg(long, value_name = "COLUMN", requires = "ids")]
    pub case_column: Option<String>,
    /// A combination applied at every point, NAME:CASE=FACTOR,… (e.g.
    /// "ULS-1:dead=1.35,live=1.5"). Repeat for each. Without any combination, each load case
    /// alone is enveloped.
    #[arg(
        long,
        value_name = "NAME:CASE=FACTOR,…",
        requires = "ids",
        allow_hyphen_values = true
    )]
    pub combination: Vec<String>,
    /// With --variable: a permanent action, its load case, γG,sup and γG,inf (e.g.
    /// dead:1.35:1.0); the combinations of EN 1990 expression (6.10) are generated and applied
    /// at every point. The factors are yours. Repeat for each.
    #[arg(long, value_name = "CASE:SUP:INF", requires = "ids")]
    pub permanent: Vec<String>,
    /// A variable action, its load case, γQ and ψ0 (e.g. live:1.5:0.7). Repeat for each.
    #[arg(long, value_name = "CASE:GAMMA:PSI0", requires = "ids")]
    pub variable: Vec<String>,
    /// Apply the combinations of this project file at every point (their load cases must be
    /// the tables' cases).
    #[arg(long, value_name = "PROJECT", requires = "ids")]
    pub combinations_from: Option<PathBuf>,
    /// Count and leave out points missing from a load case or met twice in one (default: stop
    /// at the first, naming its table, line and ids).
    #[arg(long, requires = "ids")]
    pub skip_unmatched: bool,
    /// Also write a calculation report (HTML) of the load-case tables: the files with their
    /// SHA-256, how they were read, the combinations, the counts, the worst points with their
    /// governing combination, and the worst point's governing combination in full (with the
    /// --combinations-from project's material and checks, its file unchanged).
    #[arg(long, value_name = "FILE.html", requires = "ids")]
    pub report: Option<PathBuf>,
    /// Which header names hold the components, e.g. `xx=S11,yy=S22,zz=S33,xy=S12,yz=S23,zx=S13`
    /// (default: the columns named xx, yy, zz, xy, yz, zx, case-insensitive, also sxx… and
    /// s11…).
    #[arg(long, value_name = "xx=NAME,…")]
    pub columns: Option<String>,
    /// Unit of the components: required, since a table does not say and a wrong guess is off
    /// by a factor of a million.
    #[arg(
        long,
        value_name = "UNIT",
        value_parser = values::unit,
        required_unless_present = "project"
    )]
    pub unit: Option<StressUnit>,
    /// The components are written compression positive.
    #[arg(long)]
    pub compression_positive: bool,
    /// Numbers are written with a decimal comma (fields then separated by `;`, tabs or spaces).
    #[arg(long)]
    pub decimal_comma: bool,
    /// The table holds xx, yy and xy only (plane stress, as shell results): zz, yz and zx are
    /// zero. Never assumed: without it such a table is refused, with it a table that has those
    /// columns is.
    #[arg(long)]
    pub plane_stress: bool,
    /// Rank within groups named by this column (an element set, a part): each group's worst
    /// row with the group's count of rows (and, with --at-or-beyond, of rows at or beyond it),
    /// worst group first; --top N keeps the N worst groups.
    #[arg(long, value_name = "COLUMN")]
    pub group_by: Option<String>,
    /// What to rank by: an equivalent or principal stress, a worst-plane measure or a criterion
    /// utilization.
    #[arg(long, value_name = "MEASURE")]
    pub rank: EnvelopeMeasure,
    #[command(flatten)]
    pub strengths: StrengthArgs,
    /// Keep the N worst rows (default: every row, sorted).
    #[arg(long, value_name = "N", allow_hyphen_values = true)]
    pub top: Option<usize>,
    /// Keep every row at or beyond this value of the measure (in --unit for stress measures;
    /// at or below it for sigma3 and normal-min); rows that fail at any scale or have no
    /// frictional capacity are always kept. With --top, the N worst of those.
    #[arg(long, value_name = "VALUE", allow_hyphen_values = true)]
    pub at_or_beyond: Option<String>,
    /// Write the ranked rows as CSV to this file (written whole or not at all).
    #[arg(long, value_name = "FILE", conflicts_with = "json")]
    pub out: Option<PathBuf>,
    /// Print one JSON object instead of the CSV.
    #[arg(long)]
    pub json: bool,
    /// Go on past bad rows: count them and report the first few (default: stop at the first,
    /// exit 2, write nothing).
    #[arg(long)]
    pub skip_bad_rows: bool,
    /// No progress line on standard error.
    #[arg(long)]
    pub quiet: bool,
}

/// The JSON contract.
#[derive(Serialize)]
pub struct BatchJson<'a> {
    pub file: String,
    pub measure: String,
    /// Unit of every stress below (components, principal values, stress measures).
    pub unit: String,
    pub convention: String,
    /// With --plane-stress: zz, yz and zx were read as zero, as the user stated.
    #[serde(skip_serializing_if = "std::ops::Not::not")]
    pub plane_stress: bool,
    pub rows_read: u64,
    pub bad_rows: u64,
    /// The last line had no line end (the file may have been cut short).
    pub last_line_unterminated: bool,
    /// How many rows read stand in each condition (a number, fails at any scale, no frictional
    /// capacity, never reaches the surface, undefined, not checked).
    pub conditions: crate::study::envelope::ConditionCounts,
    /// With --at-or-beyond: the threshold and how many rows reach it.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub at_or_beyond: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub rows_at_or_beyond: Option<u64>,
    /// The first bad rows (with --skip-bad-rows).
    pub first_bad: Vec<BadJson>,
    /// With --group-by: the group column and the groups, worst first (the rows are then
    /// empty).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub group_by: Option<String>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub groups: Option<Vec<GroupJson>>,
    /// Worst first (written one by one as they are read again, never held together).
    pub rows: Rows<'a>,
}

/// The ranked rows in order, made into [`RowJson`] as they are written.
pub struct Rows<'a> {
    ranked: &'a Ranked,
    source: Option<&'a std::fs::File>,
    file: &'a str,
    options: &'a TableOptions,
    measure: &'a table::Measure<'a>,
    rank: EnvelopeMeasure,
    unit: StressUnit,
}

impl Rows<'_> {
    /// The rows in order, each with its numbers as written ([`RowJson`] without the carried
    /// columns, which only the JSON adds).
    fn each(&self) -> impl Iterator<Item = Result<(table::Row, RowJson), TableError>> + '_ {
        self.ranked
            .ordered(self.source, self.file, self.options, self.measure)
            .map(|r| {
                r.map(|r| {
                    let json = row_json(&r, self.rank, self.unit, self.measure.convention);
                    (r, json)
                })
            })
    }
}

impl Serialize for Rows<'_> {
    fn serialize<S: serde::Serializer>(&self, serializer: S) -> Result<S::Ok, S::Error> {
        use serde::ser::{Error as _, SerializeSeq as _};
        let header = &self.ranked.header;
        let mut seq = serializer.serialize_seq(Some(self.ranked.kept()))?;
        for row in self.each() {
            let (r, mut json) = row.map_err(S::Error::custom)?;
            json.carried = carried_json(header, &r);
            seq.serialize_element(&json)?;
        }
        seq.end()
    }
}

/// A row's carried columns as a JSON object, by header name.
fn carried_json(
    header: &table::Header,
    row: &table::Row,
) -> serde_json::Map<String, serde_json::Value> {
    header
        .carried
        .iter()
        .zip(&row.carried)
        .map(|(&i, text)| {
            (
                header.names[i].clone(),
                serde_json::Value::String(text.clone()),
            )
        })
        .collect()
}

/// One group of a ranking by groups.
#[derive(Debug, Serialize)]
pub struct GroupJson {
    /// The group's name.
    pub group: String,
    /// Its good rows.
    pub rows: u64,
    /// With --at-or-beyond: its rows at or beyond the threshold.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub rows_at_or_beyond: Option<u64>,
    /// Its worst row.
    pub worst: RowJson,
}

/// A bad row.
#[derive(Debug, Serialize)]
pub struct BadJson {
    pub line: u64,
    pub column: Option<usize>,
    pub message: String,
}

/// One ranked row.
#[derive(Debug, Serialize)]
pub struct RowJson {
    /// Line in the file (1-based).
    pub line: u64,
    /// The carried columns by header name.
    pub carried: serde_json::Map<String, serde_json::Value>,
    /// Its state's numbers.
    #[serde(flatten)]
    pub state: StateJson,
}

/// A ranked state's numbers: the same for a table's row and for a point's governing
/// combination.
#[derive(Debug, Serialize)]
pub struct StateJson {
    /// xx, yy, zz, xy, yz, zx in the unit and convention.
    pub components: [f64; 6],
    /// σ1 ≥ σ2 ≥ σ3 in the convention.
    pub principal: [f64; 3],
    /// The ranked value; null where it is not a number (see `condition`).
    pub value: Option<f64>,
    /// How the value reads: "defined", "fails-at-any-scale", "effective-tension" (no
    /// frictional capacity), "never-reaches", "undefined" or "not-checked".
    pub condition: crate::mechanics::criteria::Condition,
    /// For worst-plane measures: dip and dip direction of the first worst plane, degrees.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub plane: Option<[f64; 2]>,
}

/// The component map of `--columns`.
fn columns(text: &str) -> Result<Vec<(usize, String)>, ArgError> {
    let mut out: Vec<(usize, String)> = Vec::new();
    for item in text.split(',').map(str::trim).filter(|s| !s.is_empty()) {
        let (key, name) = item.split_once('=').ok_or_else(|| {
            ArgError::new(
                "--columns",
                format!("'{item}' is not COMPONENT=NAME (e.g. xx=S11)"),
            )
        })?;
        let k = COMPONENTS
            .iter()
            .position(|c| c.eq_ignore_ascii_case(key.trim()))
            .ok_or_else(|| {
                ArgError::new(
                    "--columns",
                    format!("'{}' is not one of {}", key.trim(), COMPONENTS.join(", ")),
                )
            })?;
        if out.iter().any(|(j, _)| *j == k) {
            return Err(ArgError::new(
                "--columns",
                format!("{} is named twice", COMPONENTS[k]),
            ));
        }
        out.push((k, name.trim().to_owned()));
    }
    Ok(out)
}

/// What every ranking of `batch` needs, read from the arguments once.
pub(crate) struct Setup {
    /// The components' unit.
    pub unit: StressUnit,
    /// Their sign convention.
    pub convention: SignConvention,
    /// The worst-plane measures' pore pressure and Coulomb strength.
    pub settings: SearchSettings,
    /// The criteria's strengths.
    pub strengths: crate::mechanics::criteria::Strengths,
    /// The reading and ranking options.
    pub options: TableOptions,
}

impl Setup {
    /// The one ranking measure.
    pub fn measure(&self, rank: EnvelopeMeasure) -> table::Measure<'_> {
        table::Measure {
            measure: rank,
            convention: self.convention,
            plane_settings: &self.settings,
            strengths: &self.strengths,
        }
    }
}

/// Reads the measure's parameters and the table options, checking that the measure can be
/// evaluated and that `--out` is not one of the tables.
fn setup(args: &BatchArgs) -> Result<Setup, CliError> {
    let unit = args
        .unit
        .ok_or_else(|| ArgError::new("--unit", "give the tables' unit"))?;
    let convention = if args.compression_positive {
        SignConvention::CompressionPositive
    } else {
        SignConvention::TensionPositive
    };
    let plane = matches!(args.rank, EnvelopeMeasure::Plane(_));
    let (strengths, pore) = args.strengths.read(unit, plane)?;
    let material = match (strengths.cohesion_pa, strengths.friction_angle_deg) {
        (Some(c), Some(phi)) => {
            Some(MohrCoulomb::new(c, phi).map_err(|e| ArgError::new("--cohesion", e))?)
        }
        _ => None,
    };
    if let EnvelopeMeasure::Plane(m) = args.rank
        && m.uses_material()
        && material.is_none()
    {
        return Err(ArgError::new(
            "--rank",
            "mohr-coulomb needs --cohesion and --friction-angle",
        )
        .into());
    }
    let settings = SearchSettings {
        measure: args.rank.plane().unwrap_or(PlaneMeasure::Shear),
        convention,
        pore_pressure_pa: pore.unwrap_or(0.0),
        material,
    };
    if let EnvelopeMeasure::Utilization(c) = args.rank {
        let check = crate::mechanics::criteria::verdict(
            &crate::mechanics::StressTensor::default(),
            c,
            &strengths,
        );
        if check.condition == crate::mechanics::criteria::Condition::NotChecked {
            return Err(ArgError::new("--rank", format!("{}: {}", c.label(), check.note)).into());
        }
    }
    let mut inputs: Vec<&std::path::Path> = args
        .files
        .iter()
        .filter(|f| *f != "-")
        .map(|f| std::path::Path::new(cases::file_part(f, args)))
        .collect();
    if let Some(p) = &args.combinations_from {
        inputs.push(p);
    }
    if let Some(out) = &args.out {
        crate::study::atomic::not_an_input(out, &inputs).map_err(|e| ArgError::new("--out", e))?;
    }
    if let Some(report) = &args.report {
        let ext = report.extension().and_then(|e| e.to_str()).unwrap_or("");
        if !ext.eq_ignore_ascii_case("html") && !ext.eq_ignore_ascii_case("htm") {
            return Err(
                ArgError::new("--report", "the report is HTML: name the file .html").into(),
            );
        }
        crate::study::atomic::not_an_input(report, &inputs)
            .map_err(|e| ArgError::new("--report", e))?;
    }
    let above = args
        .at_or_beyond
        .as_deref()
        .map(|t| {
            if args.rank.is_stress() {
                super::stress_value("--at-or-beyond", t, unit)
            } else {
                crate::text::parse::number(t).map_err(|e| ArgError::new("--at-or-beyond", e))
            }
        })
        .transpose()?;
    let options = TableOptions {
        columns: args
            .columns
            .as_deref()
            .map(columns)
            .transpose()?
            .unwrap_or_default(),
        unit,
        convention,
        decimal_comma: args.decimal_comma,
        skip_bad_rows: args.skip_bad_rows,
        top: args.top,
        by_place: args.top.is_none(),
        above,
        plane_stress: args.plane_stress,
        group_by: args.group_by.clone(),
    };
    Ok(Setup {
        unit,
        convention,
        settings,
        strengths,
        options,
    })
}

/// A progress line on standard error for `size` bytes (when known), at most twice a second.
pub(crate) fn progress_line(quiet: bool, size: Option<u64>) -> impl FnMut(u64) -> bool {
    let started = Instant::now();
    let mut last = 0.0;
    move |bytes: u64| {
        let t = started.elapsed().as_secs_f64();
        if !quiet && t - last >= 0.5 {
            last = t;
            let mb = bytes as f64 / 1e6;
            let share = size.map_or_else(String::new, |s| {
                format!(
                    "{:.0}% of {:.1} MB, ",
                    100.0 * bytes as f64 / s.max(1) as f64,
                    s as f64 / 1e6
                )
            });
            eprint!(
                "\rplanewise batch: {share}{mb:.1} MB read, {:.0} MB/s   ",
                mb / t.max(1e-9)
            );
        }
        true
    }
}

/// Runs the subcommand.
pub fn run(args: &BatchArgs) -> Result<String, CliError> {
    let resolved;
    let args = if let Some(project) = &args.project {
        resolved = cases::from_project(args, project)?;
        &resolved
    } else {
        args
    };
    let setup = setup(args)?;
    if cases::joined(args) {
        return cases::run(args, &setup);
    }
    if args.files.len() > 1 {
        return Err(ArgError::new(
            "FILE",
            "several tables are load cases: give each as CASE=FILE and name the id columns that join them with --ids",
        )
        .into());
    }
    let file = &args.files[0];
    let (unit, convention, options) = (setup.unit, setup.convention, &setup.options);
    let above = options.above;
    let measure = setup.measure(args.rank);
    let name = if file == "-" {
        "standard input".to_owned()
    } else {
        file.to_owned()
    };
    let size = (file != "-")
        .then(|| std::fs::metadata(file).ok().map(|m| m.len()))
        .flatten();
    let started = Instant::now();
    let progress = progress_line(args.quiet, size);
    // A full ranking holds each row's place, not the row, and reads the rows again in order:
    // from the file, or from a copy of standard input spilled to a temporary file.
    let (ranked, source) = if file == "-" {
        let stdin = std::io::stdin().lock();
        if options.by_place {
            let spill = spill_file().map_err(anyhow::Error::from)?;
            let tee = Tee {
                from: stdin,
                copy: std::io::BufWriter::new(&spill),
            };
            (
                table::rank(tee, &name, options, &measure, progress),
                Some(spill),
            )
        } else {
            (table::rank(stdin, &name, options, &measure, progress), None)
        }
    } else {
        if std::fs::metadata(file).is_ok_and(|m| m.is_dir()) {
            return Err(ArgError::new("FILE", format!("{name} is a folder, not a table")).into());
        }
        let f = std::fs::File::open(file)
            .map_err(|cause| ArgError::new("FILE", format!("{name}: {cause}")))?;
        (table::rank(&f, &name, options, &measure, progress), Some(f))
    };
    let ranked = match ranked {
        Ok(r) => r,
        Err(e @ (TableError::Row { .. } | TableError::Header { .. })) => {
            return Err(ArgError::new("FILE", e).into());
        }
        Err(TableError::Measure(m)) => return Err(ArgError::new("--rank", m).into()),
        Err(e) => return Err(anyhow::Error::from(e).into()),
    };
    let seconds = started.elapsed().as_secs_f64();
    if !args.quiet {
        eprintln!(
            "\rplanewise batch: {} rows ranked in {:.2} s ({:.2} M rows/s){}",
            ranked.total_rows,
            seconds,
            ranked.total_rows as f64 / seconds.max(1e-9) / 1e6,
            if ranked.bad_count > 0 {
                format!(", {} bad rows skipped", ranked.bad_count)
            } else {
                String::new()
            }
        );
        for b in ranked.bad.iter().take(5) {
            eprintln!("planewise: skipped {}", b.located(&name));
        }
    }
    if ranked.unterminated {
        // Said even with --quiet: a table cut short is worth knowing.
        eprintln!(
            "planewise: warning: {name}: the last line has no line end; the file may have been cut short (its last row was read as it stands)"
        );
    }
    let rows = Rows {
        ranked: &ranked,
        source: source.as_ref(),
        file: &name,
        options,
        measure: &measure,
        rank: args.rank,
        unit,
    };
    let mut json = to_json(rows, &name, unit, convention);
    if let Some(g) = ranked.header.group {
        let header = &ranked.header;
        json.group_by = Some(header.names[g].clone());
        json.groups = Some(
            ranked
                .groups
                .iter()
                .map(|group| {
                    let mut worst = row_json(&group.worst, args.rank, unit, convention);
                    worst.carried = carried_json(header, &group.worst);
                    GroupJson {
                        group: group.name.clone(),
                        rows: group.rows,
                        rows_at_or_beyond: above.map(|_| group.at_or_beyond),
                        worst,
                    }
                })
                .collect(),
        );
    }
    if let Some(v) = above {
        json.at_or_beyond = Some(clean(if args.rank.is_stress() {
            unit.from_pa(v)
        } else {
            v
        }));
        json.rows_at_or_beyond = Some(ranked.at_or_beyond);
    }
    if !args.quiet {
        // The run's description: on standard error, so the CSV stays plain (header first).
        let what = if args.rank.is_stress() {
            format!("{unit}, {}", convention.key())
        } else {
            "dimensionless".to_owned()
        };
        eprintln!(
            "planewise batch: {name} ranked by {} ({what}), worst first; stresses in {unit}, {}{}; {}{}",
            args.rank.key(),
            convention.key(),
            if args.plane_stress {
                ", plane stress (zz, yz, zx taken as zero, as stated)"
            } else {
                ""
            },
            ranked.counts.text("rows"),
            json.rows_at_or_beyond.map_or_else(String::new, |n| format!(
                "; {n} at or beyond {}",
                json.at_or_beyond.unwrap_or_default()
            ))
        );
    }
    // Written row by row as the rows are read again: the output is never held whole.
    let write = |w: &mut dyn std::io::Write| -> std::io::Result<()> {
        if args.json {
            serde_json::to_writer_pretty(&mut *w, &json)?;
            w.write_all(b"\n")
        } else {
            write_csv(w, &json)
        }
    };
    if let Some(path) = &args.out {
        crate::study::atomic::write_atomic_with(path, write).map_err(anyhow::Error::from)?;
        Ok(format!(
            "wrote {} ({} rows)\n",
            path.display(),
            ranked.kept()
        ))
    } else {
        let mut out = std::io::BufWriter::with_capacity(1 << 16, std::io::stdout().lock());
        write(&mut out)
            .and_then(|()| out.flush())
            .map_err(anyhow::Error::from)?;
        Ok(String::new())
    }
}

/// An unnamed temporary file (removed from its folder as soon as it is open, so nothing is left
/// behind even if the run is killed), for a copy of standard input.
fn spill_file() -> std::io::Result<std::fs::File> {
    let path = std::env::temp_dir().join(format!(".planewise-batch.{}.tmp", std::process::id()));
    let file = std::fs::OpenOptions::new()
        .read(true)
        .write(true)
        .create_new(true)
        .open(&path)?;
    // Where an open file cannot be removed, it stays until the system clears its temporaries.
    let _ = std::fs::remove_file(&path);
    Ok(file)
}

/// A reader that copies what it reads into `copy`.
struct Tee<R, W: std::io::Write> {
    from: R,
    copy: W,
}

impl<R: std::io::Read, W: std::io::Write> std::io::Read for Tee<R, W> {
    fn read(&mut self, buf: &mut [u8]) -> std::io::Result<usize> {
        let n = self.from.read(buf)?;
        self.copy.write_all(&buf[..n])?;
        if n == 0 {
            self.copy.flush()?;
        }
        Ok(n)
    }
}

fn to_json<'a>(
    rows: Rows<'a>,
    file: &str,
    unit: StressUnit,
    convention: SignConvention,
) -> BatchJson<'a> {
    let ranked = rows.ranked;
    BatchJson {
        file: file.to_owned(),
        measure: rows.rank.key().to_owned(),
        unit: unit.symbol().to_owned(),
        convention: convention.key().to_owned(),
        plane_stress: rows.options.plane_stress,
        rows_read: ranked.total_rows,
        bad_rows: ranked.bad_count,
        last_line_unterminated: ranked.unterminated,
        conditions: ranked.counts,
        at_or_beyond: None,
        rows_at_or_beyond: None,
        first_bad: ranked
            .bad
            .iter()
            .map(|b| BadJson {
                line: b.line,
                column: b.column,
                message: b.message.clone(),
            })
            .collect(),
        group_by: None,
        groups: None,
        rows,
    }
}

/// One ranked row's numbers as written (the carried columns are left empty: the JSON adds
/// them, the CSV writes the row's own).
fn row_json(
    r: &table::Row,
    rank: EnvelopeMeasure,
    unit: StressUnit,
    convention: SignConvention,
) -> RowJson {
    let sign = convention.sign();
    // Round-off below 1e-9 of the row's magnitude prints as 0.
    let scale = r.tensor.max_abs_component_pa();
    let shown =
        |pa: f64| clean(sign * unit.from_pa(crate::text::format::clean_relative(pa, scale)));
    let principal = crate::mechanics::principal::principal_values_in(&r.tensor, convention)
        .map(|v| clean(unit.from_pa(crate::text::format::clean_relative(v, scale))));
    RowJson {
        line: r.line,
        carried: serde_json::Map::new(),
        state: StateJson {
            components: r.tensor.components_pa().map(shown),
            principal,
            value: r
                .value
                .map(|v| clean(if rank.is_stress() { unit.from_pa(v) } else { v })),
            condition: r.standing,
            plane: r.plane,
        },
    }
}

/// Quotes a CSV field when it needs it.
fn field(text: &str) -> String {
    if text.contains([',', '"', '\n', '\r']) {
        format!("\"{}\"", text.replace('"', "\"\""))
    } else {
        text.to_owned()
    }
}

/// The CSV columns of a row, from `line` to the plane (the carried columns by their names).
fn row_columns(json: &BatchJson<'_>) -> Vec<String> {
    let header = &json.rows.ranked.header;
    let mut head: Vec<String> = vec!["line".into()];
    head.extend(header.carried.iter().map(|&i| field(&header.names[i])));
    head.extend(state_columns(json.rows.rank, &json.unit));
    head
}

/// The CSV columns of a state, from the components to the plane (stresses in `unit`).
fn state_columns(rank: EnvelopeMeasure, unit: &str) -> Vec<String> {
    let u = unit;
    let mut head: Vec<String> = COMPONENTS.iter().map(|c| format!("{c}_{u}")).collect();
    head.extend(["sigma1", "sigma2", "sigma3"].map(|p| format!("{p}_{u}")));
    // σ1 and σ3 are columns already; another measure gets a column of its own.
    if own_column(rank) {
        let name = rank.key().replace('-', "_");
        head.push(if rank.is_stress() {
            format!("{name}_{u}")
        } else {
            name
        });
    }
    head.push("condition".to_owned());
    if matches!(rank, EnvelopeMeasure::Plane(_)) {
        head.extend(["dip_deg", "dip_direction_deg"].map(str::to_owned));
    }
    head
}

/// Whether the measure has a column of its own (σ1 and σ3 are columns already).
fn own_column(rank: EnvelopeMeasure) -> bool {
    !matches!(rank, EnvelopeMeasure::Sigma1 | EnvelopeMeasure::Sigma3)
}

/// The CSV cells of one row, in [`row_columns`] order, appended to `line`.
fn row_cells(line: &mut String, r: &table::Row, row: &RowJson, rank: EnvelopeMeasure) {
    let _ = write!(line, "{}", row.line);
    for t in &r.carried {
        line.push(',');
        line.push_str(&field(t));
    }
    state_cells(line, &row.state, rank);
}

/// A state's cells in [`state_columns`] order, each after a comma, appended to `line`.
fn state_cells(line: &mut String, state: &StateJson, rank: EnvelopeMeasure) {
    for v in state.components.iter().chain(&state.principal) {
        let _ = write!(line, ",{v}");
    }
    if own_column(rank) {
        line.push(',');
        if let Some(v) = state.value {
            let _ = write!(line, "{v}");
        }
    }
    let _ = write!(line, ",{}", state.condition.key());
    if let Some([dip, dd]) = state.plane {
        let _ = write!(line, ",{dip},{dd}");
    } else if matches!(rank, EnvelopeMeasure::Plane(_)) {
        line.push_str(",,");
    }
}

/// Plain RFC 4180 CSV: the header first (units in the column names), one row per ranked row;
/// the run's description goes to standard error and `--json`.
fn write_csv(w: &mut dyn std::io::Write, json: &BatchJson<'_>) -> std::io::Result<()> {
    let rows = &json.rows;
    let rank = rows.rank;
    if let (Some(column), Some(groups)) = (&json.group_by, &json.groups) {
        return write_groups_csv(w, json, column, groups);
    }
    writeln!(w, "{}", row_columns(json).join(","))?;
    let mut line = String::new();
    for row in rows.each() {
        let (r, row) = row.map_err(std::io::Error::other)?;
        line.clear();
        row_cells(&mut line, &r, &row, rank);
        line.push('\n');
        w.write_all(line.as_bytes())?;
    }
    Ok(())
}

/// Groups as CSV: the group, its counts, then its worst row's columns.
fn write_groups_csv(
    w: &mut dyn std::io::Write,
    json: &BatchJson<'_>,
    column: &str,
    groups: &[GroupJson],
) -> std::io::Result<()> {
    let rank = json.rows.rank;
    let beyond = json.at_or_beyond.is_some();
    let mut head = vec![field(column), "rows".to_owned()];
    if beyond {
        head.push("rows_at_or_beyond".to_owned());
    }
    head.extend(row_columns(json));
    writeln!(w, "{}", head.join(","))?;
    let ranked = json.rows.ranked;
    let mut line = String::new();
    for (g, group) in groups.iter().zip(&ranked.groups) {
        line.clear();
        let _ = write!(line, "{},{},", field(&g.group), g.rows);
        if let Some(n) = g.rows_at_or_beyond {
            let _ = write!(line, "{n},");
        }
        row_cells(&mut line, &group.worst, &g.worst, rank);
        line.push('\n');
        w.write_all(line.as_bytes())?;
    }
    Ok(())
}

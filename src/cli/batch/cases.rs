//! `planewise batch` over load cases as tables: one `CASE=FILE` per case or one long table with
//! `--case-column`, joined on `--ids`; the combinations (given, generated from actions, or a
//! project's) applied at every point; the points ranked by their governing combination.

use std::fmt::Write as _;
use std::io::Write as _;
use std::time::Instant;

use serde::Serialize;

use super::{
    BadJson, BatchArgs, RowJson, Setup, StateJson, field, progress_line, row_json, state_cells,
    state_columns,
};
use crate::cli::{ArgError, CliError};
use crate::study::table::{
    self, CaseTable, JoinOptions, PointRow, Points, RankedPoints, TableError,
};
use crate::study::{Combination, EnvelopeMeasure};

/// Whether the arguments ask for load cases as tables.
pub(super) fn joined(args: &BatchArgs) -> bool {
    !args.ids.is_empty()
}

/// The file of a `CASE=FILE` argument (the whole argument when not joining, or with a case
/// column).
pub(super) fn file_part<'a>(text: &'a str, args: &BatchArgs) -> &'a str {
    if joined(args) && args.case_column.is_none() {
        text.split_once('=').map_or(text, |(_, f)| f)
    } else {
        text
    }
}

/// One table read, in the JSON.
#[derive(Serialize)]
struct TableJson {
    /// Its load case (absent for a long table, whose case column names them).
    #[serde(skip_serializing_if = "Option::is_none")]
    case: Option<String>,
    file: String,
    rows_read: u64,
    bad_rows: u64,
    first_bad: Vec<BadJson>,
    last_line_unterminated: bool,
}

/// One combination, in the JSON.
#[derive(Serialize)]
struct CombinationJson {
    name: String,
    /// Factor per load case (the cases it leaves out are not listed).
    factors: serde_json::Map<String, serde_json::Value>,
    /// How many points it governs.
    points_governed: u64,
}

/// One ranked point.
#[derive(Serialize)]
struct PointJson {
    /// The point's number, in the order the tables first name it (1-based).
    point: u64,
    /// Its ids by column name.
    ids: serde_json::Map<String, serde_json::Value>,
    /// The governing combination.
    combination: String,
    /// That combination's state: components, principal values, value, condition, plane.
    #[serde(flatten)]
    state: StateJson,
}

/// A group of points.
#[derive(Serialize)]
struct PointGroupJson {
    group: String,
    points: u64,
    #[serde(skip_serializing_if = "Option::is_none")]
    points_at_or_beyond: Option<u64>,
    worst: PointJson,
}

/// The JSON contract of load cases as tables.
#[derive(Serialize)]
struct CasesJson {
    tables: Vec<TableJson>,
    /// The id columns the tables are joined on.
    ids: Vec<String>,
    #[serde(skip_serializing_if = "Option::is_none")]
    case_column: Option<String>,
    /// The load cases.
    cases: Vec<String>,
    /// Where the combinations come from: "given" (on the command line, generated from actions
    /// or from a project) or "each-case-alone" (none given: the envelope over the cases).
    combinations_from: &'static str,
    combinations: Vec<CombinationJson>,
    measure: String,
    /// Unit of every stress below.
    unit: String,
    convention: String,
    #[serde(skip_serializing_if = "std::ops::Not::not")]
    plane_stress: bool,
    /// Points ranked (those left out not counted).
    points: u64,
    /// Points left out with --skip-unmatched (missing from a case or met twice in one), and
    /// the first of them.
    points_left_out: u64,
    first_left_out: Vec<String>,
    /// How many points stand in each condition (their governing state).
    conditions: crate::study::envelope::ConditionCounts,
    #[serde(skip_serializing_if = "Option::is_none")]
    at_or_beyond: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    points_at_or_beyond: Option<u64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    group_by: Option<String>,
    #[serde(skip_serializing_if = "Option::is_none")]
    groups: Option<Vec<PointGroupJson>>,
    /// Worst first.
    rows: Vec<PointJson>,
}

/// The combinations the arguments give: `--combination`, generated from `--permanent` and
/// `--variable`, and `--combinations-from`, in that order; names must differ.
fn given_combinations(args: &BatchArgs) -> Result<Vec<Combination>, CliError> {
    let mut all: Vec<Combination> = Vec::new();
    for text in &args.combination {
        let Some((name, terms)) = text.split_once(':') else {
            return Err(ArgError::new(
                "--combination",
                format!("'{text}' is not of the form NAME:CASE=FACTOR,…"),
            )
            .into());
        };
        let name = name.trim();
        if name.is_empty() {
            return Err(ArgError::new("--combination", format!("'{text}' has no name")).into());
        }
        all.push(Combination {
            name: name.to_owned(),
            terms: crate::cli::args::terms_of("--combination", terms)?,
            unknown: crate::study::unknown::UnknownKeys::new(),
        });
    }
    if !args.permanent.is_empty() || !args.variable.is_empty() {
        let actions = crate::cli::args::actions_of(&args.permanent, &args.variable)?;
        let generated = crate::study::actions::fundamental_combinations(&actions).map_err(|e| {
            ArgError::new(
                if args.permanent.is_empty() {
                    "--variable"
                } else {
                    "--permanent"
                },
                e,
            )
        })?;
        all.extend(generated);
    }
    if let Some(path) = &args.combinations_from {
        let project = crate::cli::project::load(path)
            .map_err(|e| ArgError::new("--combinations-from", e.message))?;
        if project.combinations.is_empty() {
            return Err(ArgError::new(
                "--combinations-from",
                format!("{} has no combinations", path.display()),
            )
            .into());
        }
        all.extend(project.combinations);
    }
    for (i, c) in all.iter().enumerate() {
        if all[..i].iter().any(|d| d.name == c.name) {
            return Err(ArgError::new(
                "--combination",
                format!("two combinations are named '{}'", c.name),
            )
            .into());
        }
    }
    Ok(all)
}

/// Runs `batch` over load cases as tables.
pub(super) fn run(args: &BatchArgs, setup: &Setup) -> Result<String, CliError> {
    let long = args.case_column.is_some();
    if long && args.files.len() > 1 {
        return Err(ArgError::new(
            "--case-column",
            "a long table with a load-case column is one file; give several tables as CASE=FILE without --case-column",
        )
        .into());
    }
    let mut pairs: Vec<(String, String)> = Vec::new();
    for text in &args.files {
        let (case, file) = if long {
            (String::new(), text.clone())
        } else {
            let Some((case, file)) = text.split_once('=') else {
                return Err(ArgError::new(
                    "FILE",
                    format!(
                        "'{text}': give each load-case table as CASE=FILE (e.g. dead=dead.csv), or one long table with --case-column"
                    ),
                )
                .into());
            };
            (case.trim().to_owned(), file.to_owned())
        };
        if file == "-" {
            return Err(ArgError::new(
                "FILE",
                "load-case tables are read from files, not standard input",
            )
            .into());
        }
        if case.is_empty() && !long {
            return Err(ArgError::new("FILE", format!("'{text}' has no load-case name")).into());
        }
        pairs.push((case, file));
    }
    let combinations = given_combinations(args)?;
    let combination_arg = if args.combinations_from.is_some() && args.combination.is_empty() {
        "--combinations-from"
    } else {
        "--combination"
    };
    // One table per case: the combinations' cases are known before any table is read.
    if !long {
        let cases: Vec<String> = pairs.iter().map(|(c, _)| c.clone()).collect();
        table::point_combinations(&cases, &combinations)
            .map_err(|e| ArgError::new(combination_arg, e))?;
    }
    let mut tables = Vec::new();
    let mut size = 0u64;
    for (case, file) in &pairs {
        if std::fs::metadata(file).is_ok_and(|m| m.is_dir()) {
            return Err(ArgError::new("FILE", format!("{file} is a folder, not a table")).into());
        }
        let f = std::fs::File::open(file)
            .map_err(|cause| ArgError::new("FILE", format!("{file}: {cause}")))?;
        size += f.metadata().map_or(0, |m| m.len());
        tables.push(CaseTable {
            case: case.clone(),
            file: file.clone(),
            source: std::io::BufReader::with_capacity(1 << 16, f),
        });
    }
    let join_options = JoinOptions {
        ids: args.ids.iter().map(|s| s.trim().to_owned()).collect(),
        case_column: args.case_column.clone(),
        skip_unmatched: args.skip_unmatched,
    };
    let started = Instant::now();
    let points = table::join(
        tables,
        &setup.options,
        &join_options,
        progress_line(args.quiet, Some(size)),
    )
    .map_err(|e| match e {
        TableError::Row { .. } | TableError::Header { .. } | TableError::Join { .. } => {
            CliError::from(ArgError::new("FILE", e))
        }
        other => CliError::from(anyhow::Error::from(other)),
    })?;
    let read = started.elapsed().as_secs_f64();
    let measure = setup.measure(args.rank);
    let point_combinations = table::point_combinations(&points.cases, &combinations)
        .map_err(|e| ArgError::new(combination_arg, e))?;
    let ranked = table::rank_points(&points, point_combinations, &setup.options, &measure)
        .map_err(|e| match e {
            TableError::Measure(m) => CliError::from(ArgError::new("--rank", m)),
            other => CliError::from(ArgError::new("FILE", other)),
        })?;
    let seconds = started.elapsed().as_secs_f64();
    let rows_read: u64 = points.tables.iter().map(|t| t.rows).sum();
    if !args.quiet {
        eprintln!(
            "\rplanewise batch: {} rows of {} tables joined into {} points ({:.0} MB held) in {read:.2} s; {} at every point, ranked in {:.2} s",
            rows_read,
            points.tables.len(),
            points.len(),
            points.bytes_held() as f64 / 1e6,
            count(ranked.combinations.len(), "combination"),
            seconds - read
        );
        for t in &points.tables {
            for b in t.bad.iter().take(5) {
                eprintln!("planewise: skipped {}", b.located(&t.file));
            }
        }
        for m in points.unmatched.iter().take(5) {
            eprintln!("planewise: left out {m}");
        }
    }
    for t in points.tables.iter().filter(|t| t.unterminated) {
        eprintln!(
            "planewise: warning: {}: the last line has no line end; the file may have been cut short (its last row was read as it stands)",
            t.file
        );
    }
    let json = to_json(args, setup, &points, &ranked, combinations.is_empty());
    if let Some(path) = &args.report {
        write_report(path, args, setup, &points, &ranked, &combinations)?;
        if !args.quiet {
            eprintln!("planewise batch: wrote the report {}", path.display());
        }
    }
    if !args.quiet {
        let what = if args.rank.is_stress() {
            format!("{}, {}", setup.unit, setup.convention.key())
        } else {
            "dimensionless".to_owned()
        };
        eprintln!(
            "planewise batch: {} points ranked by {} ({what}) under {}, worst first; {}{}",
            ranked.points,
            args.rank.key(),
            if combinations.is_empty() {
                "each load case alone (no combinations given)".to_owned()
            } else {
                count(ranked.combinations.len(), "combination")
            },
            ranked.counts.text("points"),
            json.points_at_or_beyond
                .map_or_else(String::new, |n| format!(
                    "; {n} at or beyond {}",
                    json.at_or_beyond.unwrap_or_default()
                ))
        );
    }
    let write = |w: &mut dyn std::io::Write| -> std::io::Result<()> {
        if args.json {
            serde_json::to_writer_pretty(&mut *w, &json)?;
            w.write_all(b"\n")
        } else {
            write_csv(w, &json, args.rank)
        }
    };
    let kept = if json.groups.is_some() {
        json.groups.as_ref().map_or(0, Vec::len)
    } else {
        json.rows.len()
    };
    if let Some(path) = &args.out {
        crate::study::atomic::write_atomic_with(path, write).map_err(anyhow::Error::from)?;
        Ok(format!("wrote {} ({kept} rows)\n", path.display()))
    } else {
        let mut out = std::io::BufWriter::with_capacity(1 << 16, std::io::stdout().lock());
        write(&mut out)
            .and_then(|()| out.flush())
            .map_err(anyhow::Error::from)?;
        Ok(String::new())
    }
}

/// A ranked point's JSON.
fn point_json(
    points: &Points,
    ranked: &RankedPoints,
    r: &PointRow,
    args: &BatchArgs,
    setup: &Setup,
) -> PointJson {
    let RowJson { state, .. } = row_json(&r.row, args.rank, setup.unit, setup.convention);
    PointJson {
        point: r.row.line,
        ids: points
            .id_names
            .iter()
            .zip(&r.row.carried)
            .map(|(n, v)| (n.clone(), serde_json::Value::String(v.clone())))
            .collect(),
        combination: ranked.combinations[r.combination].name.clone(),
        state,
    }
}

fn to_json(
    args: &BatchArgs,
    setup: &Setup,
    points: &Points,
    ranked: &RankedPoints,
    each_case_alone: bool,
) -> CasesJson {
    let above = setup.options.above;
    let grouped = points.group_column.is_some();
    CasesJson {
        tables: points
            .tables
            .iter()
            .map(|t| TableJson {
                case: (!t.case.is_empty()).then(|| t.case.clone()),
                file: t.file.clone(),
                rows_read: t.rows,
                bad_rows: t.bad_count,
                first_bad: t
                    .bad
                    .iter()
                    .map(|b| BadJson {
                        line: b.line,
                        column: b.column,
                        message: b.message.clone(),
                    })
                    .collect(),
                last_line_unterminated: t.unterminated,
            })
            .collect(),
        ids: points.id_names.clone(),
        case_column: args.case_column.clone(),
        cases: points.cases.clone(),
        combinations_from: if each_case_alone {
            "each-case-alone"
        } else {
            "given"
        },
        combinations: ranked
            .combinations
            .iter()
            .zip(&ranked.governs)
            .map(|(c, &n)| CombinationJson {
                name: c.name.clone(),
                factors: points
                    .cases
                    .iter()
                    .zip(&c.factors)
                    .filter(|(_, f)| **f != 0.0)
                    .map(|(case, f)| (case.clone(), serde_json::json!(f)))
                    .collect(),
                points_governed: n,
            })
            .collect(),
        measure: args.rank.key().to_owned(),
        unit: setup.unit.symbol().to_owned(),
        convention: setup.convention.key().to_owned(),
        plane_stress: setup.options.plane_stress,
        points: ranked.points,
        points_left_out: points.unmatched_count,
        first_left_out: points.unmatched.clone(),
        conditions: ranked.counts,
        at_or_beyond: above.map(|v| {
            crate::text::format::clean(if args.rank.is_stress() {
                setup.unit.from_pa(v)
            } else {
                v
            })
        }),
        points_at_or_beyond: above.map(|_| ranked.at_or_beyond),
        group_by: points.group_column.clone(),
        groups: grouped.then(|| {
            ranked
                .groups
                .iter()
                .map(|g| PointGroupJson {
                    group: g.name.clone(),
                    points: g.points,
                    points_at_or_beyond: above.map(|_| g.at_or_beyond),
                    worst: point_json(points, ranked, &g.worst, args, setup),
                })
                .collect()
        }),
        rows: ranked
            .rows
            .iter()
            .map(|r| point_json(points, ranked, r, args, setup))
            .collect(),
    }
}

/// The CSV columns of a point: its number, ids, governing combination and state.
fn point_columns(json: &CasesJson, rank: EnvelopeMeasure) -> Vec<String> {
    let mut head = vec!["point".to_owned()];
    head.extend(json.ids.iter().map(|n| field(n)));
    head.push("combination".to_owned());
    head.extend(state_columns(rank, &json.unit));
    head
}

/// One point's CSV cells in [`point_columns`] order, appended to `line`.
fn point_cells(line: &mut String, p: &PointJson, rank: EnvelopeMeasure) {
    let _ = write!(line, "{}", p.point);
    for v in p.ids.values() {
        line.push(',');
        line.push_str(&field(v.as_str().unwrap_or_default()));
    }
    line.push(',');
    line.push_str(&field(&p.combination));
    state_cells(line, &p.state, rank);
}

/// Plain CSV: a row per point (or per group: the group, its counts, its worst point).
fn write_csv(
    w: &mut dyn std::io::Write,
    json: &CasesJson,
    rank: EnvelopeMeasure,
) -> std::io::Result<()> {
    let mut line = String::new();
    if let (Some(column), Some(groups)) = (&json.group_by, &json.groups) {
        let mut head = vec![field(column), "points".to_owned()];
        if json.at_or_beyond.is_some() {
            head.push("points_at_or_beyond".to_owned());
        }
        head.extend(point_columns(json, rank));
        writeln!(w, "{}", head.join(","))?;
        for g in groups {
            line.clear();
            let _ = write!(line, "{},{},", field(&g.group), g.points);
            if let Some(n) = g.points_at_or_beyond {
                let _ = write!(line, "{n},");
            }
            point_cells(&mut line, &g.worst, rank);
            line.push('\n');
            w.write_all(line.as_bytes())?;
        }
        return Ok(());
    }
    writeln!(w, "{}", point_columns(json, rank).join(","))?;
    for p in &json.rows {
        line.clear();
        point_cells(&mut line, p, rank);
        line.push('\n');
        w.write_all(line.as_bytes())?;
    }
    Ok(())
}

/// `1 combination`, `6 combinations`.
fn count(n: usize, noun: &str) -> String {
    if n == 1 {
        format!("1 {noun}")
    } else {
        format!("{n} {noun}s")
    }
}

/// The calculation report of the load-case tables: the `--combinations-from` project (or an
/// empty one) with the worst point's case tensors standing in for its cases of those names, the
/// combinations used added where it lacks them, and the tables section.
fn write_report(
    path: &std::path::Path,
    args: &BatchArgs,
    setup: &Setup,
    points: &Points,
    ranked: &RankedPoints,
    given: &[Combination],
) -> Result<(), CliError> {
    use crate::output::report::{ReportOptions, SourceFile, TablesSection, html};
    let (mut project, source) = match &args.combinations_from {
        Some(p) => {
            let project = crate::cli::project::load(p)
                .map_err(|e| ArgError::new("--combinations-from", e.message))?;
            let source = SourceFile::read(p).map_err(|e| {
                ArgError::new("--combinations-from", format!("{}: {e}", p.display()))
            })?;
            (project, Some(source))
        }
        None => (
            crate::study::Project::new(
                "Load-case tables (no project given)",
                setup.unit,
                setup.convention,
            ),
            None,
        ),
    };
    let unit = project
        .unit()
        .map_err(|e| ArgError::new("--combinations-from", e))?;
    let convention = project.convention();
    let worst = ranked
        .rows
        .first()
        .or_else(|| ranked.groups.first().map(|g| &g.worst));
    let mut shown_as = None;
    if let Some(w) = worst {
        let p = usize::try_from(w.row.line.saturating_sub(1)).unwrap_or(0);
        for case in table::point_load_cases(points, p, unit, convention) {
            if project.is_combination(&case.name) {
                return Err(ArgError::new(
                    "--combinations-from",
                    format!(
                        "'{}' is a combination of the project, not a load case",
                        case.name
                    ),
                )
                .into());
            }
            project
                .add_case(case, true)
                .map_err(|e| ArgError::new("FILE", e))?;
        }
        for c in given {
            if !project.name_used(&c.name) {
                project
                    .add_combination(c.clone(), false)
                    .map_err(|e| ArgError::new("--combination", e))?;
            }
        }
        let name = ranked.combinations[w.combination].name.clone();
        project.active.clone_from(&name);
        shown_as = Some(name);
    }
    let reading = format!(
        "unit {}, {}, components {}{}; joined on {}{}",
        setup.unit,
        setup.convention.key(),
        args.columns
            .as_deref()
            .map_or_else(|| "by header name".to_owned(), |c| format!("mapped {c}")),
        if setup.options.plane_stress {
            ", plane stress (zz, yz and zx stated zero)"
        } else {
            ""
        },
        points.id_names.join(", "),
        args.case_column
            .as_deref()
            .map_or_else(String::new, |c| format!(", load case in column {c}"))
    );
    let mut section = TablesSection::of(
        points,
        ranked,
        reading,
        args.rank,
        given.is_empty(),
        setup.options.above,
        convention,
    )
    .map_err(|e| ArgError::new("FILE", e))?;
    section.worst_shown_as.clone_from(&shown_as);
    let options = ReportOptions {
        cases: shown_as.into_iter().collect(),
        source,
        tables: Some(section),
        ..ReportOptions::default()
    };
    let text = html(&project, &options).map_err(|e| ArgError::new("--report", e))?;
    crate::study::atomic::write_atomic(path, text.as_bytes()).map_err(anyhow::Error::from)?;
    Ok(())
}

/// The arguments with the load-case tables of `project` (its `load_case_tables`): files
/// (relative ones from the project's folder), ids, case column, unit, convention, mapping; its
/// combinations applied (as `--combinations-from`).
pub(super) fn from_project(
    args: &BatchArgs,
    project: &std::path::Path,
) -> Result<BatchArgs, CliError> {
    let p =
        crate::cli::project::load(project).map_err(|e| ArgError::new("--project", e.message))?;
    let Some(t) = &p.load_case_tables else {
        return Err(ArgError::new(
            "--project",
            format!(
                "{} names no load-case tables (set them in the window's Table tab, Load cases as tables, and save)",
                project.display()
            ),
        )
        .into());
    };
    if t.tables.is_empty() || t.ids.is_empty() {
        return Err(ArgError::new(
            "--project",
            format!(
                "{}: its load-case tables name no files or no id columns",
                project.display()
            ),
        )
        .into());
    }
    let unit = t
        .unit
        .parse::<crate::mechanics::StressUnit>()
        .map_err(|e| {
            ArgError::new(
                "--project",
                format!("{}: the tables' unit: {e}", project.display()),
            )
        })?;
    let folder = project.parent().unwrap_or_else(|| std::path::Path::new(""));
    let place = |file: &str| {
        let path = std::path::Path::new(file);
        if path.is_absolute() {
            file.to_owned()
        } else {
            folder.join(path).display().to_string()
        }
    };
    let long = !t.case_column.is_empty();
    let mut out = args.clone();
    out.project = None;
    out.files = t
        .tables
        .iter()
        .map(|f| {
            if long {
                place(&f.file)
            } else {
                format!("{}={}", f.case, place(&f.file))
            }
        })
        .collect();
    out.ids.clone_from(&t.ids);
    out.case_column = long.then(|| t.case_column.clone());
    out.unit = Some(unit);
    out.compression_positive = t.compression_positive;
    out.columns = (!t.columns.is_empty()).then(|| {
        t.columns
            .iter()
            .map(|(k, v)| format!("{k}={v}"))
            .collect::<Vec<_>>()
            .join(",")
    });
    out.plane_stress = t.plane_stress;
    out.decimal_comma = t.decimal_comma;
    if !p.combinations.is_empty() {
        out.combinations_from = Some(project.to_path_buf());
    }
    Ok(out)
}

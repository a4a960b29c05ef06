//! `planewise cycles`: rainflow counting (ASTM E1049-85, three-point method, residue as half
//! cycles) of one column of a CSV — a strain-gauge channel, a load, a stress component.

use std::fmt::Write as _;
use std::path::PathBuf;

use clap::Args;
use serde::Serialize;

use super::{ArgError, CliError};
use crate::mechanics::fatigue::rainflow;
use crate::study::load_history::read_columns;
use crate::text::format::sig;

/// Arguments of `planewise cycles`.
#[derive(Debug, Clone, Args)]
pub struct CyclesArgs {
    /// The CSV: a time (or step) column first, then value columns, one line per step.
    pub file: PathBuf,
    /// The column to count (by its header name).
    #[arg(long, value_name = "NAME")]
    pub column: String,
    /// Print one JSON object instead of the table.
    #[arg(long)]
    pub json: bool,
}

/// One counted range.
#[derive(Debug, Serialize)]
pub struct CycleJson {
    /// Peak minus valley, in the column's unit.
    pub range: f64,
    /// Mean of its two reversals.
    pub mean: f64,
    /// 1 (full) or 0.5 (half).
    pub count: f64,
    /// Time (first column) of its first and second reversal.
    pub from_time: f64,
    pub to_time: f64,
}

/// `planewise cycles --json`.
#[derive(Debug, Serialize)]
pub struct CyclesJson {
    pub file: String,
    pub column: String,
    pub method: &'static str,
    pub cycles: Vec<CycleJson>,
}

/// Runs the subcommand.
pub fn run(args: &CyclesArgs) -> Result<String, CliError> {
    let cols = read_columns(&args.file).map_err(|e| ArgError::new("FILE", e))?;
    let Some(index) = cols.names.iter().position(|n| *n == args.column) else {
        return Err(ArgError::new(
            "--column",
            format!(
                "{}: no column '{}' (it has: {})",
                args.file.display(),
                args.column,
                cols.names.join(", ")
            ),
        )
        .into());
    };
    let values: Vec<f64> = cols.rows.iter().map(|r| r[index]).collect();
    let json = CyclesJson {
        file: args.file.display().to_string(),
        column: args.column.clone(),
        method: "ASTM E1049-85 rainflow, three-point method; residue counted as half cycles",
        cycles: rainflow::count(&values)
            .iter()
            .map(|c| CycleJson {
                range: c.range,
                mean: c.mean,
                count: c.count,
                from_time: cols.time[c.from],
                to_time: cols.time[c.to],
            })
            .collect(),
    };
    if args.json {
        let mut text = serde_json::to_string_pretty(&json).map_err(anyhow::Error::from)?;
        text.push('\n');
        return Ok(text);
    }
    let mut s = String::new();
    let full: f64 = json.cycles.iter().map(|c| c.count).sum();
    let _ = writeln!(
        s,
        "Rainflow count of '{}' in {} ({}): {} ranges, {} cycles",
        json.column,
        json.file,
        json.method,
        json.cycles.len(),
        sig(full, 6)
    );
    let _ = writeln!(
        s,
        "{:>12} {:>12} {:>6} {:>12} {:>12}",
        "range", "mean", "count", "from", "to"
    );
    for c in &json.cycles {
        let _ = writeln!(
            s,
            "{:>12} {:>12} {:>6} {:>12} {:>12}",
            sig(c.range, 6),
            sig(c.mean, 6),
            c.count,
            sig(c.from_time, 6),
            sig(c.to_time, 6)
        );
    }
    Ok(s)
}

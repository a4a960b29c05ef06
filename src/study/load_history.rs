//! Load histories read from CSV files: the six components in time, or factors in time on a
//! project's load cases (σ(t) = Σ fᵢ(t) σᵢ).
//!
//! Both files are a header line and one line per step, comma separated; lines starting with `#`
//! and blank lines are skipped. The first column is time (or a step number), whatever its name;
//! the others are named by component (as the table reader finds them: `xx`, `S11`, `sigma_xy`,
//! `xy_MPa`…) or by load case.

use std::path::Path;

use crate::mechanics::fatigue::{HistoryError, StressHistory};
use crate::mechanics::{SignConvention, StressTensor, StressUnit};
use crate::study::table::component_of;

/// What a history file says, before it becomes a history.
#[derive(Clone, Debug, PartialEq)]
pub struct Columns {
    /// The first column's name (time or step).
    pub time_name: String,
    /// The other columns' names, in file order.
    pub names: Vec<String>,
    /// Times.
    pub time: Vec<f64>,
    /// Values, one row per step, in the order of `names`.
    pub rows: Vec<Vec<f64>>,
}

/// Reads a CSV of a first (time) column and numbered columns. Errors say file, line and column.
pub fn read_columns(path: &Path) -> Result<Columns, String> {
    let file = path.display();
    let text = std::fs::read(path).map_err(|e| format!("{file}: {e}"))?;
    let text = String::from_utf8(text).map_err(|e| {
        format!(
            "{file}: not UTF-8 text (byte {} is not)",
            e.utf8_error().valid_up_to() + 1
        )
    })?;
    let mut lines = text
        .lines()
        .enumerate()
        .map(|(i, l)| (i + 1, l.trim()))
        .filter(|(_, l)| !l.is_empty() && !l.starts_with('#'));
    let Some((_, header)) = lines.next() else {
        return Err(format!("{file}: no header line: the file is empty"));
    };
    let mut names = header
        .split(',')
        .map(|n| n.trim().trim_matches('"').to_owned());
    let time_name = names.next().unwrap_or_default();
    let names: Vec<String> = names.collect();
    if names.is_empty() {
        return Err(format!(
            "{file}:1: the header has one column ('{time_name}'); after the time column come the value columns"
        ));
    }
    let mut time = Vec::new();
    let mut rows = Vec::new();
    for (line, l) in lines {
        let fields: Vec<&str> = l.split(',').map(str::trim).collect();
        if fields.len() != names.len() + 1 {
            return Err(format!(
                "{file}:{line}: {} fields where the header has {}",
                fields.len(),
                names.len() + 1
            ));
        }
        let number = |i: usize| -> Result<f64, String> {
            let name = if i == 0 { &time_name } else { &names[i - 1] };
            crate::text::parse::number(fields[i])
                .map_err(|e| format!("{file}:{line}: column '{name}': {e}"))
        };
        time.push(number(0)?);
        rows.push(
            (1..fields.len())
                .map(number)
                .collect::<Result<Vec<_>, _>>()?,
        );
    }
    Ok(Columns {
        time_name,
        names,
        time,
        rows,
    })
}

fn located(file: &Path, e: &HistoryError) -> String {
    format!("{}: {e}", file.display())
}

/// A history of the six components, in `unit` and `convention`, with its time column's name;
/// every component must have a column (a missing one is an error naming it, never a zero).
pub fn read_components(
    path: &Path,
    unit: StressUnit,
    convention: SignConvention,
) -> Result<(StressHistory, String), String> {
    let cols = read_columns(path)?;
    let file = path.display();
    let mut index = [None; 6];
    for (i, name) in cols.names.iter().enumerate() {
        match component_of(name) {
            Some(c) if index[c].is_some() => {
                return Err(format!(
                    "{file}:1: column '{name}' is a second column for the same component"
                ));
            }
            Some(c) => index[c] = Some(i),
            None => {
                return Err(format!(
                    "{file}:1: column '{name}' is not a stress component (xx, yy, zz, xy, yz, zx, or S11…S13)"
                ));
            }
        }
    }
    let keys = ["xx", "yy", "zz", "xy", "yz", "zx"];
    let missing: Vec<&str> = keys
        .iter()
        .zip(index)
        .filter(|(_, i)| i.is_none())
        .map(|(k, _)| *k)
        .collect();
    if !missing.is_empty() {
        return Err(format!(
            "{file}:1: no column for {} (all six components are needed; write 0 where a component is zero)",
            missing.join(", ")
        ));
    }
    let sign = convention.sign();
    let tensors = cols
        .rows
        .iter()
        .map(|row| {
            let mut t = [0.0; 6];
            for (c, i) in index.iter().enumerate() {
                if let Some(i) = i {
                    t[c] = sign * unit.to_pa(row[*i]);
                }
            }
            t
        })
        .collect();
    let history = StressHistory::new(cols.time, tensors).map_err(|e| located(path, &e))?;
    Ok((history, cols.time_name))
}

/// Factors in time on load cases, as read: which cases, and each step's factor on each.
#[derive(Clone, Debug, PartialEq)]
pub struct Factors {
    /// The file, for messages.
    pub file: String,
    /// The time (or step) column's name.
    pub time_name: String,
    /// The load cases the columns name, in column order.
    pub cases: Vec<String>,
    /// Times.
    pub time: Vec<f64>,
    /// Per step, one factor per case of `cases`.
    pub rows: Vec<Vec<f64>>,
}

impl Factors {
    /// Reads a factor table whose every column after the first names one of `known` cases.
    pub fn read(path: &Path, known: &[String]) -> Result<Self, String> {
        let cols = read_columns(path)?;
        let file = path.display().to_string();
        let mut cases: Vec<String> = Vec::new();
        for name in &cols.names {
            if !known.iter().any(|k| k == name) {
                return Err(format!(
                    "{file}:1: column '{name}' names no load case (there are: {})",
                    if known.is_empty() {
                        "none".to_owned()
                    } else {
                        known.join(", ")
                    }
                ));
            }
            if cases.contains(name) {
                return Err(format!("{file}:1: load case '{name}' has two columns"));
            }
            cases.push(name.clone());
        }
        Ok(Self {
            file,
            time_name: cols.time_name,
            cases,
            time: cols.time,
            rows: cols.rows,
        })
    }

    /// σ(t) = Σ fᵢ(t) σᵢ with `tensors` the cases' tensors in the order of `self.cases`.
    pub fn history(&self, tensors: &[StressTensor]) -> Result<StressHistory, String> {
        StressHistory::from_factors(tensors, self.time.clone(), &self.rows)
            .map_err(|e| format!("{}: {e}", self.file))
    }
}

/// A history from factors in time on named load cases (`cases`: name and tensor); returns it
/// with the factors read (the cases used, in column order).
pub fn read_factors(
    path: &Path,
    cases: &[(String, StressTensor)],
) -> Result<(StressHistory, Factors), String> {
    let known: Vec<String> = cases.iter().map(|(n, _)| n.clone()).collect();
    let factors = Factors::read(path, &known)?;
    let tensors: Vec<StressTensor> = factors
        .cases
        .iter()
        .filter_map(|name| cases.iter().find(|(n, _)| n == name).map(|(_, t)| *t))
        .collect();
    let history = factors.history(&tensors)?;
    Ok((history, factors))
}

#[cfg(test)]
mod tests {
    use super::*;

    fn write(name: &str, text: &str) -> std::path::PathBuf {
        let dir =
            std::env::temp_dir().join(format!("planewise-load-history-{}", std::process::id()));
        std::fs::create_dir_all(&dir).unwrap();
        let p = dir.join(name);
        std::fs::write(&p, text).unwrap();
        p
    }

    #[test]
    fn components_in_any_order_and_unit_and_convention() {
        let p = write(
            "h.csv",
            "# invented\ntime,S12,xx,yy,zz,yz,zx\n0,1,2,0,0,0,0\n\n0.5,-1,-2,0,0,0,0\n",
        );
        let (h, time) =
            read_components(&p, StressUnit::MPa, SignConvention::CompressionPositive).unwrap();
        assert_eq!(time, "time");
        assert_eq!(h.time(), &[0.0, 0.5]);
        assert_eq!(h.tensors_pa()[0], [-2e6, 0.0, 0.0, -1e6, 0.0, 0.0]);
    }

    #[test]
    fn errors_say_where() {
        let p = write("missing.csv", "t,xx,yy,zz,xy\n0,1,2,3,4\n1,1,2,3,4\n");
        let e = read_components(&p, StressUnit::MPa, SignConvention::TensionPositive).unwrap_err();
        assert!(e.ends_with(":1: no column for yz, zx (all six components are needed; write 0 where a component is zero)"), "{e}");
        let p = write(
            "bad.csv",
            "t,xx,yy,zz,xy,yz,zx\n0,1,2,3,4,5,6\n1,1,x,3,4,5,6\n",
        );
        let e = read_components(&p, StressUnit::MPa, SignConvention::TensionPositive).unwrap_err();
        assert!(e.contains(":3: column 'yy':"), "{e}");
        let p = write(
            "back.csv",
            "t,xx,yy,zz,xy,yz,zx\n1,1,2,3,4,5,6\n0,1,2,3,4,5,6\n",
        );
        let e = read_components(&p, StressUnit::MPa, SignConvention::TensionPositive).unwrap_err();
        assert!(e.contains("step 2: time 0 does not come after"), "{e}");
        let case = StressTensor::from_pa([1.0, 0.0, 0.0, 0.0, 0.0, 0.0]).unwrap();
        let p = write("f.csv", "t,dead,snow\n0,1,1\n1,1,0\n");
        let e = read_factors(&p, &[("dead".to_owned(), case)]).unwrap_err();
        assert!(
            e.ends_with(":1: column 'snow' names no load case (there are: dead)"),
            "{e}"
        );
    }
}

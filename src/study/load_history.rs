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

/// The column of each component (xx, yy, zz, xy, yz, zx) among `names`, skipping the columns
/// in `skip`; `other` says what else a column may be, for the error of one that is nothing.
/// Every component must have a column: a missing one is an error naming it, never a zero.
fn component_columns(
    file: &std::path::Display<'_>,
    names: &[String],
    skip: &[usize],
    other: &str,
) -> Result<[usize; 6], String> {
    let mut index = [None; 6];
    for (i, name) in names.iter().enumerate() {
        if skip.contains(&i) {
            continue;
        }
        match component_of(name) {
            Some(c) if index[c].is_some() => {
                return Err(format!(
                    "{file}:1: column '{name}' is a second column for the same component"
                ));
            }
            Some(c) => index[c] = Some(i),
            None => return Err(format!("{file}:1: column '{name}' is {other}")),
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
    Ok(index.map(Option::unwrap_or_default))
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
    let index = component_columns(
        &file,
        &cols.names,
        &[],
        "not a stress component (xx, yy, zz, xy, yz, zx, or S11…S13)",
    )?;
    let sign = convention.sign();
    let tensors = cols
        .rows
        .iter()
        .map(|row| {
            let mut t = [0.0; 6];
            for (c, i) in index.iter().enumerate() {
                t[c] = sign * unit.to_pa(row[*i]);
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

/// Histories of many points in one long table: id columns naming the point, a time column, and
/// the six components; one row per point and step.
#[derive(Clone, Debug, PartialEq)]
pub struct PointHistories {
    /// The id columns' names, as given.
    pub id_names: Vec<String>,
    /// The time column's name.
    pub time_name: String,
    /// Each point's ids, in the order the table first names it.
    pub ids: Vec<Vec<String>>,
    /// Each point's history.
    pub histories: Vec<StressHistory>,
}

/// Reads a long table of histories: the header names the `ids` columns, the `time` column and
/// the six components (any other column is an error naming it, never ignored). A point's rows
/// need not be together, but its times must increase in file order. Errors say file, line and
/// column, or the point.
pub fn read_point_histories(
    path: &Path,
    ids: &[String],
    time: &str,
    unit: StressUnit,
    convention: SignConvention,
) -> Result<PointHistories, String> {
    let file = path.display();
    let text = std::fs::read_to_string(path).map_err(|e| format!("{file}: {e}"))?;
    let mut lines = text
        .lines()
        .enumerate()
        .map(|(i, l)| (i + 1, l.trim()))
        .filter(|(_, l)| !l.is_empty() && !l.starts_with('#'));
    let Some((_, header)) = lines.next() else {
        return Err(format!("{file}: no header line: the file is empty"));
    };
    let names: Vec<String> = header
        .split(',')
        .map(|n| n.trim().trim_matches('"').to_owned())
        .collect();
    let find = |wanted: &str| names.iter().position(|n| n.eq_ignore_ascii_case(wanted));
    let mut id_index = Vec::new();
    for id in ids {
        id_index.push(find(id).ok_or_else(|| {
            format!(
                "{file}:1: no id column '{id}' (the header has: {})",
                names.join(", ")
            )
        })?);
    }
    let time_index = find(time).ok_or_else(|| {
        format!(
            "{file}:1: no time column '{time}' (the header has: {}; name it with --time-column)",
            names.join(", ")
        )
    })?;
    let mut skip = id_index.clone();
    skip.push(time_index);
    let component = component_columns(
        &file,
        &names,
        &skip,
        "neither an id, the time nor a stress component",
    )?;
    let sign = convention.sign();
    let mut order: Vec<Vec<String>> = Vec::new();
    let mut index: std::collections::HashMap<Vec<String>, usize> = std::collections::HashMap::new();
    let mut rows: Vec<(Vec<f64>, Vec<[f64; 6]>)> = Vec::new();
    for (line, l) in lines {
        let fields: Vec<&str> = l.split(',').map(str::trim).collect();
        if fields.len() != names.len() {
            return Err(format!(
                "{file}:{line}: {} fields where the header has {}",
                fields.len(),
                names.len()
            ));
        }
        let number = |i: usize| -> Result<f64, String> {
            crate::text::parse::number(fields[i])
                .map_err(|e| format!("{file}:{line}: column '{}': {e}", names[i]))
        };
        let key: Vec<String> = id_index.iter().map(|i| fields[*i].to_owned()).collect();
        let p = *index.entry(key.clone()).or_insert_with(|| {
            order.push(key);
            rows.push((Vec::new(), Vec::new()));
            rows.len() - 1
        });
        let mut t = [0.0; 6];
        for (c, i) in component.iter().enumerate() {
            t[c] = sign * unit.to_pa(number(*i)?);
        }
        rows[p].0.push(number(time_index)?);
        rows[p].1.push(t);
    }
    let mut histories = Vec::with_capacity(rows.len());
    for ((time, tensors), key) in rows.into_iter().zip(&order) {
        let point = ids
            .iter()
            .zip(key)
            .map(|(n, v)| format!("{n}={v}"))
            .collect::<Vec<_>>()
            .join(", ");
        histories.push(
            StressHistory::new(time, tensors).map_err(|e| format!("{file}: point {point}: {e}"))?,
        );
    }
    Ok(PointHistories {
        id_names: ids.to_vec(),
        time_name: names[time_index].clone(),
        ids: order,
        histories,
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Writes `text` to a file named `name` in a folder of its own (tests run in parallel and
    /// two of them write a file of the same name).
    fn write(name: &str, text: &str) -> std::path::PathBuf {
        static CALLS: std::sync::atomic::AtomicUsize = std::sync::atomic::AtomicUsize::new(0);
        let call = CALLS.fetch_add(1, std::sync::atomic::Ordering::Relaxed);
        let dir = std::env::temp_dir().join(format!(
            "planewise-load-history-{}-{call}",
            std::process::id()
        ));
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

    #[test]
    fn histories_of_many_points_in_one_long_table() {
        let p = write(
            "long.csv",
            "node,t,xx,yy,zz,xy,yz,zx\n2,0,1,0,0,0,0,0\n1,0,5,0,0,0,0,0\n2,1,-1,0,0,0,0,0\n1,1,-5,0,0,0,0,0\n1,2,5,0,0,0,0,0\n",
        );
        let read = |path: &std::path::Path, id: &str| {
            read_point_histories(
                path,
                &[id.to_owned()],
                "t",
                StressUnit::MPa,
                SignConvention::TensionPositive,
            )
        };
        let h = read(&p, "node").unwrap();
        assert_eq!(h.ids, vec![vec!["2".to_owned()], vec!["1".to_owned()]]);
        assert_eq!(h.histories[1].time(), &[0.0, 1.0, 2.0]);
        assert_eq!(h.histories[1].tensors_pa()[1][0], -5e6);
        let back = write(
            "back.csv",
            "node,t,xx,yy,zz,xy,yz,zx\n1,1,0,0,0,0,0,0\n1,0,0,0,0,0,0,0\n",
        );
        let e = read(&back, "node").unwrap_err();
        assert!(
            e.contains("point node=1: step 2: time 0 does not come after"),
            "{e}"
        );
        let e = read(&p, "elem").unwrap_err();
        assert!(
            e.ends_with(
                ":1: no id column 'elem' (the header has: node, t, xx, yy, zz, xy, yz, zx)"
            ),
            "{e}"
        );
    }
}

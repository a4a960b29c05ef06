//! Combinations at every point of joined load-case tables: each combination's tensor is
//! Σ factor × case tensor (principal values do not superpose, so the tensors are summed), the
//! measure is evaluated for each by the one ranking rule, the worst combination governs the
//! point (the earlier one among equals), and the points are ranked by the governing value —
//! the top N, those at or beyond a threshold, or the worst point of each group.

use std::collections::BinaryHeap;

use rayon::prelude::*;

use super::join::Points;
use super::{Measure, Row, TableError, TableOptions};
use crate::mechanics::StressTensor;
use crate::mechanics::criteria::Condition;
use crate::study::envelope::{ConditionCounts, RankKey};
use crate::study::model::Combination;

/// A combination's factors by load case, in [`Points::cases`] order (0 where it has no term).
#[derive(Clone, Debug, PartialEq)]
pub struct PointCombination {
    /// Its name.
    pub name: String,
    /// One factor per load case.
    pub factors: Vec<f64>,
}

/// The combinations' factors per load case (`cases`, as [`Points::cases`] orders them); a
/// term naming a case the tables do not have is refused, listing the cases they have. Without
/// combinations, each case alone (factor 1) — the envelope over the cases, said so by the
/// caller.
pub fn point_combinations(
    cases: &[String],
    combinations: &[Combination],
) -> Result<Vec<PointCombination>, String> {
    if combinations.is_empty() {
        return Ok(cases
            .iter()
            .enumerate()
            .map(|(c, name)| PointCombination {
                name: name.clone(),
                factors: (0..cases.len())
                    .map(|k| if k == c { 1.0 } else { 0.0 })
                    .collect(),
            })
            .collect());
    }
    combinations
        .iter()
        .map(|comb| {
            let mut factors = vec![0.0; cases.len()];
            for t in &comb.terms {
                let c = cases
                    .iter()
                    .position(|c| *c == t.case)
                    .ok_or_else(|| {
                        format!(
                            "combination '{}' names the load case '{}', which the tables do not have (they have: {})",
                            comb.name,
                            t.case,
                            cases.join(", ")
                        )
                    })?;
                if !t.factor.is_finite() {
                    return Err(format!(
                        "combination '{}': the factor of '{}' is not a finite number",
                        comb.name, t.case
                    ));
                }
                factors[c] += t.factor;
            }
            Ok(PointCombination {
                name: comb.name.clone(),
                factors,
            })
        })
        .collect()
}

/// One ranked point: its number, ids, governing combination and the row of that combination's
/// state (its `line` is the point's number, 1-based in the order met; its carried texts are
/// the ids).
#[derive(Clone, Debug, PartialEq)]
pub struct PointRow {
    /// Index of the governing combination.
    pub combination: usize,
    /// The point's group, with a group column.
    pub group: Option<String>,
    /// The governing combination's state, measure and standing.
    pub row: Row,
}

/// A group of points: its worst point and its counts.
#[derive(Clone, Debug, PartialEq)]
pub struct PointGroup {
    /// The group's name.
    pub name: String,
    /// Points in the group (those left out not counted).
    pub points: u64,
    /// With a threshold: its points at or beyond it.
    pub at_or_beyond: u64,
    /// Its worst point.
    pub worst: PointRow,
}

/// Points ranked by their governing combination.
#[derive(Clone, Debug, PartialEq)]
pub struct RankedPoints {
    /// The combinations used.
    pub combinations: Vec<PointCombination>,
    /// The points kept, worst first (empty when ranked by groups).
    pub rows: Vec<PointRow>,
    /// Points evaluated (those left out not counted).
    pub points: u64,
    /// How many points stand in each condition (their governing state).
    pub counts: ConditionCounts,
    /// With a threshold: how many points are at or beyond it.
    pub at_or_beyond: u64,
    /// How many points each combination governs, in combination order.
    pub governs: Vec<u64>,
    /// With a group column: the groups, worst first (the top N with a limit).
    pub groups: Vec<PointGroup>,
}

/// A point's governing state in the ranking: larger key worse, then the earlier point.
#[derive(Clone, Copy, Debug)]
struct Best {
    key: RankKey,
    point: u32,
    combination: u32,
}

impl PartialEq for Best {
    fn eq(&self, other: &Self) -> bool {
        self.cmp(other) == std::cmp::Ordering::Equal
    }
}
impl Eq for Best {}
impl PartialOrd for Best {
    fn partial_cmp(&self, other: &Self) -> Option<std::cmp::Ordering> {
        Some(self.cmp(other))
    }
}
impl Ord for Best {
    /// Worse first: `Less` is the worse (the larger key, then the earlier point).
    fn cmp(&self, other: &Self) -> std::cmp::Ordering {
        other.key.cmp(&self.key).then(self.point.cmp(&other.point))
    }
}

/// What a share of the points gave.
struct Share {
    limit: Option<usize>,
    /// A max-heap by [`Best`]'s order: its top is the least bad kept (the first to go).
    kept: BinaryHeap<Best>,
    /// Per group: its worst point, its points and those at or beyond.
    groups: std::collections::HashMap<u32, (Best, u64, u64)>,
    points: u64,
    counts: ConditionCounts,
    at_or_beyond: u64,
    governs: Vec<u64>,
}

impl Share {
    fn new(limit: Option<usize>, combinations: usize) -> Self {
        Self {
            limit,
            kept: BinaryHeap::new(),
            groups: std::collections::HashMap::new(),
            points: 0,
            counts: ConditionCounts::default(),
            at_or_beyond: 0,
            governs: vec![0; combinations],
        }
    }

    fn keep(&mut self, best: Best) {
        match self.limit {
            Some(0) => {}
            Some(n) if self.kept.len() >= n => {
                if let Some(mut top) = self.kept.peek_mut()
                    && best < *top
                {
                    *top = best;
                }
            }
            _ => self.kept.push(best),
        }
    }

    fn group(&mut self, g: u32, best: Best, beyond: bool) {
        let e = self.groups.entry(g).or_insert((best, 0, 0));
        e.1 += 1;
        e.2 += u64::from(beyond);
        if best < e.0 {
            e.0 = best;
        }
    }

    fn merge(mut self, other: Self) -> Self {
        for b in other.kept {
            self.keep(b);
        }
        for (g, (best, n, beyond)) in other.groups {
            let e = self.groups.entry(g).or_insert((best, 0, 0));
            e.1 += n;
            e.2 += beyond;
            if best < e.0 {
                e.0 = best;
            }
        }
        self.points += other.points;
        self.counts.merge(&other.counts);
        self.at_or_beyond += other.at_or_beyond;
        for (a, b) in self.governs.iter_mut().zip(other.governs) {
            *a += b;
        }
        self
    }
}

/// The tensor of combination `comb` at point `p`.
#[must_use]
pub fn combined(points: &Points, comb: &PointCombination, p: usize) -> [f64; 6] {
    let mut sum = [0.0; 6];
    for (c, &f) in comb.factors.iter().enumerate() {
        if f == 0.0 {
            continue;
        }
        let t = points.tensor(c, p);
        for (s, v) in sum.iter_mut().zip(t) {
            *s += f * v;
        }
    }
    sum
}

/// The governing combination at point `p`: its index and rank key (the earlier combination
/// among equals).
fn govern(
    points: &Points,
    combinations: &[PointCombination],
    measure: &Measure<'_>,
    p: usize,
) -> Result<(usize, RankKey, Condition), TableError> {
    let mut best: Option<(usize, RankKey, Condition)> = None;
    for (k, comb) in combinations.iter().enumerate() {
        let tensor = state(points, comb, p)?;
        let v = measure
            .evaluate(&tensor)
            .map_err(|e| TableError::Measure(e.to_string()))?;
        let key = measure.key(&v);
        if best.as_ref().is_none_or(|(_, b, _)| key > *b) {
            best = Some((k, key, v.standing()));
        }
    }
    best.ok_or_else(|| TableError::Measure("no combinations to apply".to_owned()))
}

/// Combination `comb`'s state at point `p`.
fn state(points: &Points, comb: &PointCombination, p: usize) -> Result<StressTensor, TableError> {
    StressTensor::from_pa(combined(points, comb, p)).map_err(|e| TableError::Join {
        place: comb.name.clone(),
        message: format!("{}: {e}", points.id_text(p)),
    })
}

/// The row of point `p` under combination `k`: its state evaluated again (for the planes).
pub fn point_row(
    points: &Points,
    combinations: &[PointCombination],
    measure: &Measure<'_>,
    p: usize,
    k: usize,
) -> Result<PointRow, TableError> {
    let tensor = state(points, &combinations[k], p)?;
    let v = measure
        .evaluate(&tensor)
        .map_err(|e| TableError::Measure(e.to_string()))?;
    let mut row = Row {
        line: p as u64 + 1,
        carried: points.ids(p),
        tensor,
        value: None,
        standing: Condition::Undefined,
        plane: None,
    };
    row.take(&v);
    Ok(PointRow {
        combination: k,
        group: points.group(p).map(|(_, g)| g.to_owned()),
        row,
    })
}

/// Ranks the points of `points` by their governing combination's value under `measure`:
/// `options.top` keeps the N worst (or groups, with a group column), `options.above` those at
/// or beyond the value. Points left out (unmatched) are not ranked. In parallel over points.
pub fn rank_points(
    points: &Points,
    combinations: Vec<PointCombination>,
    options: &TableOptions,
    measure: &Measure<'_>,
) -> Result<RankedPoints, TableError> {
    let threshold = options
        .above
        .map(|v| RankKey::threshold(measure.measure, v));
    let grouped = points.group_column.is_some();
    let limit = if grouped { None } else { options.top };
    let n = points.len();
    let share = (0..n)
        .into_par_iter()
        .with_min_len(1024)
        .try_fold(
            || Share::new(limit, combinations.len()),
            |mut share, p| {
                if points.left_out(p) {
                    return Ok(share);
                }
                let (k, key, standing) = govern(points, &combinations, measure, p)?;
                let best = Best {
                    key,
                    point: u32::try_from(p).unwrap_or(u32::MAX),
                    combination: u32::try_from(k).unwrap_or(u32::MAX),
                };
                share.points += 1;
                share.counts.add(standing);
                share.governs[k] += 1;
                let beyond = threshold.as_ref().is_some_and(|t| key.at_or_beyond(t));
                share.at_or_beyond += u64::from(beyond);
                if let Some((g, _)) = points.group(p) {
                    share.group(g, best, beyond);
                } else if threshold.is_none() || beyond {
                    share.keep(best);
                }
                Ok::<_, TableError>(share)
            },
        )
        .try_reduce(
            || Share::new(limit, combinations.len()),
            |a, b| Ok(a.merge(b)),
        )?;
    let row_of = |b: &Best| {
        point_row(
            points,
            &combinations,
            measure,
            b.point as usize,
            b.combination as usize,
        )
    };
    let rows = share
        .kept
        .into_sorted_vec()
        .iter()
        .map(row_of)
        .collect::<Result<Vec<_>, _>>()?;
    let mut groups: Vec<(u32, (Best, u64, u64))> = share.groups.into_iter().collect();
    groups.sort_by_key(|g| g.1.0);
    if let Some(n) = options.top {
        groups.truncate(n);
    }
    let groups = groups
        .iter()
        .map(|(g, (best, n, beyond))| {
            Ok(PointGroup {
                name: points.group_names()[*g as usize].clone(),
                points: *n,
                at_or_beyond: *beyond,
                worst: row_of(best)?,
            })
        })
        .collect::<Result<Vec<_>, TableError>>()?;
    Ok(RankedPoints {
        combinations,
        rows,
        points: share.points,
        counts: share.counts,
        at_or_beyond: share.at_or_beyond,
        governs: share.governs,
        groups,
    })
}

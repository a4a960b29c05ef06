//! Ranking a table: the file read in blocks cut at line ends, the parts parsed in parallel, each
//! row judged by the one ranking rule and kept in a bounded heap (the top N, or the rows at or
//! beyond a threshold), or every row's place for a full ranking.

use std::collections::{BinaryHeap, HashMap};
use std::io::Read;

use super::read::{read_row, skipped, split};
use super::stream::{Parsed, note_bad, stream};
use super::{BadRow, Group, Header, Measure, Place, Ranked, Row, TableError, TableOptions};
use crate::study::envelope::{ConditionCounts, RankKey};

/// A row in the heap, ordered by its key then by line (earlier first among equals).
pub(super) struct Keyed {
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
pub(super) struct Kept {
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

/// A group so far: its worst row, its rows and those at or beyond the threshold.
pub(super) struct GroupSoFar {
    worst: Keyed,
    rows: u64,
    at_or_beyond: u64,
}

/// Adds `item` (a row of group `name`, at or beyond the threshold or not) to `groups`.
fn add_to_group(groups: &mut HashMap<String, GroupSoFar>, name: &str, item: Keyed, beyond: bool) {
    let beyond = u64::from(beyond);
    match groups.get_mut(name) {
        Some(g) => {
            g.rows += 1;
            g.at_or_beyond += beyond;
            // Keyed's order is reversed: a smaller one goes first (is worse).
            if item < g.worst {
                g.worst = item;
            }
        }
        None => {
            groups.insert(
                name.to_owned(),
                GroupSoFar {
                    worst: item,
                    rows: 1,
                    at_or_beyond: beyond,
                },
            );
        }
    }
}

/// Merges the groups of a later part into `into`.
fn merge_groups(into: &mut HashMap<String, GroupSoFar>, from: HashMap<String, GroupSoFar>) {
    for (name, g) in from {
        match into.get_mut(&name) {
            Some(h) => {
                h.rows += g.rows;
                h.at_or_beyond += g.at_or_beyond;
                if g.worst < h.worst {
                    h.worst = g.worst;
                }
            }
            None => {
                into.insert(name, g);
            }
        }
    }
}

/// What one part of a block gave.
pub(super) struct Part {
    kept: Kept,
    groups: HashMap<String, GroupSoFar>,
    rows: u64,
    counts: ConditionCounts,
    at_or_beyond: u64,
}

/// Parses the lines of `bytes` (whole lines), the first being line `first_line` at byte
/// `base` of the file.
pub(super) fn parse_part(
    bytes: &[u8],
    first_line: u64,
    base: u64,
    header: &Header,
    options: &TableOptions,
    measure: &Measure<'_>,
) -> Result<Parsed<Part>, String> {
    let mut part = Parsed {
        value: Part {
            kept: Kept::new(options.top),
            groups: HashMap::new(),
            rows: 0,
            counts: ConditionCounts::default(),
            at_or_beyond: 0,
        },
        bad: Vec::new(),
        bad_count: 0,
    };
    let threshold = options
        .above
        .map(|v| RankKey::threshold(measure.measure, v));
    let mut fields = Vec::new();
    // The group column's place among the carried texts of a row.
    let group_slot = header
        .group
        .and_then(|g| header.carried.iter().position(|&c| c == g));
    let by_place = options.by_place && options.top.is_none() && group_slot.is_none();
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
        let p = &mut part.value;
        match result {
            Ok(mut row) => {
                let evaluated = measure.evaluate(&row.tensor).map_err(|e| e.to_string())?;
                let key = measure.key(&evaluated);
                row.take(&evaluated);
                p.rows += 1;
                p.counts.add(row.standing);
                if let Some(slot) = group_slot {
                    let beyond = threshold.as_ref().is_some_and(|t| key.at_or_beyond(t));
                    p.at_or_beyond += u64::from(beyond);
                    let name = row.carried.get(slot).cloned().unwrap_or_default();
                    add_to_group(&mut p.groups, &name, Keyed { key, row }, beyond);
                    continue;
                }
                if let Some(t) = &threshold {
                    if !key.at_or_beyond(t) {
                        continue;
                    }
                    p.at_or_beyond += 1;
                }
                if by_place {
                    p.kept.places.push(Place {
                        key,
                        line: number,
                        offset,
                        len,
                    });
                } else {
                    p.kept.push(Keyed { key, row });
                }
            }
            Err(bad) => {
                if !note_bad(&mut part, bad, options) {
                    break;
                }
            }
        }
    }
    Ok(part)
}

/// Ranks the table read from `source` (named `file` in messages). `progress` is told the bytes
/// read so far and returns `false` to stop (then [`TableError::Cancelled`]).
pub fn rank(
    source: impl Read,
    file: &str,
    options: &TableOptions,
    measure: &Measure<'_>,
    progress: impl FnMut(u64) -> bool,
) -> Result<Ranked, TableError> {
    let mut kept = Kept::new(options.top);
    let mut groups: HashMap<String, GroupSoFar> = HashMap::new();
    let (mut total_rows, mut at_or_beyond) = (0u64, 0u64);
    let mut counts = ConditionCounts::default();
    let streamed = stream(
        source,
        file,
        options,
        Ok,
        progress,
        |bytes, first, at, h| parse_part(bytes, first, at, h, options, measure),
        |part| {
            total_rows += part.rows;
            at_or_beyond += part.at_or_beyond;
            counts.merge(&part.counts);
            kept.merge(part.kept);
            merge_groups(&mut groups, part.groups);
            Ok(())
        },
    )?;
    let (rows, places) = kept.into_ranked();
    // The groups worst first (their worst rows' order), the top N of them with a limit.
    let mut groups: Vec<(String, GroupSoFar)> = groups.into_iter().collect();
    groups.sort_by(|a, b| a.1.worst.cmp(&b.1.worst).then_with(|| a.0.cmp(&b.0)));
    if let Some(n) = options.top {
        groups.truncate(n);
    }
    let groups = groups
        .into_iter()
        .map(|(name, g)| Group {
            name,
            rows: g.rows,
            at_or_beyond: g.at_or_beyond,
            worst: g.worst.row,
        })
        .collect();
    Ok(Ranked {
        header: streamed.header,
        rows,
        places,
        total_rows,
        bad_count: streamed.bad_count,
        bad: streamed.bad,
        counts,
        at_or_beyond,
        unterminated: streamed.unterminated,
        groups,
    })
}

//! Ranking a table: the file read in blocks cut at line ends, the parts parsed in parallel, each
//! row judged by the one ranking rule and kept in a bounded heap (the top N, or the rows at or
//! beyond a threshold), or every row's place for a full ranking.

use std::collections::{BinaryHeap, HashMap};
use std::io::Read;

use rayon::prelude::*;

use super::read::{header, read_row, skipped, split};
use super::{
    BadRow, Group, Header, KEEP_BAD, Measure, Place, Ranked, Row, TableError, TableOptions,
};
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
    bad: Vec<BadRow>,
    bad_count: u64,
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
) -> Result<Part, String> {
    let mut part = Part {
        kept: Kept::new(options.top),
        groups: HashMap::new(),
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
        match result {
            Ok(mut row) => {
                let evaluated = measure.evaluate(&row.tensor).map_err(|e| e.to_string())?;
                let key = measure.key(&evaluated);
                row.take(&evaluated);
                part.rows += 1;
                part.counts.add(row.standing);
                if let Some(slot) = group_slot {
                    let beyond = threshold.as_ref().is_some_and(|t| key.at_or_beyond(t));
                    part.at_or_beyond += u64::from(beyond);
                    let name = row.carried.get(slot).cloned().unwrap_or_default();
                    add_to_group(&mut part.groups, &name, Keyed { key, row }, beyond);
                    continue;
                }
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
pub(super) const BLOCK: usize = 8 << 20;

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
    let mut groups: HashMap<String, GroupSoFar> = HashMap::new();
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
            merge_groups(&mut groups, part.groups);
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
        header,
        rows,
        places,
        total_rows,
        bad_count,
        bad,
        counts,
        at_or_beyond,
        unterminated,
        groups,
    })
}

//! The block reader every table reading shares: the source read in blocks cut at line ends, the
//! header found (after a byte-order mark, comments and blank lines), each block's lines cut into
//! parts of about equal size and parsed in parallel, the parts' outcomes merged in file order,
//! and bad rows gathered (the first ones kept, a stop at the first unless they are skipped).

use std::io::Read;

use rayon::prelude::*;

use super::read::{header, skipped};
use super::{BadRow, Header, KEEP_BAD, TableError, TableOptions};

/// What one part of a block gave: the reader's own outcome and the part's bad rows.
pub(super) struct Parsed<P> {
    /// What the part's good rows gave.
    pub value: P,
    /// Its first bad rows (at most [`KEEP_BAD`]).
    pub bad: Vec<BadRow>,
    /// How many bad rows it had.
    pub bad_count: u64,
}

/// What the stream saw besides the parts' outcomes.
pub(super) struct Streamed<H> {
    /// What `on_header` made of the header.
    pub header: H,
    /// The first bad rows, by line (at most [`KEEP_BAD`]).
    pub bad: Vec<BadRow>,
    /// Bad rows skipped.
    pub bad_count: u64,
    /// The last line has no line end.
    pub unterminated: bool,
}

/// Bytes read per block.
pub(super) const BLOCK: usize = 8 << 20;

/// Reads the table from `source` (named `file` in messages): `on_header` checks the header and
/// makes what the parts need of it; `parse` reads the lines of one part (whole lines, the
/// first being line `first_line` at byte `base` of the file) in parallel; `merge` takes the
/// parts' outcomes in file order. `progress` is told the bytes read so far and returns
/// `false` to stop (then [`TableError::Cancelled`]).
pub(super) fn stream<H: Sync, P: Send>(
    mut source: impl Read,
    file: &str,
    options: &TableOptions,
    mut on_header: impl FnMut(Header) -> Result<H, TableError>,
    mut progress: impl FnMut(u64) -> bool,
    parse: impl Fn(&[u8], u64, u64, &H) -> Result<Parsed<P>, String> + Sync,
    mut merge: impl FnMut(P) -> Result<(), TableError>,
) -> Result<Streamed<H>, TableError> {
    let io = |cause| TableError::Io {
        file: file.to_owned(),
        cause,
    };
    let mut buffer: Vec<u8> = Vec::with_capacity(BLOCK + 4096);
    let mut read_total = 0u64;
    // Bytes of the source before the buffer's first byte.
    let mut drained = 0u64;
    let mut next_line = 1u64;
    let mut header_found: Option<H> = None;
    let mut bad_count = 0u64;
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
                    header_found = Some(on_header(header(line, number, options, file)?)?);
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
        let results: Vec<Result<Parsed<P>, String>> = parts
            .par_iter()
            .map(|(bytes, first, at)| parse(bytes, *first, *at, h))
            .collect();
        for r in results {
            let part = r.map_err(TableError::Measure)?;
            bad_count += part.bad_count;
            bad.extend(part.bad);
            merge(part.value)?;
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
    Ok(Streamed {
        header,
        bad,
        bad_count,
        unterminated,
    })
}

/// Keeps `bad` among a part's first bad rows; says whether to go on.
pub(super) fn note_bad<P>(part: &mut Parsed<P>, bad: BadRow, options: &TableOptions) -> bool {
    part.bad_count += 1;
    if part.bad.len() < KEEP_BAD {
        part.bad.push(bad);
    }
    options.skip_bad_rows
}

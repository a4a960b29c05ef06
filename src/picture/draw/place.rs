//! Label placement: text boxes measured without a font engine, and a greedy pass that puts
//! each label at the first of a few candidate positions around its point that covers no other
//! text and crosses as few strokes as it can, with a leader line back to the point when the
//! label had to move away from it. The 3D view, the Mohr diagram, the orientation map and the
//! user's notes all place their labels through [`Placer`], so window and exports agree.

use super::frame::{Anchor, Frame, Pos, Prim};
pub use crate::picture::scene::Pinned;
use crate::picture::scene::style::Rgba;

/// An axis-aligned rectangle in pixels.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Rect {
    /// Top-left corner.
    pub min: Pos,
    /// Bottom-right corner.
    pub max: Pos,
}

impl Rect {
    /// Whether the two rectangles share some area (touching edges do not count).
    #[must_use]
    pub fn overlaps(&self, other: &Rect) -> bool {
        self.min[0] < other.max[0]
            && other.min[0] < self.max[0]
            && self.min[1] < other.max[1]
            && other.min[1] < self.max[1]
    }

    /// Whether `p` is inside.
    #[must_use]
    pub fn contains(&self, p: Pos) -> bool {
        (self.min[0]..=self.max[0]).contains(&p[0]) && (self.min[1]..=self.max[1]).contains(&p[1])
    }

    /// The rectangle grown by `d` pixels on every side.
    #[must_use]
    pub fn grown(&self, d: f32) -> Rect {
        Rect {
            min: [self.min[0] - d, self.min[1] - d],
            max: [self.max[0] + d, self.max[1] + d],
        }
    }

    /// Whether `inner` lies wholly inside.
    #[must_use]
    pub fn holds(&self, inner: &Rect) -> bool {
        self.contains(inner.min) && self.contains(inner.max)
    }

    /// The point of the rectangle nearest to `p`. Total: an empty or non-finite rectangle
    /// gives a point without panicking (`f32::clamp` would).
    #[must_use]
    pub fn nearest(&self, p: Pos) -> Pos {
        [
            p[0].max(self.min[0]).min(self.max[0]),
            p[1].max(self.min[1]).min(self.max[1]),
        ]
    }

    /// Whether the segment from `a` to `b` passes through the rectangle.
    #[must_use]
    pub fn crossed_by(&self, a: Pos, b: Pos) -> bool {
        // Liang–Barsky clipping: the segment a + t (b − a), 0 ≤ t ≤ 1, against four half-planes.
        let d = [b[0] - a[0], b[1] - a[1]];
        let (mut t0, mut t1) = (0.0_f32, 1.0_f32);
        for (p, q) in [
            (-d[0], a[0] - self.min[0]),
            (d[0], self.max[0] - a[0]),
            (-d[1], a[1] - self.min[1]),
            (d[1], self.max[1] - a[1]),
        ] {
            if p == 0.0 {
                if q < 0.0 {
                    return false;
                }
            } else {
                let t = q / p;
                if p < 0.0 {
                    t0 = t0.max(t);
                } else {
                    t1 = t1.min(t);
                }
                if t0 > t1 {
                    return false;
                }
            }
        }
        true
    }
}

/// Advance width of one character in DejaVu Sans, in ems, rounded up by character class (the
/// exports embed DejaVu Sans; the window's proportional font is narrower, so boxes measured
/// this way hold the window's text too). Checked against the font file's own advances in
/// tests/placement.rs.
fn advance_em(c: char) -> f32 {
    match c {
        ' ' | '.' | ',' | ':' | ';' | '\'' | '!' | '|' | 'i' | 'j' | 'l' | 'I' => 0.35,
        '(' | ')' | '[' | ']' | '-' | 't' | 'f' | 'r' => 0.45,
        '0'..='9' | '°' | '/' | '*' => 0.64,
        'm' | 'M' | 'W' | 'w' | '—' | '%' | '@' => 1.0,
        '=' | '+' | '<' | '>' | '±' | '×' | '→' | '←' | '↑' | '↓' | '≥' | '≤' | '−' => {
            0.84
        }
        'A'..='Z' | '▲' | '●' | '■' | '◆' => 0.8,
        _ => 0.66,
    }
}

/// Width in pixels of `text` at font size `size` (no wider than the exported font draws it).
#[must_use]
pub fn text_width(text: &str, size: f32) -> f32 {
    text.chars().map(advance_em).sum::<f32>() * size
}

/// `text` broken at spaces into lines that each fit `width` pixels at font size `size` (a word
/// longer than the width keeps a line of its own).
#[must_use]
pub fn wrap(text: &str, width: f32, size: f32) -> Vec<String> {
    let mut out = Vec::new();
    let mut current = String::new();
    for word in text.split(' ') {
        let candidate = if current.is_empty() {
            word.to_owned()
        } else {
            format!("{current} {word}")
        };
        if !current.is_empty() && text_width(&candidate, size) > width {
            out.push(std::mem::replace(&mut current, word.to_owned()));
        } else {
            current = candidate;
        }
    }
    out.push(current);
    out
}

/// The box `text` takes when drawn at `at` with `anchor` at font size `size`: the advance
/// width by the line's height (1.2 em, centred on the middle line).
#[must_use]
pub fn text_rect(at: Pos, text: &str, size: f32, anchor: Anchor) -> Rect {
    let w = text_width(text, size);
    let half = 0.6 * size;
    let left = match anchor {
        Anchor::LeftCenter => at[0],
        Anchor::RightCenter => at[0] - w,
        Anchor::Center => at[0] - 0.5 * w,
    };
    Rect {
        min: [left, at[1] - half],
        max: [left + w, at[1] + half],
    }
}

/// The text of a text primitive that shows something.
fn text_of(prim: &Prim) -> Option<&str> {
    match prim {
        Prim::Text { text, .. } if !text.trim().is_empty() => Some(text),
        _ => None,
    }
}

/// The box of a text primitive that shows something.
fn prim_text_rect(prim: &Prim) -> Option<Rect> {
    match prim {
        Prim::Text {
            at,
            text,
            size,
            anchor,
            ..
        } if !text.trim().is_empty() => Some(text_rect(*at, text, *size, *anchor)),
        _ => None,
    }
}

/// The boxes of every text of `frame`, in drawing order.
#[must_use]
pub fn text_boxes(frame: &Frame) -> Vec<(String, Rect)> {
    frame
        .prims
        .iter()
        .filter_map(|p| Some((text_of(p)?.to_owned(), prim_text_rect(p)?)))
        .collect()
}

/// The pairs of texts of `frame` whose boxes overlap (the label-placement check of the tests).
#[must_use]
pub fn overlapping_texts(frame: &Frame) -> Vec<(String, String)> {
    let boxes = text_boxes(frame);
    let mut out = Vec::new();
    for (i, (a, ra)) in boxes.iter().enumerate() {
        for (b, rb) in &boxes[i + 1..] {
            if ra.overlaps(rb) {
                out.push((a.clone(), b.clone()));
            }
        }
    }
    out
}

/// A label to place near a point.
#[derive(Clone, Debug, PartialEq)]
pub struct Label {
    /// The point the label is about.
    pub point: Pos,
    /// Distance in pixels from the point to the nearest edge of the text at its first choice.
    pub gap: f32,
    /// Text.
    pub text: String,
    /// Font size, pixels.
    pub size: f32,
    /// Colour (also of the leader line).
    pub color: Rgba,
    /// The direction tried first, as a screen vector (x right, y down); zero for "right".
    pub prefer: [f32; 2],
}

/// Where a label went.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Placed {
    /// Text position.
    pub at: Pos,
    /// Text anchor.
    pub anchor: Anchor,
    /// The text's box.
    pub rect: Rect,
    /// The leader line from the point to the box, when the label moved away from its point.
    pub leader: Option<(Pos, Pos)>,
}

/// One of the strokes a label should not cross, with its bounding box for a quick test.
#[derive(Clone, Copy, Debug)]
struct Stroke {
    a: Pos,
    b: Pos,
    bounds: Rect,
    /// What crossing it costs: more for thick strokes (arrows) than thin ones (edges, grid).
    weight: f32,
}

/// Eight directions around a point, as unit screen vectors, starting at "right" and turning
/// clockwise on screen.
const DIRECTIONS: [[f32; 2]; 8] = [
    [1.0, 0.0],
    [0.707, 0.707],
    [0.0, 1.0],
    [-0.707, 0.707],
    [-1.0, 0.0],
    [-0.707, -0.707],
    [0.0, -1.0],
    [0.707, -0.707],
];

/// Rings of candidate distances, as multiples of a label's gap plus a multiple of its size.
const RINGS: [(f32, f32); 4] = [(1.0, 0.0), (1.0, 1.6), (1.0, 3.4), (1.0, 6.0)];

/// The greedy placement pass: what is already taken (text boxes and strokes) and the area the
/// labels must stay inside.
#[derive(Clone, Debug)]
pub struct Placer {
    taken: Vec<Rect>,
    strokes: Vec<Stroke>,
    /// The strokes by grid cell ([`CELL`] pixels square), so a candidate looks only at the
    /// strokes near it (a frame with every layer on holds a few thousand).
    grid: Vec<Vec<u32>>,
    columns: usize,
    rows: usize,
    /// Per stroke, the last query that counted it (so a stroke in several cells counts once).
    seen: Vec<u32>,
    /// The number of the current query (stamps equal to it were counted already).
    query: u32,
    bounds: Rect,
    /// The picture's line-width multiplier ([`super::frame::Sizes::line`]).
    scale: f32,
}

/// Side of a grid cell of the stroke index, pixels.
const CELL: f32 = 32.0;

impl Placer {
    /// A placer for a picture of `frame`'s size, drawn with line widths scaled by `scale`, that
    /// keeps clear of the texts already in it and avoids crossing its lines and small polygons
    /// (arrowheads, markers).
    #[must_use]
    pub fn new(frame: &Frame, scale: f32) -> Self {
        let columns = (frame.width / CELL).ceil().max(1.0) as usize;
        let rows = (frame.height / CELL).ceil().max(1.0) as usize;
        let mut placer = Self {
            scale: scale.max(0.1),
            taken: Vec::new(),
            strokes: Vec::new(),
            grid: vec![Vec::new(); columns * rows],
            columns,
            rows,
            seen: Vec::new(),
            query: 0,
            bounds: Rect {
                min: [0.0, 0.0],
                max: [frame.width, frame.height],
            },
        };
        placer.avoid(&frame.prims);
        placer
    }

    /// Keeps clear of `prims` too (texts are never covered; lines and small polygons are
    /// crossed only when no candidate avoids them).
    pub fn avoid(&mut self, prims: &[Prim]) {
        for prim in prims {
            if let Some(rect) = prim_text_rect(prim) {
                self.taken.push(rect);
            }
            match prim {
                Prim::Line { a, b, width, .. } => self.add_stroke(*a, *b, *width),
                // Opaque small polygons are arrowheads and markers; translucent fills (the
                // ellipsoid's triangles, faces) are backgrounds labels may sit on.
                Prim::Polygon {
                    points,
                    fill,
                    outline,
                } if points.len() <= 20 && (fill.a == 255 || outline.is_some()) => {
                    // Arrowheads and markers weigh like thick strokes.
                    for (i, a) in points.iter().enumerate() {
                        self.add_stroke(*a, points[(i + 1) % points.len()], 3.0 * self.scale);
                    }
                }
                _ => {}
            }
        }
    }

    /// Keeps labels off `rect` (a legend or key drawn later).
    pub fn reserve(&mut self, rect: Rect) {
        self.taken.push(rect);
    }

    fn add_stroke(&mut self, a: Pos, b: Pos, width: f32) {
        let bounds = Rect {
            min: [a[0].min(b[0]), a[1].min(b[1])],
            max: [a[0].max(b[0]), a[1].max(b[1])],
        };
        let index = self.strokes.len() as u32;
        self.strokes.push(Stroke {
            a,
            b,
            bounds,
            weight: 0.5 * width / self.scale,
        });
        let ([c0, r0], [c1, r1]) = self.cells(&bounds);
        for r in r0..=r1 {
            for c in c0..=c1 {
                self.grid[r * self.columns + c].push(index);
            }
        }
    }

    /// The first and last grid cell (column, row) a rectangle touches, clamped to the grid.
    fn cells(&self, rect: &Rect) -> ([usize; 2], [usize; 2]) {
        let cell = |v: f32, n: usize| ((v / CELL).floor().max(0.0) as usize).min(n - 1);
        (
            [
                cell(rect.min[0], self.columns),
                cell(rect.min[1], self.rows),
            ],
            [
                cell(rect.max[0], self.columns),
                cell(rect.max[1], self.rows),
            ],
        )
    }

    /// What covering `rect` would cost: other text dearest, then leaving the picture, then
    /// each stroke crossed.
    fn cost(&mut self, rect: &Rect) -> f32 {
        let padded = rect.grown(1.0);
        let texts = self.taken.iter().filter(|t| t.overlaps(&padded)).count() as f32;
        let outside = if self.bounds.holds(rect) { 0.0 } else { 1.0 };
        let mut crossed = 0.0;
        self.seen.resize(self.strokes.len(), 0);
        self.query += 1;
        let query = self.query;
        let ([c0, r0], [c1, r1]) = self.cells(&rect.grown(0.5));
        for r in r0..=r1 {
            for c in c0..=c1 {
                for &i in &self.grid[r * self.columns + c] {
                    let stamp = &mut self.seen[i as usize];
                    if *stamp == query {
                        continue;
                    }
                    *stamp = query;
                    let s = &self.strokes[i as usize];
                    if s.bounds.grown(0.5).overlaps(rect) && rect.crossed_by(s.a, s.b) {
                        crossed += s.weight;
                    }
                }
            }
        }
        1.0e4 * texts + 1.0e3 * outside + crossed
    }

    /// The best free position for `label` (the first candidate of least cost, nearer rings and
    /// the preferred direction first), remembered as taken. Nothing is drawn.
    pub fn place(&mut self, label: &Label) -> Placed {
        let pref = if label.prefer[0].hypot(label.prefer[1]) > 1e-6 {
            label.prefer
        } else {
            [1.0, 0.0]
        };
        // Directions sorted by how close they are to the preferred one.
        let mut dirs = DIRECTIONS;
        dirs.sort_by(|a, b| {
            let da = a[0] * pref[0] + a[1] * pref[1];
            let db = b[0] * pref[0] + b[1] * pref[1];
            db.total_cmp(&da)
        });
        let mut best: Option<(f32, Placed)> = None;
        for (ring, &(k_gap, k_size)) in RINGS.iter().enumerate() {
            let reach = k_gap * label.gap + k_size * label.size;
            for (turn, d) in dirs.iter().enumerate() {
                let placed = candidate(label, *d, reach, ring > 0);
                // Nearer rings and directions nearer the preferred one win ties.
                let cost = self.cost(&placed.rect) + 1.2 * ring as f32 + 0.01 * turn as f32;
                if best.as_ref().is_none_or(|(c, _)| cost < *c) {
                    best = Some((cost, placed));
                }
            }
            // Nothing nearer can beat what this ring found.
            if best
                .as_ref()
                .is_some_and(|(c, _)| *c < 1.2 * (ring + 1) as f32)
            {
                break;
            }
        }
        let (_, placed) = best.unwrap_or_else(|| (0.0, candidate(label, pref, label.gap, false)));
        self.taken.push(placed.rect);
        if let Some((a, b)) = placed.leader {
            self.add_stroke(a, b, self.scale);
        }
        placed
    }

    /// Places `label` and draws it into `prims`: its leader line (thin, in the label's colour)
    /// and the text with a halo.
    pub fn draw(&mut self, prims: &mut Vec<Prim>, label: &Label, line_width: f32) -> Placed {
        let placed = self.place(label);
        if let Some((a, b)) = placed.leader {
            prims.push(Prim::Line {
                a,
                b,
                width: line_width,
                color: label.color.with_alpha(200),
            });
        }
        prims.push(Prim::Text {
            at: placed.at,
            text: label.text.clone(),
            size: label.size,
            color: label.color,
            anchor: placed.anchor,
            halo: true,
        });
        placed
    }
}

/// Places `labels` in order around everything already in `frame` and draws them on top.
pub fn place_all(frame: &mut Frame, labels: &[Label], line_width: f32) {
    let mut placer = Placer::new(frame, line_width);
    let mut placed = Vec::new();
    for label in labels {
        placer.draw(&mut placed, label, line_width);
    }
    frame.prims.append(&mut placed);
}

/// Notes' colour: a dark violet no data mark uses.
pub const NOTE: Rgba = Rgba::rgb(88, 40, 130);

impl Pinned<Pos> {
    /// Where its text starts (the left end of its middle line) at text size `size`.
    #[must_use]
    pub fn text_at(&self, size: f32) -> Pos {
        [
            self.pin[0] + self.offset[0] * size,
            self.pin[1] + self.offset[1] * size,
        ]
    }

    /// Its text's box at text size `size` (what a pointer grabs to move it).
    #[must_use]
    pub fn rect(&self, size: f32) -> Rect {
        text_rect(
            self.text_at(size),
            &self.one_line(),
            size,
            Anchor::LeftCenter,
        )
    }

    /// The same note with its offset changed as little as needed for its text to lie inside a
    /// `width` × `height` picture (a note dragged or pinned near an edge stays readable).
    #[must_use]
    pub fn inside(&self, width: f32, height: f32, size: f32) -> Self {
        let rect = self.rect(size);
        let shift = |lo: f32, hi: f32, limit: f32| {
            if hi - lo > limit || lo < 0.0 {
                -lo
            } else if hi > limit {
                limit - hi
            } else {
                0.0
            }
        };
        let dx = shift(rect.min[0], rect.max[0], width);
        let dy = shift(rect.min[1], rect.max[1], height);
        Self {
            pin: self.pin,
            text: self.text.clone(),
            offset: [self.offset[0] + dx / size, self.offset[1] + dy / size],
        }
    }

    fn one_line(&self) -> String {
        self.text.split_whitespace().collect::<Vec<_>>().join(" ")
    }
}

/// Draws `notes` into `frame`: a ring at each pin, a leader to the text when the text sits
/// away from it, and the text with a halo.
pub fn draw_notes(frame: &mut Frame, notes: &[Pinned<Pos>], sizes: super::frame::Sizes) {
    for note in notes {
        // A pin off any finite pixel (a value far outside the picture's scale) is not drawn.
        if !(note.pin.iter().chain(&note.offset).all(|v| v.is_finite())) {
            continue;
        }
        let note = &note.inside(frame.width, frame.height, sizes.text);
        let rect = note.rect(sizes.text);
        let end = rect.nearest(note.pin);
        if (end[0] - note.pin[0]).hypot(end[1] - note.pin[1]) > 0.4 * sizes.text {
            frame.prims.push(Prim::Line {
                a: note.pin,
                b: end,
                width: 1.2 * sizes.line,
                color: NOTE,
            });
        }
        frame.prims.push(Prim::Polygon {
            points: super::frame::regular_polygon(note.pin, 3.5 * sizes.line, 12),
            fill: crate::picture::scene::style::BACKGROUND,
            outline: Some((NOTE, 1.6 * sizes.line)),
        });
        frame.prims.push(Prim::Text {
            at: note.text_at(sizes.text),
            text: note.one_line(),
            size: sizes.text,
            color: NOTE,
            anchor: Anchor::LeftCenter,
            halo: true,
        });
    }
}

/// The label's text placed in direction `d` at `reach` pixels from its point: text that runs
/// away from the point (left-anchored to the right, right-anchored to the left, centred above
/// and below).
fn candidate(label: &Label, d: [f32; 2], reach: f32, leader: bool) -> Placed {
    let p = label.point;
    let anchor = if d[0] > 0.3 {
        Anchor::LeftCenter
    } else if d[0] < -0.3 {
        Anchor::RightCenter
    } else {
        Anchor::Center
    };
    // Above or below, the text's half height is part of the distance.
    let half = 0.6 * label.size;
    let at = [
        p[0] + d[0] * reach,
        p[1] + d[1] * (reach + half * d[1].abs()),
    ];
    let rect = text_rect(at, &label.text, label.size, anchor);
    let leader = leader.then(|| {
        let end = rect.nearest(p);
        (p, end)
    });
    Placed {
        at,
        anchor,
        rect,
        leader,
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn segment_through_a_box_crosses_it_and_one_beside_does_not() {
        let r = Rect {
            min: [0.0, 0.0],
            max: [10.0, 10.0],
        };
        assert!(r.crossed_by([-5.0, 5.0], [15.0, 5.0]));
        assert!(r.crossed_by([2.0, 2.0], [3.0, 3.0]));
        assert!(!r.crossed_by([-5.0, -1.0], [15.0, -1.0]));
        assert!(!r.crossed_by([11.0, -5.0], [30.0, 20.0]));
    }

    #[test]
    fn a_second_label_at_the_same_point_moves_off_the_first() {
        let frame = Frame {
            width: 400.0,
            height: 300.0,
            background: crate::picture::scene::style::BACKGROUND,
            prims: Vec::new(),
        };
        let mut placer = Placer::new(&frame, 1.0);
        let label = Label {
            point: [200.0, 150.0],
            gap: 6.0,
            text: "σxx = 120 MPa".into(),
            size: 13.0,
            color: crate::picture::scene::style::INK,
            prefer: [1.0, 0.0],
        };
        let a = placer.place(&label);
        let b = placer.place(&label);
        assert!(!a.rect.overlaps(&b.rect));
        assert_eq!(a.anchor, Anchor::LeftCenter);
        assert!(a.leader.is_none());
    }
}

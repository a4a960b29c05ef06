//! Amplitude and mean of a shear path τ(t) drawn in a plane's own 2-D axes.
//!
//! - The minimum circumscribed circle (the smallest circle holding every point of the path):
//!   amplitude = its radius, mean = its centre (Papadopoulos et al. 1997; Bernasconi &
//!   Papadopoulos 2005, who compare it with the other path methods). Found by Welzl's
//!   incremental algorithm (Welzl 1991, "Smallest enclosing disks (balls and ellipsoids)"), run
//!   over the points in a fixed pseudo-random order so the answer and its cost do not depend on
//!   how the history is sampled in time.
//! - The longest chord: amplitude = half the largest distance between two points of the path,
//!   mean = the chord's midpoint. It can under-estimate the circle's radius on non-harmonic
//!   paths (by up to 1 − √3/2 ≈ 13 % on an equilateral triangle: chord = side, circle radius =
//!   side/√3, so chord/2 ÷ radius = √3/2 — derived, no published value).

/// A circle in a plane's 2-D axes.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Circle {
    /// Centre (the shear mean on the plane).
    pub centre: [f64; 2],
    /// Radius (the shear amplitude).
    pub radius: f64,
}

impl Circle {
    /// The centre as a searched plane resolves it: the critical plane is found to about 0.01°,
    /// so a component below 1e-5 of the path's size (radius plus the centre's distance from
    /// the origin) is the search's resolution, not a result, and is 0.
    #[must_use]
    pub fn centre_resolved(&self) -> [f64; 2] {
        let size = self.radius + self.centre[0].hypot(self.centre[1]);
        self.centre
            .map(|x| if x.abs() < 1e-5 * size { 0.0 } else { x })
    }
}

/// How the shear amplitude of a path is measured.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, serde::Serialize, serde::Deserialize)]
#[serde(rename_all = "kebab-case")]
pub enum PathMethod {
    /// Minimum circumscribed circle (the default).
    Circle,
    /// Longest chord.
    Chord,
}

impl PathMethod {
    /// The command-line and file key.
    #[must_use]
    pub fn key(self) -> &'static str {
        match self {
            Self::Circle => "circle",
            Self::Chord => "chord",
        }
    }

    /// What a person reads.
    #[must_use]
    pub fn label(self) -> &'static str {
        match self {
            Self::Circle => "minimum circumscribed circle (radius = amplitude, centre = mean)",
            Self::Chord => "longest chord (half its length = amplitude, midpoint = mean)",
        }
    }

    /// The method of a key.
    #[must_use]
    pub fn from_key(key: &str) -> Option<Self> {
        [Self::Circle, Self::Chord]
            .into_iter()
            .find(|m| m.key() == key)
    }

    /// The amplitude circle of `points` by this method.
    #[must_use]
    pub fn circle(self, points: &[[f64; 2]]) -> Circle {
        match self {
            Self::Circle => enclosing_circle(points),
            Self::Chord => longest_chord(points),
        }
    }
}

fn dist(a: [f64; 2], b: [f64; 2]) -> f64 {
    (a[0] - b[0]).hypot(a[1] - b[1])
}

fn two(a: [f64; 2], b: [f64; 2]) -> Circle {
    Circle {
        centre: [0.5 * (a[0] + b[0]), 0.5 * (a[1] + b[1])],
        radius: 0.5 * dist(a, b),
    }
}

/// The circle through three points; for (nearly) collinear points the circle on the farthest
/// pair, which then holds the third.
fn three(a: [f64; 2], b: [f64; 2], c: [f64; 2]) -> Circle {
    let (bx, by) = (b[0] - a[0], b[1] - a[1]);
    let (cx, cy) = (c[0] - a[0], c[1] - a[1]);
    let d = 2.0 * (bx * cy - by * cx);
    let scale = (bx * bx + by * by).max(cx * cx + cy * cy);
    if d.abs() <= 1e-12 * scale {
        let pairs = [two(a, b), two(a, c), two(b, c)];
        return pairs
            .into_iter()
            .max_by(|p, q| p.radius.total_cmp(&q.radius))
            .unwrap_or(pairs[0]);
    }
    let b2 = bx * bx + by * by;
    let c2 = cx * cx + cy * cy;
    let ux = (cy * b2 - by * c2) / d;
    let uy = (bx * c2 - cx * b2) / d;
    Circle {
        centre: [a[0] + ux, a[1] + uy],
        radius: ux.hypot(uy),
    }
}

fn holds(c: &Circle, p: [f64; 2], slack: f64) -> bool {
    dist(c.centre, p) <= c.radius + slack
}

/// A fixed permutation of `0..n` (xorshift, seeded by `n`): the same path always gives the
/// same order, and a path sampled in time order loses its worst case for Welzl's method.
fn shuffled(n: usize) -> Vec<usize> {
    let mut order: Vec<usize> = (0..n).collect();
    let mut state = 0x9E37_79B9_7F4A_7C15_u64 ^ n as u64;
    for i in (1..n).rev() {
        state ^= state << 13;
        state ^= state >> 7;
        state ^= state << 17;
        let j = (state % (i as u64 + 1)) as usize;
        order.swap(i, j);
    }
    order
}

/// The smallest circle holding every point (radius 0 for one point; centre at the origin and
/// radius 0 for none).
#[must_use]
pub fn enclosing_circle(points: &[[f64; 2]]) -> Circle {
    if points.is_empty() {
        return Circle {
            centre: [0.0, 0.0],
            radius: 0.0,
        };
    }
    let size = points
        .iter()
        .map(|p| p[0].abs().max(p[1].abs()))
        .fold(0.0_f64, f64::max);
    // Round-off slack: a point this close to the circle is on it.
    let slack = 1e-12 * size;
    let order = shuffled(points.len());
    let p = |i: usize| points[order[i]];
    let mut c = Circle {
        centre: p(0),
        radius: 0.0,
    };
    for i in 1..points.len() {
        if holds(&c, p(i), slack) {
            continue;
        }
        c = Circle {
            centre: p(i),
            radius: 0.0,
        };
        for j in 0..i {
            if holds(&c, p(j), slack) {
                continue;
            }
            c = two(p(i), p(j));
            for k in 0..j {
                if !holds(&c, p(k), slack) {
                    c = three(p(i), p(j), p(k));
                }
            }
        }
    }
    c
}

/// Convex hull (Andrew's monotone chain), counter-clockwise, without repeated points.
fn hull(points: &[[f64; 2]]) -> Vec<[f64; 2]> {
    let mut pts: Vec<[f64; 2]> = points.to_vec();
    pts.sort_by(|a, b| a[0].total_cmp(&b[0]).then(a[1].total_cmp(&b[1])));
    pts.dedup();
    if pts.len() < 3 {
        return pts;
    }
    let cross = |o: [f64; 2], a: [f64; 2], b: [f64; 2]| {
        (a[0] - o[0]) * (b[1] - o[1]) - (a[1] - o[1]) * (b[0] - o[0])
    };
    let mut out: Vec<[f64; 2]> = Vec::with_capacity(2 * pts.len());
    for pass in [pts.clone(), pts.iter().rev().copied().collect()] {
        let start = out.len();
        for p in pass {
            while out.len() >= start + 2 && cross(out[out.len() - 2], out[out.len() - 1], p) <= 0.0
            {
                out.pop();
            }
            out.push(p);
        }
        out.pop();
    }
    out
}

/// The circle on the longest chord of the path (both ends of the path's diameter on it): the
/// farthest pair of the convex hull by rotating calipers (Shamos 1978), O(n log n) for the hull
/// and O(h) for the pairs.
#[must_use]
pub fn longest_chord(points: &[[f64; 2]]) -> Circle {
    let h = hull(points);
    let mut best = Circle {
        centre: points.first().copied().unwrap_or([0.0, 0.0]),
        radius: 0.0,
    };
    let m = h.len();
    if m < 3 {
        if m == 2 {
            best = two(h[0], h[1]);
        }
        return best;
    }
    // Few corners: every pair (exact and cheap).
    if m <= 32 {
        for (i, &a) in h.iter().enumerate() {
            for &b in &h[i + 1..] {
                let c = two(a, b);
                if c.radius > best.radius {
                    best = c;
                }
            }
        }
        return best;
    }
    // A hull of nearly collinear points (a proportional path with round-off) can zigzag by
    // round-off, which the calipers cannot walk: its farthest pair is the extreme pair along
    // its length.
    let (first, last) = (h[0], h[m / 2]);
    let shoelace: f64 = (0..m)
        .map(|i| {
            let (a, b) = (h[i], h[(i + 1) % m]);
            a[0] * b[1] - a[1] * b[0]
        })
        .sum();
    let extent = dist(first, last).max(h.iter().map(|p| dist(first, *p)).fold(0.0_f64, f64::max));
    if shoelace.abs() <= 1e-9 * extent * extent {
        let far = h
            .iter()
            .copied()
            .max_by(|p, q| dist(first, *p).total_cmp(&dist(first, *q)))
            .unwrap_or(first);
        let d = [far[0] - first[0], far[1] - first[1]];
        let along = |p: &[f64; 2]| (p[0] - first[0]) * d[0] + (p[1] - first[1]) * d[1];
        let lo = h
            .iter()
            .copied()
            .min_by(|p, q| along(p).total_cmp(&along(q)))
            .unwrap_or(first);
        let hi = h
            .iter()
            .copied()
            .max_by(|p, q| along(p).total_cmp(&along(q)))
            .unwrap_or(far);
        return two(lo, hi);
    }
    // Twice the area of the triangle (a, b, c).
    let area = |a: [f64; 2], b: [f64; 2], c: [f64; 2]| {
        ((b[0] - a[0]) * (c[1] - a[1]) - (b[1] - a[1]) * (c[0] - a[0])).abs()
    };
    let mut j = 1;
    for i in 0..m {
        let next = (i + 1) % m;
        // Advance the antipodal point while it gets farther from the edge (i, next).
        while area(h[i], h[next], h[(j + 1) % m]) > area(h[i], h[next], h[j]) {
            j = (j + 1) % m;
        }
        for c in [two(h[i], h[j]), two(h[next], h[j])] {
            if c.radius > best.radius {
                best = c;
            }
        }
    }
    best
}

/// The longest chord by trying every pair (for tests of [`longest_chord`]).
#[cfg(test)]
fn longest_chord_by_pairs(points: &[[f64; 2]]) -> Circle {
    let mut best = two(points[0], points[0]);
    for (i, &a) in points.iter().enumerate() {
        for &b in &points[i + 1..] {
            let c = two(a, b);
            if c.radius > best.radius {
                best = c;
            }
        }
    }
    best
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_segment_and_a_circle_path() {
        // Proportional shear ±5 along one axis: amplitude 5, mean 0 by both methods.
        let seg: Vec<[f64; 2]> = (0..50)
            .map(|i| [5.0 * (f64::from(i) * 0.3).sin(), 0.0])
            .collect();
        let hi = seg.iter().map(|p| p[0]).fold(f64::NEG_INFINITY, f64::max);
        let lo = seg.iter().map(|p| p[0]).fold(f64::INFINITY, f64::min);
        for m in [PathMethod::Circle, PathMethod::Chord] {
            let c = m.circle(&seg);
            assert!((c.radius - 0.5 * (hi - lo)).abs() < 1e-12, "{m:?} {c:?}");
            assert!((c.centre[0] - 0.5 * (hi + lo)).abs() < 1e-12 && c.centre[1] == 0.0);
        }
        // A circular path of radius 3 about (1, 2): both give radius 3 and that centre.
        let ring: Vec<[f64; 2]> = (0..360)
            .map(|i| {
                let a = f64::from(i).to_radians();
                [1.0 + 3.0 * a.cos(), 2.0 + 3.0 * a.sin()]
            })
            .collect();
        for m in [PathMethod::Circle, PathMethod::Chord] {
            let c = m.circle(&ring);
            assert!((c.radius - 3.0).abs() < 1e-9, "{m:?} {c:?}");
            assert!((c.centre[0] - 1.0).abs() < 1e-9 && (c.centre[1] - 2.0).abs() < 1e-9);
        }
    }

    #[test]
    fn a_proportional_path_with_round_off_has_its_whole_length_as_chord() {
        // A segment through the origin along (0.5, 0.866), sampled as a sine with the
        // round-off a projection leaves: the chord is the segment, as the circle is.
        let pts: Vec<[f64; 2]> = (0..=360)
            .map(|i| {
                let s = f64::from(i).to_radians().sin() * 3.4e7;
                [s * 0.087_f64.cos() * 0.5, s * 0.866_025_403_784_438_6]
            })
            .collect();
        let chord = longest_chord(&pts);
        let pairs = longest_chord_by_pairs(&pts);
        let circle = enclosing_circle(&pts);
        assert!(
            (chord.radius - pairs.radius).abs() < 1e-6,
            "{chord:?} {pairs:?}"
        );
        assert!(
            (chord.radius - circle.radius).abs() < 1e-6,
            "{chord:?} {circle:?}"
        );
    }

    #[test]
    fn triangle_path_circle_and_chord_differ_by_root3_over_2() {
        // Equilateral triangle of side 2 traced edge by edge: circumradius 2/√3, chord/2 = 1
        // (derived, no published value).
        let corners = [[0.0, 0.0], [2.0, 0.0], [1.0, 3f64.sqrt()]];
        let mut path = Vec::new();
        for e in 0..3 {
            let (a, b) = (corners[e], corners[(e + 1) % 3]);
            for k in 0..20 {
                let t = f64::from(k) / 20.0;
                path.push([a[0] + t * (b[0] - a[0]), a[1] + t * (b[1] - a[1])]);
            }
        }
        let circle = enclosing_circle(&path);
        let chord = longest_chord(&path);
        assert!((circle.radius - 2.0 / 3f64.sqrt()).abs() < 1e-12);
        assert!((chord.radius - 1.0).abs() < 1e-12);
        assert!((chord.radius / circle.radius - 3f64.sqrt() / 2.0).abs() < 1e-12);
    }

    #[test]
    fn the_circle_holds_every_point_and_touches_two() {
        let mut state = 7_u64;
        let mut rnd = || {
            state = state
                .wrapping_mul(6_364_136_223_846_793_005)
                .wrapping_add(1);
            (state >> 11) as f64 / (1u64 << 53) as f64 - 0.5
        };
        for n in [1, 2, 3, 10, 200] {
            let pts: Vec<[f64; 2]> = (0..n).map(|_| [rnd(), 2.0 * rnd()]).collect();
            let c = enclosing_circle(&pts);
            let on = pts
                .iter()
                .filter(|p| (dist(c.centre, **p) - c.radius).abs() < 1e-9)
                .count();
            assert!(pts.iter().all(|p| dist(c.centre, *p) <= c.radius + 1e-9));
            assert!(on >= n.min(2), "n {n}: {on} on the circle");
            let chord = longest_chord(&pts);
            let pairs = longest_chord_by_pairs(&pts);
            assert!(
                (chord.radius - pairs.radius).abs() < 1e-15,
                "n {n}: {chord:?} vs {pairs:?}"
            );
            // No smaller circle about a nearby centre holds them all (a local check of
            // minimality; the global one is Welzl's proof).
            for d in [[1e-4, 0.0], [0.0, 1e-4], [-1e-4, 0.0], [0.0, -1e-4]] {
                let moved = [c.centre[0] + d[0], c.centre[1] + d[1]];
                let r = pts.iter().map(|p| dist(moved, *p)).fold(0.0, f64::max);
                assert!(r >= c.radius - 1e-12);
            }
        }
    }
}

//! Geometry the scene is built from: the cube, the cut polygon, the traction field's normals,
//! the ellipsoid's mesh, the components' names.

use nalgebra::{Point3, Vector3};

use super::TriMesh;
use super::style::Rgba;

/// `count` unit vectors spread evenly over the sphere (the golden-angle spiral: equal areas in
/// z, turning by the golden angle).
#[must_use]
pub fn field_normals(count: usize) -> Vec<Vector3<f64>> {
    let golden = std::f64::consts::PI * (3.0 - 5.0_f64.sqrt());
    (0..count)
        .map(|i| {
            let z = 1.0 - (2.0 * i as f64 + 1.0) / count as f64;
            let r = (1.0 - z * z).max(0.0).sqrt();
            let a = golden * i as f64;
            Vector3::new(r * a.cos(), r * a.sin(), z)
        })
        .collect()
}

/// The name of the stress component acting on face `i` in direction `j` (σxx, τxy, …).
#[must_use]
pub fn component_name(i: usize, j: usize) -> String {
    let axis = ['x', 'y', 'z'];
    if i == j {
        format!("σ{}{}", axis[i], axis[i])
    } else {
        format!("τ{}{}", axis[i], axis[j])
    }
}

/// The cube's eight corners.
pub(super) fn cube_corners() -> [Point3<f64>; 8] {
    std::array::from_fn(|i| {
        let s = |bit: usize| if i & bit == 0 { -0.5 } else { 0.5 };
        Point3::new(s(1), s(2), s(4))
    })
}

/// The cube's twelve edges as pairs of corner indices (corners differing in one bit).
pub(super) fn cube_edges() -> Vec<(usize, usize)> {
    let mut edges = Vec::with_capacity(12);
    for a in 0..8usize {
        for bit in [1usize, 2, 4] {
            if a & bit == 0 {
                edges.push((a, a | bit));
            }
        }
    }
    edges
}

/// The polygon where the plane through the origin with unit normal `n` cuts the cube
/// [−½, ½]³, in order around `n`. Always a convex polygon of 4 to 6 vertices.
#[must_use]
pub fn cut_polygon(n: &Vector3<f64>) -> Vec<Point3<f64>> {
    let corners = cube_corners();
    let mut points: Vec<Point3<f64>> = Vec::with_capacity(6);
    for (a, b) in cube_edges() {
        let (pa, pb) = (corners[a], corners[b]);
        let (da, db) = (n.dot(&pa.coords), n.dot(&pb.coords));
        // Include an edge end lying exactly on the plane once, from the edge where it is `a`.
        if da == 0.0 {
            if !points.iter().any(|p| (p - pa).norm() < 1e-12) {
                points.push(pa);
            }
            continue;
        }
        if da * db < 0.0 {
            let t = da / (da - db);
            let p = pa + (pb - pa) * t;
            if !points.iter().any(|q| (q - p).norm() < 1e-12) {
                points.push(p);
            }
        }
    }
    // A corner on the plane that is only ever a `b` end.
    for c in corners {
        if n.dot(&c.coords) == 0.0 && !points.iter().any(|p| (p - c).norm() < 1e-12) {
            points.push(c);
        }
    }
    let (u, v) = crate::mechanics::principal::orthogonal_complement(n);
    points.sort_by(|p, q| {
        let ap = v.dot(&p.coords).atan2(u.dot(&p.coords));
        let aq = v.dot(&q.coords).atan2(u.dot(&q.coords));
        ap.total_cmp(&aq)
    });
    points
}

/// A unit-sphere mesh mapped through x ↦ Σ aᵢ (eᵢ·x) dᵢ: the ellipsoid with semi-axes `a` along
/// unit directions `d`.
pub(super) fn ellipsoid_mesh(
    semi_axes: [f64; 3],
    directions: [Vector3<f64>; 3],
    color: Rgba,
) -> TriMesh {
    const RINGS: u32 = 14;
    const SEGMENTS: u32 = 28;
    let mut mesh = TriMesh {
        color,
        ..TriMesh::default()
    };
    for ring in 0..=RINGS {
        let polar = std::f64::consts::PI * f64::from(ring) / f64::from(RINGS);
        for seg in 0..SEGMENTS {
            let azimuth = std::f64::consts::TAU * f64::from(seg) / f64::from(SEGMENTS);
            let unit = [
                polar.sin() * azimuth.cos(),
                polar.sin() * azimuth.sin(),
                polar.cos(),
            ];
            let p = directions[0] * (semi_axes[0] * unit[0])
                + directions[1] * (semi_axes[1] * unit[1])
                + directions[2] * (semi_axes[2] * unit[2]);
            mesh.vertices.push(Point3::from(p));
        }
    }
    for ring in 0..RINGS {
        for seg in 0..SEGMENTS {
            let next = (seg + 1) % SEGMENTS;
            let (a, b) = (ring * SEGMENTS + seg, ring * SEGMENTS + next);
            let (c, d) = (a + SEGMENTS, b + SEGMENTS);
            mesh.triangles.push([a, c, b]);
            mesh.triangles.push([b, c, d]);
        }
    }
    mesh
}

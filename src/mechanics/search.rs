//! The worst plane for a chosen measure: the orientation of the plane through the point on
//! which the measure is largest, with every distinct plane that attains it.
//!
//! Every measure here is a function of the plane's normal and shear stress only. In the
//! principal frame a unit normal has direction cosines (x, y, z), and with squared cosines
//! a = x², b = y², c = z² (a + b + c = 1):
//!
//! σn = σ1 a + σ2 b + σ3 c,  τ² = (σ1 − σ2)² ab + (σ2 − σ3)² bc + (σ1 − σ3)² ac
//!
//! (e.g. Jaeger, Cook & Zimmerman, Fundamentals of Rock Mechanics, 4th ed., §2.7; the τ² form
//! avoids the cancellation of |t|² − σn²). So the search runs over the triangle of (a, c), which
//! is one octant of the hemisphere of normals; the other octants hold the sign-flipped planes
//! (±x, ±y, ±z), which carry the same (σn, τ) and are reported as symmetric equivalents.
//! Closed forms are used where they exist; otherwise a coarse sweep of the triangle is refined
//! from its best points by a projected compass search.

use nalgebra::Vector3;
use serde::{Deserialize, Serialize};

use super::analysis::Analysis;
use super::criteria::{CriterionError, MohrCoulomb};
use super::plane::{PlaneNormal, PlaneStress};
use super::tensor::StressTensor;
use super::units::SignConvention;

/// What makes a plane "worst".
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, Serialize, Deserialize)]
#[serde(rename_all = "kebab-case")]
pub enum Measure {
    /// Shear stress τ (closed form: normals (n1 ± n3)/√2).
    Shear,
    /// Largest normal stress, in the chosen sign convention (closed form: n1).
    NormalMax,
    /// Smallest normal stress, in the chosen sign convention (closed form: n3). Its value is
    /// the normal stress itself; the worst plane is where it is smallest.
    NormalMin,
    /// Traction magnitude |t| (closed form: the principal direction of largest |σi|).
    Traction,
    /// Slip tendency τ / (σn − p), compression positive (Morris et al. 1996).
    SlipTendency,
    /// Dilation tendency (σ1 − σn)/(σ1 − σ3), compression positive (Ferrill et al. 1999;
    /// closed form: the least compressive principal direction).
    DilationTendency,
    /// Mohr–Coulomb utilization τ / (c + (σn − p) tan φ), compression positive.
    MohrCoulomb,
}

impl Measure {
    /// All measures, in menu order.
    pub const ALL: [Self; 7] = [
        Self::Shear,
        Self::NormalMax,
        Self::NormalMin,
        Self::Traction,
        Self::SlipTendency,
        Self::DilationTendency,
        Self::MohrCoulomb,
    ];

    /// The command-line and JSON key.
    #[must_use]
    pub fn key(self) -> &'static str {
        match self {
            Self::Shear => "shear",
            Self::NormalMax => "normal-max",
            Self::NormalMin => "normal-min",
            Self::Traction => "traction",
            Self::SlipTendency => "slip-tendency",
            Self::DilationTendency => "dilation-tendency",
            Self::MohrCoulomb => "mohr-coulomb",
        }
    }

    /// The name a person reads (the key stays for the command line and files).
    #[must_use]
    pub fn label(self) -> &'static str {
        match self {
            Self::Shear => "shear stress τ",
            Self::NormalMax => "normal stress σn, largest",
            Self::NormalMin => "normal stress σn, smallest",
            Self::Traction => "traction |t|",
            Self::SlipTendency => "slip tendency",
            Self::DilationTendency => "dilation tendency",
            Self::MohrCoulomb => "Mohr–Coulomb utilization of planes",
        }
    }

    /// Parses a key.
    #[must_use]
    pub fn from_key(key: &str) -> Option<Self> {
        Self::ALL.into_iter().find(|m| m.key() == key.trim())
    }

    /// Whether the value is a stress (in the display unit) rather than a ratio.
    #[must_use]
    pub fn is_stress(self) -> bool {
        matches!(
            self,
            Self::Shear | Self::NormalMax | Self::NormalMin | Self::Traction
        )
    }

    /// Whether the worst plane is where the measure is smallest (normal-min) rather than largest.
    #[must_use]
    pub fn worst_is_smallest(self) -> bool {
        self == Self::NormalMin
    }

    /// Whether the measure uses a cohesion and a friction angle.
    #[must_use]
    pub fn uses_material(self) -> bool {
        self == Self::MohrCoulomb
    }

    /// Whether the measure is frictional: it uses the effective normal stress σn − p (so the pore
    /// pressure), and a plane can be without frictional capacity (the only case in which the
    /// measure is undefined on some planes but not others).
    #[must_use]
    pub fn uses_friction(self) -> bool {
        matches!(self, Self::SlipTendency | Self::MohrCoulomb)
    }

    /// The convention the measure's formula uses: the geomechanics measures are always
    /// compression positive; normal-max and normal-min follow the chosen display convention.
    fn convention(self, display: SignConvention) -> SignConvention {
        match self {
            Self::SlipTendency | Self::DilationTendency | Self::MohrCoulomb => {
                SignConvention::CompressionPositive
            }
            _ => display,
        }
    }
}

/// Parameters of a search.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct SearchSettings {
    /// The measure.
    pub measure: Measure,
    /// Display convention (normal-max / normal-min, and the stresses reported).
    pub convention: SignConvention,
    /// Pore pressure p, Pa (compression positive; slip tendency and Mohr–Coulomb).
    pub pore_pressure_pa: f64,
    /// Cohesion and friction angle (required for Mohr–Coulomb).
    pub material: Option<MohrCoulomb>,
}

impl SearchSettings {
    /// `measure` shown in `convention`, with no pore pressure and no material.
    #[must_use]
    pub fn plain(measure: Measure, convention: SignConvention) -> Self {
        Self {
            measure,
            convention,
            pore_pressure_pa: 0.0,
            material: None,
        }
    }
}

/// Why a search cannot run.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum SearchError {
    /// Mohr–Coulomb needs cohesion and friction angle.
    #[error("the mohr-coulomb measure needs a cohesion and a friction angle")]
    MissingMaterial,
    /// Bad criterion parameters.
    #[error(transparent)]
    Criterion(#[from] CriterionError),
}

/// One plane that attains the worst value.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct WorstPlane {
    /// Unit normal (the sign with a non-negative z, so that dip reads naturally).
    pub normal: PlaneNormal,
    /// Dip, degrees.
    pub dip_deg: f64,
    /// Dip direction, degrees clockwise from north.
    pub dip_direction_deg: f64,
    /// Normal stress on the plane, Pa, in the display convention.
    pub normal_stress_pa: f64,
    /// Shear stress on the plane, Pa.
    pub shear_stress_pa: f64,
}

/// How the worst planes of a search are to be read.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "kebab-case")]
pub enum WorstCondition {
    /// The value is attained on the listed planes (a finite set).
    Defined,
    /// Some planes have zero or tensile effective normal stress (no frictional capacity): they
    /// are worst of all; the one with the least effective normal stress (normal to the least
    /// compressive principal stress) is listed, and the value is undefined.
    EffectiveTension,
    /// The measure is undefined for this state (dilation tendency when σ1 = σ3).
    Undefined,
    /// Every plane carries the same normal and shear stress (a hydrostatic state): one
    /// representative plane is listed.
    EveryPlane,
    /// Two principal values are equal, and the worst planes form a cone: every plane whose
    /// normal makes [`Cone::half_angle_deg`] with [`Cone::axis`]. Representative planes are
    /// listed.
    Cone,
}

/// A cone of plane normals: every normal at `half_angle_deg` from `axis` (90° is the great
/// circle of normals perpendicular to the axis).
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Cone {
    /// Unit axis (the principal direction of the distinct principal value), with z ≥ 0.
    pub axis: Vector3<f64>,
    /// Angle between every worst normal and the axis, degrees, in (0°, 90°].
    pub half_angle_deg: f64,
}

/// The outcome of a search.
#[derive(Clone, Debug, PartialEq)]
pub struct SearchResult {
    /// The measure.
    pub measure: Measure,
    /// The worst value: the measure itself (Pa for stress measures, else dimensionless; for
    /// normal-min the smallest normal stress). `None` when some plane has no frictional
    /// capacity left or the measure is undefined (see `condition`).
    pub value: Option<f64>,
    /// How to read `planes` (see [`WorstCondition`]).
    pub condition: WorstCondition,
    /// With [`WorstCondition::Cone`], the cone of worst normals.
    pub cone: Option<Cone>,
    /// The distinct planes that attain the value, symmetric equivalents included; for a cone or
    /// every plane, representatives.
    pub planes: Vec<WorstPlane>,
}

impl SearchResult {
    /// The normals of the worst planes.
    #[must_use]
    pub fn normals(&self) -> Vec<PlaneNormal> {
        self.planes.iter().map(|p| p.normal).collect()
    }
}

/// Principal values and directions in the measure's convention and the constants of its
/// formula: the measure as a function of a plane's orientation.
#[derive(Clone, Copy, Debug)]
pub struct Objective {
    measure: Measure,
    s: [f64; 3],
    /// Deviatoric principal values (differences of principal values come from these).
    d: [f64; 3],
    directions: [Vector3<f64>; 3],
    pore_pa: f64,
    cohesion_pa: f64,
    tan_phi: f64,
}

impl Objective {
    /// The objective for `tensor` and `settings`.
    #[must_use]
    pub fn new(tensor: &StressTensor, settings: &SearchSettings) -> Self {
        let convention = settings.measure.convention(settings.convention);
        let principal = Analysis::new(tensor, convention).principal;
        let (cohesion_pa, tan_phi) = settings.material.map_or((0.0, 0.0), |m| {
            (m.cohesion_pa, m.friction_angle_deg.to_radians().tan())
        });
        Self {
            measure: settings.measure,
            s: principal.values_pa,
            d: principal.deviatoric_pa,
            directions: principal.directions,
            pore_pa: settings.pore_pressure_pa,
            cohesion_pa,
            tan_phi,
        }
    }

    /// The measure on the plane with unit normal `n` (either sign): the value itself (for
    /// normal-min, the normal stress), `None` where it is undefined.
    #[must_use]
    pub fn at_normal(&self, n: &Vector3<f64>) -> Option<f64> {
        let [l, m, k] = self.directions.map(|d| n.dot(&d));
        self.value(l * l, m * m, k * k)
    }

    /// The measure at squared direction cosines (a, b, c), or `None` for a plane without
    /// frictional capacity.
    fn value(&self, a: f64, b: f64, c: f64) -> Option<f64> {
        let [s1, s2, s3] = self.s;
        let [d1, d2, d3] = self.d;
        let sn = s1 * a + s2 * b + s3 * c;
        // Differences from the deviatoric values keep their digits under a large mean stress.
        let tau2 =
            (d1 - d2).powi(2) * a * b + (d2 - d3).powi(2) * b * c + (d1 - d3).powi(2) * a * c;
        let tau = tau2.max(0.0).sqrt();
        match self.measure {
            Measure::Shear => Some(tau),
            Measure::NormalMax | Measure::NormalMin => Some(sn),
            Measure::Traction => Some((s1 * s1 * a + s2 * s2 * b + s3 * s3 * c).max(0.0).sqrt()),
            Measure::SlipTendency => {
                let eff = sn - self.pore_pa;
                (eff > 0.0).then(|| tau / eff)
            }
            Measure::DilationTendency => {
                let dn = d1 * a + d2 * b + d3 * c;
                (d1 > d3).then(|| (d1 - dn) / (d1 - d3))
            }
            Measure::MohrCoulomb => {
                let capacity = self.cohesion_pa + (sn - self.pore_pa) * self.tan_phi;
                (capacity > 0.0).then(|| tau / capacity)
            }
        }
    }

    /// A value turned into a rank: larger is worse (normal-min is worst where smallest).
    fn rank(&self, value: f64) -> f64 {
        if self.measure.worst_is_smallest() {
            -value
        } else {
            value
        }
    }

    /// The rank of the plane at (a, c) for the search: planes without capacity rank above every
    /// defined value.
    fn score(&self, a: f64, c: f64) -> f64 {
        let b = (1.0 - a - c).max(0.0);
        self.value(a, b, c).map_or(f64::INFINITY, |v| self.rank(v))
    }
}

/// Projects (a, c) onto the triangle a ≥ 0, c ≥ 0, a + c ≤ 1 (Euclidean projection).
fn project(a: f64, c: f64) -> (f64, f64) {
    let (mut a, mut c) = (a.max(0.0), c.max(0.0));
    let excess = a + c - 1.0;
    if excess > 0.0 {
        a -= excess / 2.0;
        c -= excess / 2.0;
        if a < 0.0 {
            (0.0, 1.0)
        } else if c < 0.0 {
            (1.0, 0.0)
        } else {
            (a, c)
        }
    } else {
        (a, c)
    }
}

/// Grid divisions of the triangle's sides in the coarse sweep.
const SWEEP: usize = 48;
/// Starting points refined after the sweep.
const STARTS: usize = 8;

/// Coarse sweep then projected compass search from the best grid points.
fn numerical_candidates(obj: &Objective) -> Vec<(f64, f64)> {
    let h = 1.0 / SWEEP as f64;
    let mut grid: Vec<(f64, f64, f64)> = Vec::with_capacity((SWEEP + 1) * (SWEEP + 2) / 2);
    for i in 0..=SWEEP {
        for k in 0..=(SWEEP - i) {
            let (a, c) = (i as f64 * h, k as f64 * h);
            grid.push((obj.score(a, c), a, c));
        }
    }
    grid.sort_by(|x, y| y.0.total_cmp(&x.0));
    // Starts: the best points, at least two grid steps apart, so separate basins each get one.
    let mut starts: Vec<(f64, f64)> = Vec::with_capacity(STARTS);
    for &(_, a, c) in &grid {
        if starts
            .iter()
            .all(|&(sa, sc)| (sa - a).abs() + (sc - c).abs() > 2.5 * h)
        {
            starts.push((a, c));
            if starts.len() == STARTS {
                break;
            }
        }
    }
    starts
        .into_iter()
        .map(|(mut a, mut c)| {
            let mut best = obj.score(a, c);
            let mut step = h;
            while step > 1e-15 {
                let mut moved = false;
                for (da, dc) in [
                    (1.0, 0.0),
                    (-1.0, 0.0),
                    (0.0, 1.0),
                    (0.0, -1.0),
                    (1.0, -1.0),
                    (-1.0, 1.0),
                ] {
                    let (na, nc) = project(a + da * step, c + dc * step);
                    let v = obj.score(na, nc);
                    if v > best {
                        (a, c, best) = (na, nc, v);
                        moved = true;
                        break;
                    }
                }
                if !moved {
                    step *= 0.5;
                }
            }
            (a, c)
        })
        .collect()
}

/// The best value the numerical search alone finds (no closed form, no capacity check): for
/// checking the closed forms against the search. `None` when the best point has no capacity.
#[must_use]
pub fn numerical_value(tensor: &StressTensor, settings: &SearchSettings) -> Option<f64> {
    let obj = Objective::new(tensor, settings);
    numerical_candidates(&obj)
        .into_iter()
        .filter_map(|(a, c)| obj.value(a, (1.0 - a - c).max(0.0), c))
        .max_by(|x, y| obj.rank(*x).total_cmp(&obj.rank(*y)))
}

/// Which principal values the measure cannot tell apart: the measure depends on σ1..σ3 only
/// through these keys (the traction magnitude through σi², the others through σi).
fn symmetry(obj: &Objective, scale: f64) -> Symmetry {
    let keys = if obj.measure == Measure::Traction {
        obj.s.map(|v| v * v)
    } else {
        obj.d
    };
    let key_scale = if obj.measure == Measure::Traction {
        scale * scale
    } else {
        scale
    };
    let tie =
        |i: usize, j: usize| (keys[i] - keys[j]).abs() <= 1e-12 * key_scale.max(f64::MIN_POSITIVE);
    match (tie(0, 1), tie(1, 2), tie(0, 2)) {
        (true, true, _) | (_, true, true) | (true, _, true) => Symmetry::Full,
        (true, false, false) => Symmetry::Axis(2),
        (false, true, false) => Symmetry::Axis(0),
        (false, false, true) => Symmetry::Axis(1),
        (false, false, false) => Symmetry::None,
    }
}

/// See [`symmetry`].
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
enum Symmetry {
    /// Every principal value alike: every plane is the same.
    Full,
    /// The two values other than this index are alike: the measure depends only on the squared
    /// cosine between the normal and this principal direction.
    Axis(usize),
    /// No two alike.
    None,
}

/// Runs the search for `tensor` (stored, tension positive).
pub fn worst_plane(
    tensor: &StressTensor,
    settings: &SearchSettings,
) -> Result<SearchResult, SearchError> {
    if !settings.pore_pressure_pa.is_finite() {
        return Err(CriterionError::PorePressure.into());
    }
    if settings.measure == Measure::MohrCoulomb && settings.material.is_none() {
        return Err(SearchError::MissingMaterial);
    }
    let obj = Objective::new(tensor, settings);
    let s = obj.s;
    let (cohesion_pa, tan_phi) = (obj.cohesion_pa, obj.tan_phi);
    let scale = s[0].abs().max(s[2].abs());
    let symmetry = symmetry(&obj, scale);

    // Planes without frictional capacity: the least compressive plane (σn = σ3) has the least
    // effective normal stress, so it is the first to lose its capacity.
    let no_capacity = match settings.measure {
        Measure::SlipTendency => s[2] - settings.pore_pressure_pa <= 0.0,
        Measure::MohrCoulomb => cohesion_pa + (s[2] - settings.pore_pressure_pa) * tan_phi <= 0.0,
        _ => false,
    };
    let plane = |n: PlaneNormal| {
        let ps = PlaneStress::new(tensor, n, settings.convention);
        let (dip_deg, dip_direction_deg) = n.dip_deg();
        WorstPlane {
            normal: n,
            dip_deg,
            dip_direction_deg,
            normal_stress_pa: ps.normal_stress_pa,
            shear_stress_pa: ps.shear_stress_pa,
        }
    };
    if symmetry == Symmetry::Full {
        // Every plane carries the same (σn, τ): one representative, the horizontal plane.
        let value = obj.value(1.0, 0.0, 0.0);
        let (value, condition) = if no_capacity {
            (None, WorstCondition::EffectiveTension)
        } else if value.is_none() {
            (None, WorstCondition::Undefined)
        } else {
            (value, WorstCondition::EveryPlane)
        };
        let planes = if condition == WorstCondition::Undefined {
            Vec::new()
        } else {
            vec![plane(PlaneNormal::Z)]
        };
        return Ok(SearchResult {
            measure: settings.measure,
            value,
            condition,
            cone: None,
            planes,
        });
    }
    let candidates: Vec<(f64, f64)> = if no_capacity {
        vec![(0.0, 1.0)]
    } else {
        match settings.measure {
            Measure::Shear => vec![(0.5, 0.5)],
            Measure::NormalMax => vec![(1.0, 0.0)],
            Measure::NormalMin | Measure::DilationTendency => vec![(0.0, 1.0)],
            Measure::Traction => {
                if s[0].abs() >= s[2].abs() {
                    vec![(1.0, 0.0)]
                } else {
                    vec![(0.0, 1.0)]
                }
            }
            Measure::SlipTendency | Measure::MohrCoulomb => numerical_candidates(&obj),
        }
    };
    let value = if no_capacity {
        None
    } else {
        candidates
            .iter()
            .filter_map(|&(a, c)| obj.value(a, (1.0 - a - c).max(0.0), c))
            .max_by(|x, y| obj.rank(*x).total_cmp(&obj.rank(*y)))
    };
    let best = value.map_or(f64::INFINITY, |v| obj.rank(v));
    let tolerance =
        1e-9 * best.abs().max(if settings.measure.is_stress() {
            scale
        } else {
            1.0
        }) + 1e-300;
    let attaining: Vec<(f64, f64, f64)> = candidates
        .into_iter()
        .map(|(a, c)| (a, (1.0 - a - c).max(0.0), c))
        .filter(|&(a, b, c)| {
            no_capacity
                || obj
                    .value(a, b, c)
                    .is_some_and(|v| obj.rank(v) >= best - tolerance)
        })
        .collect();
    // With two alike principal values the measure depends only on the squared cosine q between
    // the normal and the distinct axis, so a worst plane with q < 1 is one of a whole cone.
    let cone = match (symmetry, attaining.first()) {
        (Symmetry::Axis(k), Some(&(a, b, c))) if !no_capacity => {
            let q = [a, b, c][k].clamp(0.0, 1.0);
            (q < 1.0 - 1e-9).then(|| {
                let axis = obj.directions[k];
                Cone {
                    axis: if axis.z < 0.0 { -axis } else { axis },
                    half_angle_deg: q.sqrt().acos().to_degrees(),
                }
            })
        }
        _ => None,
    };
    let representatives = if cone.is_some() {
        &attaining[..1]
    } else {
        &attaining[..]
    };
    let mut planes: Vec<WorstPlane> = Vec::new();
    for &(a, b, c) in representatives {
        for n in sign_equivalents(a, b, c, &obj.directions) {
            if planes
                .iter()
                .any(|p| p.normal.vector().dot(&n).abs() > 1.0 - 1e-12)
            {
                continue;
            }
            let Ok(normal) = PlaneNormal::from_vector(if n.z < 0.0 { -n } else { n }) else {
                continue;
            };
            planes.push(plane(normal));
        }
    }
    let condition = if no_capacity {
        WorstCondition::EffectiveTension
    } else if value.is_none() {
        WorstCondition::Undefined
    } else if cone.is_some() {
        WorstCondition::Cone
    } else {
        WorstCondition::Defined
    };
    Ok(SearchResult {
        measure: settings.measure,
        value,
        condition,
        cone,
        planes,
    })
}

/// Unit normals on `cone`, `count` of them evenly round it (for drawing its poles).
#[must_use]
pub fn cone_normals(cone: &Cone, count: usize) -> Vec<Vector3<f64>> {
    let (u, v) = super::principal::orthogonal_complement(&cone.axis);
    let (sin_h, cos_h) = cone.half_angle_deg.to_radians().sin_cos();
    (0..count)
        .map(|i| {
            let t = std::f64::consts::TAU * i as f64 / count as f64;
            cone.axis * cos_h + (u * t.cos() + v * t.sin()) * sin_h
        })
        .collect()
}

/// The normals (x d1 + y d2 + z d3) with x = ±√a, y = ±√b, z = ±√c: every sign choice, one per
/// plane (n and −n are the same plane).
fn sign_equivalents(a: f64, b: f64, c: f64, d: &[Vector3<f64>; 3]) -> Vec<Vector3<f64>> {
    let (x, y, z) = (a.max(0.0).sqrt(), b.max(0.0).sqrt(), c.max(0.0).sqrt());
    let mut out = Vec::with_capacity(4);
    for (sy, sz) in [(1.0, 1.0), (1.0, -1.0), (-1.0, 1.0), (-1.0, -1.0)] {
        let n = d[0] * x + d[1] * (sy * y) + d[2] * (sz * z);
        if let Some(n) = n.try_normalize(1e-300)
            && !out
                .iter()
                .any(|m: &Vector3<f64>| m.dot(&n).abs() > 1.0 - 1e-12)
        {
            out.push(n);
        }
    }
    out
}

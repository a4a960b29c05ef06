//! One builder per figure — the 3D view, the orientation map, the Mohr circles — from the state
//! and the view options to a [`Frame`]. The window's tabs, its export and Copy figure, and the
//! `figure`, `map` and `mohr` subcommands all draw through these, so the same project and
//! options give the same picture and the same titles everywhere.

use crate::mechanics::mohr::MohrCircles;
use crate::mechanics::search::{Measure, SearchResult, SearchSettings};
use crate::mechanics::stereonet::orientation_map;
use crate::mechanics::{Analysis, PlaneNormal, SignConvention, StressTensor, StressUnit};
use crate::picture::draw::Frame;
use crate::picture::draw::camera::Camera;
use crate::picture::draw::map::{MapMarks, MapMeasure, map_frame};
use crate::picture::draw::mohr::{
    Envelope, MohrFigure, MohrPoint, mohr_frame, worst_label, worst_points,
};
use crate::picture::draw::place::Pinned;
use crate::picture::scene::style;
use crate::picture::scene::{FaceChoice, Layers, SceneInput};
use crate::study::annotations::{Annotation, FigureKind, Pin};
use crate::study::derived::Derived;

/// What every figure shows.
#[derive(Clone, Debug, PartialEq)]
pub struct FigureInput {
    /// The tensor (pascals, tension positive).
    pub tensor: StressTensor,
    /// Display unit.
    pub unit: StressUnit,
    /// Display convention.
    pub convention: SignConvention,
    /// The cut plane, if one is drawn.
    pub plane: Option<PlaneNormal>,
    /// The worst-plane measure and its parameters, if any.
    pub search: Option<SearchSettings>,
    /// The worst planes of `search`, if they are marked.
    pub worst: Option<SearchResult>,
    /// The Mohr–Coulomb envelope on the Mohr circles, if drawn.
    pub envelope: Option<Envelope>,
    /// The orientation map's colours span this range (the measure's own values: Pa or
    /// dimensionless) instead of the data's, so one extreme value does not flatten the map.
    pub map_range: Option<(f64, f64)>,
    /// The shown case's captions and pinned notes (each names its figure).
    pub notes: Vec<Annotation>,
    /// A plane another study marks in the 3D view (the Fatigue tab's critical plane), with its
    /// label.
    pub marked_plane: Option<(PlaneNormal, String)>,
}

impl FigureInput {
    /// The window's shown state. The envelope is drawn on the Mohr circles when `envelope` is
    /// asked for or the measure is Mohr–Coulomb.
    #[must_use]
    pub fn from_derived(d: &Derived, envelope: bool) -> Self {
        let choice = &d.measure;
        let envelope = (envelope || choice.measure == Measure::MohrCoulomb)
            .then_some(d.search.material)
            .flatten()
            .map(|material| Envelope {
                material,
                pore_pressure_pa: choice.pore_pressure_pa,
            });
        Self {
            tensor: d.tensor,
            unit: d.unit,
            convention: d.convention,
            plane: Some(d.plane),
            search: Some(d.search),
            worst: d.worst.as_ref().ok().cloned(),
            envelope,
            map_range: None,
            notes: d.notes.clone(),
            marked_plane: None,
        }
    }

    /// The caption lines of `figure`.
    #[must_use]
    pub fn captions(&self, figure: FigureKind) -> Vec<String> {
        self.notes
            .iter()
            .filter(|a| a.figure == figure && a.is_caption() && !a.text.trim().is_empty())
            .map(|a| a.text.trim().to_owned())
            .collect()
    }

    /// The pins of `figure`'s notes with their words and offsets.
    fn pins(&self, figure: FigureKind) -> impl Iterator<Item = (Pin, &Annotation)> {
        self.notes
            .iter()
            .filter(move |a| a.figure == figure)
            .filter_map(|a| a.pin.map(|p| (p, a)))
    }

    /// The worst planes' normals (empty when none are marked).
    #[must_use]
    pub fn worst_normals(&self) -> Vec<PlaneNormal> {
        self.worst
            .as_ref()
            .map(SearchResult::normals)
            .unwrap_or_default()
    }
}

/// The title written into exported figures: the project and case when there is one, and the
/// caution.
#[must_use]
pub fn title(project_and_case: Option<(&str, &str)>) -> String {
    match project_and_case {
        Some((project, case)) => format!("{project} — {case} — {}", crate::SAFETY_NOTE),
        None => crate::SAFETY_NOTE.to_owned(),
    }
}

/// The 3D view: the cube with face tractions, the cut plane (when there is one and the layer
/// is on), principal axes, and the worst planes when that layer is on.
#[must_use]
pub fn view_3d(
    input: &FigureInput,
    layers: Layers,
    faces: FaceChoice,
    camera: &Camera,
    width: u32,
    height: u32,
    sizes: crate::picture::draw::Sizes,
) -> Frame {
    let mut layers = layers;
    if input.plane.is_none() {
        layers.cut_plane = false;
    }
    let worst = if layers.worst_planes {
        input.worst_normals()
    } else {
        Vec::new()
    };
    let scene = SceneInput {
        tensor: &input.tensor,
        plane: input.plane.unwrap_or(PlaneNormal::Z),
        unit: input.unit,
        convention: input.convention,
        layers,
        faces,
        worst_planes: &worst,
        marked_plane: input
            .marked_plane
            .as_ref()
            .map(|(n, label)| (*n, label.as_str())),
    };
    let mut built = crate::picture::scene::Scene::build(&scene, &camera.towards_eye());
    built.notes = space_notes(&input.notes);
    crate::picture::draw::render(&built, camera, width as f32, height as f32, sizes)
}

/// The 3D view's notes among `notes`, pinned to world points.
#[must_use]
pub fn space_notes(notes: &[Annotation]) -> Vec<Pinned<nalgebra::Point3<f64>>> {
    notes
        .iter()
        .filter_map(|a| match a.pin {
            Some(Pin::Space { at }) => Some(Pinned {
                pin: nalgebra::Point3::from(at),
                text: a.text.clone(),
                offset: a.offset,
            }),
            _ => None,
        })
        .collect()
}

/// The orientation map of `search` with the principal directions, the cut plane and the worst
/// planes marked.
#[must_use]
pub fn map(
    input: &FigureInput,
    search: &SearchSettings,
    resolution: usize,
    width: u32,
    height: u32,
    sizes: crate::picture::draw::Sizes,
) -> Frame {
    let values = orientation_map(&input.tensor, search, resolution);
    let shown = Analysis::new(&input.tensor, input.convention);
    let objective = crate::mechanics::search::Objective::new(&input.tensor, search);
    let marks = MapMarks {
        colour_range: input.map_range,
        plane_value: input.plane.and_then(|n| objective.at_normal(&n.vector())),
        worst_value: input.worst.as_ref().and_then(|r| r.value),
        principal: Some(shown.principal.directions),
        plane: input.plane,
        worst: input.worst_normals(),
        cone: input.worst.as_ref().and_then(|r| r.cone),
        notes: input
            .pins(FigureKind::Map)
            .filter_map(|(pin, a)| match pin {
                Pin::Pole { normal } => Some(Pinned {
                    pin: PlaneNormal::from_vector(nalgebra::Vector3::from(normal)).ok()?,
                    text: a.text.clone(),
                    offset: a.offset,
                }),
                _ => None,
            })
            .collect(),
    };
    let what = MapMeasure {
        measure: search.measure.into(),
        unit: input.unit,
        convention: input.convention,
    };
    map_frame(&values, &marks, &what, width, height, sizes)
}

/// The Mohr circles' content: circles, the cut plane's point, the worst planes' points and the
/// envelope.
#[must_use]
pub fn mohr_figure(input: &FigureInput) -> MohrFigure {
    let circles = MohrCircles::new(&input.tensor, input.convention);
    let (worst, worst_label) = input
        .worst
        .as_ref()
        .map(|r| (worst_points(&r.planes), worst_label(r)))
        .unwrap_or_default();
    MohrFigure {
        circles,
        unit: input.unit,
        plane: input
            .plane
            .map(|n| MohrPoint::of_plane(&circles, &input.tensor, n, "cut plane")),
        worst,
        worst_label,
        envelope: input.envelope,
        notes: input
            .pins(FigureKind::Mohr)
            .filter_map(|(pin, a)| match pin {
                Pin::Mohr {
                    normal_stress_pa,
                    shear_stress_pa,
                } => Some(Pinned {
                    pin: (input.convention.sign() * normal_stress_pa, shear_stress_pa),
                    text: a.text.clone(),
                    offset: a.offset,
                }),
                _ => None,
            })
            .collect(),
    }
}

/// The Mohr circles as a frame.
#[must_use]
pub fn mohr(
    input: &FigureInput,
    width: u32,
    height: u32,
    sizes: crate::picture::draw::Sizes,
) -> Frame {
    mohr_frame(&mohr_figure(input), width, height, sizes)
}

/// The lines of a figure's title block: the title, project and case, the tensor with its unit
/// and convention, pore pressure and material where the figure uses them, the program version
/// and the date.
#[must_use]
pub fn title_block_lines(
    title: Option<&str>,
    project_and_case: Option<(&str, &str)>,
    input: &FigureInput,
    date: &str,
) -> Vec<String> {
    use crate::mechanics::Component;
    use crate::text::format::readable;
    let unit = input.unit;
    let shown = |pa: f64| readable(unit.from_pa(pa), 5);
    let mut lines = Vec::new();
    if let Some(t) = title.filter(|t| !t.trim().is_empty()) {
        lines.push(t.trim().to_owned());
    }
    if let Some((p, c)) = project_and_case {
        lines.push(format!("Project: {p} — load case or combination: {c}"));
    }
    let sign = input.convention.sign();
    let components: Vec<String> = Component::ALL
        .iter()
        .map(|&k| {
            format!(
                "σ{} = {}",
                k.key(),
                shown(sign * input.tensor.component_pa(k))
            )
        })
        .collect();
    lines.push(format!(
        "Stress ({unit}, {}): {}",
        input.convention.key(),
        components.join(", ")
    ));
    let uses_friction = input.search.is_some_and(|s| s.measure.uses_friction());
    if let Some(env) = input.envelope {
        lines.push(format!(
            "Mohr–Coulomb: c = {} {unit}, φ = {}°, pore pressure p = {} {unit}",
            shown(env.material.cohesion_pa),
            readable(env.material.friction_angle_deg, 4),
            shown(env.pore_pressure_pa)
        ));
    } else if let Some(s) = input.search.filter(|_| uses_friction) {
        let material = s.material.map_or_else(String::new, |m| {
            format!(
                ", c = {} {unit}, φ = {}°",
                shown(m.cohesion_pa),
                readable(m.friction_angle_deg, 4)
            )
        });
        lines.push(format!(
            "Measure {}: pore pressure p = {} {unit}{material}",
            s.measure.key(),
            shown(s.pore_pressure_pa)
        ));
    }
    lines.push(format!("Planewise {}, {date}", env!("CARGO_PKG_VERSION")));
    lines
}

/// Pixels a title block of `lines` takes below the picture at text `size` (none for no lines).
#[must_use]
pub fn title_block_height(lines: usize, size: f32) -> f32 {
    if lines == 0 {
        0.0
    } else {
        (lines as f32 * 1.35 + 0.8) * size
    }
}

/// `frame` drawn `height` pixels shorter than the figure, with the title block in the rows
/// below it (so the figure keeps its requested size and nothing overlaps).
#[must_use]
pub fn with_title_block(frame: &Frame, lines: &[String], size: f32, full_height: f32) -> Frame {
    use crate::picture::draw::{Anchor, Prim};
    let mut out = frame.clone();
    out.height = full_height;
    if lines.is_empty() {
        return out;
    }
    let top = frame.height;
    out.prims.push(Prim::Line {
        a: [0.5 * size, top + 0.3 * size],
        b: [frame.width - 0.5 * size, top + 0.3 * size],
        width: 0.08 * size,
        color: style::INK,
    });
    for (i, line) in lines.iter().enumerate() {
        out.prims.push(Prim::Text {
            at: [0.5 * size, top + (1.0 + 1.35 * i as f32) * size],
            text: line.clone(),
            size: if i == 0 { size * 1.1 } else { size },
            color: style::INK,
            anchor: Anchor::LeftCenter,
            halo: false,
        });
    }
    out
}

/// The figure `build` draws at a given height, with a title block of `lines` below it when
/// there are any and a free strip at the foot for the caution
/// ([`crate::picture::caution::with_caution`]); the whole keeps `width` × `height` pixels.
pub fn titled(
    lines: &[String],
    text_px: f32,
    [width, height]: [u32; 2],
    build: impl Fn(u32) -> Frame,
) -> Frame {
    let (w, h) = (width as f32, height as f32);
    let caution = crate::picture::caution::caution_height(w, h);
    let size = 0.85 * text_px;
    let lines: Vec<String> = lines
        .iter()
        .flat_map(|l| crate::picture::draw::place::wrap(l, w - size, size))
        .collect();
    let block = (title_block_height(lines.len(), size) + caution).ceil() as u32;
    let picture = build(height.saturating_sub(block).max(16));
    with_title_block(&picture, &lines, size, h)
}

/// The shear path figure of a fatigue study on the critical plane, or on the plane of unit
/// normal `on` (the cut plane), with the governing cycle shaded when finite life was computed
/// (critical plane only).
#[must_use]
pub fn fatigue_path(
    loaded: &crate::study::fatigue::LoadedHistory,
    setup: &crate::study::fatigue::FatigueSetup,
    judged: &crate::study::fatigue::Judged,
    on: Option<nalgebra::Vector3<f64>>,
    [w, h]: [u32; 2],
    sizes: crate::picture::draw::Sizes,
) -> Frame {
    use crate::mechanics::fatigue::critical::value_on;
    use crate::mechanics::fatigue::{PathMethod, PlaneAxes, PlanePath};
    use crate::picture::draw::history::{PathFigure, path_frame};
    use crate::text::format::sig;
    let history = &loaded.history;
    let criterion = setup.constants.criterion;
    let (axes, circle, title, governing) = if let Some(n) = on {
        let value = value_on(history, &setup.constants, setup.method, &n);
        let (dip, dd) = PlaneNormal::from_vector(n).map_or((0.0, 0.0), |p| p.dip_deg());
        (
            PlaneAxes::of(n),
            value.circle,
            format!(
                "Cut plane: dip {}° / dip direction {}°; {} utilization on it {}",
                sig(dip, 4),
                sig(dd, 4),
                criterion.label(),
                sig(value.value_pa / setup.constants.limit_pa, 4)
            ),
            None,
        )
    } else {
        let plane = &judged.plane;
        (
            plane.axes,
            plane.value.circle,
            format!(
                "{} critical plane: dip {}° / dip direction {}°; utilization {}",
                criterion.label(),
                sig(plane.dip_deg, 4),
                sig(plane.dip_direction_deg, 4),
                sig(plane.utilization, 4)
            ),
            judged
                .life
                .as_ref()
                .and_then(|l| l.damage.worst)
                .map(|c| (c.from, c.to)),
        )
    };
    let p = PlanePath::of(history, &axes);
    let fig = PathFigure {
        title,
        time: history.time().to_vec(),
        time_label: loaded.time_name.clone(),
        tau: p.tau,
        sigma_n: p.sigma_n,
        circle,
        method: match setup.method {
            PathMethod::Circle => "minimum circumscribed circle",
            PathMethod::Chord => "longest chord",
        },
        unit: setup.unit,
        convention: setup.convention,
        governing,
    };
    path_frame(&fig, w, h, sizes)
}

/// The orientation map of a fatigue study: the utilization over every plane, or log₁₀ of the
/// damage with an S–N curve, the critical plane marked (and the cut plane `on`, when given);
/// with its title.
#[must_use]
pub fn fatigue_map(
    loaded: &crate::study::fatigue::LoadedHistory,
    setup: &crate::study::fatigue::FatigueSetup,
    judged: &crate::study::fatigue::Judged,
    resolution: usize,
    on: Option<PlaneNormal>,
    [w, h]: [u32; 2],
    sizes: crate::picture::draw::Sizes,
) -> (Frame, String) {
    use crate::mechanics::fatigue::critical::utilization_map;
    use crate::mechanics::fatigue::life::damage_map;
    use crate::picture::draw::map::MapQuantity;
    let history = &loaded.history;
    let (map, quantity, worst, worst_value) = if let (Some(sn), Some(l)) = (&setup.sn, &judged.life)
    {
        let mut m = damage_map(history, setup.constants.coefficient, sn, resolution);
        // Damage spans decades: the map shows its logarithm (planes with none are blank).
        for v in &mut m.values {
            *v = v.filter(|d| *d > 0.0).map(f64::log10);
        }
        m.range = m.values.iter().flatten().fold(None, |r, v| {
            Some(r.map_or((*v, *v), |(lo, hi): (f64, f64)| (lo.min(*v), hi.max(*v))))
        });
        (
            m,
            MapQuantity::LogDamage,
            l.normal,
            (l.damage.damage > 0.0).then(|| l.damage.damage.log10()),
        )
    } else {
        (
            utilization_map(history, &setup.constants, setup.method, resolution),
            MapQuantity::Utilization {
                criterion: setup.constants.criterion.label(),
            },
            judged.plane.normal,
            Some(judged.plane.utilization),
        )
    };
    let plane_value = on.map(|n| {
        crate::mechanics::fatigue::critical::value_on(
            history,
            &setup.constants,
            setup.method,
            &n.vector(),
        )
        .value_pa
            / setup.constants.limit_pa
    });
    let marks = MapMarks {
        colour_range: None,
        principal: None,
        plane: on,
        worst: PlaneNormal::try_from(worst).into_iter().collect(),
        cone: None,
        // The cut plane's value is a utilization: shown only on the utilization map.
        plane_value: plane_value.filter(|_| quantity != MapQuantity::LogDamage),
        worst_value,
        notes: Vec::new(),
    };
    let what = MapMeasure {
        measure: quantity,
        unit: setup.unit,
        convention: setup.convention,
    };
    (map_frame(&map, &marks, &what, w, h, sizes), what.title())
}

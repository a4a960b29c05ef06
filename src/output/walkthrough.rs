//! The walk-through: the shown load case or combination explained in six steps — the element
//! and its components, the cut plane's traction and its parts, the principal planes, the
//! planes of largest shear, the worst plane for the chosen measure, and the verdict. Each step
//! says which view, layers and plane to show and one or two sentences made from the numbers.
//! The window's Walk-through tab and `planewise explain` both read these steps. No egui here.

use crate::mechanics::criteria::Outcome;
use crate::mechanics::search::Measure;
use crate::mechanics::{Component, PlaneNormal, PlaneStress, SignConvention};
use crate::picture::draw::camera::Camera;
use crate::picture::scene::Layers;
use crate::study::derived::Derived;
use crate::text::format::{dip_text, readable};

/// What a step is about.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum StepKind {
    /// The element and its components.
    Element,
    /// The cut plane: traction, normal and shear parts.
    CutPlane,
    /// The principal planes (no shear).
    Principal,
    /// The planes of largest shear.
    MaxShear,
    /// The worst plane for the chosen measure.
    Worst,
    /// The verdict against the material.
    Verdict,
}

impl StepKind {
    /// A short name for files and ids.
    #[must_use]
    pub fn slug(self) -> &'static str {
        match self {
            Self::Element => "element",
            Self::CutPlane => "cut-plane",
            Self::Principal => "principal-planes",
            Self::MaxShear => "largest-shear",
            Self::Worst => "worst-plane",
            Self::Verdict => "verdict",
        }
    }
}

/// One step: what to show and what to say.
#[derive(Clone, Debug, PartialEq)]
pub struct Step {
    /// What it is about.
    pub kind: StepKind,
    /// A short heading.
    pub title: String,
    /// One or two sentences from the numbers.
    pub text: String,
    /// The camera (yaw and pitch; zoom 1, no pan).
    pub camera: Camera,
    /// The layers to draw.
    pub layers: Layers,
    /// The plane to draw as the cut plane.
    pub plane: PlaneNormal,
    /// Whether the worst planes are marked.
    pub worst_planes: bool,
}

/// A camera looking at the origin from yaw and pitch, degrees.
fn camera(yaw_deg: f64, pitch_deg: f64) -> Camera {
    Camera {
        yaw_deg,
        pitch_deg,
        ..Camera::default()
    }
}

/// A camera that shows the plane with normal `n` and a direction `along` in it (its shear
/// direction) near full length: the eye looks mostly along n × along (perpendicular to both),
/// turned a little towards n and along so the plane is seen at an angle rather than edge-on,
/// from above where it can. Every vector in the span of n and `along` (the traction too) is
/// then seen at least 0.87 of its length in orthographic projection.
fn camera_seeing(n: &nalgebra::Vector3<f64>, along: &nalgebra::Vector3<f64>) -> Camera {
    let n = n.normalize();
    // The in-plane direction: `along` less its part on n, or any direction of the plane.
    let in_plane = {
        let a = along - n * along.dot(&n);
        // Round-off shear (below 1e-9 of the traction) has no direction worth showing.
        if a.norm() > 1e-9 * along.norm() && a.norm() > 0.0 {
            a.normalize()
        } else {
            let helper = if n.z.abs() < 0.9 {
                nalgebra::Vector3::z()
            } else {
                nalgebra::Vector3::x()
            };
            (helper - n * helper.dot(&n)).normalize()
        }
    };
    let side = n.cross(&in_plane);
    let eye = |s: f64| (side * s + n * 0.45 + in_plane * 0.3).normalize();
    let (up, down) = (eye(1.0), eye(-1.0));
    let e = if up.z >= down.z { up } else { down };
    // At least 15° above the horizon: from the horizon the x and y axes of the triad would
    // lie on one line.
    camera(
        e.y.atan2(e.x).to_degrees(),
        e.z.clamp(-1.0, 1.0).asin().to_degrees().max(15.0),
    )
}

/// The shear direction of the traction on the plane with normal `n` (any in-plane direction
/// when there is no shear).
fn shear_direction(t: &crate::mechanics::StressTensor, n: &PlaneNormal) -> nalgebra::Vector3<f64> {
    let ps = PlaneStress::new(t, *n, SignConvention::TensionPositive);
    let v = n.vector();
    ps.traction_pa - v * ps.normal_stress_pa
}

/// [`camera_seeing`] for the plane `n` and its traction's shear direction.
fn camera_for(t: &crate::mechanics::StressTensor, n: &PlaneNormal) -> Camera {
    camera_seeing(&n.vector(), &shear_direction(t, n))
}

/// A vector written with three decimals.
fn vector_text(v: &nalgebra::Vector3<f64>) -> String {
    format!("({:.2}, {:.2}, {:.2})", v.x, v.y, v.z)
}

/// The six steps for the state `d`.
#[must_use]
pub fn steps(d: &Derived) -> Vec<Step> {
    let unit = d.unit;
    let sign = d.convention.sign();
    let value = |pa: f64| format!("{} {unit}", readable(unit.from_pa(pa), 4));
    let shown = |pa: f64| value(sign * pa);
    let base = Layers {
        cube: true,
        labels: true,
        legend: true,
        triad: true,
        ..Layers::none()
    };
    let mut out = Vec::new();

    // 1. The element.
    let t = &d.tensor;
    let c = |k: Component| shown(t.component_pa(k));
    out.push(Step {
        kind: StepKind::Element,
        title: "The element and its components".into(),
        text: format!(
            "Each face of the small cube carries a normal and two shear components ({}): on the x face σxx = {} and τxy = {}, τxz = {}; on the y face σyy = {} and τyz = {}; on the z face σzz = {}. Shear components come in equal pairs (τxy = τyx), so six numbers describe the state.",
            d.convention.key(),
            c(Component::Xx),
            c(Component::Xy),
            c(Component::Zx),
            c(Component::Yy),
            c(Component::Yz),
            c(Component::Zz),
        ),
        camera: Camera::default(),
        layers: Layers {
            element: true,
            ..base
        },
        plane: d.plane,
        worst_planes: false,
    });

    // 2. The cut plane.
    let ps = PlaneStress::new(t, d.plane, SignConvention::TensionPositive);
    let n = d.plane.vector();
    let verb = if ps.normal_stress_pa >= 0.0 {
        "pulls on"
    } else {
        "presses on"
    };
    out.push(Step {
        kind: StepKind::CutPlane,
        title: "The cut plane: its traction, normal and shear parts".into(),
        text: format!(
            "On the plane with normal {} the traction is t = σ·n = {} in size; its normal part σn = {} {verb} the plane and its shear part τ = {} slides along it (|t|² = σn² + τ²).",
            vector_text(&n),
            value(ps.traction_pa.norm()),
            shown(ps.normal_stress_pa),
            value(ps.shear_stress_pa),
        ),
        camera: camera_for(t, &d.plane),
        layers: Layers {
            cut_plane: true,
            ..base
        },
        plane: d.plane,
        worst_planes: false,
    });

    // 3. The principal planes.
    let a = &d.analysis;
    let [s1, s2, s3] = a.principal.values_pa;
    let n1 = a.principal.directions[0];
    let p1 = PlaneNormal::from_vector(n1).unwrap_or(d.plane);
    out.push(Step {
        kind: StepKind::Principal,
        title: "The principal planes: no shear".into(),
        text: format!(
            "Turned to the principal directions the shear vanishes and the traction is along the normal: σ1 = {} on the plane with normal {}, σ2 = {}, σ3 = {} ({}).",
            value(s1),
            vector_text(&n1),
            value(s2),
            value(s3),
            d.convention.key(),
        ),
        // σ1 along the normal and σ3 in the plane: both seen near full length.
        camera: camera_seeing(&n1, &a.principal.directions[2]),
        layers: Layers {
            cut_plane: true,
            principal_axes: true,
            ..base
        },
        plane: p1,
        worst_planes: false,
    });

    // 4. The planes of largest shear.
    let m = a.max_shear_normals[0];
    let pm = PlaneNormal::from_vector(m).unwrap_or(d.plane);
    out.push(Step {
        kind: StepKind::MaxShear,
        title: "The planes of largest shear".into(),
        text: format!(
            "The largest shear, τmax = (σ1 − σ3)/2 = {}, acts on the two planes at 45° to the σ1 and σ3 directions (one has normal {}); their normal stress is (σ1 + σ3)/2 = {}.",
            value(a.max_shear_pa),
            vector_text(&m),
            value(0.5 * (s1 + s3)),
        ),
        camera: camera_for(t, &pm),
        layers: Layers {
            cut_plane: true,
            principal_axes: true,
            ..base
        },
        plane: pm,
        worst_planes: false,
    });

    // 5. The worst plane for the measure.
    let key = d.search.measure.label();
    let (plane, text) = match &d.worst {
        Ok(r) if !r.planes.is_empty() => {
            let w = &r.planes[0];
            let v = r.value.map_or_else(
                || "undefined".to_owned(),
                |v| {
                    if d.search.measure.is_stress() {
                        value(v)
                    } else {
                        readable(v, 4)
                    }
                },
            );
            // Each quantity once: the measure's value, then whichever of σn and τ it is not.
            let at = dip_text(w.dip_deg, w.dip_direction_deg);
            let (sn, tau) = (value(w.normal_stress_pa), value(w.shear_stress_pa));
            let text = match d.search.measure {
                Measure::Shear => format!(
                    "The plane of largest shear stress is {at}, with τ = {v}; there σn = {sn}."
                ),
                Measure::NormalMax | Measure::NormalMin => format!(
                    "For the measure {key} the worst plane is {at}, with σn = {v}; there τ = {tau}."
                ),
                _ => format!(
                    "For the measure {key} the worst plane is {at}, with {key} = {v}; there σn = {sn} and τ = {tau}."
                ),
            };
            (w.normal, text)
        }
        Ok(_) => (
            d.plane,
            format!("For the measure {key} no plane is worse than another."),
        ),
        Err(e) => (
            d.plane,
            format!("The worst plane for {key} cannot be found: {e}."),
        ),
    };
    out.push(Step {
        kind: StepKind::Worst,
        title: format!("The worst plane for {key}"),
        text,
        camera: camera_for(t, &plane),
        layers: Layers {
            cut_plane: true,
            worst_planes: true,
            ..base
        },
        plane,
        worst_planes: true,
    });

    // 6. The verdict.
    let text = match d.verdicts.first() {
        Some(v) if v.outcome() != Outcome::NotChecked => {
            let u = v
                .utilization
                .map_or_else(|| "undefined".to_owned(), |u| readable(u, 3));
            let fos = v
                .factor_of_safety
                .map_or_else(|| "none".to_owned(), |f| readable(f, 3));
            let outcome = match v.outcome() {
                Outcome::Passes => "it passes",
                Outcome::Fails => "it fails",
                Outcome::NotChecked => "it is not checked",
            };
            format!(
                "Against {} (material: {}), the governing check, the utilization is U = {u} and the factor of safety {fos}: {outcome}. This is an aid: the applicable code and a licensed engineer decide.",
                v.criterion.label(),
                if d.material_name.is_empty() {
                    "unnamed"
                } else {
                    &d.material_name
                },
            )
        }
        _ => "No criterion is checked: the material's strengths are not given. Enter them in the Material section to get a verdict.".to_owned(),
    };
    out.push(Step {
        kind: StepKind::Verdict,
        title: "The verdict".into(),
        text,
        camera: Camera::default(),
        layers: Layers {
            cut_plane: true,
            principal_axes: true,
            face_tractions: true,
            ..base
        },
        plane: d.plane,
        worst_planes: false,
    });
    out
}

/// The 3D figure of a walk-through step: the step's camera, layers and plane, the worst planes
/// when the step marks them.
#[must_use]
pub fn step_figure(
    d: &Derived,
    step: &Step,
    width: u32,
    height: u32,
    sizes: crate::picture::draw::Sizes,
) -> crate::picture::draw::Frame {
    step_figure_keyed(d, step, width, height, sizes, true).0
}

/// [`step_figure`] for the window: the legend is left out where it would cover the
/// drawing, unless `key_open`; also says whether it would (then the window offers a Key).
#[must_use]
pub fn step_figure_keyed(
    d: &Derived,
    step: &Step,
    width: u32,
    height: u32,
    sizes: crate::picture::draw::Sizes,
    key_open: bool,
) -> (crate::picture::draw::Frame, bool) {
    let mut input = crate::picture::figures::FigureInput::from_derived(d, false);
    input.plane = Some(step.plane);
    if !step.worst_planes {
        input.worst = None;
    }
    let mut layers = crate::picture::scene::Layers {
        worst_planes: step.worst_planes,
        ..step.layers
    };
    let folds = layers.legend && {
        let scene = crate::picture::scene::Scene::build(
            &crate::picture::scene::SceneInput {
                tensor: &input.tensor,
                plane: step.plane,
                unit: input.unit,
                convention: input.convention,
                layers,
                faces: crate::picture::scene::FaceChoice::FacingViewer,
                worst_planes: &[],
                marked_plane: None,
            },
            &step.camera.towards_eye(),
        );
        !crate::picture::draw::legend_fits(&scene, width as f32, height as f32, sizes)
    };
    if folds && !key_open {
        layers.legend = false;
    }
    let frame = crate::picture::figures::view_3d(
        &input,
        layers,
        crate::picture::scene::FaceChoice::FacingViewer,
        &step.camera,
        width,
        height,
        sizes,
    );
    (frame, folds)
}

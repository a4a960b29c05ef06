//! The user's own words on a figure: captions written under it and notes pinned to a point of
//! it (a point of the Mohr diagram, a pole on the orientation map, a spot in the 3D view). Each
//! belongs to one load case or combination and one figure, lives in the project file, and is
//! changed through [`super::edit::Edit::SetAnnotations`] like everything else (one undo step).

use serde::{Deserialize, Serialize};

/// The figure an annotation is written on.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum FigureKind {
    /// The 3D view.
    View3d,
    /// The orientation map.
    Map,
    /// The Mohr circles.
    Mohr,
}

impl FigureKind {
    /// All, in tab order.
    pub const ALL: [Self; 3] = [Self::View3d, Self::Map, Self::Mohr];

    /// Name for people.
    #[must_use]
    pub fn label(self) -> &'static str {
        match self {
            Self::View3d => "3D view",
            Self::Map => "Orientation map",
            Self::Mohr => "Mohr circles",
        }
    }
}

/// Where a note is pinned, in the figure's own coordinates, so it stays on its point whatever
/// the picture's size, view or sign convention.
#[derive(Clone, Copy, Debug, PartialEq, Serialize, Deserialize)]
#[serde(tag = "on", rename_all = "snake_case")]
pub enum Pin {
    /// A point (σn, τ) of the Mohr diagram, Pa, σn tension positive, τ ≥ 0.
    Mohr {
        /// Normal stress, Pa, tension positive.
        normal_stress_pa: f64,
        /// Shear stress, Pa.
        shear_stress_pa: f64,
    },
    /// The pole of a plane on the orientation map: the plane's unit normal (x east, y north,
    /// z up).
    Pole {
        /// The normal.
        normal: [f64; 3],
    },
    /// A point of the 3D view in the scene's world units (the cube spans −1 to 1).
    Space {
        /// The point.
        at: [f64; 3],
    },
}

impl Pin {
    /// The figure this pin belongs on.
    #[must_use]
    pub fn figure(&self) -> FigureKind {
        match self {
            Self::Mohr { .. } => FigureKind::Mohr,
            Self::Pole { .. } => FigureKind::Map,
            Self::Space { .. } => FigureKind::View3d,
        }
    }
}

/// A caption (no pin: written under the figure) or a note pinned to a point of it.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct Annotation {
    /// The load case or combination it belongs to.
    pub case: String,
    /// The figure it is written on.
    pub figure: FigureKind,
    /// The words.
    pub text: String,
    /// The point it is pinned to; none for a caption.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub pin: Option<Pin>,
    /// Where the note's text sits relative to its pin, in multiples of the text size (x right,
    /// y down), so the note keeps its place in the window and in exports of any size.
    #[serde(default = "default_offset")]
    pub offset: [f32; 2],
}

/// A new note's text sits up and to the right of its pin.
#[must_use]
pub fn default_offset() -> [f32; 2] {
    [1.5, -2.0]
}

impl Annotation {
    /// A note on `figure` of `case` pinned at `pin`.
    #[must_use]
    pub fn note(case: &str, pin: Pin, text: &str) -> Self {
        Self {
            case: case.to_owned(),
            figure: pin.figure(),
            text: text.to_owned(),
            pin: Some(pin),
            offset: default_offset(),
        }
    }

    /// A caption under `figure` of `case`.
    #[must_use]
    pub fn caption(case: &str, figure: FigureKind, text: &str) -> Self {
        Self {
            case: case.to_owned(),
            figure,
            text: text.to_owned(),
            pin: None,
            offset: [0.0, 0.0],
        }
    }

    /// Checks every number a file can put here: finite, stresses within the limit the stress
    /// tensor has, normals not zero, 3D points and offsets within ±1000 (world units, text
    /// sizes). The error names the key.
    pub fn validate(&self) -> Result<(), String> {
        let limit = crate::mechanics::tensor::MAX_STRESS_PA;
        let within = |key: &str, v: f64, bound: f64| {
            if v.is_finite() && v.abs() <= bound {
                Ok(())
            } else {
                Err(format!(
                    "{key} = {v} is not a finite number within ±{bound:e}"
                ))
            }
        };
        for (i, v) in self.offset.iter().enumerate() {
            within(&format!("offset[{i}]"), f64::from(*v), 1e3)?;
        }
        match &self.pin {
            None => Ok(()),
            Some(Pin::Mohr {
                normal_stress_pa,
                shear_stress_pa,
            }) => {
                within("pin.normal_stress_pa", *normal_stress_pa, limit)?;
                within("pin.shear_stress_pa", *shear_stress_pa, limit)
            }
            Some(Pin::Pole { normal }) => {
                for (i, v) in normal.iter().enumerate() {
                    within(&format!("pin.normal[{i}]"), *v, 1e6)?;
                }
                if normal.iter().map(|v| v * v).sum::<f64>() < 1e-24 {
                    return Err("pin.normal is the zero vector".to_owned());
                }
                Ok(())
            }
            Some(Pin::Space { at }) => {
                for (i, v) in at.iter().enumerate() {
                    within(&format!("pin.at[{i}]"), *v, 1e3)?;
                }
                Ok(())
            }
        }
    }

    /// Whether it is a caption.
    #[must_use]
    pub fn is_caption(&self) -> bool {
        self.pin.is_none()
    }
}

//! The fixed sets of values options take (measures, envelope measures, view presets, layers)
//! and the parsers of structured values (image size), declared once: clap takes validation, the
//! error message and the list in `--help` from these, and the window's menus use the same
//! `ALL` lists and keys.

use clap::ValueEnum;
use clap::builder::PossibleValue;

use crate::mechanics::StressUnit;
use crate::mechanics::criteria::DruckerPragerFit;
use crate::mechanics::search::Measure;
use crate::picture::draw::camera::ViewPreset;
use crate::picture::scene::Layers;
use crate::study::EnvelopeMeasure;

impl ValueEnum for Measure {
    fn value_variants<'a>() -> &'a [Self] {
        &Self::ALL
    }

    fn to_possible_value(&self) -> Option<PossibleValue> {
        Some(PossibleValue::new(self.key()))
    }
}

impl ValueEnum for EnvelopeMeasure {
    fn value_variants<'a>() -> &'a [Self] {
        &Self::ALL
    }

    fn to_possible_value(&self) -> Option<PossibleValue> {
        Some(PossibleValue::new(self.key()))
    }
}

impl ValueEnum for ViewPreset {
    fn value_variants<'a>() -> &'a [Self] {
        &Self::ALL
    }

    fn to_possible_value(&self) -> Option<PossibleValue> {
        Some(PossibleValue::new(self.key()).help(self.label()))
    }
}

impl ValueEnum for crate::window::session::Central {
    fn value_variants<'a>() -> &'a [Self] {
        &Self::ALL
    }

    fn to_possible_value(&self) -> Option<PossibleValue> {
        Some(PossibleValue::new(self.key()).help(self.label()))
    }
}

impl ValueEnum for DruckerPragerFit {
    fn value_variants<'a>() -> &'a [Self] {
        &Self::ALL
    }

    fn to_possible_value(&self) -> Option<PossibleValue> {
        Some(PossibleValue::new(self.key()).help(self.label()))
    }
}

/// One layer of the 3D figure, as `--layers` names it.
#[derive(Clone, Copy, Debug, PartialEq, Eq, ValueEnum)]
pub enum Layer {
    /// The unit cube.
    Cube,
    /// Traction arrows on the cube's faces.
    Faces,
    /// The cut plane with its traction split into normal and shear parts.
    Plane,
    /// The traction ellipsoid.
    Ellipsoid,
    /// The principal axes.
    Axes,
    /// Value labels.
    Labels,
    /// The x, y, z triad.
    Triad,
    /// The legend.
    Legend,
    /// The stress element: signed component arrows on the faces (the plane element when
    /// looking down an axis).
    Element,
    /// The traction at the tips of normals spread over the sphere.
    Field,
}

/// The layers switched on by a list of names.
#[must_use]
pub fn layers(names: &[Layer]) -> Layers {
    let mut l = Layers::none();
    for name in names {
        let flag = match name {
            Layer::Cube => &mut l.cube,
            Layer::Faces => &mut l.face_tractions,
            Layer::Plane => &mut l.cut_plane,
            Layer::Ellipsoid => &mut l.ellipsoid,
            Layer::Axes => &mut l.principal_axes,
            Layer::Labels => &mut l.labels,
            Layer::Triad => &mut l.triad,
            Layer::Legend => &mut l.legend,
            Layer::Element => &mut l.element,
            Layer::Field => &mut l.traction_field,
        };
        *flag = true;
    }
    l
}

/// A stress unit, exactly as SI writes it (`N/mm²` and `N/mm2` read as MPa); the message lists
/// the units.
pub fn unit(text: &str) -> Result<StressUnit, String> {
    text.parse::<StressUnit>().map_err(|e| e.to_string())
}

/// An image size `WIDTHxHEIGHT`, each side 16 to 16384 pixels.
pub fn size(text: &str) -> Result<(u32, u32), String> {
    let bad = || format!("'{text}' is not WIDTHxHEIGHT with each side 16 to 16384 pixels");
    let (w, h) = text.trim().split_once(['x', 'X', '×']).ok_or_else(bad)?;
    let w: u32 = w.trim().parse().map_err(|_| bad())?;
    let h: u32 = h.trim().parse().map_err(|_| bad())?;
    if !(16..=16_384).contains(&w) || !(16..=16_384).contains(&h) {
        return Err(bad());
    }
    Ok((w, h))
}

/// A print width such as `16cm`, `160mm` or `6.3in`, in millimetres.
pub fn print_width(text: &str) -> Result<f32, String> {
    let t = text.trim();
    let (number, factor) = if let Some(n) = t.strip_suffix("mm") {
        (n, 1.0)
    } else if let Some(n) = t.strip_suffix("cm") {
        (n, 10.0)
    } else if let Some(n) = t.strip_suffix("in") {
        (n, 25.4)
    } else {
        return Err(format!("'{t}' needs a unit: mm, cm or in (e.g. 16cm)"));
    };
    let v: f32 = number
        .trim()
        .parse()
        .map_err(|_| format!("'{t}' is not a length such as 16cm"))?;
    let mm = v * factor;
    if !(mm.is_finite() && (20.0..=2000.0).contains(&mm)) {
        return Err(format!("'{t}' is outside 2 cm to 2 m"));
    }
    Ok(mm)
}

/// A font size such as `9pt`, in points.
pub fn font_size(text: &str) -> Result<f32, String> {
    let t = text.trim();
    let number = t
        .strip_suffix("pt")
        .ok_or_else(|| format!("'{t}' needs the unit pt (e.g. 9pt)"))?;
    let v: f32 = number
        .trim()
        .parse()
        .map_err(|_| format!("'{t}' is not a size such as 9pt"))?;
    if !(v.is_finite() && (4.0..=72.0).contains(&v)) {
        return Err(format!("'{t}' is outside 4 pt to 72 pt"));
    }
    Ok(v)
}

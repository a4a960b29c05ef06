//! The fixed sets of values options take (measures, envelope measures, view presets, layers)
//! and the parsers of structured values (image size), declared once: clap takes validation, the
//! error message and the list in `--help` from these, and the window's menus use the same
//! `ALL` lists and keys.

use clap::ValueEnum;
use clap::builder::PossibleValue;

use crate::draw::camera::ViewPreset;
use crate::mechanics::StressUnit;
use crate::mechanics::criteria::DruckerPragerFit;
use crate::mechanics::search::Measure;
use crate::scene::Layers;
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

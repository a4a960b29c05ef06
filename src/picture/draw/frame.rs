//! The 2D picture every back end draws: primitives in pixel coordinates ([`Prim`]) in a
//! [`Frame`], with the text and line sizes of a picture ([`Sizes`]). Plain data: the 3D view,
//! the map and the Mohr diagram write frames; SVG, PNG and egui read them.

use crate::picture::scene::style::{self, Rgba};

/// A pixel position (x right, y down).
pub type Pos = [f32; 2];

/// How text is placed relative to its position.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Anchor {
    /// The position is the left end of the text's middle line.
    LeftCenter,
    /// The position is the right end of the text's middle line.
    RightCenter,
    /// The position is the text's centre.
    Center,
}

/// One thing to draw, in pixels.
#[derive(Clone, Debug, PartialEq)]
pub enum Prim {
    /// A filled convex polygon, optionally outlined.
    Polygon {
        /// Corners in order.
        points: Vec<Pos>,
        /// Fill.
        fill: Rgba,
        /// Outline colour and width.
        outline: Option<(Rgba, f32)>,
    },
    /// A straight line with round ends.
    Line {
        /// Start.
        a: Pos,
        /// End.
        b: Pos,
        /// Width in pixels.
        width: f32,
        /// Colour.
        color: Rgba,
    },
    /// Text.
    Text {
        /// Where.
        at: Pos,
        /// What.
        text: String,
        /// Font size in pixels.
        size: f32,
        /// Colour.
        color: Rgba,
        /// Placement.
        anchor: Anchor,
        /// Draw a background-coloured halo behind the text (labels over geometry).
        halo: bool,
    },
    /// A raster image (straight-alpha RGBA, row-major, top row first) stretched over a
    /// rectangle without smoothing.
    Image {
        /// Top-left corner.
        at: Pos,
        /// Width and height in pixels of the frame.
        size: [f32; 2],
        /// Width and height of the raster.
        pixels: [u32; 2],
        /// The raster.
        rgba: std::sync::Arc<Vec<u8>>,
    },
}

/// A complete picture, ready for a back end.
#[derive(Clone, Debug, PartialEq)]
pub struct Frame {
    /// Width in pixels.
    pub width: f32,
    /// Height in pixels.
    pub height: f32,
    /// Background colour.
    pub background: Rgba,
    /// Primitives in drawing order (first drawn first).
    pub prims: Vec<Prim>,
}

/// Sizes that grow with the output (line widths and text scale together).
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Sizes {
    /// Multiplier for line widths and arrowheads.
    pub line: f32,
    /// Font size for labels, pixels.
    pub text: f32,
}

/// Print width exported figures are sized for by default, millimetres (a report's text width).
pub const PRINT_WIDTH_MM: f32 = 160.0;
/// Text size exported figures get by default at [`PRINT_WIDTH_MM`], points.
pub const PRINT_FONT_PT: f32 = 8.5;

impl Sizes {
    /// Sizes for an export of `width` × `height` pixels: text of [`PRINT_FONT_PT`] when the
    /// figure is printed [`PRINT_WIDTH_MM`] wide (never smaller than the 1100 × 750 screen
    /// view's proportions), lines in step.
    #[must_use]
    pub fn for_export(width: f32, height: f32) -> Self {
        Self::for_print(width, height, PRINT_WIDTH_MM, PRINT_FONT_PT)
    }

    /// Sizes for text of `font_pt` points when the `width`-pixel figure is printed
    /// `print_width_mm` wide (1 pt = 25.4/72 mm), but no more than a 25th of the height;
    /// lines scale with the text.
    #[must_use]
    pub fn for_print(width: f32, height: f32, print_width_mm: f32, font_pt: f32) -> Self {
        let screen = (width / 1100.0).min(height / 750.0).max(0.25);
        let text_px = font_pt * 25.4 / 72.0 / print_width_mm * width;
        // A very flat figure cannot hold print-sized text: keep about 25 lines of height.
        let text = text_px.max(13.0 * screen).min(height / 25.0).max(5.0);
        Self {
            line: text / 13.0,
            text,
        }
    }

    /// Points a text of `px` pixels measures when the `width`-pixel figure is printed
    /// `print_width_mm` wide.
    #[must_use]
    pub fn points(px: f32, width: f32, print_width_mm: f32) -> f32 {
        px / width * print_width_mm * 72.0 / 25.4
    }
}

impl Default for Sizes {
    fn default() -> Self {
        Self {
            line: 1.0,
            text: 13.0,
        }
    }
}

/// The corners of a regular polygon with `sides` corners at `size` pixels from `at`, the first
/// straight up.
#[must_use]
pub fn regular_polygon(at: Pos, size: f32, sides: usize) -> Vec<Pos> {
    (0..sides)
        .map(|i| {
            let a = std::f32::consts::TAU * i as f32 / sides as f32 - std::f32::consts::FRAC_PI_2;
            [at[0] + size * a.cos(), at[1] + size * a.sin()]
        })
        .collect()
}

/// A regular polygon marker centred on `at`, outlined in ink.
#[must_use]
pub fn marker(at: Pos, size: f32, sides: usize, fill: Rgba) -> Prim {
    Prim::Polygon {
        points: regular_polygon(at, size, sides),
        fill,
        outline: Some((style::INK, 1.0)),
    }
}

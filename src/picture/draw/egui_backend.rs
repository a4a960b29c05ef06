//! Draws a [`Frame`] with egui's painter: consecutive unoutlined polygons are batched into one
//! mesh; lines become anti-aliased strokes; text is egui text.

use egui::epaint::{Mesh, Shape, Stroke};
use egui::{Align2, Color32, FontId, Pos2, Rect};

use super::frame::{Anchor, Frame, Prim};
use crate::picture::scene::style::Rgba;

/// The egui colour for an [`Rgba`].
#[must_use]
pub fn color(c: Rgba) -> Color32 {
    Color32::from_rgba_unmultiplied(c.r, c.g, c.b, c.a)
}

/// The shapes for `frame`, placed with its top-left corner at `rect.min`. Text needs the
/// context's fonts, so it comes from `ctx`.
#[must_use]
pub fn shapes(frame: &Frame, rect: Rect, ctx: &egui::Context) -> Vec<Shape> {
    let o = rect.min.to_vec2();
    let p = |q: [f32; 2]| Pos2::new(q[0], q[1]) + o;
    let mut out = Vec::with_capacity(frame.prims.len() / 4 + 8);
    out.push(Shape::rect_filled(rect, 0.0, color(frame.background)));
    let mut mesh = Mesh::default();
    let flush = |mesh: &mut Mesh, out: &mut Vec<Shape>| {
        if !mesh.is_empty() {
            out.push(Shape::mesh(std::mem::take(mesh)));
        }
    };
    for prim in &frame.prims {
        match prim {
            Prim::Polygon {
                points,
                fill,
                outline,
            } => {
                if outline.is_none() && points.len() >= 3 {
                    let base = mesh.vertices.len() as u32;
                    let c = color(*fill);
                    for q in points {
                        mesh.colored_vertex(p(*q), c);
                    }
                    for i in 1..points.len() as u32 - 1 {
                        mesh.add_triangle(base, base + i, base + i + 1);
                    }
                } else {
                    flush(&mut mesh, &mut out);
                    let stroke = outline.map_or(Stroke::NONE, |(c, w)| Stroke::new(w, color(c)));
                    out.push(Shape::convex_polygon(
                        points.iter().map(|q| p(*q)).collect(),
                        color(*fill),
                        stroke,
                    ));
                }
            }
            Prim::Image {
                at,
                size,
                pixels,
                rgba,
            } => {
                // One quad per raster cell, merged into the running mesh.
                let (pw, ph) = (pixels[0] as usize, pixels[1] as usize);
                let (cw, ch) = (size[0] / pw.max(1) as f32, size[1] / ph.max(1) as f32);
                for row in 0..ph {
                    for col in 0..pw {
                        let i = (row * pw + col) * 4;
                        let Some(px) = rgba.get(i..i + 4) else {
                            continue;
                        };
                        if px[3] == 0 {
                            continue;
                        }
                        let min = p([at[0] + col as f32 * cw, at[1] + row as f32 * ch]);
                        let cell = Rect::from_min_size(min, egui::vec2(cw, ch));
                        mesh.add_colored_rect(
                            cell,
                            Color32::from_rgba_unmultiplied(px[0], px[1], px[2], px[3]),
                        );
                    }
                }
            }
            Prim::Line {
                a,
                b,
                width,
                color: c,
            } => {
                flush(&mut mesh, &mut out);
                out.push(Shape::line_segment(
                    [p(*a), p(*b)],
                    Stroke::new(*width, color(*c)),
                ));
                // Round caps so that sorted pieces join without gaps.
                out.push(Shape::circle_filled(p(*b), width / 2.0, color(*c)));
            }
            Prim::Text {
                at,
                text,
                size,
                color: c,
                anchor,
                halo,
            } => {
                flush(&mut mesh, &mut out);
                let align = match anchor {
                    Anchor::LeftCenter => Align2::LEFT_CENTER,
                    Anchor::RightCenter => Align2::RIGHT_CENTER,
                    Anchor::Center => Align2::CENTER_CENTER,
                };
                let galley = ctx.fonts_mut(|f| {
                    f.layout_no_wrap(text.clone(), FontId::proportional(*size), color(*c))
                });
                let text_rect = align.anchor_size(p(*at), galley.size());
                if *halo {
                    out.push(Shape::rect_filled(
                        text_rect.expand(1.5),
                        3.0,
                        color(frame.background).gamma_multiply(0.8),
                    ));
                }
                out.push(Shape::galley(text_rect.min, galley, color(*c)));
            }
        }
    }
    flush(&mut mesh, &mut out);
    out
}

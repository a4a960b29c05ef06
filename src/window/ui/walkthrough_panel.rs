//! The Walk-through tab: the shown load case or combination explained in six steps
//! ([`crate::output::walkthrough`]). Each step sets the 3D view's camera (animated from the last
//! one), layers and plane, and says what the picture shows in a sentence or two from the
//! numbers. Keys: → or Space for the next step, ← for the one before, Esc to leave, F11 for the
//! presentation mode (full screen, side panels hidden, larger text). The project is not
//! changed: the steps' planes are only drawn.

use crate::output::walkthrough::{Step, steps};
use crate::picture::draw::camera::Camera;
use crate::picture::draw::{Sizes, egui_backend};
use crate::study::Derived;
use crate::window::session::{Central, Settings};

/// Seconds the camera takes from one step's view to the next.
const CAMERA_SECONDS: f64 = 0.6;

/// Where the walk-through is.
#[derive(Debug, Clone, Default)]
pub struct WalkthroughPanel {
    /// The step shown (0-based).
    pub step: usize,
    /// The camera the animation started from, and when (egui time, seconds).
    from: Option<(Camera, f64)>,
    /// The camera drawn last frame.
    shown: Option<Camera>,
    /// Presentation mode: full screen, side panels hidden, larger text.
    pub presenting: bool,
    /// The window's zoom before presenting, given back after.
    zoom_before: Option<f32>,
}

/// `a` turned towards `b` by the fraction `t` (yaw the short way round).
fn blend(a: &Camera, b: &Camera, t: f64) -> Camera {
    let mut dyaw = (b.yaw_deg - a.yaw_deg) % 360.0;
    if dyaw > 180.0 {
        dyaw -= 360.0;
    } else if dyaw < -180.0 {
        dyaw += 360.0;
    }
    Camera {
        yaw_deg: a.yaw_deg + dyaw * t,
        pitch_deg: a.pitch_deg + (b.pitch_deg - a.pitch_deg) * t,
        ..*b
    }
}

impl WalkthroughPanel {
    /// Goes to step `to` (clamped), animating the camera from where it is.
    pub fn go(&mut self, to: usize, count: usize, now: f64) {
        let to = to.min(count.saturating_sub(1));
        if to != self.step {
            if let Some(c) = self.shown {
                self.from = Some((c, now));
            }
            self.step = to;
        }
    }

    /// The camera for `step` at time `now`, and whether it is still moving.
    #[must_use]
    pub fn camera(&self, step: &Step, now: f64) -> (Camera, bool) {
        match self.from {
            Some((from, started)) => {
                let t = ((now - started) / CAMERA_SECONDS).clamp(0.0, 1.0);
                let eased = t * t * (3.0 - 2.0 * t);
                (blend(&from, &step.camera, eased), t < 1.0)
            }
            None => (step.camera, false),
        }
    }

    /// The tab.
    fn show(&mut self, ui: &mut egui::Ui, d: &Derived, settings: &mut Settings) {
        let all = steps(d);
        let now = ui.input(|i| i.time);
        for act in crate::window::keys::pressed(ui.ctx(), crate::window::keys::Scope::Walkthrough) {
            use crate::window::keys::Act;
            match act {
                Act::StepNext => self.go(self.step + 1, all.len(), now),
                Act::StepBack => self.go(self.step.saturating_sub(1), all.len(), now),
                Act::Present => self.set_presenting(ui.ctx(), !self.presenting),
                Act::Leave if self.presenting => self.set_presenting(ui.ctx(), false),
                Act::Leave => settings.central = Central::View3d,
                _ => {}
            }
        }
        let step = &all[self.step.min(all.len() - 1)];
        ui.horizontal_wrapped(|ui| {
            if ui
                .add_enabled(self.step > 0, egui::Button::new("Back"))
                .on_hover_text("The step before (←)")
                .clicked()
            {
                self.go(self.step.saturating_sub(1), all.len(), now);
            }
            if ui
                .add_enabled(self.step + 1 < all.len(), egui::Button::new("Next"))
                .on_hover_text("The next step (→ or Space)")
                .clicked()
            {
                self.go(self.step + 1, all.len(), now);
            }
            for (i, s) in all.iter().enumerate() {
                if ui
                    .selectable_label(i == self.step, format!("{} {}", i + 1, short(s)))
                    .on_hover_text(&s.title)
                    .clicked()
                {
                    self.go(i, all.len(), now);
                }
            }
            let label = if self.presenting {
                "Leave presentation"
            } else {
                "Present"
            };
            if ui
                .button(label)
                .on_hover_text("Full screen, side panels hidden, larger text (F11; Esc leaves)")
                .clicked()
            {
                self.set_presenting(ui.ctx(), !self.presenting);
            }
        });
        ui.label(
            egui::RichText::new(format!("{}. {}", self.step + 1, step.title))
                .heading()
                .size(18.0),
        );
        ui.label(egui::RichText::new(&step.text).size(14.0));
        let (camera, moving) = self.camera(step, now);
        self.shown = Some(camera);
        if moving {
            ui.ctx().request_repaint();
        }
        let size = ui.available_size().max(egui::vec2(64.0, 64.0));
        let (rect, response) = ui.allocate_exact_size(size, egui::Sense::click());
        let sizes = Sizes {
            line: 1.0,
            text: 13.0,
        };
        let shown = Step {
            camera,
            ..step.clone()
        };
        // A legend that would cover the drawing folds into a Key button, as in the 3D view.
        let key_id = response.id.with("legend-open");
        let key_open = ui.data(|m| m.get_temp::<bool>(key_id).unwrap_or(false));
        let (frame, folds) = crate::output::walkthrough::step_figure_keyed(
            d,
            &shown,
            rect.width() as u32,
            rect.height() as u32,
            sizes,
            key_open,
        );
        ui.painter_at(rect)
            .extend(egui_backend::shapes(&frame, rect, ui.ctx()));
        response.widget_info(|| {
            egui::WidgetInfo::labeled(egui::Role::Image, true, "walk-through picture")
        });
        if response.clicked() {
            self.go(self.step + 1, all.len(), now);
        }
        // The keys on a "?" in the corner, not over the step's words.
        let help = format!(
            "Walk-through step {} of {}: {}. Click the picture, → or Space: next; ←: back; Esc: leave; F11: present.",
            self.step + 1,
            all.len(),
            step.title
        );
        super::corner_controls(ui, rect, &help, "walk-through help", folds, key_id);
    }

    /// Presenting enlarges everything on screen — the picture, its words and every control —
    /// by the window's zoom (1.5 ×), and gives the zoom back after.
    fn set_presenting(&mut self, ctx: &egui::Context, on: bool) {
        if on && !self.presenting {
            self.zoom_before = Some(ctx.zoom_factor());
            ctx.set_zoom_factor(PRESENT_ZOOM * ctx.zoom_factor());
        } else if !on && self.presenting {
            ctx.set_zoom_factor(self.zoom_before.take().unwrap_or(1.0));
        }
        self.presenting = on;
        ctx.send_viewport_cmd(egui::ViewportCommand::Fullscreen(on));
    }
}

/// How much larger everything is while presenting.
const PRESENT_ZOOM: f32 = 1.5;

/// A step's name in the step list.
fn short(step: &Step) -> &'static str {
    use crate::output::walkthrough::StepKind;
    match step.kind {
        StepKind::Element => "Element",
        StepKind::CutPlane => "Cut plane",
        StepKind::Principal => "Principal planes",
        StepKind::MaxShear => "Largest shear",
        StepKind::Worst => "Worst plane",
        StepKind::Verdict => "Verdict",
    }
}

impl super::Panel for WalkthroughPanel {
    fn ui(&mut self, ui: &mut egui::Ui, reads: super::Reads<'_>, writes: &mut super::Writes<'_>) {
        self.show(ui, reads.d, writes.settings);
    }
}

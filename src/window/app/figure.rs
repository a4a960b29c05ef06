//! Which figure the shown tab exports (3D view, orientation map, Mohr circles, the walk-through's
//! step) at the export size, with its captions and title block.

use super::PlanewiseApp;
use crate::study::Derived;
use crate::window::session::Central;

impl PlanewiseApp {
    /// The picture the central area shows (3D view, orientation map or Mohr circles; the 3D
    /// view from the envelope tab) at the export size, from the same drawing code as the screen
    /// and the command line.
    #[must_use]
    pub fn export_frame(&self) -> crate::picture::draw::Frame {
        use crate::picture::figures::{self, FigureInput};
        use crate::study::annotations::FigureKind;
        let [w, h] = self.settings.export_size;
        let d = Derived::new(&self.project);
        let settings = &self.settings;
        let input = FigureInput {
            marked_plane: settings.fatigue_plane.clone(),
            ..FigureInput::from_derived(&d, settings.mohr_envelope)
        };
        let sizes = crate::picture::draw::Sizes::for_export(w as f32, h as f32);
        let kind = match settings.central {
            Central::Map => FigureKind::Map,
            Central::Mohr => FigureKind::Mohr,
            Central::View3d
            | Central::Envelope
            | Central::Faults
            | Central::Walkthrough
            | Central::Table
            | Central::Fatigue => FigureKind::View3d,
        };
        let walk = crate::output::walkthrough::steps(&d);
        let step = &walk[self.walkthrough_panel.step.min(walk.len() - 1)];
        let mut lines = if settings.central == Central::Walkthrough {
            // The step's heading and sentences are the figure's caption.
            vec![
                format!("{}. {}", self.walkthrough_panel.step + 1, step.title),
                step.text.clone(),
            ]
        } else {
            input.captions(kind)
        };
        if settings.title_block {
            lines.extend(figures::title_block_lines(
                Some(&settings.figure_title),
                Some((&self.project.name, &d.name)),
                &input,
                &crate::output::report::today(),
            ));
        }
        figures::titled(&lines, sizes.text, [w, h], |h| match settings.central {
            Central::View3d
            | Central::Envelope
            | Central::Faults
            | Central::Table
            | Central::Fatigue => figures::view_3d(
                &input,
                settings.layers,
                settings.faces,
                &settings.camera,
                w,
                h,
                sizes,
            ),
            Central::Map => figures::map(&input, &d.search, 256, w, h, sizes),
            Central::Mohr => figures::mohr(&input, w, h, sizes),
            Central::Walkthrough => crate::output::walkthrough::step_figure(&d, step, w, h, sizes),
        })
    }

    /// The title exported figures carry: project, shown case and the caution.
    #[must_use]
    pub fn export_title(&self) -> String {
        crate::picture::figures::title(Some((
            &self.project.name,
            self.project.active_name().unwrap_or_default(),
        )))
    }
}

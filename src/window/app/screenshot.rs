//! The `--screenshot` mode and the start of the real window ([`run`]).

use std::path::Path;
use std::sync::Arc;
use std::sync::Mutex;

use super::PlanewiseApp;
use crate::study;
use crate::window::dialogs::NativeDialogs;
use crate::window::session::Central;
use crate::window::session::Settings;

impl PlanewiseApp {
    pub(super) fn screenshot_step(&mut self, ctx: &egui::Context) {
        let Some(job) = &mut self.screenshot else {
            return;
        };
        // Let layout and fonts settle for a few frames before taking the picture.
        // A table named on the command line is read before the picture is taken.
        if !job.requested && self.frames >= 4 && !self.table_panel.reading() {
            job.requested = true;
            let path = job.path.clone();
            let result = Arc::clone(&job.result);
            let repaint = ctx.clone();
            ctx.request_screenshot(move |image| {
                let [w, h] = image.size;
                let outcome =
                    crate::picture::draw::png::encode_rgba(w as u32, h as u32, image.as_raw())
                        .map_err(|e| e.to_string())
                        .and_then(|bytes| {
                            crate::study::atomic::write_atomic(&path, &bytes)
                                .map_err(|e| e.to_string())
                        });
                if let Ok(mut slot) = result.lock() {
                    *slot = Some(outcome);
                }
                repaint.request_repaint();
            });
        }
        let done = job.result.lock().map_or(true, |r| r.is_some());
        if done {
            ctx.send_viewport_cmd(egui::ViewportCommand::Close);
        } else {
            ctx.request_repaint();
        }
    }
}

/// Opens the window. With `screenshot`, writes a PNG of the first complete frame there and exits.
/// `subcommands` are the command line's subcommands, named when the window cannot open (they
/// need no display).
/// The Table tab's start from the command line: `--table` and its unit, and for load cases as
/// tables the id columns, the `--table` file's case and the other (case, file) tables.
pub struct TableStart<'a> {
    /// The table.
    pub path: &'a Path,
    /// Its unit, when said (the table is then read at once).
    pub unit: Option<crate::mechanics::StressUnit>,
    /// Id columns to join on.
    pub ids: Option<String>,
    /// The `--table` file's load case.
    pub first_case: Option<String>,
    /// The other load-case tables.
    pub more: Vec<(String, String)>,
}

/// The Fatigue tab's start from the command line: `--fatigue-history` with its unit, the
/// fatigue limits and (for finite life) the S–N curve, all as typed; the history is judged at
/// once.
pub struct FatigueStart {
    /// The history file (components in time).
    pub path: String,
    /// Its unit.
    pub unit: crate::mechanics::StressUnit,
    /// f₋₁ and t₋₁ as typed.
    pub limits: (String, String),
    /// τ'f and b as typed, for finite life.
    pub sn: Option<(String, String)>,
}

pub fn run(
    screenshot: Option<&Path>,
    tab: Option<Central>,
    project: Option<&Path>,
    table: Option<TableStart<'_>>,
    fatigue: Option<FatigueStart>,
    subcommands: &[String],
) -> anyhow::Result<()> {
    let headless = format!(
        "the subcommands {} need none (see planewise --help)",
        crate::text::format::series(subcommands)
    );
    // A project named on the command line must load before the window opens: a bad file is
    // said on one line, as for every other bad input.
    let project = project
        .map(|path| {
            study::load(path)
                .map(|(p, _)| (p, path.to_path_buf()))
                .map_err(|e| anyhow::anyhow!(e))
        })
        .transpose()?;
    if cfg!(target_os = "linux")
        && std::env::var_os("DISPLAY").is_none()
        && std::env::var_os("WAYLAND_DISPLAY").is_none()
    {
        anyhow::bail!(
            "no display found (neither DISPLAY nor WAYLAND_DISPLAY is set), so the window cannot open; {headless}"
        );
    }
    let options = eframe::NativeOptions {
        viewport: egui::ViewportBuilder::default()
            .with_inner_size([1280.0, 800.0])
            .with_min_inner_size([800.0, 500.0])
            .with_title("Planewise"),
        persist_window: screenshot.is_none(),
        ..Default::default()
    };
    let outcome: Arc<Mutex<Option<Result<(), String>>>> = Arc::new(Mutex::new(None));
    let outcome_for_app = Arc::clone(&outcome);
    let shot = screenshot.map(Path::to_path_buf);
    let table = table.map(|t| (t.path.to_path_buf(), t.unit, t.ids, t.first_case, t.more));
    eframe::run_native(
        "planewise",
        options,
        Box::new(move |cc| {
            // A screenshot run starts from the demo so README images do not depend on what the
            // machine last saved.
            let mut app = if shot.is_some() {
                match project {
                    Some((p, path)) => PlanewiseApp::new(
                        p,
                        Some(path),
                        Settings::default(),
                        Box::new(NativeDialogs),
                    ),
                    None => PlanewiseApp::demo(Box::new(NativeDialogs)),
                }
            } else {
                PlanewiseApp::start(cc.storage, project, eframe::storage_dir("planewise"))
            };
            app.screenshot_outcome = outcome_for_app;
            if let Some(tab) = tab {
                app.settings.central = tab;
            }
            if let Some((path, unit, ids, first_case, more)) = table {
                app.open_table(&path);
                if let Some(ids) = ids {
                    app.table_panel.ids = ids;
                    if let Some(case) = first_case {
                        app.table_panel.first_case = case;
                    }
                    app.table_panel.more_tables = more;
                }
                // A unit said on the command line is the user's: the table is read at once.
                if let Some(unit) = unit {
                    app.table_panel.unit = Some(unit);
                    app.table_panel.start(&cc.egui_ctx, &app.project);
                }
            }
            if let Some(f) = fatigue {
                let panel = &mut app.fatigue_panel;
                panel.path = f.path;
                panel.unit = Some(f.unit);
                (panel.bending, panel.torsion) = f.limits;
                if let Some((coefficient, exponent)) = f.sn {
                    panel.life = true;
                    panel.sn_coefficient = coefficient;
                    panel.sn_exponent = exponent;
                }
                app.settings.central = Central::Fatigue;
                let project = app.project.clone();
                app.fatigue_panel.judge(&project);
            }
            if let Some(path) = shot {
                app.screenshot_on_start(path);
            }
            Ok(Box::new(app))
        }),
    )
    .map_err(|e| {
        // Some back-end errors end in the library's source location; the user needs neither.
        let text = e.to_string();
        let text = text
            .split(" at /")
            .next()
            .unwrap_or(&text)
            .trim()
            .to_owned();
        anyhow::anyhow!("could not open the window ({text}); {headless}")
    })?;
    if screenshot.is_some() {
        let result = outcome
            .lock()
            .map_err(|_| anyhow::anyhow!("screenshot state poisoned"))?
            .take();
        match result {
            Some(Ok(())) => {}
            Some(Err(e)) => anyhow::bail!("screenshot failed: {e}"),
            None => anyhow::bail!("the window closed before the screenshot was taken"),
        }
    }
    Ok(())
}

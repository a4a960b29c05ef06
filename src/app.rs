//! The desktop program: state, the commands the panels return, undo and redo, shortcuts,
//! persistence, figure export and the `--screenshot` mode.

use std::path::{Path, PathBuf};

use std::sync::{Arc, Mutex};

use serde::{Deserialize, Serialize};

use crate::draw::camera::{Camera, ViewPreset};
use crate::mechanics::PlaneNormal;
use crate::scene::SceneInput;
use crate::ui;

/// Version of the saved state; bump it when a change needs migration.
pub const FORMAT_VERSION: u32 = 1;

/// The file name the save dialog and the in-window path entry suggest.
const SUGGESTED_FIGURE_NAME: &str = "planewise-figure.png";

/// Key of the saved state in eframe's storage.
const STORAGE_KEY: &str = "planewise-state";

/// What is saved between runs.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(default)]
pub struct Saved {
    /// Format version.
    pub format_version: u32,
    /// The load case.
    pub document: Document,
    /// Display settings.
    pub settings: Settings,
}

impl Default for Saved {
    fn default() -> Self {
        Self {
            format_version: FORMAT_VERSION,
            document: Document::demo(),
            settings: Settings::default(),
        }
    }
}

/// Undo and redo stacks of documents.
#[derive(Debug, Default)]
pub struct History {
    undo: Vec<Document>,
    redo: Vec<Document>,
    last: Option<Coalesce>,
}

impl History {
    /// Records `before` as the state to return to, unless this edit continues the previous
    /// one in the same field.
    pub fn record(&mut self, before: &Document, coalesce: Option<Coalesce>) {
        const LIMIT: usize = 500;
        if coalesce.is_none() || coalesce != self.last || self.undo.is_empty() {
            self.undo.push(before.clone());
            if self.undo.len() > LIMIT {
                self.undo.remove(0);
            }
        }
        self.last = coalesce;
        self.redo.clear();
    }

    /// Ends any run of merged edits (the next edit starts a new undo step).
    pub fn break_run(&mut self) {
        self.last = None;
    }

    /// Whether there is anything to undo.
    #[must_use]
    pub fn can_undo(&self) -> bool {
        !self.undo.is_empty()
    }

    /// Whether there is anything to redo.
    #[must_use]
    pub fn can_redo(&self) -> bool {
        !self.redo.is_empty()
    }
}

pub use crate::dialogs::{DialogOutcome, Dialogs, NativeDialogs};
pub use crate::session::{
    Central, Coalesce, Command, Document, MeasureChoice, Settings, Status, UNTITLED,
};

/// The `--screenshot` job: when to take it, where to write it, and how it went.
struct ScreenshotJob {
    path: PathBuf,
    requested: bool,
    result: Arc<Mutex<Option<Result<(), String>>>>,
}

/// The application.
pub struct PlanewiseApp {
    /// The load case.
    pub document: Document,
    /// Display settings.
    pub settings: Settings,
    /// Undo and redo.
    pub history: History,
    /// Grid editing state.
    pub stress_panel: ui::stress_panel::StressPanel,
    /// Plane entry state.
    pub plane_panel: ui::plane_panel::PlanePanel,
    /// Export window state.
    pub export_panel: ui::export_panel::ExportPanel,
    /// Whether the About window is open.
    pub about_open: bool,
    /// The last status message.
    pub status: Option<Status>,
    dialogs: Arc<dyn Dialogs>,
    /// The answer of a save dialog running on a worker thread.
    pending_dialog: Option<std::sync::mpsc::Receiver<DialogOutcome>>,
    frames: u64,
    screenshot: Option<ScreenshotJob>,
    /// Outcome of a `--screenshot` run, read by `main` after the window closes.
    pub screenshot_outcome: Arc<Mutex<Option<Result<(), String>>>>,
    fonts_installed: bool,
}

impl PlanewiseApp {
    /// A new app on `saved` state, with the given dialogs.
    #[must_use]
    pub fn new(saved: Saved, dialogs: Box<dyn Dialogs>) -> Self {
        Self {
            document: saved.document,
            settings: saved.settings,
            history: History::default(),
            stress_panel: ui::stress_panel::StressPanel::default(),
            plane_panel: ui::plane_panel::PlanePanel::default(),
            export_panel: ui::export_panel::ExportPanel::default(),
            about_open: false,
            status: None,
            dialogs: Arc::from(dialogs),
            pending_dialog: None,
            frames: 0,
            screenshot: None,
            screenshot_outcome: Arc::new(Mutex::new(None)),
            fonts_installed: false,
        }
    }

    /// The app on the demo, for tests and first runs.
    #[must_use]
    pub fn demo(dialogs: Box<dyn Dialogs>) -> Self {
        Self::new(Saved::default(), dialogs)
    }

    /// Restores the saved state from eframe's storage (the demo when there is none or it cannot
    /// be read).
    #[must_use]
    pub fn from_storage(storage: Option<&dyn eframe::Storage>) -> Self {
        let saved = storage
            .and_then(|s| eframe::get_value::<Saved>(s, STORAGE_KEY))
            .filter(|s| s.format_version <= FORMAT_VERSION)
            .unwrap_or_default();
        Self::new(saved, Box::new(NativeDialogs))
    }

    /// Asks the app to write a PNG of its window once the first frames are complete, then close.
    pub fn screenshot_on_start(&mut self, path: PathBuf) {
        self.screenshot = Some(ScreenshotJob {
            path,
            requested: false,
            result: Arc::clone(&self.screenshot_outcome),
        });
    }

    /// What is saved.
    #[must_use]
    pub fn saved(&self) -> Saved {
        Saved {
            format_version: FORMAT_VERSION,
            document: self.document.clone(),
            settings: self.settings.clone(),
        }
    }

    /// The scene input for the current state, with the worst planes to draw.
    #[must_use]
    pub fn scene_input<'a>(&'a self, worst_planes: &'a [PlaneNormal]) -> SceneInput<'a> {
        SceneInput {
            tensor: &self.document.tensor,
            plane: self.document.plane,
            unit: self.settings.unit,
            convention: self.settings.convention,
            layers: self.settings.layers,
            faces: self.settings.faces,
            worst_planes,
        }
    }

    /// The picture the central area shows (3D view, orientation map or Mohr circles) at the
    /// export size, from the same drawing code as the screen and the command line.
    #[must_use]
    pub fn export_frame(&self) -> crate::draw::Frame {
        let [w, h] = self.settings.export_size;
        let (doc, settings) = (&self.document, &self.settings);
        let sizes = crate::draw::Sizes::for_export(w as f32, h as f32);
        match settings.central {
            Central::View3d => {
                let worst = ui::view_panel::worst_normals(doc, settings);
                crate::draw::figure(&self.scene_input(&worst), &settings.camera, w, h)
            }
            Central::Map => ui::map_panel::map_figure(doc, settings, 256, w, h, sizes),
            Central::Mohr => {
                crate::draw::mohr::mohr_frame(&ui::mohr_panel::figure(doc, settings), w, h, sizes)
            }
        }
    }

    fn set_status(&mut self, text: impl Into<String>, error: bool) {
        self.status = Some(Status {
            text: text.into(),
            error,
        });
    }

    /// Exports the figure to `path` (format from the extension). A failure is said in the
    /// status bar and in the export window.
    pub fn export_to(&mut self, path: &Path) {
        let frame = self.export_frame();
        let title = format!("{} — {}", self.document.name, crate::SAFETY_NOTE);
        match crate::export::write_figure(path, &frame, &title) {
            Ok(()) => {
                self.export_panel.error = None;
                self.set_status(format!("Figure written to {}", path.display()), false);
            }
            Err(e) => {
                self.export_panel.error = Some(e.to_string());
                self.set_status(format!("Export failed: {e}"), true);
            }
        }
    }

    /// Whether a native save dialog is open (on its worker thread).
    #[must_use]
    pub fn dialog_open(&self) -> bool {
        self.pending_dialog.is_some()
    }

    /// Opens the save dialog on a worker thread, so the window keeps drawing meanwhile.
    fn start_save_dialog(&mut self, ctx: &egui::Context) {
        if self.pending_dialog.is_some() {
            return;
        }
        let (tx, rx) = std::sync::mpsc::channel();
        let dialogs = Arc::clone(&self.dialogs);
        let repaint = ctx.clone();
        let spawned = std::thread::Builder::new()
            .name("save-dialog".into())
            .spawn(move || {
                let _ = tx.send(dialogs.save_figure(SUGGESTED_FIGURE_NAME));
                repaint.request_repaint();
            });
        match spawned {
            Ok(_) => self.pending_dialog = Some(rx),
            Err(e) => self.dialog_answered(DialogOutcome::Unavailable(e.to_string())),
        }
    }

    /// Picks up the save dialog's answer, if it has come.
    fn poll_save_dialog(&mut self) {
        let Some(rx) = &self.pending_dialog else {
            return;
        };
        let outcome = match rx.try_recv() {
            Ok(outcome) => outcome,
            Err(std::sync::mpsc::TryRecvError::Empty) => return,
            Err(std::sync::mpsc::TryRecvError::Disconnected) => {
                DialogOutcome::Unavailable("the file dialog ended without an answer".to_owned())
            }
        };
        self.pending_dialog = None;
        self.dialog_answered(outcome);
    }

    fn dialog_answered(&mut self, outcome: DialogOutcome) {
        match outcome {
            DialogOutcome::Chosen(path) => self.export_to(&path),
            DialogOutcome::Cancelled => {}
            DialogOutcome::Unavailable(why) => {
                self.export_panel.open = true;
                self.export_panel.offer_path_entry(
                    &crate::dialogs::fallback_path(SUGGESTED_FIGURE_NAME),
                    why.clone(),
                );
                self.set_status(
                    format!("No file dialog ({why}): type the path in the export window"),
                    true,
                );
            }
        }
    }

    /// Applies one command.
    pub fn apply(&mut self, ctx: &egui::Context, command: Command) {
        match command {
            Command::Edit {
                mut document,
                coalesce,
            } => {
                // Once the demo's stress state is changed, the document is no longer the
                // invented scenario: do not keep its name.
                let demo = Document::demo();
                if document.name == demo.name && document.tensor != demo.tensor {
                    UNTITLED.clone_into(&mut document.name);
                }
                if document != self.document {
                    self.history.record(&self.document, coalesce);
                    self.document = document;
                }
            }
            Command::Undo => self.step_history(true),
            Command::Redo => self.step_history(false),
            Command::ResetToDemo => {
                let demo = Document::demo();
                if demo != self.document {
                    self.history.record(&self.document, None);
                    self.document = demo;
                }
                self.settings = Settings::default();
                self.after_external_change();
                self.set_status("Reset to the demo load case (an invented scenario)", false);
            }
            Command::SetUnit(unit) => {
                self.settings.unit = unit;
                self.after_external_change();
            }
            Command::SetConvention(convention) => {
                self.settings.convention = convention;
                self.after_external_change();
            }
            Command::SetView(preset) => {
                let projection = self.settings.camera.projection;
                self.settings.camera = Camera {
                    projection,
                    ..Camera::from_preset(preset)
                };
            }
            Command::CopyResults => {
                let rows = crate::results::rows(
                    &self.document.tensor,
                    self.document.plane,
                    self.settings.unit,
                    self.settings.convention,
                );
                ctx.copy_text(crate::results::to_tsv(
                    &rows,
                    self.settings.unit,
                    self.settings.convention,
                ));
                self.set_status("Results copied as tab-separated text", false);
            }
            Command::CopyFigure => match crate::draw::png::to_pixmap(&crate::export::with_caution(
                &self.export_frame(),
            )) {
                Ok(pixmap) => {
                    let image = egui::ColorImage::from_rgba_premultiplied(
                        [pixmap.width() as usize, pixmap.height() as usize],
                        pixmap.data(),
                    );
                    ctx.copy_image(image);
                    self.set_status(
                        "Figure copied to the clipboard (where the platform allows images)",
                        false,
                    );
                }
                Err(e) => self.set_status(format!("Copy figure failed: {e}"), true),
            },
            Command::OpenExport => self.export_panel.open = true,
            Command::ExportWithDialog => self.start_save_dialog(ctx),
            Command::ExportTo(path) => self.export_to(&path),
            Command::ShowAbout => self.about_open = true,
        }
    }

    /// Moves one step back (undo) or forward (redo) through the history.
    fn step_history(&mut self, back: bool) {
        let history = &mut self.history;
        let (from, to) = if back {
            (&mut history.undo, &mut history.redo)
        } else {
            (&mut history.redo, &mut history.undo)
        };
        if let Some(document) = from.pop() {
            to.push(std::mem::replace(&mut self.document, document));
            self.history.break_run();
            self.after_external_change();
        }
    }

    /// The grid and plane fields show the document again (after undo, presets, unit changes).
    fn after_external_change(&mut self) {
        self.stress_panel.reset();
        self.plane_panel.reset();
    }

    /// Keyboard shortcuts that work anywhere in the window.
    fn shortcuts(ctx: &egui::Context) -> Vec<Command> {
        use egui::{Key, Modifiers};
        use ui::shortcuts::{COPY_RESULTS, EXPORT, REDO, REDO_ALT, UNDO};
        let mut out = Vec::new();
        ctx.input_mut(|i| {
            // Redo first: Ctrl+Shift+Z must not be taken as Ctrl+Z.
            if i.consume_shortcut(&REDO) || i.consume_shortcut(&REDO_ALT) {
                out.push(Command::Redo);
            }
            if i.consume_shortcut(&UNDO) {
                out.push(Command::Undo);
            }
            if i.consume_shortcut(&EXPORT) {
                out.push(Command::OpenExport);
            }
            if i.consume_shortcut(&COPY_RESULTS) {
                out.push(Command::CopyResults);
            }
        });
        // View presets on plain digit keys, only when no text field has the keyboard.
        if !ctx.egui_wants_keyboard_input() {
            let keys = [
                Key::Num1,
                Key::Num2,
                Key::Num3,
                Key::Num4,
                Key::Num5,
                Key::Num6,
                Key::Num7,
            ];
            for (key, preset) in keys.into_iter().zip(ViewPreset::ALL) {
                if ctx.input_mut(|i| i.consume_key(Modifiers::NONE, key)) {
                    out.push(Command::SetView(preset));
                }
            }
        }
        out
    }

    fn install_fonts(&mut self, ctx: &egui::Context) {
        if self.fonts_installed {
            return;
        }
        self.fonts_installed = true;
        // The bundled export font first, so that the screen and exported figures match.
        let mut fonts = egui::FontDefinitions::default();
        fonts.font_data.insert(
            "dejavu".to_owned(),
            Arc::new(egui::FontData::from_static(crate::draw::png::FONT)),
        );
        if let Some(family) = fonts.families.get_mut(&egui::FontFamily::Proportional) {
            family.insert(0, "dejavu".to_owned());
        }
        ctx.set_fonts(fonts);
    }

    /// Draws the whole window into `ui` and applies what the user asked for. Used by the real
    /// window and by the interaction tests.
    pub fn show(&mut self, ui: &mut egui::Ui) {
        let ctx = ui.ctx().clone();
        self.install_fonts(&ctx);
        self.poll_save_dialog();
        let mut commands = Self::shortcuts(&ctx);
        let history = (self.history.can_undo(), self.history.can_redo());
        ui::menus_ui(ui, &mut self.settings, history, &mut commands);
        ui::status_bar_ui(ui, &self.settings, self.status.as_ref());
        egui::Panel::left("stress-state")
            .resizable(true)
            .default_size(330.0)
            .show(ui, |ui| {
                egui::ScrollArea::vertical().show(ui, |ui| {
                    let (doc, settings) = (&self.document, &self.settings);
                    self.stress_panel.ui(ui, doc, settings, &mut commands);
                    ui.separator();
                    self.plane_panel.ui(ui, doc, settings, &mut commands);
                    ui.separator();
                    ui::map_panel::worst_plane_ui(
                        ui,
                        &self.document,
                        &mut self.settings,
                        &mut commands,
                    );
                });
            });
        egui::Panel::right("results")
            .resizable(true)
            .default_size(330.0)
            .show(ui, |ui| {
                egui::ScrollArea::vertical().show(ui, |ui| {
                    ui::results_panel::results_ui(
                        ui,
                        &self.document,
                        &self.settings,
                        &mut commands,
                    );
                });
            });
        egui::CentralPanel::default().show(ui, |ui| {
            ui.horizontal(|ui| {
                ui.selectable_value(&mut self.settings.central, Central::View3d, "3D view");
                ui.selectable_value(&mut self.settings.central, Central::Map, "Orientation map");
                ui.selectable_value(&mut self.settings.central, Central::Mohr, "Mohr circles");
            });
            match self.settings.central {
                Central::View3d => {
                    ui::view_panel::view_ui(ui, &self.document, &mut self.settings, &mut commands);
                }
                Central::Map => {
                    ui::map_panel::map_ui(ui, &self.document, &self.settings, &mut commands);
                }
                Central::Mohr => {
                    ui::mohr_panel::mohr_ui(ui, &self.document, &mut self.settings, &mut commands);
                }
            }
        });
        let dialog_open = self.pending_dialog.is_some();
        self.export_panel
            .ui(&ctx, &mut self.settings, dialog_open, &mut commands);
        ui::about_ui(&ctx, &mut self.about_open);
        for command in commands {
            self.apply(&ctx, command);
        }
        self.frames += 1;
    }

    fn screenshot_step(&mut self, ctx: &egui::Context) {
        let Some(job) = &mut self.screenshot else {
            return;
        };
        // Let layout and fonts settle for a few frames before taking the picture.
        if !job.requested && self.frames >= 4 {
            job.requested = true;
            let path = job.path.clone();
            let result = Arc::clone(&job.result);
            let repaint = ctx.clone();
            ctx.request_screenshot(move |image| {
                let [w, h] = image.size;
                let outcome = crate::draw::png::encode_rgba(w as u32, h as u32, image.as_raw())
                    .map_err(|e| e.to_string())
                    .and_then(|bytes| {
                        crate::export::write_atomic(&path, &bytes).map_err(|e| e.to_string())
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

impl eframe::App for PlanewiseApp {
    fn ui(&mut self, ui: &mut egui::Ui, _frame: &mut eframe::Frame) {
        self.show(ui);
        let ctx = ui.ctx().clone();
        self.screenshot_step(&ctx);
        let title = format!("Planewise — {}", self.document.name);
        ctx.send_viewport_cmd(egui::ViewportCommand::Title(title));
    }

    fn save(&mut self, storage: &mut dyn eframe::Storage) {
        if self.screenshot.is_none() {
            eframe::set_value(storage, STORAGE_KEY, &self.saved());
        }
    }
}

/// Opens the window. With `screenshot`, writes a PNG of the first complete frame there and exits.
pub fn run(screenshot: Option<&Path>, tab: Option<Central>) -> anyhow::Result<()> {
    const HEADLESS: &str = "the headless subcommands analyze, figure, worst-plane, map and mohr need none (see planewise --help)";
    if cfg!(target_os = "linux")
        && std::env::var_os("DISPLAY").is_none()
        && std::env::var_os("WAYLAND_DISPLAY").is_none()
    {
        anyhow::bail!(
            "no display found (neither DISPLAY nor WAYLAND_DISPLAY is set), so the window cannot open; {HEADLESS}"
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
    eframe::run_native(
        "planewise",
        options,
        Box::new(move |cc| {
            // A screenshot run starts from the demo so README images do not depend on what the
            // machine last saved.
            let mut app = if shot.is_some() {
                PlanewiseApp::demo(Box::new(NativeDialogs))
            } else {
                PlanewiseApp::from_storage(cc.storage)
            };
            app.screenshot_outcome = outcome_for_app;
            if let Some(tab) = tab {
                app.settings.central = tab;
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
        anyhow::anyhow!("could not open the window ({text}); {HEADLESS}")
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

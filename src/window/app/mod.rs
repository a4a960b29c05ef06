//! The app shell: [`PlanewiseApp`] holds the open project and its file, undo and redo, the
//! panels' own state, the view settings kept between runs and what waits for an answer. Its
//! jobs are split by file: `layout.rs` draws the window each frame, the
//! commands it gets back are applied in `commands.rs`, file and dialog flows and autosave live
//! in `files.rs`, the figure the shown tab exports in `figure.rs`, and the `--screenshot` mode
//! and the start of the window in `screenshot.rs`. Panels never import this module: they read
//! the study and the session and return [`Command`]s.

use std::path::PathBuf;

use std::sync::{Arc, Mutex};

use serde::{Deserialize, Serialize};

use crate::mechanics::StressTensor;
use crate::picture::scene::SceneInput;
use crate::study::{self, Derived, DerivedCache, Project};
use crate::window::ui;

mod commands;
mod figure;
mod files;
mod layout;
mod screenshot;

pub use screenshot::{FatigueStart, TableStart, run};

/// Version of the saved view state; bump it when a change needs migration.
pub const FORMAT_VERSION: u32 = 2;

/// The file name the save dialog and the in-window path entry suggest.
const SUGGESTED_FIGURE_NAME: &str = "planewise-figure.png";

/// The file a start writes in the data folder and removes once its first frames are drawn.
const STARTING_MARKER: &str = "starting.txt";

/// Key of the saved state in eframe's storage.
const STORAGE_KEY: &str = "planewise-state";

/// What is kept between runs in the window's own storage: view settings and the project file
/// that was open. The project itself lives in its file (and, while unsaved, the working copy).
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(default)]
pub struct Saved {
    /// Format version.
    pub format_version: u32,
    /// Display settings.
    pub settings: Settings,
    /// The project file open at exit, reopened at start.
    pub file: Option<PathBuf>,
}

impl Default for Saved {
    fn default() -> Self {
        Self {
            format_version: FORMAT_VERSION,
            settings: Settings::default(),
            file: None,
        }
    }
}

pub use crate::window::dialogs::{DialogOutcome, Dialogs, NativeDialogs};
pub use crate::window::session::{
    Answer, Central, Coalesce, Command, Leaving, Settings, Status, UNTITLED,
};

/// Undo and redo of the project.
pub type History = study::History<Project, Coalesce>;

/// What needs the egui context after the unsaved-changes question was answered.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
enum FollowUp {
    OpenDialog,
    Close,
}

/// What a native dialog running on the worker thread was asked for.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
enum DialogPurpose {
    Figure,
    OpenProject,
    SaveProject,
    Report,
    Table,
}

/// The `--screenshot` job: when to take it, where to write it, and how it went.
struct ScreenshotJob {
    path: PathBuf,
    requested: bool,
    result: Arc<Mutex<Option<Result<(), String>>>>,
}

/// Which Help windows are open.
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq)]
pub struct HelpWindows {
    /// About Planewise.
    pub about: bool,
    /// Keys and mouse.
    pub keys: bool,
}

/// The application.
pub struct PlanewiseApp {
    /// The open project (what undo acts on).
    pub project: Project,
    /// Its file, once opened from or saved to one.
    pub file: Option<PathBuf>,
    /// The project as last opened or saved: unsaved changes are the difference.
    clean: Project,
    /// Display settings.
    pub settings: Settings,
    /// Undo and redo.
    pub history: History,
    /// The shown state's results, computed once per change.
    pub derived: DerivedCache,
    /// Grid editing state.
    pub stress_panel: ui::stress_panel::StressPanel,
    /// Plane entry state.
    pub plane_panel: ui::plane_panel::PlanePanel,
    /// The faults tab.
    pub faults_panel: ui::faults_panel::FaultsPanel,
    /// A load case's input form.
    pub input_panel: ui::input_panel::InputPanel,
    /// The material editor.
    pub material_panel: ui::verdict_panel::MaterialPanel,
    /// Load cases and combinations.
    pub cases_panel: ui::cases_panel::CasesPanel,
    /// The envelope tab.
    pub envelope_panel: ui::envelope_panel::EnvelopePanel,
    /// The Walk-through tab.
    pub walkthrough_panel: ui::walkthrough_panel::WalkthroughPanel,
    /// The Table tab.
    pub table_panel: ui::table_panel::TablePanel,
    /// The Fatigue tab.
    pub fatigue_panel: ui::fatigue_panel::FatiguePanel,
    /// Export window state.
    pub export_panel: ui::export_panel::ExportPanel,
    /// The in-window path entry for projects when no dialog opens.
    pub file_prompt: ui::file_prompt::FilePrompt,
    /// Whether the About window is open.
    pub help: HelpWindows,
    /// The last status message.
    pub status: Option<Status>,
    /// The unsaved-changes question, while it is asked.
    pub leaving: Option<Leaving>,
    /// What to do once the project is saved (the answer "Save" to the question).
    after_save: Option<Leaving>,
    /// The window may close (no unsaved changes, or the user said so).
    close_allowed: bool,
    /// Where the working copy is autosaved (`None`: no autosave).
    autosave_dir: Option<PathBuf>,
    /// The start marker to remove once the first frames are drawn.
    start_marker: Option<PathBuf>,
    /// The working copy found at start, offered back.
    pub recovery: Option<crate::window::autosave::WorkingCopy>,
    /// What `go` left to do once the current command is done.
    follow_up: Option<FollowUp>,
    /// Time (egui seconds) and content of the last autosave.
    last_autosave: (f64, Option<Project>),
    dialogs: Arc<dyn Dialogs>,
    /// The answer of a native dialog running on a worker thread.
    pending_dialog: Option<(DialogPurpose, std::sync::mpsc::Receiver<DialogOutcome>)>,
    frames: u64,
    screenshot: Option<ScreenshotJob>,
    /// Outcome of a `--screenshot` run, read by `main` after the window closes.
    pub screenshot_outcome: Arc<Mutex<Option<Result<(), String>>>>,
    fonts_installed: bool,
}

impl PlanewiseApp {
    /// A new app on `project` (from `file`, if any) with `settings` and the given dialogs.
    #[must_use]
    pub fn new(
        project: Project,
        file: Option<PathBuf>,
        settings: Settings,
        dialogs: Box<dyn Dialogs>,
    ) -> Self {
        Self {
            walkthrough_panel: ui::walkthrough_panel::WalkthroughPanel::default(),
            table_panel: ui::table_panel::TablePanel::default(),
            fatigue_panel: ui::fatigue_panel::FatiguePanel::default(),
            clean: project.clone(),
            project,
            file,
            settings,
            history: History::default(),
            derived: DerivedCache::default(),
            stress_panel: ui::stress_panel::StressPanel::default(),
            plane_panel: ui::plane_panel::PlanePanel::default(),
            cases_panel: ui::cases_panel::CasesPanel::default(),
            material_panel: ui::verdict_panel::MaterialPanel::default(),
            input_panel: ui::input_panel::InputPanel::default(),
            faults_panel: ui::faults_panel::FaultsPanel::default(),
            envelope_panel: ui::envelope_panel::EnvelopePanel::default(),
            export_panel: ui::export_panel::ExportPanel::default(),
            file_prompt: ui::file_prompt::FilePrompt::default(),
            help: HelpWindows::default(),
            status: None,
            leaving: None,
            after_save: None,
            close_allowed: false,
            autosave_dir: None,
            start_marker: None,
            recovery: None,
            last_autosave: (0.0, None),
            follow_up: None,
            dialogs: Arc::from(dialogs),
            pending_dialog: None,
            frames: 0,
            screenshot: None,
            screenshot_outcome: Arc::new(Mutex::new(None)),
            fonts_installed: false,
        }
    }

    /// The app on the demo project, for tests and first runs.
    #[must_use]
    pub fn demo(dialogs: Box<dyn Dialogs>) -> Self {
        Self::new(Project::demo(), None, Settings::default(), dialogs)
    }

    /// Restores the view settings from eframe's storage and opens, in this order: `project`
    /// (from the command line), the project open at the last exit, or the demo. A working copy
    /// left by a run that did not end cleanly is offered back.
    #[must_use]
    pub fn start(
        storage: Option<&dyn eframe::Storage>,
        project: Option<(Project, PathBuf)>,
        autosave_dir: Option<PathBuf>,
    ) -> Self {
        let saved = storage
            .and_then(|s| eframe::get_value::<Saved>(s, STORAGE_KEY))
            .filter(|s| s.format_version <= FORMAT_VERSION)
            .unwrap_or_default();
        // A start that did not reach its first frames leaves its marker behind: then the file it
        // was opening is not reopened (it may be what stopped it), and the window says so.
        let marker = autosave_dir.as_ref().map(|d| d.join(STARTING_MARKER));
        let unfinished = marker
            .as_ref()
            .and_then(|m| std::fs::read_to_string(m).ok());
        let mut note = None;
        let (project, file) = match project {
            Some((p, path)) => (p, Some(path)),
            None => match (&saved.file, unfinished) {
                (Some(path), Some(_)) => {
                    note = Some(format!(
                        "The last start did not finish while opening {}; it was not reopened and the demo is shown (File → Open opens it again)",
                        path.display()
                    ));
                    (Project::demo(), None)
                }
                (Some(path), None) => match study::load(path) {
                    Ok((p, _)) => (p, Some(path.clone())),
                    Err(e) => {
                        note = Some(format!("Could not reopen the last project: {e}"));
                        (Project::demo(), None)
                    }
                },
                (None, _) => (Project::demo(), None),
            },
        };
        if let Some(m) = &marker {
            let what = file
                .as_ref()
                .map_or_else(|| "the demo".to_owned(), |f| f.display().to_string());
            if let Some(dir) = m.parent() {
                let _ = std::fs::create_dir_all(dir);
            }
            let _ = std::fs::write(m, what);
        }
        let mut app = Self::new(project, file, saved.settings, Box::new(NativeDialogs));
        app.start_marker = marker;
        if let Some(note) = note {
            app.set_status(note, true);
        }
        if let Some(dir) = autosave_dir {
            match crate::window::autosave::read(&dir) {
                Ok(copy) => app.recovery = copy,
                Err(message) => app.set_status(message, true),
            }
            app.autosave_dir = Some(dir);
        }
        app
    }

    /// Autosave the working copy to `dir` (tests point it at a temporary folder).
    pub fn set_autosave_dir(&mut self, dir: Option<PathBuf>) {
        self.autosave_dir = dir;
    }

    /// Asks the app to write a PNG of its window once the first frames are complete, then close.
    pub fn screenshot_on_start(&mut self, path: PathBuf) {
        self.screenshot = Some(ScreenshotJob {
            path,
            requested: false,
            result: Arc::clone(&self.screenshot_outcome),
        });
    }

    /// What is saved in the window's storage.
    #[must_use]
    pub fn saved(&self) -> Saved {
        Saved {
            format_version: FORMAT_VERSION,
            settings: self.settings.clone(),
            file: self.file.clone(),
        }
    }

    /// Opens the Table tab on `path` with its preview (`--table`): no ranking yet, since the
    /// table's unit is the user's to choose first.
    pub fn open_table(&mut self, path: &std::path::Path) {
        self.settings.central = Central::Table;
        self.table_panel.load_preview(&path.display().to_string());
    }

    /// Whether the project has changes not saved to its file.
    #[must_use]
    pub fn dirty(&self) -> bool {
        // Which case is shown is saved in the file but is not a change worth a question.
        self.project != self.clean
            && Project {
                active: self.clean.active.clone(),
                ..self.project.clone()
            } != self.clean
    }

    /// The tensor of the shown case or combination (pascals, tension positive).
    #[must_use]
    pub fn tensor(&self) -> StressTensor {
        self.project
            .active_name()
            .and_then(|n| self.project.tensor(n).ok())
            .unwrap_or_default()
    }

    /// The window title: an unsaved-changes mark, the project's name and its file.
    #[must_use]
    pub fn title(&self) -> String {
        let file = self.file.as_ref().map_or_else(
            || "not saved to a file".to_owned(),
            |p| {
                p.file_name()
                    .map_or_else(|| p.display().to_string(), |n| n.to_string_lossy().into())
            },
        );
        let mark = if self.dirty() { "● " } else { "" };
        format!("{mark}{} ({file}) — Planewise", self.project.name)
    }

    /// The scene input for `d`, with the worst planes to draw.
    #[must_use]
    pub fn scene_input<'a>(
        &'a self,
        d: &'a Derived,
        worst_planes: &'a [crate::mechanics::PlaneNormal],
    ) -> SceneInput<'a> {
        SceneInput {
            tensor: &d.tensor,
            plane: d.plane,
            unit: d.unit,
            convention: d.convention,
            layers: self.settings.layers,
            faces: self.settings.faces,
            worst_planes,
            marked_plane: self
                .settings
                .fatigue_plane
                .as_ref()
                .map(|(n, label)| (*n, label.as_str())),
        }
    }

    fn set_status(&mut self, text: impl Into<String>, error: bool) {
        self.status = Some(Status {
            text: text.into(),
            error,
        });
    }

    /// Whether a native dialog is open (on its worker thread).
    #[must_use]
    pub fn dialog_open(&self) -> bool {
        self.pending_dialog.is_some()
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
            Arc::new(egui::FontData::from_static(crate::picture::draw::png::FONT)),
        );
        if let Some(family) = fonts.families.get_mut(&egui::FontFamily::Proportional) {
            family.insert(0, "dejavu".to_owned());
        }
        ctx.set_fonts(fonts);
    }
}

impl eframe::App for PlanewiseApp {
    fn ui(&mut self, ui: &mut egui::Ui, _frame: &mut eframe::Frame) {
        self.show(ui);
        let ctx = ui.ctx().clone();
        self.screenshot_step(&ctx);
        ctx.send_viewport_cmd(egui::ViewportCommand::Title(self.title()));
    }

    fn save(&mut self, storage: &mut dyn eframe::Storage) {
        if self.screenshot.is_none() {
            eframe::set_value(storage, STORAGE_KEY, &self.saved());
        }
    }
}

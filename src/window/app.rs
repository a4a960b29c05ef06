//! The desktop program: the open project and its file, undo and redo, the commands the panels
//! return, shortcuts, the unsaved-changes question, autosave and recovery, the view settings
//! kept between runs, figure export and the `--screenshot` mode.

use std::path::{Path, PathBuf};

use std::sync::{Arc, Mutex};

use serde::{Deserialize, Serialize};

use crate::mechanics::StressTensor;
use crate::picture::draw::camera::Camera;
use crate::picture::scene::SceneInput;
use crate::study::{self, Derived, DerivedCache, Edit, Project};
use crate::window::ui;
use crate::window::ui::file_prompt::PromptPurpose;

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
        }
    }

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
        let input = FigureInput::from_derived(&d, settings.mohr_envelope);
        let sizes = crate::picture::draw::Sizes::for_export(w as f32, h as f32);
        let kind = match settings.central {
            Central::Map => FigureKind::Map,
            Central::Mohr => FigureKind::Mohr,
            Central::View3d
            | Central::Envelope
            | Central::Faults
            | Central::Walkthrough
            | Central::Table => FigureKind::View3d,
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
            Central::View3d | Central::Envelope | Central::Faults | Central::Table => {
                figures::view_3d(
                    &input,
                    settings.layers,
                    settings.faces,
                    &settings.camera,
                    w,
                    h,
                    sizes,
                )
            }
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
        match crate::output::export::write_figure(path, &frame, &self.export_title()) {
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

    /// Whether a native dialog is open (on its worker thread).
    #[must_use]
    pub fn dialog_open(&self) -> bool {
        self.pending_dialog.is_some()
    }

    /// The file name the project's save dialog suggests.
    fn suggested_project_name(&self) -> String {
        let stem: String = self
            .project
            .name
            .chars()
            .map(|c| {
                if c.is_alphanumeric() || c == '-' {
                    c
                } else {
                    '-'
                }
            })
            .collect();
        let stem = stem.trim_matches('-');
        let stem = if stem.is_empty() { "project" } else { stem };
        format!("{}.json", stem.chars().take(60).collect::<String>())
    }

    /// Opens a native dialog on a worker thread, so the window keeps drawing meanwhile.
    fn start_dialog(&mut self, ctx: &egui::Context, purpose: DialogPurpose) {
        if self.pending_dialog.is_some() {
            return;
        }
        let (tx, rx) = std::sync::mpsc::channel();
        let dialogs = Arc::clone(&self.dialogs);
        let repaint = ctx.clone();
        let project_name = self.suggested_project_name();
        let spawned = std::thread::Builder::new()
            .name("file-dialog".into())
            .spawn(move || {
                let outcome = match purpose {
                    DialogPurpose::Figure => dialogs.save_figure(SUGGESTED_FIGURE_NAME),
                    DialogPurpose::OpenProject => dialogs.open_project(),
                    DialogPurpose::Table => dialogs.open_table(),
                    DialogPurpose::SaveProject => dialogs.save_project(&project_name),
                    DialogPurpose::Report => {
                        dialogs.save_report(&project_name.replace(".json", "-report.html"))
                    }
                };
                let _ = tx.send(outcome);
                repaint.request_repaint();
            });
        match spawned {
            Ok(_) => self.pending_dialog = Some((purpose, rx)),
            Err(e) => self.dialog_answered(purpose, DialogOutcome::Unavailable(e.to_string())),
        }
    }

    /// Picks up the dialog's answer, if it has come.
    fn poll_dialog(&mut self) {
        let Some((purpose, rx)) = &self.pending_dialog else {
            return;
        };
        let purpose = *purpose;
        let outcome = match rx.try_recv() {
            Ok(outcome) => outcome,
            Err(std::sync::mpsc::TryRecvError::Empty) => return,
            Err(std::sync::mpsc::TryRecvError::Disconnected) => {
                DialogOutcome::Unavailable("the file dialog ended without an answer".to_owned())
            }
        };
        self.pending_dialog = None;
        self.dialog_answered(purpose, outcome);
    }

    fn dialog_answered(&mut self, purpose: DialogPurpose, outcome: DialogOutcome) {
        match (purpose, outcome) {
            (DialogPurpose::Figure, DialogOutcome::Chosen(path)) => self.export_to(&path),
            (DialogPurpose::OpenProject, DialogOutcome::Chosen(path)) => self.open_path(&path),
            (DialogPurpose::SaveProject, DialogOutcome::Chosen(path)) => self.save_to(&path),
            (DialogPurpose::Report, DialogOutcome::Chosen(path)) => self.report_to(&path),
            (DialogPurpose::Table, DialogOutcome::Chosen(path)) => {
                self.settings.central = Central::Table;
                self.table_panel.load_preview(&path.display().to_string());
            }
            (DialogPurpose::Table, DialogOutcome::Unavailable(why)) => {
                self.settings.central = Central::Table;
                self.set_status(
                    format!("No file dialog ({why}): type the table's path in the Table tab"),
                    false,
                );
            }
            (DialogPurpose::SaveProject, DialogOutcome::Cancelled) => self.after_save = None,
            (_, DialogOutcome::Cancelled) => {}
            (DialogPurpose::Figure, DialogOutcome::Unavailable(why)) => {
                self.export_panel.open = true;
                self.export_panel.offer_path_entry(
                    &crate::window::dialogs::fallback_path(SUGGESTED_FIGURE_NAME),
                    why.clone(),
                );
                self.set_status(
                    format!("No file dialog ({why}): type the path in the export window"),
                    true,
                );
            }
            (project_purpose, DialogOutcome::Unavailable(why)) => {
                let (prompt, suggested) = if project_purpose == DialogPurpose::OpenProject {
                    (
                        PromptPurpose::Open,
                        crate::window::dialogs::fallback_path(""),
                    )
                } else if project_purpose == DialogPurpose::Report {
                    let name = self
                        .suggested_project_name()
                        .replace(".json", "-report.html");
                    (
                        PromptPurpose::Report,
                        crate::window::dialogs::fallback_path(&name),
                    )
                } else {
                    let name = self.suggested_project_name();
                    let path = self
                        .file
                        .clone()
                        .unwrap_or_else(|| crate::window::dialogs::fallback_path(&name));
                    (PromptPurpose::SaveAs, path)
                };
                self.file_prompt.offer(prompt, &suggested, why.clone());
                self.set_status(format!("No file dialog ({why}): type the path"), true);
            }
        }
    }

    /// Opens a project file; a failure is said and changes nothing.
    pub fn open_path(&mut self, path: &Path) {
        match study::load(path) {
            Ok((project, warnings)) => {
                self.replace_project(project, Some(path.to_owned()));
                self.settings.remember(path);
                self.file_prompt.close();
                if warnings.is_empty() {
                    self.set_status(format!("Opened {}", path.display()), false);
                } else {
                    self.set_status(
                        format!("Opened {} ({})", path.display(), warnings.join("; ")),
                        true,
                    );
                }
            }
            Err(e) => {
                self.file_prompt.error = Some(e.to_string());
                self.set_status(format!("Not opened: {e}"), true);
            }
        }
    }

    /// Saves the project to `path`; on success the file becomes the project's file, and what
    /// waited for the save (new, open, quit) goes ahead.
    pub fn save_to(&mut self, path: &Path) {
        match study::save(path, &self.project) {
            Ok(()) => {
                self.file = Some(path.to_owned());
                self.clean = self.project.clone();
                self.settings.remember(path);
                self.file_prompt.close();
                if let Some(dir) = &self.autosave_dir {
                    crate::window::autosave::clear(dir);
                }
                self.set_status(format!("Saved {}", path.display()), false);
                if let Some(next) = self.after_save.take() {
                    self.go(next);
                }
            }
            Err(e) => {
                self.after_save = None;
                self.file_prompt.error = Some(e.to_string());
                self.set_status(format!("Not saved: {e}"), true);
            }
        }
    }

    /// Writes the calculation report of the whole project to `path` (HTML, atomically).
    pub fn report_to(&mut self, path: &Path) {
        // The file is named (with its SHA-256) only when the report is of it as saved.
        let source = self
            .file
            .as_ref()
            .filter(|_| !self.dirty())
            .and_then(|f| crate::output::report::SourceFile::read(f).ok());
        let options = crate::output::report::ReportOptions {
            source,
            ..crate::output::report::ReportOptions::default()
        };
        let written = crate::output::report::html(&self.project, &options)
            .map_err(|e| e.to_string())
            .and_then(|text| {
                crate::study::atomic::write_atomic(path, text.as_bytes()).map_err(|e| e.to_string())
            });
        match written {
            Ok(()) => {
                self.file_prompt.close();
                self.set_status(format!("Report written to {}", path.display()), false);
            }
            Err(e) => {
                self.file_prompt.error = Some(e.clone());
                self.set_status(format!("Report not written: {e}"), true);
            }
        }
    }

    /// A project replaces the open one: no undo across projects.
    fn replace_project(&mut self, project: Project, file: Option<PathBuf>) {
        self.clean = project.clone();
        self.project = project;
        self.file = file;
        self.history.clear();
        self.after_external_change();
    }

    /// Does what the unsaved-changes question was about (or what needed no question).
    fn go(&mut self, what: Leaving) {
        self.leaving = None;
        match what {
            Leaving::New => {
                let mut project = Project::new(
                    UNTITLED,
                    self.project.unit().unwrap_or_default(),
                    self.project.convention(),
                );
                if let Ok(p) = Edit::AddCase.apply(&project) {
                    project = p;
                }
                self.replace_project(project, None);
                self.set_status("New project with one load case (zero stress)", false);
            }
            Leaving::Open => self.follow_up = Some(FollowUp::OpenDialog),
            Leaving::OpenPath(path) => self.open_path(&path),
            Leaving::Demo => {
                self.replace_project(Project::demo(), None);
                self.set_status("Opened the demo project (an invented scenario)", false);
            }
            Leaving::Quit => {
                self.close_allowed = true;
                if let Some(dir) = &self.autosave_dir {
                    crate::window::autosave::clear(dir);
                }
                self.follow_up = Some(FollowUp::Close);
            }
        }
    }

    /// Goes ahead at once when nothing is unsaved; asks first otherwise.
    fn leave(&mut self, what: Leaving) {
        if self.dirty() {
            self.leaving = Some(what);
        } else {
            self.go(what);
        }
    }

    /// Applies one command.
    pub fn apply(&mut self, ctx: &egui::Context, command: Command) {
        match command {
            Command::Edit { edit, coalesce } => self.edit(&edit, coalesce),
            Command::Undo => self.step_history(true),
            Command::Redo => self.step_history(false),
            Command::SetView(preset) => {
                let projection = self.settings.camera.projection;
                self.settings.camera = Camera {
                    projection,
                    ..Camera::from_preset(preset)
                };
            }
            Command::NewProject => self.leave(Leaving::New),
            Command::OpenProject => self.leave(Leaving::Open),
            Command::OpenPath(path) => {
                if self.file_prompt.purpose == Some(PromptPurpose::Open) {
                    // Typed in the path entry, after any question was answered.
                    self.open_path(&path);
                } else {
                    self.leave(Leaving::OpenPath(path));
                }
            }
            Command::OpenDemo => self.leave(Leaving::Demo),
            Command::Save => match self.file.clone() {
                Some(path) => self.save_to(&path),
                None => self.start_dialog(ctx, DialogPurpose::SaveProject),
            },
            Command::SaveAs => self.start_dialog(ctx, DialogPurpose::SaveProject),
            Command::SaveTo(path) => self.save_to(&path),
            Command::ExportReport => self.start_dialog(ctx, DialogPurpose::Report),
            Command::ReportTo(path) => self.report_to(&path),
            Command::CopyTable(table, format) => {
                ctx.copy_text(table.write(format));
                self.set_status("Table copied", false);
            }
            Command::CopyResults(format) => {
                let d = Derived::new(&self.project);
                let mut rows = crate::output::results::shown_rows(&d);
                rows.extend(crate::output::results::verdict_rows(&d.verdicts));
                ctx.copy_text(
                    crate::output::results::table(&rows, d.unit, d.convention).write(format),
                );
                self.set_status("Results copied (value and unit in separate columns)", false);
            }
            Command::CopyFigure => match crate::picture::draw::png::to_pixmap(
                &crate::picture::caution::with_caution(&self.export_frame()),
            ) {
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
            Command::ExportWithDialog => self.start_dialog(ctx, DialogPurpose::Figure),
            Command::ExportTo(path) => self.export_to(&path),
            Command::ShowAbout => self.help.about = true,
            Command::ShowKeys => self.help.keys = true,
            Command::Answer(answer) => self.answer(ctx, answer),
            Command::ToggleInputs => self.settings.show_inputs = !self.settings.show_inputs,
            Command::ToggleResults => self.settings.show_results = !self.settings.show_results,
            Command::ImportTable => self.start_dialog(ctx, DialogPurpose::Table),
        }
        self.follow_up(ctx);
    }

    /// What `go` left to do with the context: show the open dialog, close the window.
    fn follow_up(&mut self, ctx: &egui::Context) {
        match self.follow_up.take() {
            Some(FollowUp::OpenDialog) => self.start_dialog(ctx, DialogPurpose::OpenProject),
            Some(FollowUp::Close) => ctx.send_viewport_cmd(egui::ViewportCommand::Close),
            None => {}
        }
    }

    /// One study edit: one undo step (or merged into the last), or a message saying why not.
    fn edit(&mut self, edit: &Edit, coalesce: Option<Coalesce>) {
        match edit.apply(&self.project) {
            Ok(mut next) => {
                // Once the demo's stresses are changed, the project is no longer the invented
                // scenario: do not keep its name.
                let demo = Project::demo();
                if next.name == demo.name
                    && (next.cases != demo.cases || next.combinations != demo.combinations)
                {
                    UNTITLED.clone_into(&mut next.name);
                }
                if next != self.project {
                    // Showing another case is navigation, not a change: no undo step of its
                    // own (undo of a later edit comes back to the case it was made on).
                    if matches!(edit, Edit::Activate(_)) {
                        self.history.break_run();
                    } else {
                        self.history.record(&self.project, coalesce);
                    }
                    self.project = next;
                }
                if !matches!(
                    edit,
                    Edit::SetComponents(_)
                        | Edit::SetComponent(..)
                        | Edit::SetPlane(_)
                        | Edit::SetMeasure(_)
                ) {
                    self.after_external_change();
                }
            }
            Err(e) => self.set_status(format!("Not changed: {e}"), true),
        }
    }

    /// Moves one step back (undo) or forward (redo) through the history.
    fn step_history(&mut self, back: bool) {
        let current = self.project.clone();
        let to = if back {
            self.history.undo(current)
        } else {
            self.history.redo(current)
        };
        if let Some(project) = to {
            self.project = project;
            self.after_external_change();
        }
    }

    /// The grid and plane fields show the project again (after undo, presets, unit changes).
    fn after_external_change(&mut self) {
        self.stress_panel.reset();
        self.plane_panel.reset();
    }

    /// Writes the working copy when it has unsaved changes and the interval has passed since
    /// the last write (`now` in seconds on the window's clock; called every frame).
    pub fn autosave(&mut self, now: f64) {
        let Some(dir) = self.autosave_dir.clone() else {
            return;
        };
        if !self.dirty()
            || now - self.last_autosave.0 < crate::window::autosave::INTERVAL_S
            || self.last_autosave.1.as_ref() == Some(&self.project)
        {
            return;
        }
        self.last_autosave = (now, Some(self.project.clone()));
        if let Err(e) = crate::window::autosave::write(&dir, &self.project, self.file.as_deref()) {
            self.set_status(format!("Autosave failed: {e}"), true);
        }
    }

    /// The commands of the window-wide keys pressed this frame ([`crate::window::keys`]).
    fn shortcuts(ctx: &egui::Context) -> Vec<Command> {
        use crate::window::keys::{Scope, pressed};
        pressed(ctx, Scope::Window)
            .into_iter()
            .chain(pressed(ctx, Scope::NoTextField))
            .filter_map(crate::window::keys::Act::command)
            .collect()
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

    /// Acts on the answer to the unsaved-changes question or the recovery offer.
    fn answer(&mut self, ctx: &egui::Context, answer: Answer) {
        match answer {
            Answer::SaveFirst => {
                if let Some(what) = self.leaving.take() {
                    self.after_save = Some(what);
                    self.apply(ctx, Command::Save);
                }
            }
            Answer::DontSave => {
                if let Some(what) = self.leaving.clone() {
                    self.go(what);
                }
            }
            Answer::Stay => self.leaving = None,
            Answer::Recover => {
                let Some(copy) = self.recovery.take() else {
                    return;
                };
                let clean = copy
                    .source
                    .as_ref()
                    .and_then(|p| study::load(p).ok())
                    .map(|(p, _)| p);
                self.replace_project(copy.project.clone(), copy.source.clone());
                // Recovered work is unsaved until the user saves it.
                self.clean = clean.unwrap_or_else(|| {
                    Project::new(
                        "",
                        crate::mechanics::StressUnit::MPa,
                        crate::mechanics::SignConvention::TensionPositive,
                    )
                });
                self.set_status(
                    "Recovered the autosaved working copy; save it to keep it",
                    false,
                );
            }
            Answer::DiscardRecovery => {
                self.recovery = None;
                if let Some(dir) = &self.autosave_dir {
                    crate::window::autosave::clear(dir);
                }
            }
        }
    }

    /// The window is asked to close: `false` when it must stay open to ask about unsaved
    /// changes. On a close, the working copy is removed — but only once the user has answered
    /// the recovery question (closing while it is open keeps the copy for the next start).
    pub fn close_requested(&mut self) -> bool {
        if self.dirty() && !self.close_allowed {
            self.leaving = Some(Leaving::Quit);
            return false;
        }
        if self.recovery.is_none()
            && let Some(dir) = &self.autosave_dir
        {
            crate::window::autosave::clear(dir);
        }
        true
    }

    /// Draws the whole window into `ui` and applies what the user asked for. Used by the real
    /// window and by the interaction tests.
    pub fn show(&mut self, ui: &mut egui::Ui) {
        let ctx = ui.ctx().clone();
        self.install_fonts(&ctx);
        self.poll_dialog();
        if ctx.input(|i| i.viewport().close_requested()) && !self.close_requested() {
            ctx.send_viewport_cmd(egui::ViewportCommand::CancelClose);
        }
        let mut commands = Self::shortcuts(&ctx);
        let history = (self.history.can_undo(), self.history.can_redo());
        let d = self.derived.get(&self.project).clone();
        ui::menus_ui(ui, &mut self.settings, history, &mut commands);
        ui::status_bar_ui(ui, &d, self.status.as_ref());
        let theme = if self.settings.dark {
            egui::ThemePreference::Dark
        } else {
            egui::ThemePreference::Light
        };
        if ctx.options(|o| o.theme_preference) != theme {
            ctx.set_theme(theme);
        }
        // Presenting the walk-through: the picture and its words only.
        let presenting =
            self.walkthrough_panel.presenting && self.settings.central == Central::Walkthrough;
        // Each side panel takes at most a quarter of the window, so the picture keeps at least
        // half of it; wider content scrolls inside the panel.
        let side_max = (ui.available_width() * 0.25).max(180.0);
        if !presenting && self.settings.show_inputs {
            egui::Panel::left("stress-state")
                .resizable(true)
                .default_size(330.0)
                .size_range(180.0..=side_max)
                .show(ui, |ui| {
                    egui::ScrollArea::both().show(ui, |ui| {
                        self.cases_panel.ui(ui, &self.project, &d, &mut commands);
                        self.input_panel.ui(ui, &d, &mut commands);
                        ui.separator();
                        self.stress_panel.ui(ui, &d, &mut commands);
                        ui.separator();
                        self.plane_panel.ui(ui, &d, &mut commands);
                        ui.separator();
                        ui::map_panel::worst_plane_ui(ui, &d, &mut commands);
                    });
                });
        }
        if !presenting && self.settings.show_results {
            egui::Panel::right("results")
                .resizable(true)
                .default_size(330.0)
                .size_range(180.0..=side_max)
                .show(ui, |ui| {
                    egui::ScrollArea::both().show(ui, |ui| {
                        ui::verdict_panel::verdict_ui(ui, &d, &mut commands);
                        egui::CollapsingHeader::new("Material")
                            .default_open(true)
                            .show(ui, |ui| {
                                self.material_panel.ui(
                                    ui,
                                    &self.project.material,
                                    &d,
                                    &mut commands,
                                );
                            });
                        ui.separator();
                        ui::results_panel::results_ui(ui, &d, &mut commands);
                    });
                });
        }
        egui::CentralPanel::default().show(ui, |ui| {
            ui.horizontal_wrapped(|ui| {
                ui.selectable_value(&mut self.settings.central, Central::View3d, "3D view");
                ui.selectable_value(&mut self.settings.central, Central::Map, "Orientation map");
                ui.selectable_value(&mut self.settings.central, Central::Mohr, "Mohr circles");
                ui.selectable_value(&mut self.settings.central, Central::Envelope, "Envelope");
                ui.selectable_value(&mut self.settings.central, Central::Faults, "Faults");
                ui.selectable_value(
                    &mut self.settings.central,
                    Central::Walkthrough,
                    "Walk-through",
                )
                .on_hover_text("The shown case explained step by step (→ / Space, ←, Esc, F11)");
                ui.selectable_value(&mut self.settings.central, Central::Table, "Table")
                    .on_hover_text("A finite-element result table, ranked (File → Import table…)");
            });
            match self.settings.central {
                Central::View3d => {
                    ui::view_panel::view_ui(
                        ui,
                        &d,
                        &self.project.annotations,
                        &mut self.settings,
                        &mut commands,
                    );
                }
                Central::Map => {
                    ui::map_panel::map_ui(ui, &d, &self.project.annotations, &mut commands);
                }
                Central::Mohr => {
                    ui::mohr_panel::mohr_ui(
                        ui,
                        &d,
                        &self.project.annotations,
                        &mut self.settings,
                        &mut commands,
                    );
                }
                Central::Faults => {
                    self.faults_panel
                        .ui(ui, &self.project.faults, &d, &mut commands);
                }
                Central::Walkthrough => {
                    self.walkthrough_panel.ui(ui, &d, &mut self.settings);
                }
                Central::Table => {
                    self.table_panel
                        .ui(ui, &self.project, &d, &mut self.settings, &mut commands);
                }
                Central::Envelope => {
                    self.envelope_panel.ui(
                        ui,
                        &self.project,
                        &d,
                        &mut self.settings,
                        &mut commands,
                    );
                }
            }
        });
        let dialog_open = self.pending_dialog.is_some();
        self.export_panel
            .ui(&ctx, &mut self.settings, dialog_open, &mut commands);
        self.file_prompt.ui(&ctx, &mut commands);
        ui::about_ui(&ctx, &mut self.help.about);
        ui::keys_ui(&ctx, &mut self.help.keys);
        ui::questions::questions_ui(
            &ctx,
            &self.project.name,
            self.leaving.as_ref(),
            self.recovery.as_ref(),
            &mut commands,
        );
        for command in commands {
            self.apply(&ctx, command);
        }
        self.follow_up(&ctx);
        let now = ctx.input(|i| i.time);
        self.autosave(now);
        if self.autosave_dir.is_some() && self.dirty() {
            ctx.request_repaint_after(std::time::Duration::from_secs_f64(
                crate::window::autosave::INTERVAL_S,
            ));
        }
        self.frames += 1;
        if self.frames >= 3
            && let Some(marker) = self.start_marker.take()
        {
            let _ = std::fs::remove_file(marker);
        }
    }

    fn screenshot_step(&mut self, ctx: &egui::Context) {
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

/// Opens the window. With `screenshot`, writes a PNG of the first complete frame there and exits.
/// `subcommands` are the command line's subcommands, named when the window cannot open (they
/// need no display).
pub fn run(
    screenshot: Option<&Path>,
    tab: Option<Central>,
    project: Option<&Path>,
    table: Option<(&Path, Option<crate::mechanics::StressUnit>)>,
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
    let table = table.map(|(path, unit)| (path.to_path_buf(), unit));
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
            if let Some((path, unit)) = table {
                app.open_table(&path);
                // A unit said on the command line is the user's: the table is read at once.
                if let Some(unit) = unit {
                    app.table_panel.unit = Some(unit);
                    app.table_panel.start(&cc.egui_ctx, &app.project);
                }
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

//! The Fatigue tab: a load history (components in time, or factors in time on the project's load
//! cases) judged on its critical plane — the criterion's constants, the critical plane with its
//! utilization and factor of safety, finite life with an S–N curve — with the shear path on the
//! critical plane (or the cut plane) and the orientation map, and the fatigue report.
//!
//! The tab's fields are the window's, not the project's: a history is a file beside the project.

use std::path::PathBuf;
use std::sync::Arc;
use std::sync::atomic::{AtomicBool, AtomicUsize, Ordering};
use std::sync::mpsc::Receiver;

use crate::mechanics::fatigue::{Constants, Criterion, FatigueLimits, PathMethod, SnCurve};
use crate::mechanics::{SignConvention, StressUnit};
use crate::picture::draw::egui_backend;
use crate::study::fatigue::{FATIGUE_CAUTION, FatigueSetup, Judged, LoadedHistory, ManyPoints};
use crate::study::load_history::{read_components, read_factors};
use crate::study::{Edit, Project};
use crate::text::format::sig;
use crate::window::session::Command;

/// Where the history comes from.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Default)]
pub enum HistoryKind {
    /// A CSV of time and the six components.
    #[default]
    Components,
    /// A CSV of time and one factor column per load case of the project.
    Factors,
}

/// Which plane the path figure shows.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Default)]
pub enum PathOn {
    /// The critical plane.
    #[default]
    Critical,
    /// The project's cut plane.
    CutPlane,
}

/// What the cached map was drawn for: its size in pixels and the cut plane marked on it.
type MapKey = (u32, u32, [u64; 3]);

/// The figure the tab shows.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Default)]
pub enum Shown {
    /// The shear path on a plane with σn(t) and |τ(t)|.
    #[default]
    Path,
    /// The orientation map.
    Map,
    /// The six components against time.
    Components,
}

/// The Fatigue tab's fields and its last answer.
#[derive(Default)]
#[expect(
    clippy::struct_excessive_bools,
    reason = "independent check boxes and toggles of the tab"
)]
pub struct FatiguePanel {
    /// The history file as typed.
    pub path: String,
    /// What the file holds.
    pub kind: HistoryKind,
    /// Unit of the components (and of every stress typed here); none until chosen.
    pub unit: Option<StressUnit>,
    /// The components are compression positive.
    pub compression_positive: bool,
    /// The criterion.
    pub criterion: Option<Criterion>,
    /// f₋₁, t₋₁ and σu as typed, in the unit.
    pub bending: String,
    /// t₋₁ as typed.
    pub torsion: String,
    /// σu as typed (McDiarmid).
    pub tensile: String,
    /// The shear amplitude is half the longest chord (default: the circumscribed circle).
    pub chord: bool,
    /// Finite life: τ'f and b as typed, and the endurance limit (empty: none).
    pub life: bool,
    /// τ'f as typed.
    pub sn_coefficient: String,
    /// b as typed.
    pub sn_exponent: String,
    /// The endurance limit as typed (empty: none).
    pub endurance: String,
    /// The path figure's plane.
    pub path_on: PathOn,
    /// The report's file as typed.
    pub report_path: String,
    /// The last answer: what was read, with what, and the result.
    pub answer: Option<(LoadedHistory, FatigueSetup, Judged)>,
    /// The map of the last answer, computed once (the frame is redrawn at the tab's size from
    /// it).
    map_cache: Option<(MapKey, crate::picture::draw::Frame)>,
    /// What went wrong, or what was written.
    pub message: Option<Result<String, String>>,
    /// A judgement has just succeeded: fold the inputs once, so the figures get the room.
    fold_inputs: bool,
    /// Which figure the tab shows.
    pub figure: Shown,
    /// Do not mark the critical plane in the 3D view.
    pub hide_in_3d: bool,
    /// Many points: where they come from, their ids, the running ranking and its answer.
    pub many: Many,
}

/// Where many points come from.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Default)]
pub enum ManyKind {
    /// Load-case tables, every point under the factor history in the history file field.
    #[default]
    Tables,
    /// The history file is one long table of a history per point.
    Long,
}

/// A ranking running in the background.
struct ManyJob {
    answer: Receiver<Result<Ranked, String>>,
    cancel: Arc<AtomicBool>,
    done: Arc<AtomicUsize>,
    total: usize,
}

/// A finished ranking: the points and every judged point, worst first.
pub struct Ranked {
    /// The points.
    pub source: Arc<ManyPoints>,
    /// Judged points (index into the source), worst first.
    pub judged: Vec<(usize, Judged)>,
    /// The settings they were judged with.
    pub setup: FatigueSetup,
    /// The files read, with their role.
    pub files: Vec<(String, PathBuf)>,
}

/// The many-points section's fields.
#[derive(Default)]
pub struct Many {
    /// The section is open.
    pub open: bool,
    /// Where the points come from.
    pub kind: ManyKind,
    /// The id columns, comma separated.
    pub ids: String,
    /// The time column of a long table.
    pub time_column: String,
    /// Load-case tables: (case, path) as typed.
    pub tables: Vec<(String, String)>,
    job: Option<ManyJob>,
    /// The last ranking.
    pub ranked: Option<Ranked>,
    /// What went wrong.
    pub message: Option<String>,
}

fn number(text: &str, what: &str) -> Result<f64, String> {
    crate::text::parse::number(text).map_err(|e| format!("{what}: {e}"))
}

impl FatiguePanel {
    /// Reads the history and judges it with the tab's settings (the project gives the load
    /// cases of a factor history).
    pub fn judge(&mut self, project: &Project) {
        self.map_cache = None;
        self.message = Some(self.try_judge(project).map(|()| String::new()));
        self.fold_inputs = matches!(self.message, Some(Ok(_)));
        if matches!(&self.message, Some(Ok(m)) if m.is_empty()) {
            self.message = None;
        }
    }

    /// The settings the tab's fields give.
    fn setup(&self) -> Result<FatigueSetup, String> {
        let unit = self
            .unit
            .ok_or("choose the unit of the history's stresses (a file does not say)")?;
        let criterion = self.criterion.unwrap_or(Criterion::Findley);
        let convention = if self.compression_positive {
            SignConvention::CompressionPositive
        } else {
            SignConvention::TensionPositive
        };
        let stress = |text: &str, what: &str| number(text, what).map(|v| unit.to_pa(v));
        // An empty field is a value not given (the criterion says whether it needs it).
        let optional = |text: &str, what: &str| {
            if text.trim().is_empty() {
                Ok(None)
            } else {
                stress(text, what).map(Some)
            }
        };
        let limits = FatigueLimits {
            bending_pa: optional(&self.bending, "f₋₁, the bending fatigue limit")?,
            torsion_pa: stress(&self.torsion, "t₋₁, the torsion fatigue limit")?,
            tensile_strength_pa: optional(&self.tensile, "σu, the tensile strength")?,
        };
        let constants = Constants::derive(criterion, &limits).map_err(|e| e.to_string())?;
        let sn = if self.life {
            Some(
                SnCurve::new(
                    stress(&self.sn_coefficient, "τ'f, the S–N coefficient")?,
                    number(&self.sn_exponent, "b, the S–N exponent")?,
                    optional(&self.endurance, "the endurance limit")?,
                )
                .map_err(|e| e.to_string())?,
            )
        } else {
            None
        };
        let method = if self.chord {
            PathMethod::Chord
        } else {
            PathMethod::Circle
        };
        Ok(FatigueSetup::new(
            unit,
            convention,
            constants,
            Some(limits),
            sn,
            method,
        )?)
    }

    fn try_judge(&mut self, project: &Project) -> Result<(), String> {
        let setup = self.setup()?;
        let (unit, convention) = (setup.unit, setup.convention);
        let path = PathBuf::from(self.path.trim());
        if self.path.trim().is_empty() {
            return Err("type the history file's path".into());
        }
        let loaded = match self.kind {
            HistoryKind::Components => {
                let (history, time_name) = read_components(&path, unit, convention)?;
                LoadedHistory {
                    text: format!("{} (components)", path.display()),
                    time_name,
                    history,
                    files: vec![("history (components in time)".to_owned(), path.clone())],
                }
            }
            HistoryKind::Factors => {
                let mut cases = Vec::new();
                for c in &project.cases {
                    let t = project
                        .tensor(&c.name)
                        .map_err(|e| format!("load case '{}': {e}", c.name))?;
                    cases.push((c.name.clone(), t));
                }
                let (history, read) = read_factors(&path, &cases)?;
                LoadedHistory {
                    text: format!(
                        "{} × the project's load cases {}",
                        path.display(),
                        read.cases.join(", ")
                    ),
                    time_name: read.time_name,
                    history,
                    files: vec![("factors in time".to_owned(), path.clone())],
                }
            }
        };
        let judged = Judged::of(&loaded.history, &setup);
        self.answer = Some((loaded, setup, judged));
        Ok(())
    }

    /// Starts ranking many points in the background.
    pub fn rank_many(&mut self, ctx: &egui::Context) {
        self.many.message = None;
        let setup = match self.setup() {
            Ok(s) => s,
            Err(e) => {
                self.many.message = Some(e);
                return;
            }
        };
        let ids: Vec<String> = self
            .many
            .ids
            .split(',')
            .map(|s| s.trim().to_owned())
            .filter(|s| !s.is_empty())
            .collect();
        if ids.is_empty() {
            self.many.message = Some("name the id columns of the points (e.g. node)".to_owned());
            return;
        }
        let file = PathBuf::from(self.path.trim());
        let kind = self.many.kind;
        let time_column = if self.many.time_column.trim().is_empty() {
            "time".to_owned()
        } else {
            self.many.time_column.trim().to_owned()
        };
        let tables: Vec<(String, PathBuf)> = self
            .many
            .tables
            .iter()
            .filter(|(c, f)| !c.trim().is_empty() || !f.trim().is_empty())
            .map(|(c, f)| (c.trim().to_owned(), PathBuf::from(f.trim())))
            .collect();
        let mut files: Vec<(String, PathBuf)> = match kind {
            ManyKind::Tables => tables
                .iter()
                .map(|(c, f)| (format!("load-case table '{c}'"), f.clone()))
                .collect(),
            ManyKind::Long => Vec::new(),
        };
        files.push((
            match kind {
                ManyKind::Tables => "factors in time",
                ManyKind::Long => "a history per point",
            }
            .to_owned(),
            file.clone(),
        ));
        let source = match kind {
            ManyKind::Tables => {
                ManyPoints::read_tables(&tables, &ids, &file, setup.unit, setup.convention).map_err(
                    |e| match e {
                        crate::study::fatigue::ManyError::Tables(m)
                        | crate::study::fatigue::ManyError::Factors(m) => m,
                    },
                )
            }
            ManyKind::Long => {
                ManyPoints::read_long(&file, &ids, &time_column, setup.unit, setup.convention)
            }
        };
        let source = match source {
            Ok(s) => Arc::new(s),
            Err(e) => {
                self.many.message = Some(e);
                return;
            }
        };
        let cancel = Arc::new(AtomicBool::new(false));
        let done = Arc::new(AtomicUsize::new(0));
        let (tx, rx) = std::sync::mpsc::channel();
        let (c, d, repaint) = (cancel.clone(), done.clone(), ctx.clone());
        let total = source.len();
        std::thread::spawn(move || {
            let result =
                crate::study::fatigue::rank(&source, &setup, &d, &c).map(|judged| Ranked {
                    source,
                    judged,
                    setup,
                    files,
                });
            let _ = tx.send(result);
            repaint.request_repaint();
        });
        self.many.job = Some(ManyJob {
            answer: rx,
            cancel,
            done,
            total,
        });
    }

    /// Shows point `p` of the last ranking as the tab's one point.
    fn show_point(&mut self, rank: usize) {
        let Some(r) = &self.many.ranked else {
            return;
        };
        let Some((p, judged)) = r.judged.get(rank) else {
            return;
        };
        let Ok(history) = r.source.history(*p) else {
            return;
        };
        let ids = r
            .source
            .id_names()
            .iter()
            .zip(r.source.ids(*p))
            .map(|(n, v)| format!("{n}={v}"))
            .collect::<Vec<_>>()
            .join(", ");
        self.answer = Some((
            LoadedHistory {
                text: format!("point {ids} of {}", r.source.describe().0),
                time_name: r.source.time_name().to_owned(),
                history: history.into_owned(),
                files: r.files.clone(),
            },
            r.setup.clone(),
            judged.clone(),
        ));
        self.map_cache = None;
    }

    fn many_ui(&mut self, ui: &mut egui::Ui) {
        ui.horizontal_wrapped(|ui| {
            ui.radio_value(
                &mut self.many.kind,
                ManyKind::Tables,
                "load-case tables under the factor history in the file above",
            );
            ui.radio_value(
                &mut self.many.kind,
                ManyKind::Long,
                "the file above is a long table of a history per point",
            );
        });
        ui.horizontal_wrapped(|ui| {
            ui.label("Id columns:");
            ui.add(
                egui::TextEdit::singleline(&mut self.many.ids)
                    .hint_text("id columns, e.g. node")
                    .desired_width(140.0),
            )
            .on_hover_text("id columns naming the points, comma separated");
            if self.many.kind == ManyKind::Long {
                ui.label("Time column:");
                ui.add(
                    egui::TextEdit::singleline(&mut self.many.time_column)
                        .hint_text("time")
                        .desired_width(100.0),
                )
                .on_hover_text("time column of the long table (default: time)");
            }
        });
        if self.many.kind == ManyKind::Tables {
            if self.many.tables.is_empty() {
                self.many.tables.push((String::new(), String::new()));
            }
            let mut remove = None;
            for (i, (case, path)) in self.many.tables.iter_mut().enumerate() {
                ui.horizontal(|ui| {
                    ui.add(
                        egui::TextEdit::singleline(case)
                            .hint_text("load case")
                            .desired_width(100.0),
                    )
                    .on_hover_text(format!(
                        "load case {}: as the factor file's column names it",
                        i + 1
                    ));
                    ui.add(
                        egui::TextEdit::singleline(path)
                            .hint_text("its table's path")
                            .desired_width(300.0),
                    )
                    .on_hover_text(format!(
                        "table {}'s path: a header with the id columns and the six components",
                        i + 1
                    ));
                    if ui.button("×").on_hover_text("Remove this table").clicked() {
                        remove = Some(i);
                    }
                });
            }
            if let Some(i) = remove {
                self.many.tables.remove(i);
            }
            if ui.button("+ table").clicked() {
                self.many.tables.push((String::new(), String::new()));
            }
        }
        ui.horizontal(|ui| {
            if let Some(job) = &self.many.job {
                ui.add(egui::Spinner::new());
                ui.label(format!(
                    "{} of {} points judged",
                    job.done.load(Ordering::Relaxed),
                    job.total
                ));
                if ui.button("Stop").clicked() {
                    job.cancel.store(true, Ordering::Relaxed);
                }
            } else if ui
                .button("Rank the points")
                .on_hover_text("Judge every point with the settings above, in parallel, worst first (by damage with finite life, else by utilization)")
                .clicked()
            {
                self.rank_many(ui.ctx());
            }
            if let Some(m) = &self.many.message {
                ui.colored_label(ui.visuals().error_fg_color, m);
            }
        });
        if let Some(job) = &self.many.job {
            match job.answer.try_recv() {
                Ok(Ok(r)) => {
                    self.many.ranked = Some(r);
                    self.many.job = None;
                }
                Ok(Err(e)) => {
                    self.many.message = Some(e);
                    self.many.job = None;
                }
                Err(std::sync::mpsc::TryRecvError::Empty) => {
                    ui.ctx()
                        .request_repaint_after(std::time::Duration::from_millis(200));
                }
                Err(std::sync::mpsc::TryRecvError::Disconnected) => {
                    self.many.message = Some("the ranking stopped unexpectedly".to_owned());
                    self.many.job = None;
                }
            }
        }
        let mut show = None;
        if let Some(r) = &self.many.ranked {
            let u = r.setup.unit;
            let sym = u.symbol();
            ui.label(format!(
                "{} points, worst first (the 20 worst; Show makes one the tab's point):",
                r.judged.len()
            ));
            egui::Grid::new("fatigue points")
                .striped(true)
                .show(ui, |ui| {
                    ui.strong(r.source.id_names().join(", "));
                    ui.strong("utilization");
                    ui.strong("dip / dip direction");
                    ui.strong(format!("τa {sym}"));
                    ui.strong(format!("σn,max {sym}"));
                    if r.setup.sn.is_some() {
                        ui.strong("damage per repeat");
                        ui.strong("life, repeats");
                    }
                    ui.end_row();
                    for (rank, (p, j)) in r.judged.iter().take(20).enumerate() {
                        ui.label(r.source.ids(*p).join(", "));
                        ui.label(sig(j.plane.utilization, 4));
                        ui.label(format!(
                            "{}° / {}°",
                            sig(j.plane.dip_deg, 4),
                            sig(j.plane.dip_direction_deg, 4)
                        ));
                        ui.label(sig(u.from_pa(j.plane.value.tau_amplitude_pa), 5));
                        ui.label(sig(u.from_pa(j.plane.value.sigma_n_max_pa), 5));
                        if let Some(l) = &j.life {
                            ui.label(sig(l.damage.damage, 4));
                            ui.label(
                                l.life_repeats
                                    .map_or_else(|| "unlimited".to_owned(), |n| sig(n, 4)),
                            );
                        }
                        if ui.button("Show").clicked() {
                            show = Some(rank);
                        }
                        ui.end_row();
                    }
                });
        }
        if let Some(rank) = show {
            self.show_point(rank);
        }
    }

    fn inputs_ui(&mut self, ui: &mut egui::Ui, project: &Project) {
        ui.horizontal_wrapped(|ui| {
            ui.label("History file:");
            ui.add(
                egui::TextEdit::singleline(&mut self.path)
                    .hint_text("history file (CSV: time, then columns)")
                    .desired_width(300.0),
            )
            .on_hover_text("A CSV: a time (or step) column first, then the six components by name (xx … zx or S11 … S13), or one factor column per load case of the project");
            ui.radio_value(&mut self.kind, HistoryKind::Components, "components in time");
            ui.radio_value(&mut self.kind, HistoryKind::Factors, "factors on the load cases")
                .on_hover_text(format!(
                    "σ(t) = Σ fᵢ(t) σᵢ over the project's load cases ({})",
                    project
                        .cases
                        .iter()
                        .map(|c| c.name.as_str())
                        .collect::<Vec<_>>()
                        .join(", ")
                ));
        });
        ui.horizontal_wrapped(|ui| {
            ui.label("Unit:");
            let shown = self.unit.map_or("choose…", StressUnit::symbol);
            egui::ComboBox::from_id_salt("fatigue unit")
                .selected_text(shown)
                .show_ui(ui, |ui| {
                    for u in StressUnit::ALL {
                        ui.selectable_value(&mut self.unit, Some(u), u.symbol());
                    }
                })
                .response
                .widget_info(|| {
                    egui::WidgetInfo::labeled(egui::Role::ComboBox, true, "fatigue unit")
                });
            ui.checkbox(&mut self.compression_positive, "compression positive");
            ui.separator();
            ui.label("Criterion:");
            let criterion = self.criterion.get_or_insert(Criterion::Findley);
            egui::ComboBox::from_id_salt("fatigue criterion")
                .selected_text(criterion.label())
                .show_ui(ui, |ui| {
                    for c in Criterion::ALL {
                        ui.selectable_value(criterion, c, c.label())
                            .on_hover_text(c.definition());
                    }
                })
                .response
                .widget_info(|| {
                    egui::WidgetInfo::labeled(egui::Role::ComboBox, true, "fatigue criterion")
                });
            ui.weak(criterion.definition());
        });
        let unit = self.unit.map_or("", StressUnit::symbol);
        ui.horizontal_wrapped(|ui| {
            let field = |ui: &mut egui::Ui, text: &mut String, symbol: &str, hint: String, tip: &str| {
                ui.label(symbol).on_hover_text(tip);
                ui.add(
                    egui::TextEdit::singleline(text)
                        .hint_text(hint)
                        .desired_width(90.0),
                )
                .on_hover_text(tip);
            };
            field(
                ui,
                &mut self.bending,
                "f₋₁",
                format!("f₋₁ bending limit {unit}"),
                "Fully reversed bending (or tension–compression) fatigue limit f₋₁, in the unit",
            );
            field(
                ui,
                &mut self.torsion,
                "t₋₁",
                format!("t₋₁ torsion limit {unit}"),
                "Fully reversed torsion fatigue limit t₋₁, in the unit",
            );
            field(
                ui,
                &mut self.tensile,
                "σu",
                format!("σu tensile strength {unit}"),
                "Ultimate tensile strength σu, in the unit (McDiarmid only)",
            );
            ui.label(unit);
            ui.checkbox(&mut self.chord, "longest chord")
                .on_hover_text("Off: the shear amplitude is the radius of the path's minimum circumscribed circle. On: half its longest chord (can fall short by up to 13 % on non-harmonic paths)");
        });
        ui.horizontal_wrapped(|ui| {
            ui.checkbox(&mut self.life, "finite life")
                .on_hover_text("Rainflow (ASTM E1049-85) on directions in each plane, Findley's parameter as a torsion amplitude on the S–N curve τa = τ'f (2N)^b, Miner's sum");
            if self.life {
                for (text, symbol, hint) in [
                    (&mut self.sn_coefficient, "τ'f", format!("τ'f S–N coefficient {unit}")),
                    (&mut self.sn_exponent, "b", "b S–N exponent".to_owned()),
                    (&mut self.endurance, "endurance", format!("endurance limit {unit} (none)")),
                ] {
                    ui.label(symbol);
                    ui.add(
                        egui::TextEdit::singleline(text)
                            .hint_text(hint)
                            .desired_width(90.0),
                    );
                }
                ui.weak("τa = τ'f (2N)^b on torsion; no endurance limit: Basquin's line below every amplitude");
            }
        });
    }

    fn answer_ui(
        &mut self,
        ui: &mut egui::Ui,
        plane_normal: &crate::mechanics::PlaneNormal,
        out: &mut Vec<Command>,
    ) {
        let Some((loaded, setup, judged)) = &self.answer else {
            ui.label("A history at one point, judged on every plane: give the file, its unit, the fatigue limits, and Judge (Ctrl+Enter in a field). The same as planewise fatigue on the command line.");
            return;
        };
        let u = setup.unit;
        let sym = u.symbol();
        let p = &judged.plane;
        let c = &setup.constants;
        ui.label(format!(
            "{}: {} steps of {}; constants {} = {}, {} = {} {sym} ({})",
            loaded.text,
            loaded.history.len(),
            loaded.time_name,
            c.criterion.coefficient_symbol(),
            sig(c.coefficient, 4),
            c.criterion.limit_symbol(),
            sig(u.from_pa(c.limit_pa), 5),
            c.derivation
        ));
        ui.horizontal_wrapped(|ui| {
            ui.strong(format!(
                "Utilization {} (value ÷ {})",
                sig(p.utilization, 4),
                c.criterion.limit_symbol()
            ))
            .on_hover_text(c.criterion.definition());
            ui.label(format!(
                "factor of safety {}",
                p.factor_of_safety()
                    .map_or_else(|| "undefined".to_owned(), |f| sig(f, 4))
            ))
            .on_hover_text("Limit ÷ value: the factor on the whole history that reaches the limit");
            ui.label(format!(
                "critical plane dip {}° / dip direction {}°; τa {} {sym}, σn,max {} {sym}",
                sig(p.dip_deg, 4),
                sig(p.dip_direction_deg, 4),
                sig(u.from_pa(p.value.tau_amplitude_pa), 5),
                sig(u.from_pa(p.value.sigma_n_max_pa), 5)
            ));
            let mut shown = !self.hide_in_3d;
            if ui
                .checkbox(&mut shown, "mark it in the 3D view")
                .on_hover_text("The 3D view (and the figure it exports) draws the critical plane's outline and normal in ink, with its name")
                .changed()
            {
                self.hide_in_3d = !shown;
            }
            if ui
                .button("Make it the cut plane")
                .on_hover_text("The project's cut plane becomes the critical plane, so the 3D view, the map and the Mohr circles show it (one undo step)")
                .clicked()
                && let Ok(n) = crate::mechanics::PlaneNormal::try_from(p.normal)
            {
                out.push(Command::Edit {
                    edit: Edit::SetPlane(n),
                    coalesce: None,
                });
            }
        });
        if let Some(l) = &judged.life {
            ui.label(format!(
                "Finite life: damage {} per repeat, life {} on the plane dip {}° / dip direction {}°{}",
                sig(l.damage.damage, 4),
                l.life_repeats
                    .map_or_else(|| "unlimited".to_owned(), |n| format!("{} repeats", sig(n, 4))),
                sig(l.dip_deg, 4),
                sig(l.dip_direction_deg, 4),
                l.damage.worst.map_or_else(String::new, |w| format!(
                    "; governing cycle {} {} to {}",
                    loaded.time_name,
                    sig(loaded.history.time()[w.from.min(w.to)], 5),
                    sig(loaded.history.time()[w.from.max(w.to)], 5)
                ))
            ));
        }
        ui.horizontal_wrapped(|ui| {
            ui.label("Path figure on:");
            ui.radio_value(&mut self.path_on, PathOn::Critical, "the critical plane");
            let (dip, dd) = plane_normal.dip_deg();
            ui.radio_value(
                &mut self.path_on,
                PathOn::CutPlane,
                format!("the cut plane ({}° / {}°)", sig(dip, 3), sig(dd, 4)),
            );
            ui.separator();
            ui.add(
                egui::TextEdit::singleline(&mut self.report_path)
                    .hint_text("report file .html")
                    .desired_width(200.0),
            );
            if ui.button("Write report").clicked() {
                self.message = Some(self.write_report());
            }
        });
        ui.colored_label(ui.visuals().warn_fg_color, FATIGUE_CAUTION);
    }

    /// Writes the fatigue report to the typed path.
    fn write_report(&self) -> Result<String, String> {
        let Some((loaded, setup, judged)) = &self.answer else {
            return Err("judge a history first".into());
        };
        let path = PathBuf::from(self.report_path.trim());
        if path.extension().and_then(|e| e.to_str()) != Some("html") {
            return Err("the report is an .html file: type its path".into());
        }
        let inputs: Vec<&std::path::Path> = loaded.files.iter().map(|(_, p)| p.as_path()).collect();
        crate::study::atomic::not_an_input(&path, &inputs)?;
        let report = crate::output::fatigue_report::of(
            loaded,
            setup,
            judged,
            96,
            &crate::output::report::now_iso8601(),
        )?;
        crate::study::atomic::write_atomic(
            &path,
            crate::output::fatigue_report::html(&report).as_bytes(),
        )
        .map_err(|e| format!("{}: {e}", path.display()))?;
        Ok(format!("wrote {}", path.display()))
    }

    fn figures_ui(&mut self, ui: &mut egui::Ui, plane_normal: &crate::mechanics::PlaneNormal) {
        let Some((loaded, setup, judged)) = &self.answer else {
            return;
        };
        let sizes = crate::picture::draw::Sizes::default();
        ui.horizontal(|ui| {
            ui.label("Figure:");
            ui.radio_value(
                &mut self.figure,
                Shown::Path,
                "shear path, σn(t) and |τ(t)|",
            );
            ui.radio_value(&mut self.figure, Shown::Map, "orientation map");
            ui.radio_value(&mut self.figure, Shown::Components, "components in time");
        });
        // The figure keeps a readable height; the tab scrolls when the sections above take
        // the room.
        let height = ui.available_height();
        let height = if height.is_finite() {
            height.max(300.0)
        } else {
            520.0
        };
        let size = egui::vec2(ui.available_width().max(300.0), height);
        let (rect, _) = ui.allocate_exact_size(size, egui::Sense::hover());
        let px = [rect.width() as u32, rect.height() as u32];
        let frame = match self.figure {
            Shown::Path => crate::picture::figures::fatigue_path(
                loaded,
                setup,
                judged,
                (self.path_on == PathOn::CutPlane).then(|| plane_normal.vector()),
                px,
                sizes,
            ),
            Shown::Components => crate::picture::draw::history::components_frame(
                loaded.history.time(),
                loaded.history.tensors_pa(),
                &loaded.time_name,
                setup.unit,
                setup.convention,
                px,
                sizes,
            ),
            Shown::Map => {
                let n = plane_normal.vector();
                let key = (px[0], px[1], [n.x.to_bits(), n.y.to_bits(), n.z.to_bits()]);
                if self.map_cache.as_ref().is_none_or(|(k, _)| *k != key) {
                    let (frame, _) = crate::picture::figures::fatigue_map(
                        loaded,
                        setup,
                        judged,
                        72,
                        Some(*plane_normal),
                        px,
                        sizes,
                    );
                    self.map_cache = Some((key, frame));
                }
                match &self.map_cache {
                    Some((_, frame)) => frame.clone(),
                    None => return,
                }
            }
        };
        ui.painter_at(rect)
            .extend(egui_backend::shapes(&frame, rect, ui.ctx()));
    }
}

impl super::Panel for FatiguePanel {
    fn ui(&mut self, ui: &mut egui::Ui, reads: super::Reads<'_>, writes: &mut super::Writes<'_>) {
        egui::ScrollArea::vertical()
            .auto_shrink([false, false])
            .show(ui, |ui| self.contents(ui, reads, writes));
    }
}

impl FatiguePanel {
    fn contents(
        &mut self,
        ui: &mut egui::Ui,
        reads: super::Reads<'_>,
        writes: &mut super::Writes<'_>,
    ) {
        let fold = std::mem::take(&mut self.fold_inputs);
        egui::CollapsingHeader::new("History and material")
            .default_open(true)
            .open(fold.then_some(false))
            .show(ui, |ui| {
                self.inputs_ui(ui, reads.project);
                ui.horizontal(|ui| {
                    let enter =
                        ui.input(|i| i.modifiers.command && i.key_pressed(egui::Key::Enter));
                    if ui
                        .button("Judge")
                        .on_hover_text("Read the history and search every plane (Ctrl+Enter)")
                        .clicked()
                        || enter
                    {
                        self.judge(reads.project);
                    }
                    match &self.message {
                        Some(Err(e)) => {
                            ui.colored_label(ui.visuals().error_fg_color, e);
                        }
                        Some(Ok(m)) => {
                            ui.label(m);
                        }
                        None => {}
                    }
                });
            });
        ui.checkbox(&mut self.many.open, "Many points")
            .on_hover_text("Rank every point of load-case tables under a factor history, or of a long table of histories, by the settings above");
        if self.many.open {
            ui.indent("many points", |ui| self.many_ui(ui));
        }
        ui.separator();
        // The critical plane marked in the 3D view (and its exported figure) while asked.
        writes.settings.fatigue_plane = if self.hide_in_3d {
            None
        } else {
            self.answer.as_ref().and_then(|(_, setup, judged)| {
                crate::mechanics::PlaneNormal::try_from(judged.plane.normal)
                    .ok()
                    .map(|n| {
                        (
                            n,
                            format!("{} critical plane", setup.constants.criterion.label()),
                        )
                    })
            })
        };
        self.answer_ui(ui, &reads.d.plane, writes.commands);
        self.figures_ui(ui, &reads.d.plane);
    }
}

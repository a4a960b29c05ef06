//! The Table tab: a finite-element result table imported, ranked in a background thread with a
//! progress bar and Cancel, and listed worst first (a virtualised list: only the visible rows
//! are laid out), sortable by any column and filterable by text, with a histogram of the ranked
//! measure. Clicking a row makes it a load case ("row N of FILE"), shown at once, so every view
//! follows. The reading itself is [`crate::study::table::rank`], the same as `planewise batch`.
//!
//! Load cases as tables: with id columns to join on, this table is one load case and more
//! tables are the others (or one long table names its cases in a column); the project's
//! combinations over those cases (each case alone when it has none) are applied at every point,
//! the points are listed by their governing combination, and a clicked point becomes the
//! project's load cases of those names, so its combinations, verdicts and figures follow.

use std::path::PathBuf;
use std::sync::Arc;
use std::sync::atomic::{AtomicBool, AtomicU64, Ordering};
use std::sync::mpsc::Receiver;

use crate::mechanics::search::{Measure as PlaneMeasure, SearchSettings};
use crate::mechanics::{SignConvention, StressUnit};
use crate::study::table::{
    COMPONENTS, CaseTable, Delimiter, Header, JoinOptions, Points, Ranked, RankedPoints,
    TableError, TableOptions,
};
use crate::study::{
    CaseInput, Derived, Edit, EnvelopeMeasure, LoadCase, Project, TableRowInput, TypedTensor,
};
use crate::window::session::Command;

/// Rows the window keeps (the worst ones) unless told otherwise.
pub const DEFAULT_KEEP: usize = 100_000;

/// A table's header and its first rows' fields.
type Preview = (Header, Vec<Vec<String>>);

/// What a read gives: ranked rows, or joined points ranked by their governing combination.
enum Answer {
    Rows(Box<Ranked>),
    Points(Box<(Points, RankedPoints, String)>),
}

/// A read in progress.
struct Job {
    answer: Receiver<Result<Answer, TableError>>,
    cancel: Arc<AtomicBool>,
    bytes: Arc<AtomicU64>,
    size: Option<u64>,
    read_with: (StressUnit, bool, EnvelopeMeasure),
}

/// Said when a read is asked for before the unit is chosen.
const UNIT_FIRST: &str = "Choose the table's unit first: a table does not say, and a wrong unit is off by up to a factor of a million.";

/// The tab's state.
#[expect(
    clippy::struct_excessive_bools,
    reason = "independent check boxes of the tab"
)]
pub struct TablePanel {
    /// The file path as typed or chosen.
    pub path: String,
    /// Component → header name (empty: found by name).
    mapping: [String; 6],
    /// The preview: header and first rows, or what is wrong.
    preview: Option<Result<Preview, String>>,
    /// Unit of the components: none until the user chooses (a table does not say, and a guess
    /// is off by up to a factor of a million).
    pub unit: Option<StressUnit>,
    /// The components are compression positive.
    pub compression_positive: bool,
    /// Numbers use a decimal comma.
    pub decimal_comma: bool,
    /// The table holds xx, yy and xy only; zz, yz and zx are zero (the user says so).
    pub plane_stress: bool,
    /// What to rank by.
    pub measure: EnvelopeMeasure,
    /// How many worst rows to keep.
    pub keep: usize,
    /// Skip bad rows instead of stopping.
    pub skip_bad_rows: bool,
    job: Option<Job>,
    /// The last result.
    pub ranked: Option<Ranked>,
    /// What the last result was read with: unit, compression positive, measure (the choices
    /// may have changed since; the rows are shown as read).
    read_with: Option<(StressUnit, bool, EnvelopeMeasure)>,
    /// The last error or cancellation, said in the tab.
    pub message: Option<String>,
    /// Text the rows must contain (any carried column).
    pub filter: String,
    /// Sort column (None: rank order) and whether descending.
    sort: (Option<SortKey>, bool),
    /// Row order after sorting and filtering (indices into the result's rows).
    order: Vec<usize>,
    order_key: Option<(Option<SortKey>, bool, String)>,
    /// Load cases as tables: the id columns the tables join on, comma-separated (empty: one
    /// table of rows).
    pub ids: String,
    /// One long table: the column naming each row's load case (empty: a table per case).
    pub case_column: String,
    /// This table's load case, with a table per case.
    pub first_case: String,
    /// The other load-case tables: (case, path).
    pub more_tables: Vec<(String, String)>,
    /// The joined points of the last read, when it joined tables; with the list's rows
    /// (their `line` is the point's number, their first carried text the governing
    /// combination).
    points: Option<Points>,
    /// A read has just given a list: fold the reading settings once.
    fold_reading: bool,
    /// The project's load-case tables last taken into the tab's fields.
    seen_tables: Option<crate::study::LoadCaseTables>,
    /// The last joined read's ranking, whether it enveloped each case alone, and how it read
    /// the tables (for the report's tables section).
    joined_ranking: Option<(RankedPoints, bool, String)>,
}

/// What the list can be sorted by.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
enum SortKey {
    Line,
    Carried(usize),
    Component(usize),
    Value,
}

impl Default for TablePanel {
    fn default() -> Self {
        Self {
            path: String::new(),
            mapping: Default::default(),
            preview: None,
            unit: None,
            compression_positive: false,
            decimal_comma: false,
            plane_stress: false,
            measure: EnvelopeMeasure::VonMises,
            keep: DEFAULT_KEEP,
            skip_bad_rows: false,
            job: None,
            ranked: None,
            read_with: None,
            message: None,
            filter: String::new(),
            sort: (None, true),
            order: Vec::new(),
            order_key: None,
            ids: String::new(),
            case_column: String::new(),
            first_case: "case 1".to_owned(),
            more_tables: Vec::new(),
            points: None,
            fold_reading: false,
            seen_tables: None,
            joined_ranking: None,
        }
    }
}

impl TablePanel {
    /// Whether a read is running.
    #[must_use]
    pub fn reading(&self) -> bool {
        self.job.is_some()
    }

    /// The reading options in `unit` (the header does not depend on it).
    fn options(&self, unit: StressUnit) -> TableOptions {
        TableOptions {
            columns: self
                .mapping
                .iter()
                .enumerate()
                .filter(|(_, n)| !n.trim().is_empty())
                .map(|(k, n)| (k, n.clone()))
                .collect(),
            unit,
            convention: if self.compression_positive {
                SignConvention::CompressionPositive
            } else {
                SignConvention::TensionPositive
            },
            decimal_comma: self.decimal_comma,
            plane_stress: self.plane_stress,
            group_by: None,
            skip_bad_rows: self.skip_bad_rows,
            top: Some(self.keep.max(1)),
            by_place: false,
            above: None,
        }
    }

    /// The load-case tables as the project keeps them: the tab's files (absolute where they
    /// can be), ids, case column, unit, convention and mapping; `None` unless joining with a
    /// unit chosen.
    #[must_use]
    pub fn load_case_tables(&self) -> Option<crate::study::LoadCaseTables> {
        let unit = self.unit?;
        if !self.joined() {
            return None;
        }
        let absolute = |f: &str| {
            std::fs::canonicalize(f).map_or_else(|_| f.to_owned(), |p| p.display().to_string())
        };
        let long = !self.case_column.trim().is_empty();
        Some(crate::study::LoadCaseTables {
            tables: self
                .tables()
                .into_iter()
                .map(|(case, file)| crate::study::CaseTableFile {
                    case: if long { String::new() } else { case },
                    file: absolute(&file),
                    unknown: crate::study::unknown::UnknownKeys::new(),
                })
                .collect(),
            ids: self
                .ids
                .split(',')
                .map(str::trim)
                .filter(|s| !s.is_empty())
                .map(str::to_owned)
                .collect(),
            case_column: self.case_column.trim().to_owned(),
            unit: unit.symbol().to_owned(),
            compression_positive: self.compression_positive,
            columns: self
                .mapping
                .iter()
                .enumerate()
                .filter(|(_, n)| !n.trim().is_empty())
                .map(|(k, n)| (COMPONENTS[k].to_owned(), n.trim().to_owned()))
                .collect(),
            plane_stress: self.plane_stress,
            decimal_comma: self.decimal_comma,
            unknown: crate::study::unknown::UnknownKeys::new(),
        })
    }

    /// Takes the project's load-case tables into the tab's fields when the project names some
    /// the tab has not taken yet and the tab has no table of its own.
    fn take_from(&mut self, project: &Project) {
        let Some(t) = &project.load_case_tables else {
            return;
        };
        if self.seen_tables.as_ref() == Some(t) || self.job.is_some() {
            return;
        }
        self.seen_tables = Some(t.clone());
        if !self.path.trim().is_empty() {
            return;
        }
        let mut files = t.tables.iter();
        if let Some(first) = files.next() {
            self.path.clone_from(&first.file);
            self.first_case.clone_from(&first.case);
        }
        self.more_tables = files.map(|f| (f.case.clone(), f.file.clone())).collect();
        self.ids = t.ids.join(", ");
        self.case_column.clone_from(&t.case_column);
        self.unit = t.unit.parse().ok();
        self.compression_positive = t.compression_positive;
        self.plane_stress = t.plane_stress;
        self.decimal_comma = t.decimal_comma;
        for (k, c) in COMPONENTS.iter().enumerate() {
            self.mapping[k] = t.columns.get(*c).cloned().unwrap_or_default();
        }
        let path = self.path.clone();
        self.load_preview(&path);
    }

    /// The report's tables section of the last joined read, if any (each table's SHA-256 read
    /// now); principal values in `convention`.
    #[must_use]
    pub fn report_section(
        &self,
        convention: SignConvention,
    ) -> Option<Result<crate::output::report::TablesSection, String>> {
        let points = self.points.as_ref()?;
        let (ranked, alone, reading) = self.joined_ranking.as_ref()?;
        let (_, _, measure) = self.read_with?;
        Some(crate::output::report::TablesSection::of(
            points,
            ranked,
            reading.clone(),
            measure,
            *alone,
            None,
            convention,
        ))
    }

    /// Whether the read joins load-case tables (id columns are given).
    #[must_use]
    pub fn joined(&self) -> bool {
        !self.ids.trim().is_empty()
    }

    /// The load-case tables as (case, path): this table first (a long table: its only one).
    fn tables(&self) -> Vec<(String, String)> {
        let mut all = vec![(
            self.first_case.trim().to_owned(),
            self.path.trim().to_owned(),
        )];
        if self.case_column.trim().is_empty() {
            all.extend(
                self.more_tables
                    .iter()
                    .filter(|(_, f)| !f.trim().is_empty())
                    .map(|(c, f)| (c.trim().to_owned(), f.trim().to_owned())),
            );
        }
        all
    }

    /// Reads the header and first rows of the file at `path`.
    pub fn load_preview(&mut self, path: &str) {
        path.clone_into(&mut self.path);
        self.preview = Some(
            std::fs::File::open(path)
                .map_err(|e| format!("{path}: {e}"))
                .and_then(|f| {
                    crate::study::table::preview(f, path, &self.options(StressUnit::Pa), 256 << 10)
                        .map_err(|e| e.to_string())
                }),
        );
        if let Some(Ok((h, _))) = &self.preview {
            for k in 0..6 {
                if let Some(name) = h.names.get(h.components[k]) {
                    self.mapping[k].clone_from(name);
                }
            }
        }
    }

    /// Starts reading the table in a background thread.
    pub fn start(&mut self, ctx: &egui::Context, project: &Project) {
        let Some(unit) = self.unit else {
            self.message = Some(UNIT_FIRST.to_owned());
            return;
        };
        let path = PathBuf::from(self.path.trim());
        let options = self.options(unit);
        let measure = self.measure;
        let read_with = (unit, self.compression_positive, measure);
        let strengths = project.material.strengths;
        let convention = options.convention;
        let plane = SearchSettings {
            convention,
            ..project.search_settings()
        };
        let settings = SearchSettings {
            measure: measure.plane().unwrap_or(PlaneMeasure::Shear),
            ..plane
        };
        let cancel = Arc::new(AtomicBool::new(false));
        let bytes = Arc::new(AtomicU64::new(0));
        let (tx, rx) = std::sync::mpsc::channel();
        let size = std::fs::metadata(&path).ok().map(|m| m.len());
        let (c, b, repaint) = (cancel.clone(), bytes.clone(), ctx.clone());
        let name = path.display().to_string();
        let joined = self.joined();
        let tables = self.tables();
        let size = if joined {
            Some(
                tables
                    .iter()
                    .filter_map(|(_, f)| std::fs::metadata(f).ok())
                    .map(|m| m.len())
                    .sum(),
            )
        } else {
            size
        };
        let join = JoinOptions {
            ids: self
                .ids
                .split(',')
                .map(str::trim)
                .filter(|s| !s.is_empty())
                .map(str::to_owned)
                .collect(),
            case_column: Some(self.case_column.trim().to_owned()).filter(|c| !c.is_empty()),
            skip_unmatched: false,
        };
        let combinations = project.combinations.clone();
        let spawned = std::thread::Builder::new()
            .name("planewise-table".into())
            .spawn(move || {
                let m = crate::study::table::Measure {
                    measure,
                    convention,
                    plane_settings: &settings,
                    strengths: &strengths,
                };
                let progress = |n| {
                    b.store(n, Ordering::Relaxed);
                    repaint.request_repaint();
                    !c.load(Ordering::Relaxed)
                };
                let result = if joined {
                    read_points(&tables, &options, &join, &combinations, &m, progress)
                } else {
                    std::fs::File::open(&path)
                        .map_err(|cause| TableError::Io {
                            file: name.clone(),
                            cause,
                        })
                        .and_then(|f| crate::study::table::rank(f, &name, &options, &m, progress))
                        .map(|r| Answer::Rows(Box::new(r)))
                };
                let _ = tx.send(result);
                repaint.request_repaint();
            });
        match spawned {
            Ok(_) => {
                self.message = None;
                self.job = Some(Job {
                    answer: rx,
                    cancel,
                    bytes,
                    size,
                    read_with,
                });
            }
            Err(e) => self.message = Some(format!("could not start reading: {e}")),
        }
    }

    /// Asks a running read to stop.
    pub fn cancel(&mut self) {
        if let Some(job) = &self.job {
            job.cancel.store(true, Ordering::Relaxed);
        }
    }

    /// Picks up the result of a finished read.
    pub fn poll(&mut self) {
        let Some(job) = &self.job else {
            return;
        };
        match job.answer.try_recv() {
            Ok(Ok(Answer::Points(joined))) => {
                let (points, ranked_points, which) = *joined;
                let (unit, compression_positive, _) = job.read_with;
                let reading = format!(
                    "unit {unit}, {}, components {}{}; joined on {}{}",
                    if compression_positive {
                        "compression-positive"
                    } else {
                        "tension-positive"
                    },
                    if self.mapping.iter().all(|m| m.trim().is_empty()) {
                        "by header name".to_owned()
                    } else {
                        format!(
                            "from the columns {}",
                            COMPONENTS
                                .iter()
                                .zip(&self.mapping)
                                .map(|(c, m)| format!("{c}={m}"))
                                .collect::<Vec<_>>()
                                .join(", ")
                        )
                    },
                    if self.plane_stress {
                        ", plane stress (zz, yz and zx stated zero)"
                    } else {
                        ""
                    },
                    points.id_names.join(", "),
                    if self.case_column.trim().is_empty() {
                        String::new()
                    } else {
                        format!(", load case in column {}", self.case_column.trim())
                    }
                );
                let alone = which.starts_with("each load case alone");
                self.message = Some(format!(
                    "{} points joined from {} tables ({} rows); {}; the {} worst points kept",
                    points.len(),
                    points.tables.len(),
                    points.tables.iter().map(|t| t.rows).sum::<u64>(),
                    which,
                    ranked_points.rows.len()
                ));
                self.ranked = Some(as_ranked(&points, &ranked_points));
                self.joined_ranking = Some((ranked_points, alone, reading));
                self.points = Some(points);
                self.fold_reading = true;
                self.read_with = Some(job.read_with);
                self.order_key = None;
                self.job = None;
            }
            Ok(Ok(Answer::Rows(ranked))) => {
                let ranked = *ranked;
                self.points = None;
                self.joined_ranking = None;
                self.message = Some(format!(
                    "{} rows read, {} kept (the worst), {} bad rows{}",
                    ranked.total_rows,
                    ranked.rows.len(),
                    ranked.bad_count,
                    if ranked.bad_count > 0 {
                        " (listed below)"
                    } else {
                        ""
                    }
                ));
                self.ranked = Some(ranked);
                self.fold_reading = true;
                self.read_with = Some(job.read_with);
                self.order_key = None;
                self.job = None;
            }
            Ok(Err(TableError::Cancelled)) => {
                self.message = Some("Reading cancelled; nothing was changed.".into());
                self.job = None;
            }
            Ok(Err(e)) => {
                self.message = Some(e.to_string());
                self.job = None;
            }
            Err(std::sync::mpsc::TryRecvError::Empty) => {}
            Err(std::sync::mpsc::TryRecvError::Disconnected) => {
                self.message = Some("the reading thread ended without an answer".into());
                self.job = None;
            }
        }
    }

    /// Sorts and filters the rows for the list, when either changed.
    fn refresh_order(&mut self) {
        let key = (self.sort.0, self.sort.1, self.filter.clone());
        if self.order_key.as_ref() == Some(&key) {
            return;
        }
        let (Some(r), Some((_, _, measure))) = (&self.ranked, self.read_with) else {
            self.order.clear();
            return;
        };
        let needle = self.filter.trim().to_lowercase();
        let mut order: Vec<usize> = (0..r.rows.len())
            .filter(|&i| {
                needle.is_empty()
                    || r.rows[i]
                        .carried
                        .iter()
                        .any(|t| t.to_lowercase().contains(&needle))
            })
            .collect();
        if let Some(k) = self.sort.0 {
            let number = |i: usize| -> f64 {
                let row = &r.rows[i];
                match k {
                    SortKey::Line => row.line as f64,
                    SortKey::Component(c) => row.tensor.components_pa()[c],
                    SortKey::Value => row.value.unwrap_or(f64::NEG_INFINITY),
                    SortKey::Carried(c) => row.carried[c].trim().parse().unwrap_or(f64::NAN),
                }
            };
            match k {
                SortKey::Carried(c)
                    if r.rows
                        .iter()
                        .any(|row| row.carried[c].trim().parse::<f64>().is_err()) =>
                {
                    order.sort_by(|&a, &b| r.rows[a].carried[c].cmp(&r.rows[b].carried[c]));
                }
                // The ranked value sorts by the one rank rule (failing at any scale or without
                // frictional capacity worst, never reaching best), not by the bare number.
                SortKey::Value => order.sort_by_key(|&i| {
                    crate::study::envelope::RankKey::new(
                        measure,
                        r.rows[i].value,
                        r.rows[i].standing,
                    )
                }),
                _ => order.sort_by(|&a, &b| number(a).total_cmp(&number(b))),
            }
            if self.sort.1 {
                order.reverse();
            }
        }
        self.order = order;
        self.order_key = Some(key);
    }

    /// The tab.
    fn show(&mut self, ui: &mut egui::Ui, project: &Project, d: &Derived, out: &mut Vec<Command>) {
        self.poll();
        self.take_from(project);
        // What to read and how folds away once a read has given a list, so the list has the
        // room; its header opens it again.
        let mut fold = egui::collapsing_header::CollapsingState::load_with_default_open(
            ui.ctx(),
            ui.make_persistent_id("planewise-table-reading"),
            true,
        );
        if std::mem::take(&mut self.fold_reading) {
            fold.set_open(false);
        }
        fold.show_header(ui, |ui| {
            ui.strong("Table, columns and unit");
        })
        .body(|ui| {
                ui.horizontal_wrapped(|ui| {
                    ui.label("Table file:");
                    let field = ui.add(
                        egui::TextEdit::singleline(&mut self.path)
                            .id(egui::Id::unique("planewise-table-path"))
                            .hint_text("path to a CSV, TSV or text table")
                            .desired_width(320.0),
                    )
                    .on_hover_text("Table file path: CSV, TSV, semicolon or whitespace separated, with a header row");
                    if (field.lost_focus() && ui.input(|i| i.key_pressed(egui::Key::Enter)))
                        || ui.button("Preview").clicked()
                    {
                        let path = self.path.trim().to_owned();
                        self.load_preview(&path);
                    }
                    if ui
                        .button("Browse…")
                        .on_hover_text("Choose the table file (File → Import table…)")
                        .clicked()
                    {
                        out.push(Command::ImportTable);
                    }
                });
                self.cases_ui(ui);
                if self.preview.is_none() && self.ranked.is_none() {
                    ui.label("A finite-element result table: one stress state per row, a header row first. The components are found by their header names — xx, yy, zz, xy, yz, zx, with or without an s, sigma or stress in front (sxx, SigmaXX), or s11 … s13 — and any other names can be mapped after Preview. Every other column (element, node, point) is carried along to identify the rows. The unit is yours to say.");
                }
                if let Some(preview) = &self.preview {
                    match preview {
                        Err(e) => {
                            ui.colored_label(ui.visuals().error_fg_color, e);
                        }
                        Ok((header, rows)) => {
                            let header = header.clone();
                            let rows = rows.clone();
                            self.mapping_ui(ui, &header, &rows);
                        }
                    }
                }
                ui.horizontal_wrapped(|ui| {
                    ui.label("Unit");
                    let unit = egui::ComboBox::from_id_salt("planewise-table-unit")
                        .selected_text(self.unit.map_or("choose…", StressUnit::symbol))
                        .show_ui(ui, |ui| {
                            for u in StressUnit::ALL {
                                ui.selectable_value(&mut self.unit, Some(u), u.symbol());
                            }
                        })
                        .response;
                    unit.widget_info(|| {
                        egui::WidgetInfo::labeled(egui::Role::ComboBox, true, "table unit")
                    });
                    unit.on_hover_text("The unit the table's components are written in: a table does not say, so it is yours to choose");
                    ui.checkbox(&mut self.compression_positive, "compression +");
                    ui.checkbox(&mut self.decimal_comma, "decimal comma");
                    ui.checkbox(&mut self.plane_stress, "plane stress")
                        .on_hover_text("The table holds xx, yy and xy only (shell results): zz, yz and zx are read as zero. Never assumed; a table with those columns is refused while this is on");
                });
                // A row of its own: the label and its picker never part at a wrap.
                ui.horizontal(|ui| {
                    ui.label("rank by");
                    egui::ComboBox::from_id_salt("planewise-table-measure")
                        .selected_text(self.measure.label())
                        .show_ui(ui, |ui| {
                            for m in EnvelopeMeasure::ALL {
                                ui.selectable_value(&mut self.measure, m, m.label());
                            }
                        })
                        .response
                        .widget_info(|| egui::WidgetInfo::labeled(egui::Role::ComboBox, true, "rank by"));
                });
                // A row of its own: a label and its field never part at a wrap.
                ui.horizontal(|ui| {
                    ui.label("keep");
                    ui.add(egui::DragValue::new(&mut self.keep).range(1..=5_000_000))
                        .on_hover_text(
                            "How many of the worst rows to keep (the file is read whole either way)",
                        );
                    ui.checkbox(&mut self.skip_bad_rows, "skip bad rows");
                });
        });
        ui.horizontal(|ui| {
            let ready = !self.path.trim().is_empty() && self.job.is_none() && self.unit.is_some();
            if ui
                .add_enabled(ready, egui::Button::new("Read and rank"))
                .on_hover_text("Read the whole table in the background and keep the worst rows")
                .on_disabled_hover_text(if self.unit.is_none() {
                    UNIT_FIRST
                } else {
                    "Give a table file first (or wait for the read in progress)"
                })
                .clicked()
            {
                self.start(ui.ctx(), project);
                // The project keeps where its load cases come from as tables.
                if let Some(t) = self.load_case_tables()
                    && project.load_case_tables.as_ref() != Some(&t)
                {
                    self.seen_tables = Some(t.clone());
                    out.push(Command::Edit {
                        edit: Edit::SetLoadCaseTables(Some(Box::new(t))),
                        coalesce: None,
                    });
                }
            }
            if self.unit.is_none() && !self.path.trim().is_empty() {
                ui.colored_label(
                    ui.visuals().warn_fg_color,
                    "Choose the unit to read the table",
                );
            }
            if let Some(job) = &self.job {
                let read = job.bytes.load(Ordering::Relaxed);
                let fraction = job.size.map_or(0.0, |s| read as f32 / s.max(1) as f32);
                ui.add(
                    egui::ProgressBar::new(fraction)
                        .desired_width(220.0)
                        .text(format!("{:.1} MB read", read as f64 / 1e6)),
                );
                if ui.button("Cancel").clicked() {
                    self.cancel();
                }
            }
        });
        if let Some(m) = &self.message {
            ui.label(m);
        }
        if self.ranked.is_some() {
            self.results_ui(ui, d, out);
        }
    }

    /// Load cases as tables: the id columns to join on, this table's case and the others (or
    /// a long table's case column).
    fn cases_ui(&mut self, ui: &mut egui::Ui) {
        egui::CollapsingHeader::new("Load cases as tables")
            .default_open(self.joined())
            .show(ui, |ui| {
                ui.weak("Finite-element results with one table per load case (or one long table with a load-case column): name the id columns that make a point (element, integration point, section point) and the tables are joined on them in any row order. The project's combinations of these cases are applied at every point (each case alone when it has none); a clicked point becomes the project's load cases of these names.");
                ui.horizontal(|ui| {
                    ui.label("join on ids");
                    ui.add(
                        egui::TextEdit::singleline(&mut self.ids)
                            .id(egui::Id::unique("planewise-table-ids"))
                            .hint_text("element, ip")
                            .desired_width(140.0),
                    )
                    .on_hover_text("Id columns that name a point in every table, comma-separated (empty: one table of rows)");
                    ui.label("case column");
                    ui.add(
                        egui::TextEdit::singleline(&mut self.case_column)
                            .id(egui::Id::unique("planewise-table-case-column"))
                            .hint_text("none")
                            .desired_width(100.0),
                    )
                    .on_hover_text("One long table: the column naming each row's load case (empty: a table per case)");
                });
                if !self.case_column.trim().is_empty() {
                    return;
                }
                ui.horizontal(|ui| {
                    ui.label("this table is the load case");
                    ui.add(
                        egui::TextEdit::singleline(&mut self.first_case)
                            .id(egui::Id::unique("planewise-table-first-case"))
                            .desired_width(100.0),
                    )
                    .on_hover_text("Load case of this table: name it as the project's combinations do");
                });
                let mut remove = None;
                for (i, (case, path)) in self.more_tables.iter_mut().enumerate() {
                    ui.horizontal(|ui| {
                        ui.label("load case");
                        ui.add(
                            egui::TextEdit::singleline(case)
                                .id(egui::Id::unique(("planewise-table-case", i)))
                                .desired_width(100.0),
                        )
                        .on_hover_text(format!("Load case of table {}", i + 2));
                        ui.label("file");
                        ui.add(
                            egui::TextEdit::singleline(path)
                                .id(egui::Id::unique(("planewise-table-more", i)))
                                .hint_text("path to the case's table")
                                .desired_width(260.0),
                        )
                        .on_hover_text(format!(
                            "Table {} path: the same columns, points in any order",
                            i + 2
                        ));
                        if ui
                            .small_button("✕")
                            .on_hover_text("Leave this table out")
                            .clicked()
                        {
                            remove = Some(i);
                        }
                    });
                }
                if let Some(i) = remove {
                    self.more_tables.remove(i);
                }
                if ui
                    .button("Add a load-case table")
                    .on_hover_text("Another table of the same points under another load case")
                    .clicked()
                {
                    let n = self.more_tables.len() + 2;
                    self.more_tables.push((format!("case {n}"), String::new()));
                }
            });
    }

    fn mapping_ui(&mut self, ui: &mut egui::Ui, header: &Header, rows: &[Vec<String>]) {
        ui.label(format!(
            "{} separated, {} columns; components (change where the names differ):",
            header.delimiter.name(),
            header.names.len()
        ));
        // Two rows of three (normal, then shear components): a name never parts from its
        // picker.
        for row in [0..3, 3..6] {
            ui.horizontal(|ui| {
                for k in row {
                    ui.label(COMPONENTS[k]);
                    egui::ComboBox::from_id_salt(("planewise-table-map", k))
                        .selected_text(self.mapping[k].clone())
                        .width(80.0)
                        .show_ui(ui, |ui| {
                            for n in &header.names {
                                ui.selectable_value(&mut self.mapping[k], n.clone(), n);
                            }
                        })
                        .response
                        .widget_info(|| {
                            egui::WidgetInfo::labeled(
                                egui::Role::ComboBox,
                                true,
                                format!("column for {}", COMPONENTS[k]),
                            )
                        });
                }
            });
        }
        egui::Grid::new("planewise-table-preview")
            .striped(true)
            .show(ui, |ui| {
                for n in &header.names {
                    ui.strong(n);
                }
                ui.end_row();
                for r in rows.iter().take(5) {
                    for f in r {
                        ui.label(f);
                    }
                    ui.end_row();
                }
            });
    }

    fn results_ui(&mut self, ui: &mut egui::Ui, d: &Derived, out: &mut Vec<Command>) {
        self.refresh_order();
        let Some(r) = &self.ranked else {
            return;
        };
        let Some((unit, compression_positive, measure)) = self.read_with else {
            return;
        };
        let sign = if compression_positive { -1.0 } else { 1.0 };
        let value_text = |v: Option<f64>, standing| match v {
            Some(v) if measure.is_stress() => crate::text::format::readable(unit.from_pa(v), 5),
            Some(v) => crate::text::format::readable(v, 4),
            None => crate::output::results::standing_word(standing).to_owned(),
        };
        ui.weak(r.counts.text(if self.points.is_some() {
            "points (their governing combinations)"
        } else {
            "rows read"
        }))
            .on_hover_text("Rows that fail at any scale or have no frictional capacity rank worst, above every number; rows that never reach the surface rank best; undefined values follow, with their reason");
        for b in r.bad.iter().take(5) {
            ui.colored_label(
                ui.visuals().warn_fg_color,
                format!("skipped {}", b.located(&self.path)),
            );
        }
        histogram(ui, r, measure, unit);
        ui.horizontal(|ui| {
            ui.label("Filter:");
            ui.add(
                egui::TextEdit::singleline(&mut self.filter)
                    .id(egui::Id::unique("planewise-table-filter"))
                    .hint_text("text in an id or other carried column")
                    .desired_width(200.0),
            )
            .on_hover_text("Table filter: rows whose carried columns contain this text");
            ui.label(format!("{} rows shown", self.order.len()));
        });
        // Column headers: click to sort (again to reverse).
        // The ranked value first, then what identifies the row, then the components.
        let joined = self.points.is_some();
        let mut columns: Vec<(String, SortKey)> = vec![
            (
                (if joined { "point" } else { "line" }).into(),
                SortKey::Line,
            ),
            (
                if measure.is_stress() {
                    format!("{} ({unit})", measure.label())
                } else {
                    measure.label()
                },
                SortKey::Value,
            ),
        ];
        columns.extend(
            r.header
                .carried
                .iter()
                .enumerate()
                .map(|(i, &c)| (r.header.names[c].clone(), SortKey::Carried(i))),
        );
        columns.extend(
            COMPONENTS
                .iter()
                .enumerate()
                .map(|(k, c)| (format!("{c} ({unit})"), SortKey::Component(k))),
        );
        // One width per column, shared by its header and its cells: wide enough for the
        // header's words and its sort mark, so no header drifts over the next column.
        let base = (ui.available_width() / columns.len() as f32 - 8.0).clamp(58.0, 110.0);
        // Measured in the largest of the styles a button's text may take.
        let fonts: Vec<egui::FontId> = [egui::TextStyle::Button, egui::TextStyle::Body]
            .iter()
            .map(|t| t.resolve(ui.style()))
            .collect();
        let pad = 2.0 * ui.spacing().button_padding.x + 4.0;
        let widths: Vec<f32> = columns
            .iter()
            .map(|(name, _)| {
                let text = ui.ctx().fonts_mut(|f| {
                    fonts
                        .iter()
                        .map(|font| {
                            f.layout_no_wrap(
                                format!("{name} ↓"),
                                font.clone(),
                                egui::Color32::WHITE,
                            )
                            .size()
                            .x
                        })
                        .fold(0.0, f32::max)
                });
                base.max((text + pad).ceil()).min(240.0)
            })
            .collect();
        // Joined points: the governing combination's column is as wide as its longest name
        // (generated names are long), within reason.
        let mut widths = widths;
        if joined {
            let longest = r
                .rows
                .iter()
                .filter_map(|row| row.carried.first())
                .max_by_key(|t| t.chars().count())
                .cloned()
                .unwrap_or_default();
            let font = egui::TextStyle::Body.resolve(ui.style());
            let text = ui.ctx().fonts_mut(|f| {
                f.layout_no_wrap(longest, font, egui::Color32::WHITE)
                    .size()
                    .x
            });
            if let Some(w) = widths.get_mut(2) {
                *w = w.max((text + pad).ceil()).min(360.0);
            }
        }
        let mut clicked_sort = None;
        let row_height = ui.text_style_height(&egui::TextStyle::Body) + 4.0;
        let mut chosen = None;
        // Wide tables scroll sideways, headers and rows together.
        egui::ScrollArea::horizontal()
            .id_salt("planewise-table-wide")
            .show(ui, |ui| {
                ui.horizontal(|ui| {
                    for ((name, key), &width) in columns.iter().zip(&widths) {
                        let mark = match self.sort {
                            (Some(k), desc) if k == *key => {
                                if desc {
                                    " ↓"
                                } else {
                                    " ↑"
                                }
                            }
                            _ => "",
                        };
                        if ui
                            .add_sized(
                                [width, 20.0],
                                egui::Button::new(format!("{name}{mark}"))
                                    .small()
                                    .truncate(),
                            )
                            .on_hover_text(format!("Sort by {name}"))
                            .clicked()
                        {
                            clicked_sort = Some(*key);
                        }
                    }
                });
                egui::ScrollArea::vertical()
                    .id_salt("planewise-table-rows")
                    .auto_shrink([false, false])
                    .show_rows(ui, row_height, self.order.len(), |ui, range| {
                        for &i in &self.order[range] {
                            let row = &r.rows[i];
                            let comps = row.tensor.components_pa();
                            let rect = ui
                                .horizontal(|ui| {
                                    let mut width = widths.iter();
                                    let mut column = 0;
                                    let mut cell = |ui: &mut egui::Ui, t: String| {
                                        let w = width.next().copied().unwrap_or(base);
                                        let size = egui::vec2(w, row_height - 2.0);
                                        // A joined point's combination name reads from its
                                        // start, as text does.
                                        if joined && column == 2 {
                                            ui.allocate_ui_with_layout(
                                                size,
                                                egui::Layout::left_to_right(egui::Align::Center),
                                                |ui| {
                                                    ui.set_min_size(size);
                                                    ui.add(egui::Label::new(t).truncate());
                                                },
                                            );
                                        } else {
                                            ui.add_sized(size, egui::Label::new(t).truncate());
                                        }
                                        column += 1;
                                    };
                                    cell(ui, row.line.to_string());
                                    cell(ui, value_text(row.value, row.standing));
                                    for t in &row.carried {
                                        cell(ui, t.clone());
                                    }
                                    for c in comps {
                                        cell(
                                            ui,
                                            crate::text::format::readable(
                                                sign * unit.from_pa(c),
                                                5,
                                            ),
                                        );
                                    }
                                })
                                .response
                                .rect;
                            // The whole row is one click target, laid over its cells.
                            let response = ui
                                .interact(
                                    rect,
                                    ui.scope_id().with(("planewise-table-row", row.line)),
                                    egui::Sense::click(),
                                )
                                .on_hover_text(if joined {
                                    format!(
                                        "Point {}: click to make its load cases the project's, shown under its governing combination",
                                        row.line
                                    )
                                } else {
                                    format!(
                                        "Row on line {}: click to show it as a load case",
                                        row.line
                                    )
                                });
                            if response.clicked() {
                                chosen = Some(i);
                            }
                        }
                    });
            });
        if let Some(k) = clicked_sort {
            self.sort = if self.sort.0 == Some(k) {
                (Some(k), !self.sort.1)
            } else {
                (Some(k), true)
            };
            self.order_key = None;
        }
        if let (Some(i), Some(points)) = (chosen, &self.points) {
            out.push(point_cases(points, &r.rows[i], d));
            return;
        }
        if let Some(i) = chosen {
            let row = &r.rows[i];
            let file = std::path::Path::new(self.path.trim())
                .file_name()
                .map_or_else(|| self.path.clone(), |n| n.to_string_lossy().into_owned());
            let id = row.carried.first().cloned().unwrap_or_default();
            let name = format!("row {} of {}", row.line, file.replace([',', '='], " "));
            let project_unit = d.unit;
            let psign = d.convention.sign();
            out.push(Command::Edit {
                edit: Edit::AddTableRow(Box::new(LoadCase {
                    unknown: crate::study::unknown::UnknownKeys::new(),
                    name,
                    description: format!(
                        "From {}, line {}{}",
                        self.path.trim(),
                        row.line,
                        if id.is_empty() {
                            String::new()
                        } else {
                            format!(" ({id})")
                        }
                    ),
                    input: CaseInput::TableRow(TableRowInput {
                        file: self.path.trim().to_owned(),
                        line: row.line,
                        id: id.clone(),
                        stress: TypedTensor {
                            unit: project_unit.symbol().to_owned(),
                            compression_positive: d.convention
                                == SignConvention::CompressionPositive,
                            components: row
                                .tensor
                                .components_pa()
                                .map(|c| psign * project_unit.from_pa(c)),
                        },
                    }),
                })),
                coalesce: None,
            });
        }
    }
}

/// The edit that makes point `row` (a row of [`as_ranked`]) the project's load cases: one per
/// table case, in the project's unit and convention, then its governing combination shown.
fn point_cases(points: &Points, row: &crate::study::table::Row, d: &Derived) -> Command {
    let p = usize::try_from(row.line.saturating_sub(1)).unwrap_or(0);
    Command::Edit {
        edit: Edit::AddTablePoint {
            cases: crate::study::table::point_load_cases(points, p, d.unit, d.convention),
            show: row.carried.first().cloned().unwrap_or_default(),
        },
        coalesce: None,
    }
}

/// Joins the load-case tables and ranks their points under the combinations of `project` whose
/// terms all name the tables' cases (each case alone when none do); says which were used.
fn read_points(
    tables: &[(String, String)],
    options: &TableOptions,
    join: &JoinOptions,
    combinations: &[crate::study::Combination],
    measure: &crate::study::table::Measure<'_>,
    progress: impl FnMut(u64) -> bool,
) -> Result<Answer, TableError> {
    let mut sources = Vec::new();
    for (case, file) in tables {
        let f = std::fs::File::open(file).map_err(|cause| TableError::Io {
            file: file.clone(),
            cause,
        })?;
        sources.push(CaseTable {
            case: case.clone(),
            file: file.clone(),
            source: std::io::BufReader::with_capacity(1 << 16, f),
        });
    }
    let points = crate::study::table::join(sources, options, join, progress)?;
    let usable: Vec<crate::study::Combination> = combinations
        .iter()
        .filter(|c| c.terms.iter().all(|t| points.cases.contains(&t.case)))
        .cloned()
        .collect();
    let which = if usable.is_empty() {
        "each load case alone (the project has no combinations of these cases)".to_owned()
    } else {
        format!(
            "the project's {} combinations of these cases at every point",
            usable.len()
        )
    };
    let factors = crate::study::table::point_combinations(&points.cases, &usable)
        .map_err(TableError::Measure)?;
    let ranked = crate::study::table::rank_points(&points, factors, options, measure)?;
    Ok(Answer::Points(Box::new((points, ranked, which))))
}

/// Joined points as the list shows rows: `line` is the point's number, the carried texts are
/// the governing combination and then the ids.
fn as_ranked(points: &Points, ranked: &RankedPoints) -> Ranked {
    let mut names = vec!["combination".to_owned()];
    names.extend(points.id_names.iter().cloned());
    let width = names.len();
    let bad: Vec<crate::study::table::BadRow> =
        points.tables.iter().flat_map(|t| t.bad.clone()).collect();
    Ranked {
        header: Header {
            names,
            delimiter: Delimiter::Byte(b','),
            components: [usize::MAX; 6],
            carried: (0..width).collect(),
            group: None,
            line: 1,
        },
        rows: ranked
            .rows
            .iter()
            .map(|r| {
                let mut row = r.row.clone();
                row.carried
                    .insert(0, ranked.combinations[r.combination].name.clone());
                row
            })
            .collect(),
        places: Vec::new(),
        total_rows: ranked.points,
        bad_count: points.tables.iter().map(|t| t.bad_count).sum(),
        bad,
        counts: ranked.counts,
        at_or_beyond: ranked.at_or_beyond,
        unterminated: points.tables.iter().any(|t| t.unterminated),
        groups: Vec::new(),
    }
}

/// Bars of the histogram.
const BINS: usize = 20;

/// A histogram of the kept rows' ranked values (20 bins), drawn with the painter.
fn histogram(ui: &mut egui::Ui, r: &Ranked, measure: EnvelopeMeasure, unit: StressUnit) {
    let values: Vec<f64> = r
        .rows
        .iter()
        .filter_map(|row| row.value)
        .filter(|v| v.is_finite())
        .collect();
    let (Some(lo), Some(hi)) = (
        values.iter().copied().reduce(f64::min),
        values.iter().copied().reduce(f64::max),
    ) else {
        return;
    };
    let span = (hi - lo).max(1e-300);
    let mut counts = [0usize; BINS];
    for v in &values {
        counts[(((v - lo) / span * BINS as f64) as usize).min(BINS - 1)] += 1;
    }
    let most = counts.iter().copied().max().unwrap_or(1).max(1);
    let (rect, response) = ui.allocate_exact_size(
        egui::vec2(ui.available_width().min(520.0), 70.0),
        egui::Sense::hover(),
    );
    let painter = ui.painter_at(rect);
    let w = rect.width() / BINS as f32;
    for (i, c) in counts.iter().enumerate() {
        let h = (rect.height() - 14.0) * *c as f32 / most as f32;
        painter.rect_filled(
            egui::Rect::from_min_max(
                egui::pos2(rect.left() + i as f32 * w + 1.0, rect.bottom() - 14.0 - h),
                egui::pos2(rect.left() + (i + 1) as f32 * w - 1.0, rect.bottom() - 14.0),
            ),
            0.0,
            ui.visuals().selection.bg_fill,
        );
    }
    let shown = |v: f64| {
        if measure.is_stress() {
            format!(
                "{} {unit}",
                crate::text::format::readable(unit.from_pa(v), 4)
            )
        } else {
            crate::text::format::readable(v, 4)
        }
    };
    let font = egui::FontId::proportional(11.0);
    painter.text(
        rect.left_bottom(),
        egui::Align2::LEFT_BOTTOM,
        shown(lo),
        font.clone(),
        ui.visuals().text_color(),
    );
    painter.text(
        rect.right_bottom(),
        egui::Align2::RIGHT_BOTTOM,
        shown(hi),
        font,
        ui.visuals().text_color(),
    );
    response.on_hover_text(format!(
        "Histogram of {} over the {} kept rows (20 bins)",
        measure.label(),
        values.len()
    ));
}

impl super::Panel for TablePanel {
    fn ui(&mut self, ui: &mut egui::Ui, reads: super::Reads<'_>, writes: &mut super::Writes<'_>) {
        self.show(ui, reads.project, reads.d, writes.commands);
    }
}

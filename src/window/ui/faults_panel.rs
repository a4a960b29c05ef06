//! The faults tab: named planes (dip / dip direction, or strike / dip by the right-hand rule)
//! checked at once as faults — effective normal stress, shear, slip and dilation tendency,
//! Coulomb utilization, the pore-pressure rise to slip and the rake — sortable by any column.

use crate::mechanics::criteria::FaultCheck;
use crate::study::{Derived, Edit, FaultPlane};
use crate::text::format::readable;
use crate::text::parse;
use crate::window::session::{Coalesce, Command};

/// Columns that sort.
const COLUMNS: [&str; 8] = [
    "σn′",
    "τ",
    "slip tendency",
    "dilation tendency",
    "Coulomb U",
    "Δp to slip",
    "rake",
    "name",
];

/// Tab state: sorting, strike entry and the text being typed.
#[derive(Debug, Default)]
pub struct FaultsPanel {
    /// Sort column (index into the columns) and whether descending.
    sort: Option<(usize, bool)>,
    /// Show and type strike (right-hand rule) instead of dip direction.
    pub strike: bool,
    shown: Option<(Vec<FaultPlane>, bool)>,
    sent: Option<Vec<FaultPlane>>,
    texts: Vec<[String; 3]>,
    error: Option<String>,
}

fn value(c: Option<&FaultCheck>, column: usize) -> Option<f64> {
    let c = c?;
    match column {
        0 => Some(c.effective_normal_stress_pa),
        1 => Some(c.shear_stress_pa),
        2 => c.slip_tendency.utilization,
        3 => c.dilation_tendency.utilization,
        4 => c.mohr_coulomb.and_then(|m| m.utilization),
        5 => c.pore_pressure_to_slip_pa,
        6 => c.rake_deg,
        _ => None,
    }
}

impl FaultsPanel {
    fn refresh(&mut self, faults: &[FaultPlane]) {
        let key = (faults.to_vec(), self.strike);
        if self.shown.as_ref() == Some(&key) {
            return;
        }
        let own = self.sent.as_deref() == Some(faults)
            && self
                .shown
                .as_ref()
                .is_some_and(|(f, s)| f.len() == faults.len() && *s == self.strike);
        self.shown = Some(key);
        if own {
            return;
        }
        self.texts = faults
            .iter()
            .map(|f| {
                let azimuth = if self.strike {
                    f.strike_deg()
                } else {
                    f.dip_direction_deg
                };
                [f.name.clone(), readable(f.dip_deg, 6), readable(azimuth, 6)]
            })
            .collect();
        self.error = None;
    }

    fn parse(&self) -> Result<Vec<FaultPlane>, String> {
        self.texts
            .iter()
            .map(|[name, dip, azimuth]| {
                let dip = parse::number(dip).map_err(|e| format!("{name}: dip: {e}"))?;
                let azimuth =
                    parse::number(azimuth).map_err(|e| format!("{name}: azimuth: {e}"))?;
                let dip_direction_deg = if self.strike {
                    (azimuth + 90.0).rem_euclid(360.0)
                } else {
                    azimuth
                };
                let f = FaultPlane {
                    unknown: crate::study::unknown::UnknownKeys::new(),
                    name: name.trim().to_owned(),
                    dip_deg: dip,
                    dip_direction_deg,
                };
                f.normal().map_err(|e| e.to_string())?;
                Ok(f)
            })
            .collect()
    }

    fn send(
        &mut self,
        faults: Vec<FaultPlane>,
        coalesce: Option<Coalesce>,
        out: &mut Vec<Command>,
    ) {
        self.sent = Some(faults.clone());
        out.push(Command::Edit {
            edit: Edit::SetFaults(faults),
            coalesce,
        });
    }

    /// Draws the tab.
    fn show(
        &mut self,
        ui: &mut egui::Ui,
        faults: &[FaultPlane],
        d: &Derived,
        out: &mut Vec<Command>,
    ) {
        self.refresh(faults);
        ui.horizontal_wrapped(|ui| {
            if ui
                .button("+ fault from the cut plane")
                .on_hover_text("Adds the current cut plane as a named fault")
                .clicked()
            {
                let (dip, dd) = d.plane.dip_deg();
                let mut next = faults.to_vec();
                let n = (1..=faults.len() + 1)
                    .map(|i| format!("fault {i}"))
                    .find(|n| !faults.iter().any(|f| &f.name == n))
                    .unwrap_or_default();
                next.push(FaultPlane { unknown: crate::study::unknown::UnknownKeys::new(),
                    name: n,
                    dip_deg: dip,
                    dip_direction_deg: dd,
                });
                self.sent = None;
                out.push(Command::Edit {
                    edit: Edit::SetFaults(next),
                    coalesce: None,
                });
            }
            ui.checkbox(&mut self.strike, "strike / dip (right-hand rule)")
                .on_hover_text(
                    "Type and show strike instead of dip direction: strike = dip direction − 90°, the plane dipping to the right when looking along strike",
                );
            ui.weak(format!(
                "compression positive, σn′ = σn − p with p = {} {} and the plane's c and φ from the worst-plane section",
                readable(d.unit.from_pa(d.measure.pore_pressure_pa), 5),
                d.unit
            ));
        });
        if let Some(e) = &self.error {
            ui.colored_label(
                ui.visuals().error_fg_color,
                format!("⚠ {e} — the last valid faults are kept"),
            );
        }
        if faults.is_empty() {
            ui.weak("No faults yet: set the cut plane to a fault (dip / dip direction in the cut-plane section) and add it here.");
            return;
        }
        let mut order: Vec<usize> = (0..d.faults.len()).collect();
        if let Some((col, desc)) = self.sort {
            order.sort_by(|&a, &b| {
                let cmp = if col == 7 {
                    d.faults[a].0.name.cmp(&d.faults[b].0.name)
                } else {
                    let va = value(d.faults[a].1.as_ref(), col);
                    let vb = value(d.faults[b].1.as_ref(), col);
                    // Undefined values sort last either way.
                    match (va, vb) {
                        (Some(x), Some(y)) => x.total_cmp(&y),
                        (Some(_), None) => std::cmp::Ordering::Less,
                        (None, Some(_)) => std::cmp::Ordering::Greater,
                        (None, None) => std::cmp::Ordering::Equal,
                    }
                };
                if desc && col != 7 { cmp.reverse() } else { cmp }
            });
        }
        let stress = |pa: f64| format!("{} {}", readable(d.unit.from_pa(pa), 5), d.unit);
        let ratio = |v: Option<f64>| v.map_or_else(|| "undefined".to_owned(), |x| readable(x, 4));
        let mut changed = false;
        let mut remove = None;
        let mut show = None;
        egui::ScrollArea::both().show(ui, |ui| {
            egui::Grid::new("faults")
                .striped(true)
                .spacing([10.0, 4.0])
                .show(ui, |ui| {
                    ui.strong("name");
                    ui.strong("dip (°)");
                    ui.strong(if self.strike {
                        "strike (°)"
                    } else {
                        "dip direction (°)"
                    });
                    for (i, head) in COLUMNS[..7].iter().enumerate() {
                        let mark = match self.sort {
                            Some((c, true)) if c == i => " ▼",
                            Some((c, false)) if c == i => " ▲",
                            _ => "",
                        };
                        if ui
                            .button(format!("{head}{mark}"))
                            .on_hover_text("Sort by this column (again: reverse)")
                            .clicked()
                        {
                            self.sort = match self.sort {
                                Some((c, desc)) if c == i => Some((i, !desc)),
                                _ => Some((i, true)),
                            };
                        }
                    }
                    ui.label("");
                    ui.end_row();
                    for &i in &order {
                        let (_, check) = &d.faults[i];
                        if let Some(texts) = self.texts.get_mut(i) {
                            for (k, width) in [(0, 90.0), (1, 50.0), (2, 60.0)] {
                                let names = ["name", "dip", "azimuth"];
                                changed |= ui
                                    .add(
                                        egui::TextEdit::singleline(&mut texts[k])
                                            .id_salt(("fault-field", i, k))
                                            .desired_width(width),
                                    )
                                    .on_hover_text(format!("Fault {} {}", i + 1, names[k]))
                                    .changed();
                            }
                        }
                        match check {
                            Some(c) => {
                                ui.monospace(stress(c.effective_normal_stress_pa));
                                ui.monospace(stress(c.shear_stress_pa));
                                ui.monospace(ratio(c.slip_tendency.utilization));
                                ui.monospace(ratio(c.dilation_tendency.utilization));
                                if c.mohr_coulomb.is_some() {
                                    ui.monospace(ratio(
                                        c.mohr_coulomb.and_then(|m| m.utilization),
                                    ));
                                    ui.monospace(
                                        c.pore_pressure_to_slip_pa.map_or_else(
                                            || "undefined (φ = 0)".to_owned(),
                                            stress,
                                        ),
                                    );
                                } else {
                                    let tip = "not checked: needs the planes' cohesion and friction angle (Worst plane section)";
                                    ui.weak("not checked").on_hover_text(tip);
                                    ui.weak("not checked").on_hover_text(tip);
                                }
                                ui.monospace(c.rake_deg.map_or_else(
                                    || "undefined".to_owned(),
                                    |r| format!("{}°", readable(r, 4)),
                                ));
                            }
                            None => {
                                for _ in 0..7 {
                                    ui.label("—");
                                }
                            }
                        }
                        ui.horizontal(|ui| {
                            if ui
                                .small_button("show")
                                .on_hover_text("Make it the cut plane")
                                .clicked()
                            {
                                show = Some(i);
                            }
                            if ui
                                .small_button("✕")
                                .on_hover_text("Delete this fault (undo brings it back)")
                                .clicked()
                            {
                                remove = Some(i);
                            }
                        });
                        ui.end_row();
                    }
                });
        });
        if let Some(i) = show
            && let Ok(n) = faults[i].normal()
        {
            out.push(Command::Edit {
                edit: Edit::SetPlane(n),
                coalesce: None,
            });
        }
        if let Some(i) = remove {
            let mut next = faults.to_vec();
            next.remove(i);
            self.sent = None;
            out.push(Command::Edit {
                edit: Edit::SetFaults(next),
                coalesce: None,
            });
        } else if changed {
            match self.parse() {
                Ok(next) => {
                    self.error = None;
                    if next != faults {
                        self.send(next, Some(Coalesce::FaultFields), out);
                    }
                }
                Err(e) => self.error = Some(e),
            }
        }
    }
}

impl super::Panel for FaultsPanel {
    fn ui(&mut self, ui: &mut egui::Ui, reads: super::Reads<'_>, writes: &mut super::Writes<'_>) {
        self.show(ui, &reads.project.faults, reads.d, writes.commands);
    }
}

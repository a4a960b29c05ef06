//! A fatigue study of one point: the history with where it came from, the settings every point
//! shares (unit, convention, the criterion's constants, the S–N curve, the path method), and
//! the answer (the critical plane, and the plane of largest damage with an S–N curve). The
//! command line, the window's Fatigue tab and the fatigue report all read these.

use std::path::PathBuf;
use std::sync::atomic::{AtomicBool, AtomicUsize, Ordering};

use crate::mechanics::fatigue::{
    Constants, CriticalPlane, DamagePlane, FatigueLimits, PathMethod, SearchSettings, SnCurve,
    StressHistory, critical_plane, damage_plane,
};
use crate::mechanics::{SignConvention, StressTensor, StressUnit};
use crate::study::load_history::{Factors, PointHistories, read_point_histories};

/// The cautions every fatigue answer carries (besides the program's own).
pub const FATIGUE_CAUTION: &str = "Fatigue results are sensitive to surface finish, size, notches, residual stress and environment, which these criteria do not see; the fatigue limits and S–N curve must come from tests of the material in its condition. Defer to the applicable design code and test data.";

/// How finite life is computed, in words.
pub const LIFE_METHOD: &str = "rainflow (ASTM E1049-85) of the shear resolved every 15° in the plane; per cycle Findley's P = τa + k·σn,max (σn,max between the cycle's reversals: the criterion's mean-stress term), τeq = P/√(1 + k²) on the torsion S–N curve; Palmgren–Miner sum; the plane of largest damage";

/// A history and where it came from.
#[derive(Clone, Debug, PartialEq)]
pub struct LoadedHistory {
    /// What it is, for people (the file, or the factors and the load cases).
    pub text: String,
    /// The name of its time (or step) column.
    pub time_name: String,
    /// The history.
    pub history: StressHistory,
    /// The files it was read from, with their role.
    pub files: Vec<(String, PathBuf)>,
}

/// The settings every point shares.
#[derive(Clone, Debug, PartialEq)]
pub struct FatigueSetup {
    /// Unit of every stress read and shown.
    pub unit: StressUnit,
    /// Convention of the stresses read and shown.
    pub convention: SignConvention,
    /// The criterion and its constants.
    pub constants: Constants,
    /// The fatigue limits they came from (`None` when given directly).
    pub limits: Option<FatigueLimits>,
    /// The S–N curve for finite life, if any (Findley only).
    pub sn: Option<SnCurve>,
    /// How the shear amplitude is measured.
    pub method: PathMethod,
    /// How finely planes are searched.
    pub search: SearchSettings,
}

impl FatigueSetup {
    /// The setup, with the default search. Finite life is computed with Findley's parameter,
    /// so an S–N curve with another criterion is refused (said in words).
    pub fn new(
        unit: StressUnit,
        convention: SignConvention,
        constants: Constants,
        limits: Option<FatigueLimits>,
        sn: Option<SnCurve>,
        method: PathMethod,
    ) -> Result<Self, &'static str> {
        if sn.is_some() && constants.criterion != crate::mechanics::fatigue::Criterion::Findley {
            return Err(
                "finite life is computed with Findley's parameter: choose the Findley criterion",
            );
        }
        Ok(Self {
            unit,
            convention,
            constants,
            limits,
            sn,
            method,
            search: SearchSettings::default(),
        })
    }
}

/// One point's answer.
#[derive(Clone, Debug, PartialEq)]
pub struct Judged {
    /// The long-life criterion's critical plane.
    pub plane: CriticalPlane,
    /// With an S–N curve: the plane of largest damage and its life.
    pub life: Option<DamagePlane>,
}

impl Judged {
    /// Judges `history` under `setup`.
    #[must_use]
    pub fn of(history: &StressHistory, setup: &FatigueSetup) -> Self {
        let plane = critical_plane(history, &setup.constants, setup.method, &setup.search);
        let life = setup
            .sn
            .as_ref()
            .map(|sn| damage_plane(history, setup.constants.coefficient, sn, &setup.search));
        Self { plane, life }
    }

    /// What points are ranked by: the damage with an S–N curve, else the utilization.
    #[must_use]
    pub fn rank_value(&self) -> f64 {
        self.life
            .as_ref()
            .map_or(self.plane.utilization, |l| l.damage.damage)
    }
}

/// Why many points could not be read: which input, and what is wrong.
#[derive(Debug, Clone, PartialEq, Eq)]
pub enum ManyError {
    /// The load-case tables.
    Tables(String),
    /// The factor history.
    Factors(String),
}

/// Where many points' histories come from.
pub enum ManyPoints {
    /// Load-case tables joined on ids, every point under one factor history.
    Tables {
        /// The joined points.
        points: Box<crate::study::table::Points>,
        /// The factor history.
        factors: Factors,
        /// The tables' index of each factor column's case.
        case_index: Vec<usize>,
    },
    /// One long table of a history per point.
    Long(PointHistories),
}

impl ManyPoints {
    /// Load-case tables (`tables`: case and file) joined on `ids`, under the factor history in
    /// `factors` (its columns name the tables' cases).
    pub fn read_tables(
        tables: &[(String, PathBuf)],
        ids: &[String],
        factors: &std::path::Path,
        unit: StressUnit,
        convention: SignConvention,
    ) -> Result<Self, ManyError> {
        use crate::study::table::{self, CaseTable, JoinOptions, TableOptions};
        let mut read = Vec::new();
        for (case, file) in tables {
            let f = std::fs::File::open(file)
                .map_err(|e| ManyError::Tables(format!("{}: {e}", file.display())))?;
            read.push(CaseTable {
                case: case.clone(),
                file: file.display().to_string(),
                source: std::io::BufReader::new(f),
            });
        }
        let options = TableOptions::new(unit, convention);
        let join = JoinOptions {
            ids: ids.to_vec(),
            case_column: None,
            skip_unmatched: false,
        };
        let points = table::join(read, &options, &join, |_| true)
            .map_err(|e| ManyError::Tables(e.to_string()))?;
        let factors = Factors::read(factors, &points.cases).map_err(ManyError::Factors)?;
        let case_index: Vec<usize> = factors
            .cases
            .iter()
            .filter_map(|c| points.cases.iter().position(|p| p == c))
            .collect();
        Ok(Self::Tables {
            points: Box::new(points),
            factors,
            case_index,
        })
    }

    /// One long table of a history per point (see [`read_point_histories`]).
    pub fn read_long(
        path: &std::path::Path,
        ids: &[String],
        time: &str,
        unit: StressUnit,
        convention: SignConvention,
    ) -> Result<Self, String> {
        read_point_histories(path, ids, time, unit, convention).map(Self::Long)
    }

    /// How many points.
    #[must_use]
    pub fn len(&self) -> usize {
        match self {
            Self::Tables { points, .. } => points.len(),
            Self::Long(h) => h.histories.len(),
        }
    }

    /// Whether there are none.
    #[must_use]
    pub fn is_empty(&self) -> bool {
        self.len() == 0
    }

    /// Whether point `p` was left out of the join.
    #[must_use]
    pub fn left_out(&self, p: usize) -> bool {
        match self {
            Self::Tables { points, .. } => points.left_out(p),
            Self::Long(_) => false,
        }
    }

    /// The id columns' names.
    #[must_use]
    pub fn id_names(&self) -> &[String] {
        match self {
            Self::Tables { points, .. } => &points.id_names,
            Self::Long(h) => &h.id_names,
        }
    }

    /// Point `p`'s ids.
    #[must_use]
    pub fn ids(&self, p: usize) -> Vec<String> {
        match self {
            Self::Tables { points, .. } => points.ids(p),
            Self::Long(h) => h.ids[p].clone(),
        }
    }

    /// The name of the histories' time column.
    #[must_use]
    pub fn time_name(&self) -> &str {
        match self {
            Self::Tables { factors, .. } => &factors.time_name,
            Self::Long(h) => &h.time_name,
        }
    }

    /// Point `p`'s history.
    pub fn history(&self, p: usize) -> Result<std::borrow::Cow<'_, StressHistory>, String> {
        match self {
            Self::Tables {
                points,
                factors,
                case_index,
            } => {
                let tensors: Vec<StressTensor> = case_index
                    .iter()
                    .map(|c| StressTensor::from_pa(points.tensor(*c, p)).map_err(|e| e.to_string()))
                    .collect::<Result<_, _>>()?;
                factors.history(&tensors).map(std::borrow::Cow::Owned)
            }
            Self::Long(h) => Ok(std::borrow::Cow::Borrowed(&h.histories[p])),
        }
    }

    /// Where the histories come from, in words; the load cases (none for a long table); the
    /// steps when every point has the same.
    #[must_use]
    pub fn describe(&self) -> (String, Vec<String>, Option<usize>) {
        match self {
            Self::Tables { factors, .. } => (
                format!("{} on load-case tables", factors.file),
                factors.cases.clone(),
                Some(factors.time.len()),
            ),
            Self::Long(h) => {
                let first = h.histories.first().map_or(0, StressHistory::len);
                (
                    format!(
                        "a history per point ({} against {})",
                        h.ids.len(),
                        h.time_name
                    ),
                    Vec::new(),
                    h.histories
                        .iter()
                        .all(|x| x.len() == first)
                        .then_some(first),
                )
            }
        }
    }
}

/// Judges every point of `source` in parallel and returns them worst first (by damage with an
/// S–N curve, else by utilization; ties in point order). `done` counts the points judged;
/// setting `cancel` stops the work (the points judged so far are dropped and an error says so).
pub fn rank(
    source: &ManyPoints,
    setup: &FatigueSetup,
    done: &AtomicUsize,
    cancel: &AtomicBool,
) -> Result<Vec<(usize, Judged)>, String> {
    use rayon::prelude::*;
    let judged: Vec<Result<Option<(usize, Judged)>, String>> = (0..source.len())
        .into_par_iter()
        .filter(|p| !source.left_out(*p))
        .map(|p| {
            if cancel.load(Ordering::Relaxed) {
                return Ok(None);
            }
            let history = source.history(p)?;
            let j = Judged::of(&history, setup);
            done.fetch_add(1, Ordering::Relaxed);
            Ok(Some((p, j)))
        })
        .collect();
    if cancel.load(Ordering::Relaxed) {
        return Err("stopped".to_owned());
    }
    let mut judged: Vec<(usize, Judged)> = judged
        .into_iter()
        .filter_map(Result::transpose)
        .collect::<Result<_, _>>()?;
    judged.sort_by(|a, b| {
        b.1.rank_value()
            .total_cmp(&a.1.rank_value())
            .then(a.0.cmp(&b.0))
    });
    Ok(judged)
}

//! A fatigue study of one point: the history with where it came from, the settings every point
//! shares (unit, convention, the criterion's constants, the S–N curve, the path method), and
//! the answer (the critical plane, and the plane of largest damage with an S–N curve). The
//! command line, the window's Fatigue tab and the fatigue report all read these.

use std::path::PathBuf;

use crate::mechanics::fatigue::{
    Constants, CriticalPlane, DamagePlane, FatigueLimits, PathMethod, SearchSettings, SnCurve,
    StressHistory, critical_plane, damage_plane,
};
use crate::mechanics::{SignConvention, StressUnit};

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

//! `planewise fatigue`: a load history at a point (or at every point of load-case tables),
//! judged on its critical plane by a long-life criterion, and optionally its finite life by
//! rainflow counting and Miner's rule.

use std::fmt::Write as _;
use std::path::{Path, PathBuf};

use clap::Args;
use serde::Serialize;

use super::{ArgError, CliError, values};
use crate::mechanics::fatigue::life::WorstCycle;
use crate::mechanics::fatigue::{
    Constants, Criterion, CriticalPlane, DamagePlane, FatigueLimits, Limit, PathMethod, SnCurve,
    StressHistory,
};
use crate::mechanics::{SignConvention, StressUnit};
use crate::picture::draw::Sizes;
use crate::picture::figures;
use crate::study::fatigue::{
    FATIGUE_CAUTION, FatigueSetup, Judged, LIFE_METHOD, LoadedHistory, ManyError, ManyPoints,
};
use crate::study::load_history::read_components;
use crate::text::format::{clean, sig};

/// Arguments of `planewise fatigue`.
#[derive(Debug, Clone, Args)]
pub struct FatigueArgs {
    /// The history as a CSV: a time (or step) column first, then the six components by name
    /// (xx, yy, zz, xy, yz, zx or S11 … S13), one line per step.
    #[arg(long, value_name = "FILE", conflicts_with_all = ["project", "case_table"])]
    pub history: Option<PathBuf>,
    /// Factors in time on load cases: a CSV of a time column and one column per load case
    /// (named as the project or the tables name them); σ(t) = Σ fᵢ(t) σᵢ. With --project or
    /// --case-table.
    #[arg(long, value_name = "FILE")]
    pub factors: Option<PathBuf>,
    /// The project whose load cases --factors scales.
    #[arg(long, value_name = "FILE", requires = "factors")]
    pub project: Option<PathBuf>,
    /// Many points: a load-case table CASE=FILE (one stress state per row, joined on --ids);
    /// repeat for each case. Every point gets the --factors history and the points are ranked.
    #[arg(long, value_name = "CASE=FILE", requires_all = ["factors", "ids"])]
    pub case_table: Vec<String>,
    /// Many points: one long table of a history per point — the --ids columns naming the
    /// point, the --time-column, and the six components — one row per point and step; the
    /// points are ranked.
    #[arg(long, value_name = "FILE", conflicts_with_all = ["history", "project", "case_table", "factors"])]
    pub histories: Option<PathBuf>,
    /// The time (or step) column of --histories.
    #[arg(long, value_name = "NAME", default_value = "time")]
    pub time_column: String,
    /// The id columns the --case-table files join on, or that name the points of --histories
    /// (e.g. element,ip).
    #[arg(long, value_name = "COLUMN,…", value_delimiter = ',')]
    pub ids: Vec<String>,
    /// With --case-table or --histories: how many of the worst points to list.
    #[arg(long, value_name = "N", default_value = "20")]
    pub top: usize,
    /// With --case-table or --histories: list every point at or above this utilization (or
    /// damage with --sn)
    /// instead of the top N.
    #[arg(long, value_name = "VALUE", allow_hyphen_values = true)]
    pub above: Option<String>,
    /// Unit of the history's (or tables') stresses and of every stress typed and printed.
    /// [default: MPa, or the project's unit with --project]
    #[arg(long, value_name = "UNIT", value_parser = values::unit)]
    pub unit: Option<StressUnit>,
    /// Stresses read and printed are compression-positive.
    #[arg(long)]
    pub compression_positive: bool,
    /// The long-life criterion.
    #[arg(long, value_name = "NAME", default_value = "findley", value_parser = criterion)]
    pub criterion: Criterion,
    /// Fully reversed bending (or tension–compression) fatigue limit f₋₁, in --unit.
    #[arg(long, value_name = "STRESS")]
    pub bending_limit: Option<String>,
    /// Fully reversed torsion fatigue limit t₋₁, in --unit.
    #[arg(long, value_name = "STRESS")]
    pub torsion_limit: Option<String>,
    /// Ultimate tensile strength σu, in --unit (McDiarmid).
    #[arg(long, value_name = "STRESS")]
    pub tensile_strength: Option<String>,
    /// The criterion's stress coefficient (k, μ, t₋₁/(2σu) or α), given directly with --limit
    /// instead of the fatigue limits.
    #[arg(
        long,
        value_name = "NUMBER",
        allow_hyphen_values = true,
        requires = "limit"
    )]
    pub coefficient: Option<String>,
    /// The criterion's limit (f*, t₋₁ or β), in --unit, with --coefficient.
    #[arg(long, value_name = "STRESS", requires = "coefficient")]
    pub limit: Option<String>,
    /// How the shear amplitude of a path is measured: circle (minimum circumscribed circle)
    /// or chord (longest chord).
    #[arg(long = "path", value_name = "METHOD", default_value = "circle", value_parser = path_method)]
    pub path: PathMethod,
    /// Finite life: the torsion S–N curve τa = τ'f (2N)^b as τ'f,b (τ'f in --unit), e.g.
    /// 450,-0.09. Findley only.
    #[arg(long, value_name = "TAUF,B", allow_hyphen_values = true)]
    pub sn: Option<String>,
    /// With --sn: shear amplitude below which cycles do no damage, in --unit (a cut-off;
    /// without it Basquin's line is followed to every amplitude).
    #[arg(long, value_name = "STRESS", requires = "sn")]
    pub endurance: Option<String>,
    /// Write the orientation map of the utilization (or of log₁₀ damage with --sn) over every
    /// plane, .svg or .png.
    #[arg(long, value_name = "FILE")]
    pub map: Option<PathBuf>,
    /// Write the critical plane's shear path with its amplitude circle and σn(t), |τ(t)|
    /// against time, .svg or .png.
    #[arg(long, value_name = "FILE")]
    pub path_figure: Option<PathBuf>,
    /// Write the fatigue calculation report: one self-contained HTML page (inputs with their
    /// SHA-256, material and constants, critical plane, utilization, life, both figures).
    #[arg(long, value_name = "FILE.html")]
    pub report: Option<PathBuf>,
    /// Map cells per side (16 to 512).
    #[arg(long, value_name = "N", default_value = "120", value_parser = clap::value_parser!(u16).range(16..=512))]
    pub resolution: u16,
    /// Print one JSON object instead of the text.
    #[arg(long)]
    pub json: bool,
    /// No progress on standard error (many points).
    #[arg(long)]
    pub quiet: bool,
}

fn criterion(text: &str) -> Result<Criterion, String> {
    Criterion::from_key(text).ok_or_else(|| {
        let keys: Vec<&str> = Criterion::ALL.iter().map(|c| c.key()).collect();
        format!("'{text}' is not a criterion (one of: {})", keys.join(", "))
    })
}

fn path_method(text: &str) -> Result<PathMethod, String> {
    PathMethod::from_key(text)
        .ok_or_else(|| format!("'{text}' is not a path method (circle or chord)"))
}

fn stress(arg: &'static str, text: &str, unit: StressUnit) -> Result<f64, ArgError> {
    super::stress_value(arg, text, unit)
}

/// The argument that gives `limit`.
fn limit_arg(limit: Limit) -> &'static str {
    match limit {
        Limit::Bending => "--bending-limit",
        Limit::Torsion => "--torsion-limit",
        Limit::TensileStrength => "--tensile-strength",
    }
}

/// The settings the arguments give, stresses read in `unit`.
fn read_setup(args: &FatigueArgs, unit: StressUnit) -> Result<FatigueSetup, ArgError> {
    let convention = if args.compression_positive {
        SignConvention::CompressionPositive
    } else {
        SignConvention::TensionPositive
    };
    let optional = |text: &Option<String>, arg: &'static str| {
        text.as_deref().map(|t| stress(arg, t, unit)).transpose()
    };
    let (constants, limits) = if let (Some(k), Some(limit)) = (&args.coefficient, &args.limit) {
        if args.bending_limit.is_some() || args.torsion_limit.is_some() {
            return Err(ArgError::new(
                "--coefficient",
                "give the criterion's constants or the fatigue limits, not both",
            ));
        }
        let k = crate::text::parse::number(k).map_err(|e| ArgError::new("--coefficient", e))?;
        let limit = stress("--limit", limit, unit)?;
        (
            Constants::given(args.criterion, k, limit).map_err(|e| ArgError::new("--limit", e))?,
            None,
        )
    } else {
        let torsion = optional(&args.torsion_limit, "--torsion-limit")?.ok_or_else(|| {
            ArgError::new(
                "--torsion-limit",
                "the fatigue limits are needed (--bending-limit and --torsion-limit), or the criterion's constants (--coefficient and --limit)",
            )
        })?;
        let limits = FatigueLimits {
            bending_pa: optional(&args.bending_limit, "--bending-limit")?,
            torsion_pa: torsion,
            tensile_strength_pa: optional(&args.tensile_strength, "--tensile-strength")?,
        };
        let constants = Constants::derive(args.criterion, &limits)
            .map_err(|e| ArgError::new(e.limit().map_or("--bending-limit", limit_arg), e))?;
        (constants, Some(limits))
    };
    let sn = args
        .sn
        .as_deref()
        .map(|text| {
            let [coefficient, exponent] =
                crate::text::parse::numbers::<2>(text).map_err(|e| ArgError::new("--sn", e))?;
            SnCurve::new(
                unit.to_pa(coefficient),
                exponent,
                optional(&args.endurance, "--endurance")?,
            )
            .map_err(|e| ArgError::new("--sn", e))
        })
        .transpose()?;
    FatigueSetup::new(unit, convention, constants, limits, sn, args.path)
        .map_err(|e| ArgError::new("--sn", e))
}

// ---- JSON contract -------------------------------------------------------------------------

/// The constants used.
#[derive(Debug, Serialize)]
pub struct ConstantsJson {
    pub coefficient_symbol: &'static str,
    pub coefficient: f64,
    pub limit_symbol: &'static str,
    /// In `unit`.
    pub limit: f64,
    pub derivation: String,
    /// The fatigue limits they were derived from, in `unit` (null when given directly).
    pub bending_limit: Option<f64>,
    pub torsion_limit: Option<f64>,
    pub tensile_strength: Option<f64>,
}

/// The critical plane of the long-life criterion.
#[derive(Debug, Serialize)]
pub struct PlaneJson {
    /// Upward unit normal.
    pub normal: [f64; 3],
    pub dip_deg: f64,
    pub dip_direction_deg: f64,
    /// Shear amplitude τa (the path's amplitude circle's radius), in `unit`.
    pub shear_amplitude: f64,
    /// Mean shear vector (the circle's centre) in the plane's axes (a along strike, b up the
    /// dip), in `unit`.
    pub mean_shear: [f64; 2],
    /// Largest normal stress over the history, in `unit`, tension positive whatever the
    /// display convention (the criteria are written so).
    pub normal_stress_max: f64,
    /// The criterion's value, in `unit`.
    pub value: f64,
    /// Time at which the value (Dang Van) or σn,max (the others) is reached, in the history's
    /// first column.
    pub time: f64,
}

/// The governing cycle of finite life.
#[derive(Debug, Serialize)]
pub struct CycleJson {
    pub from_time: f64,
    pub to_time: f64,
    /// Direction in the plane it was counted on, degrees from the plane's strike axis.
    pub direction_deg: f64,
    pub shear_amplitude: f64,
    pub normal_stress_max: f64,
    /// τeq = (τa + k·σn,max)/√(1 + k²), in `unit`.
    pub equivalent_amplitude: f64,
    pub count: f64,
    pub damage: f64,
}

/// Finite life.
#[derive(Debug, Serialize)]
pub struct LifeJson {
    /// τ'f in `unit`.
    pub sn_coefficient: f64,
    pub sn_exponent: f64,
    pub endurance_limit: Option<f64>,
    pub method: &'static str,
    pub normal: [f64; 3],
    pub dip_deg: f64,
    pub dip_direction_deg: f64,
    pub damage_per_repeat: f64,
    /// Repeats of the history to failure; null when nothing does damage.
    pub life_repeats: Option<f64>,
    pub governing_cycle: Option<CycleJson>,
}

/// What every fatigue answer states first: the criterion, units, path method and constants.
#[derive(Debug, Serialize)]
pub struct SettingsJson {
    pub criterion: &'static str,
    pub definition: &'static str,
    pub unit: &'static str,
    pub convention: &'static str,
    pub path_method: &'static str,
    pub constants: ConstantsJson,
}

impl SettingsJson {
    fn of(setup: &FatigueSetup) -> Self {
        Self {
            criterion: setup.constants.criterion.key(),
            definition: setup.constants.criterion.definition(),
            unit: setup.unit.symbol(),
            convention: setup.convention.key(),
            path_method: setup.method.key(),
            constants: constants_json(setup),
        }
    }

    /// The constants' line of the text.
    fn constants_line(&self) -> String {
        let c = &self.constants;
        format!(
            "  Constants: {} = {}, {} = {} {}  ({})",
            c.coefficient_symbol,
            sig(c.coefficient, 5),
            c.limit_symbol,
            sig(c.limit, 6),
            self.unit,
            c.derivation
        )
    }
}

/// `planewise fatigue --json` for one point.
#[derive(Debug, Serialize)]
pub struct FatigueJson {
    #[serde(flatten)]
    pub settings: SettingsJson,
    pub history: String,
    /// The name of the history's first column (time or step), which every time here is in.
    pub time_column: String,
    pub steps: usize,
    pub critical_plane: PlaneJson,
    /// Value ÷ limit.
    pub utilization: f64,
    /// Limit ÷ value: the factor on the whole history that reaches the limit; null when the
    /// value is not positive.
    pub factor_of_safety: Option<f64>,
    pub life: Option<LifeJson>,
    pub planes_evaluated: usize,
    pub caution: &'static str,
}

fn constants_json(setup: &FatigueSetup) -> ConstantsJson {
    let u = setup.unit;
    let c = &setup.constants;
    ConstantsJson {
        coefficient_symbol: c.criterion.coefficient_symbol(),
        coefficient: clean(c.coefficient),
        limit_symbol: c.criterion.limit_symbol(),
        limit: clean(u.from_pa(c.limit_pa)),
        derivation: c.derivation.clone(),
        bending_limit: setup
            .limits
            .and_then(|l| l.bending_pa)
            .map(|v| clean(u.from_pa(v))),
        torsion_limit: setup.limits.map(|l| clean(u.from_pa(l.torsion_pa))),
        tensile_strength: setup
            .limits
            .and_then(|l| l.tensile_strength_pa)
            .map(|v| clean(u.from_pa(v))),
    }
}

fn plane_json(p: &CriticalPlane, h: &StressHistory, u: StressUnit) -> PlaneJson {
    let v = &p.value;
    let scale = h.scale_pa();
    let stress = |x: f64| clean(u.from_pa(crate::text::format::clean_relative(x, scale)));
    PlaneJson {
        normal: p.normal.map(|c| crate::text::format::resolved(clean(c))),
        dip_deg: crate::text::format::angle(p.dip_deg, false),
        dip_direction_deg: crate::text::format::angle(p.dip_direction_deg, true),
        shear_amplitude: stress(v.tau_amplitude_pa),
        mean_shear: v.circle.centre_resolved().map(stress),
        normal_stress_max: stress(v.sigma_n_max_pa),
        value: stress(v.value_pa),
        time: h.time()[v.step],
    }
}

fn cycle_json(c: &WorstCycle, h: &StressHistory, u: StressUnit) -> CycleJson {
    CycleJson {
        from_time: h.time()[c.from.min(c.to)],
        to_time: h.time()[c.from.max(c.to)],
        direction_deg: c.direction_deg,
        shear_amplitude: clean(u.from_pa(c.amplitude_pa)),
        normal_stress_max: clean(u.from_pa(c.sigma_n_max_pa)),
        equivalent_amplitude: clean(u.from_pa(c.equivalent_pa)),
        count: c.count,
        damage: c.damage,
    }
}

fn life_json(l: &DamagePlane, sn: &SnCurve, h: &StressHistory, u: StressUnit) -> LifeJson {
    LifeJson {
        sn_coefficient: clean(u.from_pa(sn.coefficient_pa)),
        sn_exponent: sn.exponent,
        endurance_limit: sn.endurance_pa.map(|e| clean(u.from_pa(e))),
        method: LIFE_METHOD,
        normal: l.normal.map(|c| crate::text::format::resolved(clean(c))),
        dip_deg: crate::text::format::angle(l.dip_deg, false),
        dip_direction_deg: crate::text::format::angle(l.dip_direction_deg, true),
        damage_per_repeat: l.damage.damage,
        life_repeats: l.life_repeats,
        governing_cycle: l.damage.worst.as_ref().map(|c| cycle_json(c, h, u)),
    }
}

fn single_json(source: &LoadedHistory, setup: &FatigueSetup, j: &Judged) -> FatigueJson {
    let u = setup.unit;
    let h = &source.history;
    FatigueJson {
        settings: SettingsJson::of(setup),
        history: source.text.clone(),
        time_column: source.time_name.clone(),
        steps: h.len(),
        critical_plane: plane_json(&j.plane, h, u),
        utilization: clean(j.plane.utilization),
        factor_of_safety: j.plane.factor_of_safety().map(clean),
        life: j
            .life
            .as_ref()
            .zip(setup.sn.as_ref())
            .map(|(l, sn)| life_json(l, sn, h, u)),
        planes_evaluated: j.plane.evaluations + j.life.as_ref().map_or(0, |l| l.evaluations),
        caution: FATIGUE_CAUTION,
    }
}

// ---- text ----------------------------------------------------------------------------------

use crate::output::fatigue_report::plane_text;

fn single_text(json: &FatigueJson) -> String {
    let settings = &json.settings;
    let u = settings.unit;
    let c = &settings.constants;
    let p = &json.critical_plane;
    let mut s = String::new();
    let _ = writeln!(
        s,
        "Fatigue on the critical plane: {} — {}",
        Criterion::from_key(settings.criterion).map_or(settings.criterion, Criterion::label),
        settings.definition
    );
    let _ = writeln!(
        s,
        "  History: {}, {} steps; stresses in {u}, {} (σn in the criteria is tension-positive)",
        json.history, json.steps, settings.convention
    );
    if let (Some(t), bending) = (c.torsion_limit, c.bending_limit) {
        let _ = writeln!(
            s,
            "  Material: {}t₋₁ {} {u} (fully reversed torsion){}",
            bending.map_or_else(String::new, |b| format!(
                "f₋₁ {} {u} (fully reversed bending), ",
                sig(b, 6)
            )),
            sig(t, 6),
            c.tensile_strength
                .map_or_else(String::new, |v| format!(", σu {} {u}", sig(v, 6)))
        );
    }
    let _ = writeln!(s, "{}", settings.constants_line());
    let _ = writeln!(
        s,
        "  Shear amplitude: {}",
        PathMethod::from_key(settings.path_method).map_or("", PathMethod::label)
    );
    let _ = writeln!(
        s,
        "  Critical plane: {}",
        plane_text(p.dip_deg, p.dip_direction_deg, p.normal)
    );
    let _ = writeln!(
        s,
        "    τa {} {u}, mean shear ({}, {}) {u}, σn,max {} {u}; value {} {u} (at {} {})",
        sig(p.shear_amplitude, 6),
        sig(p.mean_shear[0], 4),
        sig(p.mean_shear[1], 4),
        sig(p.normal_stress_max, 6),
        sig(p.value, 6),
        json.time_column,
        sig(p.time, 6)
    );
    let _ = writeln!(
        s,
        "  Utilization {} (value ÷ {}); factor of safety {}",
        sig(json.utilization, 4),
        c.limit_symbol,
        json.factor_of_safety.map_or_else(
            || "undefined (the value is not positive)".to_owned(),
            |f| format!(
                "{} ({} ÷ value: the factor on the whole history that reaches the limit)",
                sig(f, 4),
                c.limit_symbol
            )
        )
    );
    if let Some(l) = &json.life {
        let _ = writeln!(
            s,
            "  Finite life: torsion S–N τa = τ'f (2N)^b, τ'f {} {u}, b {}; {}",
            sig(l.sn_coefficient, 6),
            sig(l.sn_exponent, 4),
            l.endurance_limit.map_or_else(
                || "no endurance limit: Basquin's line below every amplitude".to_owned(),
                |e| format!("cycles below {} {u} do no damage (a cut-off)", sig(e, 6))
            )
        );
        let _ = writeln!(s, "    Method: {}", l.method);
        let _ = writeln!(
            s,
            "    Plane of largest damage: {}",
            plane_text(l.dip_deg, l.dip_direction_deg, l.normal)
        );
        let _ = writeln!(
            s,
            "    Damage per repeat {}; life {}",
            sig(l.damage_per_repeat, 4),
            l.life_repeats.map_or_else(
                || "unlimited (no cycle does damage)".to_owned(),
                |n| format!("{} repeats of the history", sig(n, 4))
            )
        );
        if let Some(g) = &l.governing_cycle {
            let _ = writeln!(
                s,
                "    Governing cycle: {} {} to {}, τa {} {u}, σn,max {} {u}, τeq {} {u}, {} cycle, damage {}",
                json.time_column,
                sig(g.from_time, 6),
                sig(g.to_time, 6),
                sig(g.shear_amplitude, 5),
                sig(g.normal_stress_max, 5),
                sig(g.equivalent_amplitude, 5),
                if g.count < 1.0 { "half" } else { "full" },
                sig(g.damage, 4)
            );
        }
    }
    let _ = writeln!(s, "  Planes evaluated: {}", json.planes_evaluated);
    let _ = writeln!(s, "{}", json.caution);
    s
}

// ---- figures -------------------------------------------------------------------------------

fn write_figures(
    args: &FatigueArgs,
    source: &LoadedHistory,
    setup: &FatigueSetup,
    j: &Judged,
) -> Result<Vec<String>, CliError> {
    let mut written = Vec::new();
    if let Some(path) = &args.path_figure {
        let frame = figures::fatigue_path(
            source,
            setup,
            j,
            None,
            [1400, 760],
            Sizes::for_export(1400.0, 760.0),
        );
        crate::output::export::write_figure(path, &frame, "Shear path on the critical plane")
            .map_err(|e| ArgError::new("--path-figure", e))?;
        written.push(format!("wrote {}", path.display()));
    }
    if let Some(path) = &args.map {
        let (frame, title) = figures::fatigue_map(
            source,
            setup,
            j,
            usize::from(args.resolution),
            None,
            [1200, 900],
            Sizes::for_export(1200.0, 900.0),
        );
        crate::output::export::write_figure(path, &frame, &title)
            .map_err(|e| ArgError::new("--map", e))?;
        written.push(format!("wrote {}", path.display()));
    }
    if let Some(path) = &args.report {
        let html = crate::output::fatigue_report::of(
            source,
            setup,
            j,
            usize::from(args.resolution),
            &crate::output::report::now_iso8601(),
        )
        .map(|r| crate::output::fatigue_report::html(&r))
        .map_err(|e| ArgError::new("--report", e))?;
        crate::study::atomic::write_atomic(path, html.as_bytes())
            .map_err(|e| anyhow::anyhow!("{}: {e}", path.display()))?;
        written.push(format!("wrote {}", path.display()));
    }
    Ok(written)
}

// ---- many points ---------------------------------------------------------------------------

/// One ranked point, in the JSON.
#[derive(Debug, Serialize)]
pub struct PointJson {
    pub ids: serde_json::Map<String, serde_json::Value>,
    pub utilization: f64,
    pub factor_of_safety: Option<f64>,
    pub critical_plane: PlaneJson,
    pub life: Option<LifeJson>,
}

/// `planewise fatigue --case-table … --json`.
#[derive(Debug, Serialize)]
pub struct PointsJson {
    #[serde(flatten)]
    pub settings: SettingsJson,
    /// Where the histories come from: a factor history on load-case tables, or a history per
    /// point.
    pub histories: String,
    /// The load cases the factors scale (empty for a history per point).
    pub cases: Vec<String>,
    /// Steps of every point's history; null when the points' histories differ in length.
    pub steps: Option<usize>,
    /// "utilization" or "damage per repeat".
    pub ranked_by: &'static str,
    pub points: usize,
    pub listed: Vec<PointJson>,
    pub seconds: f64,
    pub caution: &'static str,
}

/// Reads the many points: load-case tables with a factor history, or a long table of histories.
fn read_many_points(args: &FatigueArgs, setup: &FatigueSetup) -> Result<ManyPoints, CliError> {
    let ids: Vec<String> = args.ids.iter().map(|s| s.trim().to_owned()).collect();
    if let Some(file) = &args.histories {
        if ids.is_empty() {
            return Err(ArgError::new(
                "--ids",
                "--histories needs the id columns that name the points",
            )
            .into());
        }
        return ManyPoints::read_long(file, &ids, &args.time_column, setup.unit, setup.convention)
            .map_err(|e| ArgError::new("--histories", e).into());
    }
    let Some(factors_file) = &args.factors else {
        return Err(ArgError::new("--factors", "--case-table needs --factors").into());
    };
    let mut tables = Vec::new();
    for text in &args.case_table {
        let Some((case, file)) = text.split_once('=') else {
            return Err(ArgError::new(
                "--case-table",
                format!("'{text}': give each load-case table as CASE=FILE"),
            )
            .into());
        };
        tables.push((case.trim().to_owned(), PathBuf::from(file)));
    }
    ManyPoints::read_tables(&tables, &ids, factors_file, setup.unit, setup.convention).map_err(
        |e| match e {
            ManyError::Tables(e) => ArgError::new("--case-table", e).into(),
            ManyError::Factors(e) => ArgError::new("--factors", e).into(),
        },
    )
}

fn many_points(args: &FatigueArgs, setup: &FatigueSetup) -> Result<String, CliError> {
    let started = std::time::Instant::now();
    let source = read_many_points(args, setup)?;
    let threshold = args
        .above
        .as_deref()
        .map(|t| crate::text::parse::number(t).map_err(|e| ArgError::new("--above", e)))
        .transpose()?;
    let n = source.len();
    let done = std::sync::atomic::AtomicUsize::new(0);
    let quiet = args.quiet || args.json;
    let judged = std::thread::scope(|scope| {
        let ranking = scope.spawn(|| {
            crate::study::fatigue::rank(
                &source,
                setup,
                &done,
                &std::sync::atomic::AtomicBool::new(false),
            )
        });
        while !ranking.is_finished() {
            std::thread::sleep(std::time::Duration::from_millis(250));
            if !quiet {
                eprint!(
                    "\rplanewise fatigue: {} of {n} points   ",
                    done.load(std::sync::atomic::Ordering::Relaxed)
                );
            }
        }
        ranking.join()
    })
    .map_err(|_| anyhow::anyhow!("the ranking stopped unexpectedly"))?
    .map_err(|e| ArgError::new("--factors", e))?;
    if !quiet {
        eprintln!(
            "\rplanewise fatigue: {n} points judged in {:.1} s   ",
            started.elapsed().as_secs_f64()
        );
    }
    let listed: Vec<&(usize, Judged)> = match threshold {
        Some(t) => judged.iter().filter(|(_, j)| j.rank_value() >= t).collect(),
        None => judged.iter().take(args.top).collect(),
    };
    let u = setup.unit;
    let (histories, cases, steps) = source.describe();
    let mut rows = Vec::with_capacity(listed.len());
    for (p, j) in &listed {
        let history = source
            .history(*p)
            .map_err(|e| ArgError::new("--factors", e))?;
        rows.push(PointJson {
            ids: source
                .id_names()
                .iter()
                .zip(source.ids(*p))
                .map(|(k, v)| (k.clone(), serde_json::Value::String(v)))
                .collect(),
            utilization: clean(j.plane.utilization),
            factor_of_safety: j.plane.factor_of_safety().map(clean),
            critical_plane: plane_json(&j.plane, &history, u),
            life: j
                .life
                .as_ref()
                .zip(setup.sn.as_ref())
                .map(|(l, sn)| life_json(l, sn, &history, u)),
        });
    }
    let json = PointsJson {
        settings: SettingsJson::of(setup),
        histories,
        cases,
        steps,
        ranked_by: if setup.sn.is_some() {
            "damage per repeat"
        } else {
            "utilization"
        },
        points: judged.len(),
        listed: rows,
        seconds: started.elapsed().as_secs_f64(),
        caution: FATIGUE_CAUTION,
    };
    if args.json {
        let mut text = serde_json::to_string_pretty(&json).map_err(anyhow::Error::from)?;
        text.push('\n');
        return Ok(text);
    }
    let mut s = String::new();
    let _ = writeln!(
        s,
        "Fatigue at {} points ({} — {}), ranked by {}; histories: {}{}{}; {u}, {}",
        json.points,
        setup.constants.criterion.label(),
        json.settings.definition,
        json.ranked_by,
        json.histories,
        if json.cases.is_empty() {
            String::new()
        } else {
            format!(" ({})", json.cases.join(", "))
        },
        json.steps
            .map_or_else(String::new, |n| format!(", {n} steps")),
        json.settings.convention,
        u = json.settings.unit
    );
    let _ = writeln!(s, "{}", json.settings.constants_line());
    let _ = writeln!(
        s,
        "{:<24} {:>11} {:>8} {:>8} {:>11} {:>11}{}",
        source.id_names().join(","),
        "utilization",
        "dip°",
        "dipdir°",
        format!("τa {}", json.settings.unit),
        format!("σn,max {}", json.settings.unit),
        if setup.sn.is_some() {
            "      damage        life"
        } else {
            ""
        }
    );
    for p in &json.listed {
        let ids: Vec<String> = p
            .ids
            .values()
            .map(|v| v.as_str().unwrap_or_default().to_owned())
            .collect();
        let _ = write!(
            s,
            "{:<24} {:>11} {:>8} {:>8} {:>11} {:>11}",
            ids.join(","),
            sig(p.utilization, 4),
            sig(p.critical_plane.dip_deg, 4),
            sig(p.critical_plane.dip_direction_deg, 4),
            sig(p.critical_plane.shear_amplitude, 5),
            sig(p.critical_plane.normal_stress_max, 5)
        );
        if let Some(l) = &p.life {
            let _ = write!(
                s,
                " {:>11} {:>11}",
                sig(l.damage_per_repeat, 4),
                l.life_repeats
                    .map_or_else(|| "unlimited".to_owned(), |n| sig(n, 4))
            );
        }
        s.push('\n');
    }
    if json.listed.is_empty() {
        let _ = writeln!(s, "  (no point at or above the threshold)");
    }
    let _ = writeln!(s, "{}", json.caution);
    Ok(s)
}

// ---- run -----------------------------------------------------------------------------------

fn read_source(
    args: &FatigueArgs,
    unit: StressUnit,
    convention: SignConvention,
) -> Result<LoadedHistory, ArgError> {
    if let Some(file) = &args.history {
        let (history, time_name) =
            read_components(file, unit, convention).map_err(|e| ArgError::new("--history", e))?;
        return Ok(LoadedHistory {
            text: format!("{} (components)", file.display()),
            time_name,
            history,
            files: vec![("history (components in time)".to_owned(), file.clone())],
        });
    }
    let (Some(project_file), Some(factors)) = (&args.project, &args.factors) else {
        return Err(ArgError::new(
            "--history",
            "give the history: --history FILE (components in time), --project FILE with --factors FILE (factors on its load cases), --case-table with --ids and --factors, or --histories with --ids (many points)",
        ));
    };
    let (project, _) =
        crate::study::load(project_file).map_err(|e| ArgError::new("--project", e))?;
    let mut cases = Vec::new();
    for c in &project.cases {
        let t = project
            .tensor(&c.name)
            .map_err(|e| ArgError::new("--project", format!("load case '{}': {e}", c.name)))?;
        cases.push((c.name.clone(), t));
    }
    let (history, read) = crate::study::load_history::read_factors(factors, &cases)
        .map_err(|e| ArgError::new("--factors", e))?;
    Ok(LoadedHistory {
        text: format!(
            "{} × load cases {} of {}",
            factors.display(),
            read.cases.join(", "),
            project_file.display()
        ),
        time_name: read.time_name,
        files: vec![
            ("factors in time".to_owned(), factors.clone()),
            ("project (load cases)".to_owned(), project_file.clone()),
        ],
        history,
    })
}

/// Runs the subcommand.
pub fn run(args: &FatigueArgs) -> Result<String, CliError> {
    let project_unit = args
        .project
        .as_ref()
        .map(|p| {
            crate::study::load(p)
                .map_err(|e| ArgError::new("--project", e))
                .and_then(|(pr, _)| pr.unit().map_err(|e| ArgError::new("--project", e)))
        })
        .transpose()?;
    let unit = args.unit.or(project_unit).unwrap_or(StressUnit::MPa);
    let setup = read_setup(args, unit)?;
    for (arg, path) in [
        ("--map", &args.map),
        ("--path-figure", &args.path_figure),
        ("--report", &args.report),
    ] {
        if let Some(p) = path {
            if arg == "--report" {
                if p.extension().and_then(|e| e.to_str()) != Some("html") {
                    return Err(ArgError::new(arg, "the report is an .html file").into());
                }
            } else {
                crate::output::export::ImageFormat::from_path(p)
                    .map_err(|e| ArgError::new(arg, e))?;
            }
            let inputs: Vec<&Path> = [&args.history, &args.factors, &args.project]
                .into_iter()
                .flatten()
                .map(PathBuf::as_path)
                .collect();
            crate::study::atomic::not_an_input(p, &inputs).map_err(|e| ArgError::new(arg, e))?;
        }
    }
    if !args.case_table.is_empty() || args.histories.is_some() {
        if args.map.is_some() || args.path_figure.is_some() || args.report.is_some() {
            return Err(ArgError::new(
                "--map",
                "figures are drawn for one point (--history or --project); not with --case-table or --histories",
            )
            .into());
        }
        return many_points(args, &setup);
    }
    // Read in the given convention: the history file's components are in it.
    let source = read_source(args, unit, setup.convention)?;
    let judged = Judged::of(&source.history, &setup);
    let json = single_json(&source, &setup, &judged);
    let written = write_figures(args, &source, &setup, &judged)?;
    let mut out = if args.json {
        let mut text = serde_json::to_string_pretty(&json).map_err(anyhow::Error::from)?;
        text.push('\n');
        text
    } else {
        single_text(&json)
    };
    if !args.json {
        for w in written {
            let _ = writeln!(out, "{w}");
        }
    }
    Ok(out)
}

//! The argument groups several subcommands share, in one place: the stress state
//! ([`StressArgs`]: components, another input kind, or a project's case), the cut plane, the
//! strengths, the measure and its material, and a figure's output (file, print size, title).
//! Each subcommand's own file holds only its own arguments.

use std::path::{Path, PathBuf};

use clap::Args;

use super::{ArgError, no_such_case, values};
use crate::mechanics::criteria::{CriterionError, DruckerPragerFit, MohrCoulomb, Strengths};
use crate::mechanics::search::{Measure, SearchSettings};
use crate::mechanics::{PlaneNormal, SignConvention, StressTensor, StressUnit};
use crate::text::parse;

/// The stress state, as every subcommand takes it.
#[derive(Debug, Clone, Args)]
pub struct StressArgs {
    /// Components as key=value pairs, e.g. xx=120,yy=-35,zz=15,xy=48,yz=-12,zx=22. Omitted
    /// components are 0; yx, zy, xz are accepted for xy, yz, zx. Or --project with --case.
    #[arg(long, value_name = "KEY=VALUE,…", allow_hyphen_values = true)]
    pub stress: Option<String>,
    /// Unit of every stress typed and printed, exactly as written: Pa, kPa, MPa, GPa, bar, psi
    /// or ksi (N/mm² and N/mm2 are read as MPa).
    /// [default: MPa, or the project's unit with --project]
    #[arg(long, value_name = "UNIT", value_parser = values::unit)]
    pub unit: Option<StressUnit>,
    /// Stresses typed and printed are compression-positive (geomechanics).
    #[arg(long)]
    pub compression_positive: bool,
    #[command(flatten)]
    pub other: InputArgs,
    /// Take the state from this project file (with --case) instead of --stress.
    #[arg(long, value_name = "FILE", requires = "case")]
    pub project: Option<std::path::PathBuf>,
    /// The load case or combination of --project.
    #[arg(long, value_name = "NAME", requires = "project")]
    pub case: Option<String>,
}

impl StressArgs {
    /// The unit given with `--unit`, or `default`.
    #[must_use]
    pub fn unit_or(&self, default: StressUnit) -> StressUnit {
        self.unit.unwrap_or(default)
    }

    /// The state of load case or combination `case` of the project in `file` (shown in the
    /// project's unit and convention unless `--unit` or `--compression-positive` say otherwise);
    /// `--stress` must then be absent.
    pub fn read_from_project(&self, file: &Path, case: &str) -> Result<StressInput, ArgError> {
        if self.stress.is_some() {
            return Err(ArgError::new(
                "--stress",
                "cannot be given together with --project",
            ));
        }
        if self.other.any() {
            return Err(ArgError::new(
                "--project",
                "cannot be given together with --in-situ or --principal",
            ));
        }
        let (project, _) = crate::study::load(file).map_err(|e| ArgError::new("--project", e))?;
        let tensor = project.tensor(case).map_err(|e| {
            if project.name_used(case) {
                ArgError::new("--case", e)
            } else {
                no_such_case(&project, case)
            }
        })?;
        let project_unit = project.unit().map_err(|e| ArgError::new("--project", e))?;
        let convention = if self.compression_positive {
            SignConvention::CompressionPositive
        } else {
            project.convention()
        };
        Ok(StressInput {
            tensor,
            unit: self.unit_or(project_unit),
            convention,
        })
    }

    /// The project's names, cut plane and measure with `--project`, else `None`.
    pub fn project_view(&self) -> Result<Option<ProjectView>, ArgError> {
        let (Some(file), Some(case)) = (&self.project, &self.case) else {
            return Ok(None);
        };
        let (project, _) = crate::study::load(file).map_err(|e| ArgError::new("--project", e))?;
        let search = project.search_settings();
        Ok(Some(ProjectView {
            search,
            name: project.name,
            case: case.clone(),
            plane: project.plane,
            measure: project.measure,
            notes: project
                .annotations
                .iter()
                .filter(|a| &a.case == case)
                .cloned()
                .collect(),
        }))
    }

    /// Reads and checks the arguments.
    pub fn read(&self) -> Result<StressInput, ArgError> {
        if let (Some(file), Some(case)) = (&self.project, &self.case) {
            return self.read_from_project(file, case);
        }
        let unit = self.unit_or(StressUnit::MPa);
        let convention = if self.compression_positive {
            SignConvention::CompressionPositive
        } else {
            SignConvention::TensionPositive
        };
        if self.other.any() {
            if self.stress.is_some() {
                return Err(ArgError::new(
                    "--stress",
                    "cannot be given together with --in-situ or --principal",
                ));
            }
            let (_, tensor) = self
                .other
                .read(unit, self.compression_positive)?
                .ok_or_else(|| ArgError::new("--stress", "is required"))?;
            return Ok(StressInput {
                tensor,
                unit,
                convention,
            });
        }
        let Some(stress) = &self.stress else {
            return Err(ArgError::new(
                "--stress",
                "is required (key=value pairs such as xx=120,xy=-35), or --in-situ, --principal with --axes, or --project with --case",
            ));
        };
        let values = parse::stress_list(stress).map_err(|e| ArgError::new("--stress", e))?;
        let tensor = StressTensor::from_components(values, unit, convention.sign())
            .map_err(|e| ArgError::new("--stress", e))?;
        Ok(StressInput {
            tensor,
            unit,
            convention,
        })
    }
}

/// The state given some other way than six components.
#[derive(Debug, Clone, Args, Default)]
pub struct InputArgs {
    /// In-situ stresses instead of --stress, compression positive in the stress unit:
    /// sv=…,shmax=…,shmin=…,azimuth=DEG (SHmax's azimuth clockwise from north; x = east,
    /// y = north, z = up).
    #[arg(long, value_name = "KEY=VALUE,…", allow_hyphen_values = true)]
    pub in_situ: Option<String>,
    /// Principal values instead of --stress: s1=…,s2=…,s3=… (s1 ≥ s2 ≥ s3 in the chosen
    /// convention); needs --axes.
    #[arg(
        long,
        value_name = "KEY=VALUE,…",
        allow_hyphen_values = true,
        requires = "axes"
    )]
    pub principal: Option<String>,
    /// The σ1 and σ3 axes for --principal: 1=TREND/PLUNGE,3=TREND/PLUNGE in degrees (trend
    /// clockwise from north, plunge down); σ2 completes a right-handed set.
    #[arg(long, value_name = "1=T/P,3=T/P", requires = "principal")]
    pub axes: Option<String>,
}

impl InputArgs {
    /// The input and its tensor, if one of these forms is given (stresses in `unit`; principal
    /// values in the convention `compression_positive` says).
    pub fn read(
        &self,
        unit: StressUnit,
        compression_positive: bool,
    ) -> Result<Option<(crate::study::CaseInput, StressTensor)>, ArgError> {
        use crate::study::{CaseInput, InSituInput, PrincipalInput};
        let input = if let Some(text) = &self.in_situ {
            let [sv, shmax, shmin, azimuth_deg] =
                parse::key_list(text, ["sv", "shmax", "shmin", "azimuth"])
                    .map_err(|e| ArgError::new("--in-situ", e))?;
            CaseInput::InSitu(InSituInput {
                unit: unit.symbol().to_owned(),
                sv,
                shmax,
                shmin,
                azimuth_deg,
            })
        } else if let Some(text) = &self.principal {
            let values = parse::key_list(text, ["s1", "s2", "s3"])
                .map_err(|e| ArgError::new("--principal", e))?;
            let axes = self.axes.as_deref().unwrap_or_default();
            let mut found: [Option<[f64; 2]>; 2] = [None, None];
            for item in axes.split(',').map(str::trim).filter(|s| !s.is_empty()) {
                let bad = || {
                    ArgError::new(
                        "--axes",
                        format!("'{item}' is not 1=TREND/PLUNGE or 3=TREND/PLUNGE"),
                    )
                };
                let (key, value) = item.split_once('=').ok_or_else(bad)?;
                let (trend, plunge) = value.split_once('/').ok_or_else(bad)?;
                let i = match key.trim() {
                    "1" => 0,
                    "3" => 1,
                    _ => return Err(bad()),
                };
                let number = |t: &str| parse::number(t).map_err(|e| ArgError::new("--axes", e));
                found[i] = Some([number(trend)?, number(plunge)?]);
            }
            let [Some(axis1), Some(axis3)] = found else {
                return Err(ArgError::new(
                    "--axes",
                    "needs both 1=TREND/PLUNGE and 3=TREND/PLUNGE",
                ));
            };
            CaseInput::Principal(PrincipalInput {
                unit: unit.symbol().to_owned(),
                compression_positive,
                values,
                axis1,
                axis3,
            })
        } else {
            return Ok(None);
        };
        let tensor = input.tensor().map_err(|e| {
            use crate::mechanics::inputs::InputError;
            let arg = match &e {
                _ if self.in_situ.is_some() => "--in-situ",
                crate::study::StudyError::Input(
                    InputError::NotPerpendicular(_) | InputError::Plunge(_),
                ) => "--axes",
                _ => "--principal",
            };
            ArgError::new(arg, e)
        })?;
        Ok(Some((input, tensor)))
    }

    /// Whether any form is given.
    #[must_use]
    pub fn any(&self) -> bool {
        self.in_situ.is_some() || self.principal.is_some()
    }
}

/// What a project gives the figure and plane subcommands besides the tensor: its name and the
/// case for titles, and the saved cut plane and measure, used wherever the command line does not
/// say otherwise — so `figure|map|mohr --project F --case C` draw what the window shows.
#[derive(Debug, Clone)]
pub struct ProjectView {
    /// The project's name.
    pub name: String,
    /// The load case or combination.
    pub case: String,
    /// The saved cut plane.
    pub plane: crate::mechanics::PlaneNormal,
    /// The saved measure, pore pressure and the planes' strength as saved.
    pub measure: crate::study::MeasureChoice,
    /// The search settings the window uses (the planes' c and φ, else the material's).
    pub search: crate::mechanics::search::SearchSettings,
    /// The case's captions and pinned notes.
    pub notes: Vec<crate::study::annotations::Annotation>,
}

impl ProjectView {
    /// The figure title (project, case and the caution).
    #[must_use]
    pub fn title(view: Option<&Self>) -> String {
        crate::picture::figures::title(view.map(|v| (v.name.as_str(), v.case.as_str())))
    }
}

/// The tensor, unit and convention read from [`StressArgs`].
#[derive(Debug, Clone, Copy)]
pub struct StressInput {
    /// The tensor, stored tension-positive in pascals.
    pub tensor: StressTensor,
    /// The unit of every stress typed and printed.
    pub unit: StressUnit,
    /// The sign convention of every stress typed and printed.
    pub convention: SignConvention,
}

impl StressInput {
    /// The figure of this state with the cut plane `plane` and the project's notes; no worst
    /// planes, envelope or colour range (the figure subcommands add theirs).
    #[must_use]
    pub fn figure(
        &self,
        plane: Option<PlaneNormal>,
        view: Option<&ProjectView>,
    ) -> crate::picture::figures::FigureInput {
        crate::picture::figures::FigureInput {
            tensor: self.tensor,
            unit: self.unit,
            convention: self.convention,
            plane,
            search: None,
            worst: None,
            envelope: None,
            map_range: None,
            notes: view.map(|v| v.notes.clone()).unwrap_or_default(),
            marked_plane: None,
        }
    }
}

/// Parses a stress typed in `unit` (pore pressure, cohesion) and converts it to pascals; the
/// same limit as the tensor's components applies.
pub fn stress_value(arg: &'static str, text: &str, unit: StressUnit) -> Result<f64, ArgError> {
    let value = parse::number(text).map_err(|e| ArgError::new(arg, e))?;
    let pa = unit.to_pa(value);
    // `parse::number` only returns finite numbers, so the product is finite or ±inf.
    if pa.abs() > crate::mechanics::tensor::MAX_STRESS_PA {
        return Err(ArgError::new(
            arg,
            format!(
                "'{}' is out of range (magnitude above 1e30 Pa)",
                text.trim()
            ),
        ));
    }
    Ok(pa)
}

/// The friction angle φ in degrees from `--friction-angle DEG` or `--friction-coefficient MU`
/// (φ = atan μ; one or the other, not both).
pub fn friction_deg(
    angle: Option<&str>,
    coefficient: Option<&str>,
) -> Result<Option<f64>, ArgError> {
    match (angle, coefficient) {
        (Some(_), Some(_)) => Err(ArgError::new(
            "--friction-coefficient",
            "give the friction angle or the friction coefficient, not both",
        )),
        (Some(t), None) => parse::number(t)
            .map(Some)
            .map_err(|e| ArgError::new("--friction-angle", e)),
        (None, Some(t)) => {
            let mu = parse::number(t).map_err(|e| ArgError::new("--friction-coefficient", e))?;
            if mu < 0.0 {
                return Err(ArgError::new(
                    "--friction-coefficient",
                    format!("μ = {mu} must be zero or positive"),
                ));
            }
            Ok(Some(mu.atan().to_degrees()))
        }
        (None, None) => Ok(None),
    }
}

/// A plane given by its normal or by dip and dip direction.
#[derive(Debug, Clone, Args)]
pub struct PlaneArgs {
    /// The plane's normal as x,y,z (normalised; need not be unit length).
    #[arg(long, value_name = "X,Y,Z", allow_hyphen_values = true, conflicts_with_all = ["dip", "dip_direction"])]
    pub normal: Option<String>,
    /// The plane's dip in degrees, 0 (horizontal) to 90 (vertical); needs --dip-direction.
    #[arg(
        long,
        value_name = "DEG",
        allow_hyphen_values = true,
        requires = "dip_direction"
    )]
    pub dip: Option<String>,
    /// The plane's dip direction in degrees clockwise from north (x = east, y = north, z = up).
    #[arg(long, value_name = "DEG", allow_hyphen_values = true, requires = "dip")]
    pub dip_direction: Option<String>,
}

impl PlaneArgs {
    /// The plane, if one was given.
    pub fn read(&self) -> Result<Option<PlaneNormal>, ArgError> {
        if let Some(text) = &self.normal {
            let v = parse::numbers::<3>(text).map_err(|e| ArgError::new("--normal", e))?;
            return PlaneNormal::from_vector(v.into())
                .map(Some)
                .map_err(|e| ArgError::new("--normal", e));
        }
        let (Some(dip), Some(dd)) = (&self.dip, &self.dip_direction) else {
            return Ok(None);
        };
        let dip = parse::number(dip).map_err(|e| ArgError::new("--dip", e))?;
        let dd = parse::number(dd).map_err(|e| ArgError::new("--dip-direction", e))?;
        PlaneNormal::from_dip(dip, dd)
            .map(Some)
            .map_err(|e| ArgError::new("--dip", e))
    }
}

/// The material for the criteria and the plane's fault check (stresses in the stress unit).
#[derive(Debug, Clone, Args)]
pub struct StrengthArgs {
    /// Yield strength f_y, for von Mises and Tresca.
    #[arg(long, value_name = "V", allow_hyphen_values = true)]
    pub yield_strength: Option<String>,
    /// Tensile strength f_t (a positive number), for Rankine.
    #[arg(long, value_name = "V", allow_hyphen_values = true)]
    pub tensile_strength: Option<String>,
    /// Compressive strength f_c (a positive number), for Rankine.
    #[arg(long, value_name = "V", allow_hyphen_values = true)]
    pub compressive_strength: Option<String>,
    /// Cohesion c, for Mohr–Coulomb, Drucker–Prager and the plane's fault check.
    #[arg(long, value_name = "C", allow_hyphen_values = true)]
    pub cohesion: Option<String>,
    /// Friction angle φ in degrees, with --cohesion.
    #[arg(long, value_name = "DEG", allow_hyphen_values = true)]
    pub friction_angle: Option<String>,
    /// Friction coefficient μ instead of --friction-angle (φ = atan μ).
    #[arg(long, value_name = "MU", allow_hyphen_values = true)]
    pub friction_coefficient: Option<String>,
    /// How Drucker–Prager is fitted to c and φ.
    #[arg(long, value_name = "FIT")]
    pub dp_fit: Option<DruckerPragerFit>,
    /// Pore pressure p (compression positive) for the plane's fault check.
    #[arg(long, value_name = "P", allow_hyphen_values = true)]
    pub pore_pressure: Option<String>,
}

impl StrengthArgs {
    /// The strengths (Pa) and pore pressure (Pa, if given); a value nothing uses, or one out of
    /// range, is bad input naming its argument. `plane`: a plane check or plane measure is asked
    /// for (the pore pressure applies to it); the pore pressure also applies to the
    /// pressure-sensitive criteria (Rankine, Mohr–Coulomb, Drucker–Prager) when their strengths
    /// are given.
    pub fn read(
        &self,
        unit: StressUnit,
        plane: bool,
    ) -> Result<(Strengths, Option<f64>), ArgError> {
        let stress = |name: &'static str, text: &Option<String>| {
            text.as_deref()
                .map(|t| stress_value(name, t, unit))
                .transpose()
        };
        let friction = friction_deg(
            self.friction_angle.as_deref(),
            self.friction_coefficient.as_deref(),
        )?;
        let strengths = Strengths {
            yield_strength_pa: stress("--yield-strength", &self.yield_strength)?,
            tensile_strength_pa: stress("--tensile-strength", &self.tensile_strength)?,
            compressive_strength_pa: stress("--compressive-strength", &self.compressive_strength)?,
            cohesion_pa: stress("--cohesion", &self.cohesion)?,
            friction_angle_deg: friction,
            dp_fit: self.dp_fit.unwrap_or_default(),
        };
        pair_material(strengths.cohesion_pa, strengths.friction_angle_deg)?;
        if self.dp_fit.is_some() && strengths.cohesion_pa.is_none() {
            return Err(ArgError::new(
                "--dp-fit",
                "applies only with --cohesion and --friction-angle",
            ));
        }
        for (value, name) in [
            (strengths.yield_strength_pa, "--yield-strength"),
            (strengths.tensile_strength_pa, "--tensile-strength"),
            (strengths.compressive_strength_pa, "--compressive-strength"),
        ] {
            if value.is_some_and(|v| v <= 0.0) {
                return Err(ArgError::new(name, "must be a positive stress"));
            }
        }
        let pore = stress("--pore-pressure", &self.pore_pressure)?;
        let pressure_sensitive = strengths.cohesion_pa.is_some()
            || strengths.tensile_strength_pa.is_some()
            || strengths.compressive_strength_pa.is_some();
        if pore.is_some() && !plane && !pressure_sensitive {
            return Err(ArgError::new(
                "--pore-pressure",
                "applies to the fault checks (give --normal, --dip and --dip-direction, or --fault) and to the pressure-sensitive criteria (give --cohesion and --friction-angle, or --tensile-strength / --compressive-strength)",
            ));
        }
        Ok((strengths, pore))
    }
}

/// Pore pressure and Mohr–Coulomb material, shared by `worst-plane`, `map` and `mohr`.
#[derive(Debug, Clone, Args)]
pub struct MaterialArgs {
    /// Pore pressure p in the stress unit (compression positive), for slip-tendency and
    /// mohr-coulomb.
    #[arg(long, value_name = "P", allow_hyphen_values = true)]
    pub pore_pressure: Option<String>,
    /// Cohesion c in the stress unit, for mohr-coulomb.
    #[arg(long, value_name = "C", allow_hyphen_values = true)]
    pub cohesion: Option<String>,
    /// Friction angle φ in degrees, for mohr-coulomb.
    #[arg(long, value_name = "DEG", allow_hyphen_values = true)]
    pub friction_angle: Option<String>,
    /// Friction coefficient μ instead of --friction-angle (φ = atan μ).
    #[arg(long, value_name = "MU", allow_hyphen_values = true)]
    pub friction_coefficient: Option<String>,
}

impl MaterialArgs {
    /// Whether any of the three was given.
    pub(crate) fn any(&self) -> bool {
        self.pore_pressure.is_some()
            || self.cohesion.is_some()
            || self.friction_angle.is_some()
            || self.friction_coefficient.is_some()
    }

    /// The pore pressure (Pa, 0 when not given) and the material, if both cohesion and friction
    /// angle are given (stresses in `unit`). `measure` is the measure in use, if any;
    /// `envelope` says whether the command also draws a Mohr–Coulomb envelope from the material.
    /// An argument that nothing uses is bad input, not silently ignored.
    pub fn read(
        &self,
        unit: StressUnit,
        measure: Option<Measure>,
        envelope: bool,
    ) -> Result<(f64, Option<MohrCoulomb>), ArgError> {
        let stress_arg =
            |name: &'static str, text: &Option<String>| -> Result<Option<f64>, ArgError> {
                text.as_deref()
                    .map(|t| stress_value(name, t, unit))
                    .transpose()
            };
        let pore_pressure_pa = stress_arg("--pore-pressure", &self.pore_pressure)?;
        let cohesion_pa = stress_arg("--cohesion", &self.cohesion)?;
        let friction = friction_deg(
            self.friction_angle.as_deref(),
            self.friction_coefficient.as_deref(),
        )?;
        let measure_text = measure.map_or_else(
            || "no --measure is given".to_owned(),
            |m| format!("the measure is {}", m.key()),
        );
        let material_used = measure.is_some_and(Measure::uses_material) || envelope;
        if !material_used {
            for (given, name) in [
                (cohesion_pa.is_some(), "--cohesion"),
                (friction.is_some(), "--friction-angle"),
            ] {
                if given {
                    return Err(ArgError::new(
                        name,
                        format!("applies only to --measure mohr-coulomb ({measure_text})"),
                    ));
                }
            }
        }
        let material = pair_material(cohesion_pa, friction)?;
        let pore_used =
            measure.is_some_and(Measure::uses_friction) || (envelope && material.is_some());
        if pore_pressure_pa.is_some() && !pore_used {
            let also = if envelope {
                " or to the Mohr–Coulomb envelope (--cohesion and --friction-angle)"
            } else {
                ""
            };
            return Err(ArgError::new(
                "--pore-pressure",
                format!(
                    "applies only to --measure slip-tendency or mohr-coulomb{also} ({measure_text})"
                ),
            ));
        }
        Ok((pore_pressure_pa.unwrap_or(0.0), material))
    }
}

/// The Mohr–Coulomb material from --cohesion and --friction-angle, which go together; an
/// out-of-range value is bad input naming its argument.
pub fn pair_material(
    cohesion_pa: Option<f64>,
    friction_deg: Option<f64>,
) -> Result<Option<MohrCoulomb>, ArgError> {
    match (cohesion_pa, friction_deg) {
        (Some(c), Some(phi)) => MohrCoulomb::new(c, phi).map(Some).map_err(|e| {
            let arg = if matches!(e, CriterionError::Cohesion) {
                "--cohesion"
            } else {
                "--friction-angle"
            };
            ArgError::new(arg, e)
        }),
        (None, None) => Ok(None),
        (Some(_), None) => Err(ArgError::new(
            "--friction-angle",
            "is needed together with --cohesion",
        )),
        (None, Some(_)) => Err(ArgError::new(
            "--cohesion",
            "is needed together with --friction-angle",
        )),
    }
}

/// The search settings for `measure`; mohr-coulomb without a material, or a material argument
/// the measure does not use, is bad input. `envelope`: the command also draws the Mohr–Coulomb
/// envelope from the material.
pub fn search_settings(
    measure: Measure,
    material: &MaterialArgs,
    input: &StressInput,
    envelope: bool,
) -> Result<SearchSettings, ArgError> {
    let (pore_pressure_pa, material) = material.read(input.unit, Some(measure), envelope)?;
    if measure == Measure::MohrCoulomb && material.is_none() {
        return Err(ArgError::new(
            "--measure",
            "mohr-coulomb needs --cohesion and --friction-angle",
        ));
    }
    Ok(SearchSettings {
        measure,
        convention: input.convention,
        pore_pressure_pa,
        material,
    })
}

/// Like [`search_settings`]; with `--project`, the project's pore pressure and Coulomb strength
/// (as the window uses them) where the command line gives none.
pub fn search_settings_in(
    measure: Measure,
    material: &MaterialArgs,
    input: &StressInput,
    envelope: bool,
    view: Option<&ProjectView>,
) -> Result<SearchSettings, ArgError> {
    let Some(v) = view else {
        return search_settings(measure, material, input, envelope);
    };
    let mut settings = SearchSettings {
        measure,
        convention: input.convention,
        ..v.search
    };
    if material.any() {
        let (pore_pressure_pa, strength) = material.read(input.unit, Some(measure), envelope)?;
        if material.pore_pressure.is_some() {
            settings.pore_pressure_pa = pore_pressure_pa;
        }
        if strength.is_some() {
            settings.material = strength;
        }
    }
    if measure == Measure::MohrCoulomb && settings.material.is_none() {
        return Err(ArgError::new(
            "--measure",
            "mohr-coulomb needs a cohesion and friction angle: the project has none for the planes or the material, and no --cohesion and --friction-angle are given",
        ));
    }
    Ok(settings)
}

/// Refuses material arguments when no measure uses them (commands whose measure is optional).
pub fn no_material(material: &MaterialArgs, input: &StressInput) -> Result<(), ArgError> {
    if material.any() {
        material.read(input.unit, None, false)?;
    }
    Ok(())
}

/// The measure and its parameters, shared by `worst-plane` and `map`.
#[derive(Debug, Clone, Args)]
pub struct MeasureArgs {
    /// What makes a plane worst. [default with --project: the project's measure, pore
    /// pressure and material]
    #[arg(long, value_name = "MEASURE")]
    pub measure: Option<Measure>,
    #[command(flatten)]
    pub material: MaterialArgs,
}

impl MeasureArgs {
    /// Reads the measure and its parameters (stresses in `input.unit`); with a project, what
    /// the command line leaves out comes from it.
    pub fn read(
        &self,
        input: &StressInput,
        view: Option<&ProjectView>,
    ) -> Result<SearchSettings, ArgError> {
        let measure = match (&self.measure, view) {
            (Some(m), _) => *m,
            (None, Some(v)) => v.measure.measure,
            (None, None) => {
                let keys: Vec<&str> = Measure::ALL.iter().map(|m| m.key()).collect();
                return Err(ArgError::new(
                    "--measure",
                    format!("is required (one of {})", keys.join(", ")),
                ));
            }
        };
        search_settings_in(measure, &self.material, input, false, view)
    }
}

/// The text size of exported figures for a print width.
#[derive(Debug, Clone, clap::Args)]
pub struct PrintArgs {
    /// The width the figure will be printed at (mm, cm or in) [default: 16cm].
    #[arg(long, value_name = "LENGTH", value_parser = values::print_width)]
    pub print_width: Option<f32>,
    /// Text size at that print width [default: 8.5pt].
    #[arg(long, value_name = "SIZE", value_parser = values::font_size)]
    pub font_size: Option<f32>,
}

impl PrintArgs {
    /// Sizes for a `width` × `height` figure.
    #[must_use]
    pub fn sizes(&self, width: u32, height: u32) -> crate::picture::draw::Sizes {
        crate::picture::draw::Sizes::for_print(
            width as f32,
            height as f32,
            self.print_width
                .unwrap_or(crate::picture::draw::PRINT_WIDTH_MM),
            self.font_size
                .unwrap_or(crate::picture::draw::PRINT_FONT_PT),
        )
    }
}

/// The optional title block of exported figures.
#[derive(Debug, Clone, clap::Args)]
pub struct TitleArgs {
    /// Add a title block below the picture (project and case, the tensor, pore pressure and
    /// material where used, program version and date).
    #[arg(long)]
    pub title_block: bool,
    /// The title block's first line (implies --title-block).
    #[arg(long, value_name = "TEXT")]
    pub title: Option<String>,
}

impl TitleArgs {
    /// Whether a block is wanted.
    #[must_use]
    pub fn wanted(&self) -> bool {
        self.title_block || self.title.is_some()
    }
}

/// Where a figure subcommand writes its picture: the file, the print size and the title block.
#[derive(Debug, Clone, Args)]
pub struct FigureOutArgs {
    /// Output file; .svg or .png.
    #[arg(long, value_name = "FILE")]
    pub out: PathBuf,
    #[command(flatten)]
    pub print: PrintArgs,
    #[command(flatten)]
    pub title: TitleArgs,
}

impl FigureOutArgs {
    /// Refuses an output that is not .svg or .png, or that is the project the state is read
    /// from (writing it would destroy it).
    pub fn check(&self, stress: &StressArgs) -> Result<(), ArgError> {
        crate::output::export::ImageFormat::from_path(&self.out)
            .map_err(|e| ArgError::new("--out", e))?;
        if let Some(project) = &stress.project {
            crate::study::atomic::not_an_input(&self.out, &[project.as_path()])
                .map_err(|e| ArgError::new("--out", e))?;
        }
        Ok(())
    }

    /// Writes the figure of `kind` at `size` pixels: its captions, the title block when asked,
    /// and the picture `build` draws in the height left (with this output's text and line
    /// sizes). Returns the line the subcommand prints.
    pub fn write(
        &self,
        view: Option<&ProjectView>,
        figure: &crate::picture::figures::FigureInput,
        kind: crate::study::annotations::FigureKind,
        [w, h]: [u32; 2],
        build: impl Fn(u32, crate::picture::draw::Sizes) -> crate::picture::draw::Frame,
    ) -> Result<String, super::CliError> {
        use crate::picture::figures;
        let sizes = self.print.sizes(w, h);
        let mut lines = figure.captions(kind);
        if self.title.wanted() {
            lines.extend(figures::title_block_lines(
                self.title.title.as_deref(),
                view.map(|v| (v.name.as_str(), v.case.as_str())),
                figure,
                &crate::output::report::today(),
            ));
        }
        let frame = figures::titled(&lines, sizes.text, [w, h], |h| build(h, sizes));
        crate::output::export::write_figure(&self.out, &frame, &ProjectView::title(view))
            .map_err(anyhow::Error::from)?;
        Ok(format!("wrote {}\n", self.out.display()))
    }
}

/// Combination terms written `CASE=FACTOR,…` (factors may be negative or zero), for `arg`.
pub fn terms_of(arg: &'static str, text: &str) -> Result<Vec<crate::study::Term>, ArgError> {
    let mut terms = Vec::new();
    for item in text.split(',').map(str::trim).filter(|s| !s.is_empty()) {
        let Some((case, factor)) = item.rsplit_once('=') else {
            return Err(ArgError::new(
                arg,
                format!("item '{item}' is not of the form CASE=FACTOR"),
            ));
        };
        let factor = crate::text::parse::number(factor)
            .map_err(|e| ArgError::new(arg, format!("factor of '{}' {e}", case.trim())))?;
        terms.push(crate::study::Term {
            unknown: crate::study::unknown::UnknownKeys::new(),
            case: case.trim().to_owned(),
            factor,
        });
    }
    if terms.is_empty() {
        return Err(ArgError::new(arg, "no terms given"));
    }
    Ok(terms)
}

/// An action written CASE:A:B (the case may hold ':'; the two factors are the last fields).
fn action_of(arg: &'static str, text: &str) -> Result<(String, f64, f64), ArgError> {
    let mut parts = text.rsplitn(3, ':');
    let (Some(b), Some(a), Some(case)) = (parts.next(), parts.next(), parts.next()) else {
        return Err(ArgError::new(
            arg,
            format!("'{text}' is not of the form CASE:FACTOR:FACTOR"),
        ));
    };
    let number = |t: &str| {
        crate::text::parse::number(t).map_err(|e| ArgError::new(arg, format!("'{text}': {e}")))
    };
    Ok((case.trim().to_owned(), number(a)?, number(b)?))
}

/// The actions of `--permanent CASE:SUP:INF` and `--variable CASE:GAMMA:PSI0`.
pub fn actions_of(
    permanent: &[String],
    variable: &[String],
) -> Result<Vec<crate::study::actions::Action>, ArgError> {
    use crate::study::actions::{Action, ActionKind};
    let mut actions = Vec::new();
    for text in permanent {
        let (case, unfavourable, favourable) = action_of("--permanent", text)?;
        actions.push(Action {
            case,
            kind: ActionKind::Permanent {
                unfavourable,
                favourable,
            },
        });
    }
    for text in variable {
        let (case, gamma, psi0) = action_of("--variable", text)?;
        actions.push(Action {
            case,
            kind: ActionKind::Variable { gamma, psi0 },
        });
    }
    Ok(actions)
}

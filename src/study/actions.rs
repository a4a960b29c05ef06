//! Combinations generated from actions by the fundamental combination rule of EN 1990,
//! expression (6.10):
//!
//! Σ γG,j Gk,j "+" γQ,1 Qk,1 "+" Σ γQ,i ψ0,i Qk,i   (i > 1)
//!
//! Each action is a load case of the project, declared permanent (with its partial factors
//! when unfavourable and when favourable) or variable (with its partial factor and its
//! combination factor ψ0). The set generated here has every variable action leading in turn,
//! each other variable action either accompanying (γQ ψ0) or left out (a favourable variable
//! action is not applied), and each permanent action either unfavourable or favourable; plus
//! the permanent actions alone (every variable action favourable). The factors are the user's:
//! which code, annex and values apply is the engineer's choice, and nothing here supplies one.

use super::model::{Combination, Term};
use super::unknown::UnknownKeys;

/// How an action enters the combinations.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum ActionKind {
    /// A permanent action Gk: γG,sup when unfavourable, γG,inf when favourable.
    Permanent {
        /// γG,sup, the partial factor when the action is unfavourable.
        unfavourable: f64,
        /// γG,inf, the partial factor when the action is favourable.
        favourable: f64,
    },
    /// A variable action Qk: γQ when it leads, γQ ψ0 when it accompanies, left out when
    /// favourable.
    Variable {
        /// γQ, the partial factor.
        gamma: f64,
        /// ψ0, the combination factor (0 to 1).
        psi0: f64,
    },
}

/// One action: a load case of the project and how it combines.
#[derive(Clone, Debug, PartialEq)]
pub struct Action {
    /// The load case.
    pub case: String,
    /// Permanent or variable, with its factors.
    pub kind: ActionKind,
}

/// Why a set of actions gives no combinations.
#[derive(Clone, Debug, PartialEq, thiserror::Error)]
pub enum ActionsError {
    /// No action was given.
    #[error("no actions: give at least one permanent or variable action")]
    None,
    /// A load case named twice.
    #[error("the load case '{0}' is given as two actions")]
    Twice(String),
    /// A factor that is negative or not a finite number.
    #[error("action '{case}': {what} must be a finite number ≥ 0, not {value}")]
    Factor {
        /// The action's load case.
        case: String,
        /// Which factor.
        what: &'static str,
        /// The value given.
        value: f64,
    },
    /// ψ0 outside 0 to 1.
    #[error("action '{case}': ψ0 must lie between 0 and 1, not {value}")]
    Psi {
        /// The action's load case.
        case: String,
        /// The value given.
        value: f64,
    },
    /// Too many actions for the full set (it doubles with each one).
    #[error(
        "{0} actions give more than 4096 combinations; split the study or combine actions first"
    )]
    TooMany(usize),
}

/// The most combinations one call generates.
const MOST: usize = 4096;

/// The combinations of expression (6.10) for `actions`, named so a checker reads which action
/// leads and which permanent actions are taken favourable ("6.10 live leads | dead unfav |
/// wind accomp"). Order: the permanent actions alone first, then each variable action leading
/// in the order given; within those, accompanying sets and permanent choices in a fixed order.
pub fn fundamental_combinations(actions: &[Action]) -> Result<Vec<Combination>, ActionsError> {
    check(actions)?;
    let permanent: Vec<(&str, f64, f64)> = actions
        .iter()
        .filter_map(|a| match a.kind {
            ActionKind::Permanent {
                unfavourable,
                favourable,
            } => Some((a.case.as_str(), unfavourable, favourable)),
            ActionKind::Variable { .. } => None,
        })
        .collect();
    let variable: Vec<(&str, f64, f64)> = actions
        .iter()
        .filter_map(|a| match a.kind {
            ActionKind::Variable { gamma, psi0 } => Some((a.case.as_str(), gamma, psi0)),
            ActionKind::Permanent { .. } => None,
        })
        .collect();
    // Checked before any shift: 64 actions or more would overflow it.
    if actions.len() > 24 {
        return Err(ActionsError::TooMany(actions.len()));
    }
    let choices = 1usize << permanent.len();
    let permanent_only = if permanent.is_empty() { 0 } else { choices };
    let count =
        permanent_only + choices * variable.len() * (1usize << variable.len().saturating_sub(1));
    if count > MOST {
        return Err(ActionsError::TooMany(actions.len()));
    }
    let mut out = Vec::with_capacity(count);
    // The permanent part for one choice: bit j set = permanent action j favourable.
    let permanents = |choice: usize| -> (Vec<Term>, Vec<String>) {
        permanent
            .iter()
            .enumerate()
            .map(|(j, &(case, sup, inf))| {
                let favourable = choice & (1 << j) != 0;
                (
                    term(case, if favourable { inf } else { sup }),
                    format!("{case} {}", if favourable { "fav" } else { "unfav" }),
                )
            })
            .unzip()
    };
    for choice in 0..permanent_only {
        let (terms, words) = permanents(choice);
        out.push(combination(
            format!("6.10 permanent only | {}", words.join(" | ")),
            terms,
        ));
    }
    for (lead, &(lead_case, lead_gamma, _)) in variable.iter().enumerate() {
        let others: Vec<&(&str, f64, f64)> = variable
            .iter()
            .enumerate()
            .filter(|&(i, _)| i != lead)
            .map(|(_, v)| v)
            .collect();
        // Bit i set = the i-th other variable action accompanies; all of them first.
        for accompany in (0..1usize << others.len()).rev() {
            for choice in 0..choices {
                let (mut terms, mut words) = permanents(choice);
                terms.push(term(lead_case, lead_gamma));
                words.insert(0, format!("{lead_case} leads"));
                for (i, &&(case, gamma, psi0)) in others.iter().enumerate() {
                    if accompany & (1 << i) != 0 {
                        // Rounded to 15 significant digits: 1.5 × 0.6 is written 0.9, not 0.8999999999999999.
                        terms.push(term(case, crate::text::format::clean(gamma * psi0)));
                        words.push(format!("{case} accomp"));
                    }
                }
                out.push(combination(format!("6.10 {}", words.join(" | ")), terms));
            }
        }
    }
    Ok(out)
}

fn check(actions: &[Action]) -> Result<(), ActionsError> {
    if actions.is_empty() {
        return Err(ActionsError::None);
    }
    for (i, a) in actions.iter().enumerate() {
        if actions[..i].iter().any(|b| b.case == a.case) {
            return Err(ActionsError::Twice(a.case.clone()));
        }
        let factors: &[(&'static str, f64)] = match &a.kind {
            ActionKind::Permanent {
                unfavourable,
                favourable,
            } => &[("γG,sup", *unfavourable), ("γG,inf", *favourable)],
            ActionKind::Variable { gamma, psi0 } => {
                if !(0.0..=1.0).contains(psi0) {
                    return Err(ActionsError::Psi {
                        case: a.case.clone(),
                        value: *psi0,
                    });
                }
                &[("γQ", *gamma)]
            }
        };
        for &(what, value) in factors {
            if !(value.is_finite() && value >= 0.0) {
                return Err(ActionsError::Factor {
                    case: a.case.clone(),
                    what,
                    value,
                });
            }
        }
    }
    Ok(())
}

fn term(case: &str, factor: f64) -> Term {
    Term {
        case: case.to_owned(),
        factor,
        unknown: UnknownKeys::new(),
    }
}

fn combination(name: String, terms: Vec<Term>) -> Combination {
    Combination {
        name,
        terms,
        unknown: UnknownKeys::new(),
    }
}

//! Combinations generated from actions by EN 1990's fundamental combination rule, expression
//! (6.10): Σ γG,j Gk,j "+" γQ,1 Qk,1 "+" Σ γQ,i ψ0,i Qk,i. The expected sets are written out by
//! hand from that expression (each variable action leading in turn, each other variable action
//! accompanying or left out, each permanent action unfavourable or favourable, and the
//! permanent actions alone). The factor values are this test's own, chosen so every product is
//! distinct; they are not a recommendation.

#![allow(clippy::unwrap_used, reason = "tests")]

mod common;

use planewise::study::actions::{Action, ActionKind, ActionsError, fundamental_combinations};

fn permanent(case: &str, unfavourable: f64, favourable: f64) -> Action {
    Action {
        case: case.to_owned(),
        kind: ActionKind::Permanent {
            unfavourable,
            favourable,
        },
    }
}

fn variable(case: &str, gamma: f64, psi0: f64) -> Action {
    Action {
        case: case.to_owned(),
        kind: ActionKind::Variable { gamma, psi0 },
    }
}

/// Each combination as (name, [(case, factor)]) with the factors rounded to 1e-12.
fn written(actions: &[Action]) -> Vec<(String, Vec<(String, f64)>)> {
    fundamental_combinations(actions)
        .unwrap()
        .into_iter()
        .map(|c| {
            (
                c.name,
                c.terms
                    .into_iter()
                    .map(|t| (t.case, (t.factor * 1e12).round() / 1e12))
                    .collect(),
            )
        })
        .collect()
}

fn expect(rows: &[(&str, &[(&str, f64)])]) -> Vec<(String, Vec<(String, f64)>)> {
    rows.iter()
        .map(|(name, terms)| {
            (
                (*name).to_owned(),
                terms.iter().map(|(c, f)| ((*c).to_owned(), *f)).collect(),
            )
        })
        .collect()
}

#[test]
fn three_actions_give_the_sets_of_expression_6_10_written_by_hand() {
    // One permanent action G (γG,sup 1.35, γG,inf 1.0) and two variable actions, live
    // (γQ 1.5, ψ0 0.7) and wind (γQ 1.5, ψ0 0.6): 2 permanent choices × (1 permanent-only
    // + 2 leading × 2 accompanying sets) = 10 combinations.
    let actions = [
        permanent("dead", 1.35, 1.0),
        variable("live", 1.5, 0.7),
        variable("wind", 1.5, 0.6),
    ];
    let by_hand = expect(&[
        ("6.10 permanent only | dead unfav", &[("dead", 1.35)]),
        ("6.10 permanent only | dead fav", &[("dead", 1.0)]),
        // live leads, wind accompanies with γQ ψ0 = 1.5 × 0.6 = 0.9
        (
            "6.10 live leads | dead unfav | wind accomp",
            &[("dead", 1.35), ("live", 1.5), ("wind", 0.9)],
        ),
        (
            "6.10 live leads | dead fav | wind accomp",
            &[("dead", 1.0), ("live", 1.5), ("wind", 0.9)],
        ),
        // live leads, wind favourable (left out)
        (
            "6.10 live leads | dead unfav",
            &[("dead", 1.35), ("live", 1.5)],
        ),
        (
            "6.10 live leads | dead fav",
            &[("dead", 1.0), ("live", 1.5)],
        ),
        // wind leads, live accompanies with 1.5 × 0.7 = 1.05
        (
            "6.10 wind leads | dead unfav | live accomp",
            &[("dead", 1.35), ("wind", 1.5), ("live", 1.05)],
        ),
        (
            "6.10 wind leads | dead fav | live accomp",
            &[("dead", 1.0), ("wind", 1.5), ("live", 1.05)],
        ),
        (
            "6.10 wind leads | dead unfav",
            &[("dead", 1.35), ("wind", 1.5)],
        ),
        (
            "6.10 wind leads | dead fav",
            &[("dead", 1.0), ("wind", 1.5)],
        ),
    ]);
    assert_eq!(written(&actions), by_hand);
}

#[test]
fn the_count_follows_the_rule_for_any_number_of_actions() {
    // 2^nG × (1 + nQ × 2^(nQ − 1)) combinations, every name distinct (common practice of
    // enumerating (6.10), no source beyond the expression itself).
    for (ng, nq) in [(0, 1), (1, 0), (2, 1), (2, 3), (3, 2), (1, 4)] {
        let mut actions: Vec<Action> = (0..ng)
            .map(|j| permanent(&format!("G{j}"), 1.35, 1.0))
            .collect();
        actions.extend((0..nq).map(|i| variable(&format!("Q{i}"), 1.5, 0.7)));
        let all = fundamental_combinations(&actions).unwrap();
        let permanent_only = if ng > 0 { 1usize << ng } else { 0 };
        let expected = permanent_only + (1usize << ng) * nq * (1usize << nq.saturating_sub(1));
        assert_eq!(all.len(), expected, "{ng} permanent, {nq} variable");
        let mut names: Vec<&str> = all.iter().map(|c| c.name.as_str()).collect();
        names.sort_unstable();
        names.dedup();
        assert_eq!(names.len(), all.len());
        for c in &all {
            assert!(!c.name.contains(['=', ',']), "{}", c.name);
            // Exactly one leading variable action at γQ, or none in a permanent-only one.
            let leads = c.name.matches(" leads").count();
            assert!(leads <= 1);
        }
    }
}

#[test]
fn bad_actions_are_refused_with_the_action_named() {
    assert_eq!(fundamental_combinations(&[]), Err(ActionsError::None));
    let e = fundamental_combinations(&[variable("live", 1.5, 1.2)]).unwrap_err();
    assert!(
        e.to_string().contains("'live'") && e.to_string().contains("ψ0"),
        "{e}"
    );
    let e = fundamental_combinations(&[permanent("dead", -1.35, 1.0)]).unwrap_err();
    assert!(
        e.to_string().contains("'dead'") && e.to_string().contains("γG,sup"),
        "{e}"
    );
    let e = fundamental_combinations(&[variable("live", f64::NAN, 0.7)]).unwrap_err();
    assert!(e.to_string().contains("γQ"), "{e}");
    let e = fundamental_combinations(&[variable("live", 1.5, 0.7), permanent("live", 1.35, 1.0)])
        .unwrap_err();
    assert_eq!(e, ActionsError::Twice("live".to_owned()));
    // Too many actions for the full set: refused, not computed (70 would overflow a shift).
    let many: Vec<Action> = (0..70)
        .map(|j| permanent(&format!("G{j}"), 1.35, 1.0))
        .collect();
    assert_eq!(
        fundamental_combinations(&many),
        Err(ActionsError::TooMany(70))
    );
    let many: Vec<Action> = (0..13)
        .map(|i| variable(&format!("Q{i}"), 1.5, 0.7))
        .collect();
    assert_eq!(
        fundamental_combinations(&many),
        Err(ActionsError::TooMany(13))
    );
}

mod cli {
    use crate::common::{planewise, planewise_ok};

    #[test]
    fn project_generate_combinations_writes_them_and_refuses_without_changing_the_file() {
        let dir = std::env::temp_dir().join(format!("planewise-actions-{}", std::process::id()));
        std::fs::create_dir_all(&dir).unwrap();
        let file = dir.join("p.json");
        let _ = std::fs::remove_file(&file);
        let f = file.to_str().unwrap();
        planewise_ok(&["project", "new", f, "--unit", "MPa"]);
        for (name, stress) in [
            ("dead", "xx=40,xy=10"),
            ("live", "xx=30,yy=-10"),
            ("wind", "xy=25,zx=-8"),
        ] {
            planewise_ok(&["project", "add-case", f, "--name", name, "--stress", stress]);
        }
        let generate = |extra: &[&str]| {
            let mut args = vec![
                "project",
                "generate-combinations",
                f,
                "--permanent",
                "dead:1.35:1.0",
                "--variable",
                "live:1.5:0.7",
                "--variable",
                "wind:1.5:0.6",
            ];
            args.extend_from_slice(extra);
            planewise(&args)
        };
        let out = generate(&[]);
        assert!(
            out.status.success(),
            "{}",
            String::from_utf8_lossy(&out.stderr)
        );
        let shown = planewise_ok(&["project", "show", f, "--json"]);
        let j: serde_json::Value = serde_json::from_slice(&shown.stdout).unwrap();
        let combos = j["combinations"].as_array().unwrap();
        assert_eq!(combos.len(), 10);
        // γQ ψ0 of wind accompanying live: 1.5 × 0.6, written as 0.9.
        let c = combos
            .iter()
            .find(|c| c["name"] == "6.10 live leads | dead unfav | wind accomp")
            .unwrap();
        assert_eq!(c["terms"][2]["factor"], 0.9);
        // Again without --replace: refused, names the option, the file is as it was.
        let before = std::fs::read(&file).unwrap();
        let out = generate(&[]);
        assert_eq!(out.status.code(), Some(2));
        assert!(String::from_utf8_lossy(&out.stderr).contains("--replace"));
        assert_eq!(std::fs::read(&file).unwrap(), before);
        assert!(generate(&["--replace"]).status.success());
        // An action that is not a load case.
        let out = planewise(&[
            "project",
            "generate-combinations",
            f,
            "--variable",
            "snow:1.5:0.5",
        ]);
        assert_eq!(out.status.code(), Some(2));
        assert!(String::from_utf8_lossy(&out.stderr).contains("'snow' is not a load case"));
        let _ = std::fs::remove_dir_all(&dir);
    }
}

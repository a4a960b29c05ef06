//! Load cases as tables (issue 23, items 1–2): tables joined on id columns in any row order,
//! combinations applied at every point, the envelope over them and the ranking of points.
//!
//! Checks against something outside the join: each point's combined tensor against the sum
//! written out here term by term; the governing value against a brute force over every
//! combination with the von Mises formula written out (σvM = √(½[(σxx−σyy)² + (σyy−σzz)² +
//! (σzz−σxx)²] + 3(τxy² + τyz² + τzx²)), Budynas & Nisbett, Shigley's Mechanical Engineering
//! Design, eq. 5-14, from memory) and, for Tresca, nalgebra's symmetric eigen solver.

#![allow(
    clippy::unwrap_used,
    reason = "a test helper that fails should panic loudly"
)]

mod common;

use std::fmt::Write as _;
use std::io::Cursor;

use planewise::mechanics::criteria::Strengths;
use planewise::mechanics::search::{Measure as PlaneMeasure, SearchSettings};
use planewise::mechanics::{SignConvention, StressUnit};
use planewise::study::table::{
    CaseTable, JoinOptions, Measure, Points, TableError, TableOptions, join, point_combinations,
    rank_points,
};
use planewise::study::{Combination, EnvelopeMeasure, Term};
use proptest::prelude::*;

/// The textbook von Mises stress (see the file's head), Pa.
fn von_mises(c: &[f64; 6]) -> f64 {
    let [xx, yy, zz, xy, yz, zx] = *c;
    (0.5 * ((xx - yy).powi(2) + (yy - zz).powi(2) + (zz - xx).powi(2))
        + 3.0 * (xy * xy + yz * yz + zx * zx))
        .sqrt()
}

/// Tresca σ1 − σ3 from nalgebra's symmetric eigen solver, Pa.
fn tresca(c: &[f64; 6]) -> f64 {
    let [xx, yy, zz, xy, yz, zx] = *c;
    let m = nalgebra::Matrix3::new(xx, xy, zx, xy, yy, yz, zx, yz, zz);
    let e = m.symmetric_eigen().eigenvalues;
    e.max() - e.min()
}

fn options() -> TableOptions {
    TableOptions::new(StressUnit::MPa, SignConvention::TensionPositive)
}

fn ids(names: &[&str]) -> JoinOptions {
    JoinOptions {
        ids: names.iter().map(|s| (*s).to_owned()).collect(),
        ..JoinOptions::default()
    }
}

fn tables(list: &[(&str, String)]) -> Vec<CaseTable<Cursor<Vec<u8>>>> {
    list.iter()
        .map(|(case, text)| CaseTable {
            case: (*case).to_owned(),
            file: format!("{case}.csv"),
            source: Cursor::new(text.clone().into_bytes()),
        })
        .collect()
}

fn combination(name: &str, terms: &[(&str, f64)]) -> Combination {
    Combination {
        name: name.to_owned(),
        terms: terms
            .iter()
            .map(|(case, factor)| Term {
                case: (*case).to_owned(),
                factor: *factor,
                unknown: planewise::study::unknown::UnknownKeys::default(),
            })
            .collect(),
        unknown: planewise::study::unknown::UnknownKeys::default(),
    }
}

fn ranking<'a>(
    measure: EnvelopeMeasure,
    settings: &'a SearchSettings,
    strengths: &'a Strengths,
) -> Measure<'a> {
    Measure {
        measure,
        convention: SignConvention::TensionPositive,
        plane_settings: settings,
        strengths,
    }
}

/// A table of `case` over the points `order` (element, section point), components from
/// `values[point]`, written in that row order.
fn table_text(order: &[usize], values: &[[f64; 6]], header: &str) -> String {
    let mut t = format!("{header}\n");
    for &p in order {
        let c = values[p];
        let _ = writeln!(
            t,
            "{},{},{},{},{},{},{},{}",
            p / 2 + 1,
            if p % 2 == 0 { "top" } else { "bottom" },
            c[0],
            c[1],
            c[2],
            c[3],
            c[4],
            c[5]
        );
    }
    t
}

fn shuffled(n: usize, seed: u64) -> Vec<usize> {
    let mut order: Vec<usize> = (0..n).collect();
    let mut s = seed | 1;
    for i in (1..n).rev() {
        s ^= s << 13;
        s ^= s >> 7;
        s ^= s << 17;
        order.swap(i, (s % (i as u64 + 1)) as usize);
    }
    order
}

const HEADER: &str = "element,section,xx,yy,zz,xy,yz,zx";

fn component() -> impl Strategy<Value = f64> {
    (-2000i32..=2000).prop_map(|v| f64::from(v) / 10.0)
}

fn tensor() -> impl Strategy<Value = [f64; 6]> {
    proptest::array::uniform6(component())
}

fn factor() -> impl Strategy<Value = f64> {
    (-20i32..=20).prop_map(|v| f64::from(v) / 10.0)
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(48))]

    /// Three cases in three shuffled row orders, up to four combinations of random factors:
    /// every point's governing combination is the largest of the hand-summed tensors' von
    /// Mises values (brute force), and the ranking is that order.
    #[test]
    fn every_point_is_governed_by_its_worst_hand_summed_combination(
        values in proptest::collection::vec((tensor(), tensor(), tensor()), 1..24),
        factors in proptest::collection::vec(proptest::array::uniform3(factor()), 1..5),
        seeds in proptest::array::uniform3(any::<u64>()),
    ) {
        let n = values.len();
        let cases: [Vec<[f64; 6]>; 3] = [
            values.iter().map(|v| v.0).collect(),
            values.iter().map(|v| v.1).collect(),
            values.iter().map(|v| v.2).collect(),
        ];
        let names = ["dead", "live", "wind"];
        let list: Vec<(&str, String)> = (0..3)
            .map(|c| (names[c], table_text(&shuffled(n, seeds[c]), &cases[c], HEADER)))
            .collect();
        let points = join(tables(&list), &options(), &ids(&["element", "section"]), |_| true)
            .unwrap();
        prop_assert_eq!(points.len(), n);
        let combos: Vec<Combination> = factors
            .iter()
            .enumerate()
            .map(|(k, f)| {
                combination(
                    &format!("C{k}"),
                    &[("dead", f[0]), ("live", f[1]), ("wind", f[2])],
                )
            })
            .collect();
        let settings = SearchSettings::plain(PlaneMeasure::Shear, SignConvention::TensionPositive);
        let strengths = Strengths::default();
        let m = ranking(EnvelopeMeasure::VonMises, &settings, &strengths);
        let pc = point_combinations(&points.cases, &combos).unwrap();
        let ranked = rank_points(&points, pc, &options(), &m).unwrap();
        prop_assert_eq!(ranked.rows.len(), n);
        // Brute force: per point (by its ids), the hand-summed tensor of every combination.
        let mut expected: Vec<(f64, usize, usize)> = Vec::new();
        for p in 0..n {
            let mut best: Option<(f64, usize)> = None;
            for (k, f) in factors.iter().enumerate() {
                let sum: [f64; 6] = std::array::from_fn(|i| {
                    1e6 * (f[0] * cases[0][p][i] + f[1] * cases[1][p][i] + f[2] * cases[2][p][i])
                });
                let v = von_mises(&sum);
                if best.is_none_or(|(b, _)| v > b) {
                    best = Some((v, k));
                }
            }
            let (v, k) = best.unwrap();
            expected.push((v, k, p));
        }
        for r in &ranked.rows {
            let element: usize = r.row.carried[0].parse().unwrap();
            let p = (element - 1) * 2 + usize::from(r.row.carried[1] == "bottom");
            let (v, _, _) = expected[p];
            let got = r.row.value.unwrap();
            prop_assert!((got - v).abs() <= 1e-9 * v.max(1.0), "point {p}: {got} vs {v}");
            // The governing combination's value is the maximum (ties may pick another index
            // with the same value).
            let f = factors[r.combination];
            let sum: [f64; 6] = std::array::from_fn(|i| {
                1e6 * (f[0] * cases[0][p][i] + f[1] * cases[1][p][i] + f[2] * cases[2][p][i])
            });
            prop_assert!((von_mises(&sum) - v).abs() <= 1e-9 * v.max(1.0));
            for (a, b) in r.row.tensor.components_pa().iter().zip(sum) {
                prop_assert!((a - b).abs() <= 1e-9 * b.abs().max(1.0));
            }
        }
        // Worst first.
        for w in ranked.rows.windows(2) {
            prop_assert!(w[0].row.value.unwrap() >= w[1].row.value.unwrap());
        }
    }
}

/// The same tables in the same order and in reverse order give the same points and tensors.
#[test]
fn rows_in_different_orders_join_on_their_ids() {
    let values: Vec<[f64; 6]> = (0..10)
        .map(|p| std::array::from_fn(|i| (p * 6 + i) as f64))
        .collect();
    let other: Vec<[f64; 6]> = values.iter().map(|v| v.map(|x| -2.0 * x)).collect();
    let forward: Vec<usize> = (0..10).collect();
    let backward: Vec<usize> = (0..10).rev().collect();
    let list = [
        ("a", table_text(&forward, &values, HEADER)),
        ("b", table_text(&backward, &other, HEADER)),
    ];
    let points = join(
        tables(&list),
        &options(),
        &ids(&["element", "section"]),
        |_| true,
    )
    .unwrap();
    assert_eq!(points.len(), 10);
    for p in 0..10 {
        let ids = points.ids(p);
        let element: usize = ids[0].parse().unwrap();
        let q = (element - 1) * 2 + usize::from(ids[1] == "bottom");
        assert_eq!(points.tensor(0, p), values[q].map(|x| x * 1e6));
        assert_eq!(points.tensor(1, p), other[q].map(|x| x * 1e6));
    }
}

fn join_error(list: &[(&str, String)], join_options: &JoinOptions) -> String {
    match join(tables(list), &options(), join_options, |_| true) {
        Err(e @ (TableError::Join { .. } | TableError::Header { .. })) => e.to_string(),
        Err(e) => panic!("unexpected error {e}"),
        Ok(_) => panic!("joined"),
    }
}

/// A point missing from a table, or met twice in one, stops the join with the table, line
/// and id; with `skip_unmatched` it is counted and left out.
#[test]
fn missing_and_duplicated_ids_are_named_or_counted() {
    let values: Vec<[f64; 6]> = (0..6).map(|p| [f64::from(p), 0., 0., 0., 0., 0.]).collect();
    let all = table_text(&[0, 1, 2, 3, 4, 5], &values, HEADER);
    let missing = table_text(&[0, 1, 2, 4, 5], &values, HEADER);
    let twice = table_text(&[0, 1, 2, 3, 3, 4, 5], &values, HEADER);
    let join_ids = ids(&["element", "section"]);
    let e = join_error(
        &[("dead", all.clone()), ("live", missing.clone())],
        &join_ids,
    );
    assert_eq!(
        e,
        "live.csv: no row for element=2, section=bottom (load case 'live'; it is in dead.csv)"
    );
    let e = join_error(&[("dead", all.clone()), ("live", twice.clone())], &join_ids);
    assert_eq!(
        e,
        "live.csv:6: element=2, section=bottom appears a second time in load case 'live'"
    );
    // A point only in the second table is missing from the first.
    let e = join_error(
        &[("dead", missing.clone()), ("live", all.clone())],
        &join_ids,
    );
    assert!(
        e.starts_with("dead.csv: no row for element=2, section=bottom"),
        "{e}"
    );
    // Counted and skipped.
    let skip = JoinOptions {
        skip_unmatched: true,
        ..join_ids.clone()
    };
    let points = join(
        tables(&[("dead", all.clone()), ("live", missing), ("wind", twice)]),
        &options(),
        &skip,
        |_| true,
    )
    .unwrap();
    assert_eq!(points.len(), 6);
    assert_eq!(points.unmatched_count, 1, "{:?}", points.unmatched);
    let settings = SearchSettings::plain(PlaneMeasure::Shear, SignConvention::TensionPositive);
    let strengths = Strengths::default();
    let m = ranking(EnvelopeMeasure::VonMises, &settings, &strengths);
    let pc = point_combinations(&points.cases, &[]).unwrap();
    let ranked = rank_points(&points, pc, &options(), &m).unwrap();
    assert_eq!(ranked.points, 5);
    assert!(ranked.rows.iter().all(|r| r.row.carried != ["2", "bottom"]));
    // Headers: an id column that is not there, or that holds a component.
    let e = join_error(&[("dead", all.clone())], &ids(&["node"]));
    assert!(e.starts_with("dead.csv:1: no id column 'node'"), "{e}");
    let e = join_error(&[("dead", all.clone())], &ids(&["xx"]));
    assert!(e.contains("holds a stress component"), "{e}");
    let e = join_error(&[("dead", all.clone()), ("dead", all)], &join_ids);
    assert_eq!(e, "dead.csv: the load case 'dead' is given twice");
}

/// One long table with a load-case column gives the same points and tensors as one table per
/// case, whatever the rows' order.
#[test]
fn a_long_table_with_a_case_column_joins_like_one_table_per_case() {
    let n = 12;
    let dead: Vec<[f64; 6]> = (0..n)
        .map(|p| std::array::from_fn(|i| (p * 7 + i) as f64 - 30.0))
        .collect();
    let live: Vec<[f64; 6]> = (0..n)
        .map(|p| std::array::from_fn(|i| ((p * 3 + i * 5) % 11) as f64))
        .collect();
    let mut long = String::from("case,element,section,xx,yy,zz,xy,yz,zx\n");
    let mut rows: Vec<(usize, usize)> = (0..n).flat_map(|p| [(0, p), (1, p)]).collect();
    let order = shuffled(rows.len(), 99);
    rows = order.iter().map(|&i| rows[i]).collect();
    for (c, p) in rows {
        let v = if c == 0 { dead[p] } else { live[p] };
        let _ = writeln!(
            long,
            "{},{},{},{},{},{},{},{},{}",
            ["dead", "live"][c],
            p / 2 + 1,
            if p % 2 == 0 { "top" } else { "bottom" },
            v[0],
            v[1],
            v[2],
            v[3],
            v[4],
            v[5]
        );
    }
    let long_join = JoinOptions {
        case_column: Some("case".to_owned()),
        ..ids(&["element", "section"])
    };
    let a = join(tables(&[("", long)]), &options(), &long_join, |_| true).unwrap();
    let order: Vec<usize> = (0..n).collect();
    let b = join(
        tables(&[
            ("dead", table_text(&order, &dead, HEADER)),
            ("live", table_text(&order, &live, HEADER)),
        ]),
        &options(),
        &ids(&["element", "section"]),
        |_| true,
    )
    .unwrap();
    assert_eq!(a.len(), n);
    let mut cases = a.cases.clone();
    cases.sort();
    assert_eq!(cases, ["dead", "live"]);
    for p in 0..n {
        let q = b
            .find(&a.ids(p).iter().map(String::as_str).collect::<Vec<_>>())
            .unwrap();
        for (ca, name) in a.cases.iter().enumerate() {
            let cb = b.cases.iter().position(|c| c == name).unwrap();
            assert_eq!(a.tensor(ca, p), b.tensor(cb, q));
        }
    }
}

/// The governing combination under a worst-plane-free, eigenvalue measure (Tresca) is the
/// brute-force maximum over nalgebra's eigenvalues; groups rank their worst points.
#[test]
fn tresca_and_groups_over_joined_tables() {
    let n = 40;
    let mut s: u64 = 12345;
    let mut next = || {
        s ^= s << 13;
        s ^= s >> 7;
        s ^= s << 17;
        (s % 4001) as f64 / 10.0 - 200.0
    };
    let a: Vec<[f64; 6]> = (0..n).map(|_| std::array::from_fn(|_| next())).collect();
    let b: Vec<[f64; 6]> = (0..n).map(|_| std::array::from_fn(|_| next())).collect();
    let header = "element,section,part,xx,yy,zz,xy,yz,zx";
    let with_part = |values: &[[f64; 6]], order: &[usize]| {
        let mut t = format!("{header}\n");
        for &p in order {
            let c = values[p];
            let _ = writeln!(
                t,
                "{},{},P{},{},{},{},{},{},{}",
                p / 2 + 1,
                if p % 2 == 0 { "top" } else { "bottom" },
                p % 3,
                c[0],
                c[1],
                c[2],
                c[3],
                c[4],
                c[5]
            );
        }
        t
    };
    let list = [
        ("g", with_part(&a, &shuffled(n, 5))),
        ("q", with_part(&b, &shuffled(n, 6))),
    ];
    let combos = [
        combination("1.35g+1.5q", &[("g", 1.35), ("q", 1.5)]),
        combination("1.0g", &[("g", 1.0)]),
        combination("1.0g-1.5q", &[("g", 1.0), ("q", -1.5)]),
    ];
    let factors = [[1.35, 1.5], [1.0, 0.0], [1.0, -1.5]];
    let brute = |p: usize| {
        factors
            .iter()
            .map(|f| {
                let t: [f64; 6] = std::array::from_fn(|i| 1e6 * (f[0] * a[p][i] + f[1] * b[p][i]));
                tresca(&t)
            })
            .fold(f64::NEG_INFINITY, f64::max)
    };
    let mut opts = options();
    opts.group_by = Some("part".to_owned());
    let points = join(tables(&list), &opts, &ids(&["element", "section"]), |_| {
        true
    })
    .unwrap();
    let settings = SearchSettings::plain(PlaneMeasure::Shear, SignConvention::TensionPositive);
    let strengths = Strengths::default();
    let m = ranking(EnvelopeMeasure::Tresca, &settings, &strengths);
    let pc = point_combinations(&points.cases, &combos).unwrap();
    let ranked = rank_points(&points, pc, &opts, &m).unwrap();
    assert_eq!(ranked.groups.len(), 3);
    for g in &ranked.groups {
        let k: usize = g.name[1..].parse().unwrap();
        let members: Vec<usize> = (0..n).filter(|p| p % 3 == k).collect();
        assert_eq!(g.points, members.len() as u64);
        let worst = members
            .iter()
            .map(|&p| brute(p))
            .fold(f64::NEG_INFINITY, f64::max);
        let got = g.worst.row.value.unwrap();
        assert!(
            (got - worst).abs() <= 1e-6 * worst,
            "{}: {got} vs {worst}",
            g.name
        );
    }
    for w in ranked.groups.windows(2) {
        assert!(w[0].worst.row.value >= w[1].worst.row.value);
    }
    assert_eq!(ranked.governs.iter().sum::<u64>(), n as u64);
}

/// A combination naming a case the tables lack is refused with the cases they have.
#[test]
fn a_combination_of_an_unknown_case_is_refused() {
    let values = vec![[1.0, 0., 0., 0., 0., 0.]];
    let points: Points = join(
        tables(&[("dead", table_text(&[0], &values, HEADER))]),
        &options(),
        &ids(&["element", "section"]),
        |_| true,
    )
    .unwrap();
    let e = point_combinations(&points.cases, &[combination("ULS", &[("snow", 1.5)])]).unwrap_err();
    assert_eq!(
        e,
        "combination 'ULS' names the load case 'snow', which the tables do not have (they have: dead)"
    );
}

mod cli {
    //! `planewise batch` over load-case tables, from the command line.

    use std::fmt::Write as _;

    use super::common::{assert_bad_input, planewise, planewise_ok};

    /// Writes the invented example tables (a two-element shell, top and bottom; values made
    /// up for the test) into a fresh folder of its own; returns it. Each call gets its own
    /// folder: tests run in parallel, and one rewriting a table while another reads it made
    /// the reader see an empty file.
    fn example() -> std::path::PathBuf {
        static CALLS: std::sync::atomic::AtomicUsize = std::sync::atomic::AtomicUsize::new(0);
        let call = CALLS.fetch_add(1, std::sync::atomic::Ordering::Relaxed);
        let dir = std::env::temp_dir().join(format!("planewise-lt-{}-{call}", std::process::id()));
        std::fs::create_dir_all(&dir).unwrap();
        let head = "element,section,part,xx,yy,zz,xy,yz,zx\n";
        let write = |name: &str, rows: &str| {
            std::fs::write(dir.join(name), format!("{head}{rows}")).unwrap();
        };
        write(
            "dead.csv",
            "1,top,web,10,2,0,1,0,0\n1,bottom,web,-10,-2,0,-1,0,0\n2,top,flange,20,5,0,3,0,0\n2,bottom,flange,-20,-5,0,-3,0,0\n",
        );
        // Another row order.
        write(
            "live.csv",
            "2,bottom,flange,-8,-1,0,-2,0,0\n1,top,web,5,1,0,0.5,0,0\n2,top,flange,8,1,0,2,0,0\n1,bottom,web,-5,-1,0,-0.5,0,0\n",
        );
        write(
            "wind.csv",
            "1,top,web,-3,0,0,6,0,0\n1,bottom,web,3,0,0,-6,0,0\n2,top,flange,4,0,0,1,0,0\n2,bottom,flange,-4,0,0,-1,0,0\n",
        );
        dir
    }

    fn arg(dir: &std::path::Path, case: &str) -> String {
        format!("{case}={}", dir.join(format!("{case}.csv")).display())
    }

    /// EN 1990 expression (6.10) generated from three actions and applied at every point: the
    /// worst point's governing combination and its tensor, summed here by hand.
    #[test]
    fn generated_combinations_govern_each_point() {
        let dir = example();
        let (d, l, w) = (arg(&dir, "dead"), arg(&dir, "live"), arg(&dir, "wind"));
        let out = planewise_ok(&[
            "batch",
            &d,
            &l,
            &w,
            "--ids",
            "element,section",
            "--unit",
            "MPa",
            "--rank",
            "von-mises",
            "--permanent",
            "dead:1.35:1.0",
            "--variable",
            "live:1.5:0.7",
            "--variable",
            "wind:1.5:0.6",
            "--top",
            "2",
            "--json",
            "--quiet",
        ]);
        let json: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
        // 2 × (1 + 2 × 2) = 10 combinations (EN 1990 (6.10) with each permanent action
        // unfavourable or favourable and each variable action leading in turn).
        assert_eq!(json["combinations"].as_array().unwrap().len(), 10);
        let top = &json["rows"][0];
        assert_eq!(top["ids"]["element"], "2");
        assert_eq!(top["ids"]["section"], "top");
        assert_eq!(
            top["combination"],
            "6.10 live leads | dead unfav | wind accomp"
        );
        // By hand: 1.35 × dead + 1.5 × live + 1.5 × 0.6 × wind at element 2, top.
        let expected = [
            1.35 * 20.0 + 1.5 * 8.0 + 0.9 * 4.0,
            1.35 * 5.0 + 1.5 * 1.0,
            0.0,
            1.35 * 3.0 + 1.5 * 2.0 + 0.9 * 1.0,
            0.0,
            0.0,
        ];
        for (got, want) in top["components"].as_array().unwrap().iter().zip(expected) {
            assert!(
                (got.as_f64().unwrap() - want).abs() < 1e-9,
                "{got} vs {want}"
            );
        }
        assert_eq!(json["points"], 4);
        let governed: u64 = json["combinations"]
            .as_array()
            .unwrap()
            .iter()
            .map(|c| c["points_governed"].as_u64().unwrap())
            .sum();
        assert_eq!(governed, 4);
    }

    /// Given combinations, CSV output, groups and a threshold.
    #[test]
    fn given_combinations_as_csv_by_groups() {
        let dir = example();
        let (d, l) = (arg(&dir, "dead"), arg(&dir, "live"));
        let out = planewise_ok(&[
            "batch",
            &d,
            &l,
            "--ids",
            "element,section",
            "--unit",
            "MPa",
            "--rank",
            "sigma1",
            "--combination",
            "ULS:dead=1.35,live=1.5",
            "--combination",
            "SLS:dead=1,live=1",
            "--group-by",
            "part",
            "--at-or-beyond",
            "10",
            "--quiet",
        ]);
        let text = String::from_utf8(out.stdout).unwrap();
        let lines: Vec<&str> = text.lines().collect();
        assert_eq!(
            lines[0],
            "part,points,points_at_or_beyond,point,element,section,combination,xx_MPa,yy_MPa,zz_MPa,xy_MPa,yz_MPa,zx_MPa,sigma1_MPa,sigma2_MPa,sigma3_MPa,condition"
        );
        assert_eq!(lines.len(), 3, "{text}");
        // Flange first (element 2 top under ULS: xx = 1.35·20 + 1.5·8 = 39); both flange
        // points? Only the top is in tension: σ1 of the bottom is 0 (plane stress, zz = 0).
        assert!(
            lines[1].starts_with("flange,2,1,3,2,top,ULS,39,"),
            "{}",
            lines[1]
        );
        assert!(lines[2].starts_with("web,2,1,1,1,top,ULS,"), "{}", lines[2]);
    }

    /// A long table with a case column gives the same answer as a table per case.
    #[test]
    fn a_long_table_gives_the_same_answer() {
        let dir = example();
        let mut long = String::from("element,section,case,xx,yy,zz,xy,yz,zx\n");
        for case in ["wind", "dead", "live"] {
            let text = std::fs::read_to_string(dir.join(format!("{case}.csv"))).unwrap();
            for row in text.lines().skip(1) {
                let f: Vec<&str> = row.split(',').collect();
                let _ = writeln!(long, "{},{},{case},{}", f[0], f[1], f[3..].join(","));
            }
        }
        let path = dir.join("long.csv");
        std::fs::write(&path, long).unwrap();
        let common = [
            "--ids",
            "element,section",
            "--unit",
            "MPa",
            "--rank",
            "tresca",
            "--combination",
            "A:dead=1.35,live=1.5,wind=0.9",
            "--combination",
            "B:dead=1,wind=1.5",
            "--json",
            "--quiet",
        ];
        let mut a = vec!["batch", path.to_str().unwrap(), "--case-column", "case"];
        a.extend(common);
        let (d, l, w) = (arg(&dir, "dead"), arg(&dir, "live"), arg(&dir, "wind"));
        let mut b = vec!["batch", &d, &l, &w];
        b.extend(common);
        let ja: serde_json::Value = serde_json::from_slice(&planewise_ok(&a).stdout).unwrap();
        let jb: serde_json::Value = serde_json::from_slice(&planewise_ok(&b).stdout).unwrap();
        let strip = |j: &serde_json::Value| {
            j["rows"]
                .as_array()
                .unwrap()
                .iter()
                .map(|r| {
                    (
                        r["ids"].clone(),
                        r["combination"].clone(),
                        r["value"].clone(),
                    )
                })
                .collect::<Vec<_>>()
        };
        assert_eq!(strip(&ja), strip(&jb));
        assert_eq!(ja["cases"], serde_json::json!(["wind", "dead", "live"]));
    }

    /// Refusals name the argument and say what is wrong.
    #[test]
    fn bad_load_case_arguments_are_refused() {
        let dir = example();
        let (d, l) = (arg(&dir, "dead"), arg(&dir, "live"));
        let dead = dir.join("dead.csv");
        let dead = dead.to_str().unwrap();
        let base = ["--unit", "MPa", "--rank", "von-mises"];
        let with = |extra: &[&'static str], files: &[String]| -> Vec<String> {
            let mut v: Vec<String> = files.to_vec();
            v.extend(base.iter().map(|s| (*s).to_owned()));
            v.extend(extra.iter().map(|s| (*s).to_owned()));
            v
        };
        let cases: Vec<(Vec<String>, &str)> = vec![
            (
                with(&["--ids", "element,section"], &[dead.to_owned(), l.clone()]),
                "CASE=FILE",
            ),
            (with(&[], &[d.clone(), l.clone()]), "--ids"),
            (
                with(
                    &[
                        "--ids",
                        "element,section",
                        "--combination",
                        "U:dead=1.35,snow=1.5",
                    ],
                    &[d.clone(), l.clone()],
                ),
                "'snow', which the tables do not have (they have: dead, live)",
            ),
            (
                with(
                    &["--ids", "element,section", "--combination", "dead=1.35"],
                    std::slice::from_ref(&d),
                ),
                "NAME:CASE=FACTOR",
            ),
            (
                with(&["--ids", "node"], std::slice::from_ref(&d)),
                "no id column 'node'",
            ),
            (
                with(
                    &["--ids", "element,section", "--case-column", "case"],
                    &[d.clone(), l.clone()],
                ),
                "--case-column",
            ),
            (
                with(&["--ids", "element,section"], &["dead=-".to_owned()]),
                "standard input",
            ),
        ];
        let owned: Vec<(Vec<&str>, &str)> = cases
            .iter()
            .map(|(v, m)| (v.iter().map(String::as_str).collect(), *m))
            .collect();
        let refs: Vec<(&[&str], &str)> = owned.iter().map(|(v, m)| (v.as_slice(), *m)).collect();
        assert_bad_input("batch", &refs);
        // An id missing from a table: named with the table, or counted with --skip-unmatched.
        let short = dir.join("short.csv");
        let text = std::fs::read_to_string(dir.join("live.csv")).unwrap();
        std::fs::write(
            &short,
            text.lines().take(4).collect::<Vec<_>>().join("\n") + "\n",
        )
        .unwrap();
        let s = format!("live={}", short.display());
        let out = planewise(&[
            "batch",
            &d,
            &s,
            "--ids",
            "element,section",
            "--unit",
            "MPa",
            "--rank",
            "von-mises",
        ]);
        assert_eq!(out.status.code(), Some(2));
        let err = String::from_utf8_lossy(&out.stderr);
        assert!(
            err.contains("short.csv: no row for element=1, section=bottom (load case 'live'"),
            "{err}"
        );
        let out = planewise_ok(&[
            "batch",
            &d,
            &s,
            "--ids",
            "element,section",
            "--unit",
            "MPa",
            "--rank",
            "von-mises",
            "--skip-unmatched",
            "--json",
            "--quiet",
        ]);
        let json: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
        assert_eq!(json["points_left_out"], 1);
        assert_eq!(json["points"], 3);
    }

    /// `--report`: the tables section names every file with its SHA-256 (checked against the
    /// sha2 crate), the combinations with the points they govern, the worst points, and the
    /// worst point's governing combination reported in full; the project file is unchanged.
    #[test]
    fn the_report_has_a_tables_section() {
        use sha2::Digest as _;
        let dir = example();
        let (d, l, w) = (arg(&dir, "dead"), arg(&dir, "live"), arg(&dir, "wind"));
        let project = dir.join("plate.json");
        let _ = std::fs::remove_file(&project);
        let p = project.to_str().unwrap();
        planewise_ok(&["project", "new", p]);
        for case in ["dead", "live", "wind"] {
            planewise_ok(&["project", "add-case", p, "--name", case, "--stress", "xx=0"]);
        }
        planewise_ok(&[
            "project",
            "combine",
            p,
            "--name",
            "ULS",
            "--factors",
            "dead=1.35,live=1.5,wind=0.9",
        ]);
        let before = std::fs::read(&project).unwrap();
        let report = dir.join("tables.html");
        planewise_ok(&[
            "batch",
            &d,
            &l,
            &w,
            "--ids",
            "element,section",
            "--unit",
            "MPa",
            "--rank",
            "von-mises",
            "--combinations-from",
            p,
            "--top",
            "3",
            "--at-or-beyond",
            "30",
            "--report",
            report.to_str().unwrap(),
            "--quiet",
        ]);
        let html = std::fs::read_to_string(&report).unwrap();
        assert_eq!(
            std::fs::read(&project).unwrap(),
            before,
            "the project file changed"
        );
        assert!(html.contains("<h2>Load cases as tables</h2>"));
        for case in ["dead", "live", "wind"] {
            let bytes = std::fs::read(dir.join(format!("{case}.csv"))).unwrap();
            let hex = sha2::Sha256::digest(&bytes)
                .iter()
                .fold(String::new(), |mut s, b| {
                    let _ = write!(s, "{b:02x}");
                    s
                });
            assert!(html.contains(&hex), "no SHA-256 of {case}.csv");
        }
        // 1.35 × dead + 1.5 × live + 0.9 × wind governs all four points (the only
        // combination); element 2 top is the worst (xx = 1.35·20 + 1.5·8 + 0.9·4 = 42.6).
        assert!(html.contains("<td class=\"num\">4</td>"), "points governed");
        assert!(html.contains("element=2, section=top"));
        assert!(html.contains("at or beyond 30 MPa"));
        assert!(html.contains("reported in full below as <strong>ULS</strong>"));
        // The governing combination's own section follows, with the worst point's tensor.
        assert!(html.contains("42.6"), "the worst point's summed xx");
    }

    /// `batch --project`: the project's load-case tables (relative files from its folder, ids,
    /// unit) and its combinations give the same points as the same tables named on the
    /// command line; a project without tables is refused.
    #[test]
    fn a_project_names_its_load_case_tables() {
        let dir = example();
        let project = dir.join("with-tables.json");
        let _ = std::fs::remove_file(&project);
        let p = project.to_str().unwrap();
        planewise_ok(&["project", "new", p]);
        for case in ["dead", "live"] {
            planewise_ok(&["project", "add-case", p, "--name", case, "--stress", "xx=0"]);
        }
        planewise_ok(&[
            "project",
            "combine",
            p,
            "--name",
            "ULS",
            "--factors",
            "dead=1.35,live=1.5",
        ]);
        let out = planewise(&["batch", "--project", p, "--rank", "von-mises"]);
        assert_eq!(out.status.code(), Some(2));
        assert!(String::from_utf8_lossy(&out.stderr).contains("names no load-case tables"));
        let mut json: serde_json::Value =
            serde_json::from_str(&std::fs::read_to_string(&project).unwrap()).unwrap();
        json["load_case_tables"] = serde_json::json!({
            "tables": [{"case": "dead", "file": "dead.csv"}, {"case": "live", "file": "live.csv"}],
            "ids": ["element", "section"],
            "unit": "MPa"
        });
        std::fs::write(&project, serde_json::to_string_pretty(&json).unwrap()).unwrap();
        let a = planewise_ok(&[
            "batch",
            "--project",
            p,
            "--rank",
            "von-mises",
            "--json",
            "--quiet",
        ]);
        let (d, l) = (arg(&dir, "dead"), arg(&dir, "live"));
        let b = planewise_ok(&[
            "batch",
            &d,
            &l,
            "--ids",
            "element,section",
            "--unit",
            "MPa",
            "--rank",
            "von-mises",
            "--combination",
            "ULS:dead=1.35,live=1.5",
            "--json",
            "--quiet",
        ]);
        let ja: serde_json::Value = serde_json::from_slice(&a.stdout).unwrap();
        let jb: serde_json::Value = serde_json::from_slice(&b.stdout).unwrap();
        assert_eq!(ja["rows"], jb["rows"]);
        assert_eq!(ja["combinations"][0]["name"], "ULS");
        // The file keeps the tables through a load and save.
        let (loaded, _) = planewise::study::load(&project).unwrap();
        assert_eq!(
            loaded.load_case_tables.as_ref().unwrap().ids,
            ["element", "section"]
        );
    }
}

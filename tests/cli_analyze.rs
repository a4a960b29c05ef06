//! `planewise analyze` seen from outside: the JSON contract and every bad-input case.

#![allow(
    clippy::unwrap_used,
    reason = "a test helper that fails should panic loudly"
)]

mod common;

use common::planewise;

use serde_json::Value;

fn json(args: &[&str]) -> Value {
    let out = planewise(args);
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    serde_json::from_slice(&out.stdout).expect("stdout is one JSON object")
}

fn f(v: &Value) -> f64 {
    v.as_f64().unwrap_or_else(|| panic!("not a number: {v}"))
}

#[test]
fn json_contract_for_an_ordinary_state() {
    let j = json(&[
        "analyze",
        "--stress",
        "xx=120,yy=-35,zz=15,xy=48,yz=-12,zx=22",
        "--normal",
        "1,0.5,0",
        "--json",
    ]);
    for key in [
        "unit",
        "convention",
        "stress",
        "principal",
        "invariants",
        "mean_stress",
        "von_mises",
        "tresca",
        "max_shear",
        "max_shear_normals",
        "octahedral",
        "lode_angle_deg",
        "triaxiality",
        "plane",
    ] {
        assert!(j.get(key).is_some(), "missing {key}");
    }
    assert_eq!(j["unit"], "MPa");
    assert_eq!(j["convention"], "tension-positive");
    assert_eq!(f(&j["stress"]["zx"]), 22.0);
    let values: Vec<f64> = j["principal"]["values"]
        .as_array()
        .unwrap()
        .iter()
        .map(f)
        .collect();
    assert!(values[0] >= values[1] && values[1] >= values[2]);
    // I1 = trace = 100 MPa (closed form).
    assert!((f(&j["invariants"]["i1"]) - 100.0).abs() < 1e-12);
    // numpy 2.4.6 numpy.linalg.eigvalsh on the same matrix (reference library, run 2026-12-01).
    let numpy = [
        136.330_715_395_901_34,
        16.962_804_786_392_034,
        -53.293_520_182_293_36,
    ];
    for (ours, reference) in values.iter().zip(numpy) {
        assert!(
            (ours - reference).abs() < 1e-11,
            "{ours} vs numpy {reference}"
        );
    }
    let plane = &j["plane"];
    let n: Vec<f64> = plane["normal"].as_array().unwrap().iter().map(f).collect();
    assert!(
        (n[0] - 2.0 / 5.0_f64.sqrt()).abs() < 1e-15 && (n[1] - 1.0 / 5.0_f64.sqrt()).abs() < 1e-15
    );
    // t = σn with n = (2, 1, 0)/√5: t_x = (240 + 48)/√5 (closed form).
    assert!((f(&plane["traction"][0]) - 288.0 / 5.0_f64.sqrt()).abs() < 1e-12);
    assert!(plane["shear_direction"].is_array());
}

#[test]
fn plane_is_absent_without_a_plane_and_units_convert() {
    let j = json(&["analyze", "--stress", "xx=1", "--unit", "ksi", "--json"]);
    assert!(j.get("plane").is_none());
    assert_eq!(j["unit"], "ksi");
    assert!((f(&j["von_mises"]) - 1.0).abs() < 1e-12);
}

#[test]
fn hydrostatic_state_gives_nulls_not_nan() {
    let j = json(&[
        "analyze",
        "--stress",
        "xx=-10,yy=-10,zz=-10",
        "--dip",
        "30",
        "--dip-direction",
        "-30",
        "--json",
    ]);
    assert!(j["lode_angle_deg"].is_null());
    assert!(j["triaxiality"].is_null());
    assert_eq!(f(&j["von_mises"]), 0.0);
    assert_eq!(f(&j["plane"]["shear_stress"]), 0.0);
    assert!(j["plane"]["shear_direction"].is_null());
}

#[test]
fn compression_positive_reorders_and_negates() {
    // Compression-positive east/north/up 20, 40, 50 MPa on dip 60°, dip direction 090°:
    // σn = 27.5 MPa (Morris et al. 1996 definitions, worked by hand).
    let j = json(&[
        "analyze",
        "--stress",
        "xx=20,yy=40,zz=50",
        "--compression-positive",
        "--dip",
        "60",
        "--dip-direction",
        "90",
        "--json",
    ]);
    assert_eq!(j["convention"], "compression-positive");
    assert!((f(&j["principal"]["values"][0]) - 50.0).abs() < 1e-12);
    assert!((f(&j["principal"]["values"][2]) - 20.0).abs() < 1e-12);
    assert!((f(&j["plane"]["normal_stress"]) - 27.5).abs() < 1e-12);
    assert!((f(&j["plane"]["shear_stress"]) - 12.990_381_056_766_580).abs() < 1e-12);
}

#[test]
fn badly_conditioned_states_stay_finite() {
    // A large mean with a tiny deviator, and a tensor at the bottom of the range.
    for stress in ["xx=1e9,yy=1e9,zz=1e9,xy=1e-3", "xx=1e-12,xy=3e-13", "xx=0"] {
        let out = planewise(&["analyze", "--stress", stress, "--unit", "Pa", "--json"]);
        assert!(out.status.success(), "{stress}");
        let text = String::from_utf8(out.stdout).unwrap();
        assert!(
            !text.contains("NaN") && !text.contains("inf"),
            "{stress}: {text}"
        );
        let j: Value = serde_json::from_str(&text).unwrap();
        assert!(j["principal"]["values"][0].is_number());
    }
}

#[test]
fn text_output_names_units_and_convention() {
    let out = planewise(&["analyze", "--stress", "xx=50,yy=-10,xy=40"]);
    let text = String::from_utf8(out.stdout).unwrap();
    assert!(text.contains("tension-positive"));
    assert!(text.contains("70 MPa"), "{text}");
    assert!(text.contains("-30 MPa"), "{text}");
}

/// Each bad input exits with status 2, prints one line on stderr naming the argument, and
/// nothing on stdout.
#[test]
fn bad_input_is_rejected_with_one_line() {
    let cases: &[(&[&str], &str)] = &[
        (&["--stress", "xw=1"], "--stress"),
        (&["--stress", "xy=1,yx=2"], "--stress"),
        (&["--stress", "xx=abc"], "--stress"),
        (&["--stress", "xx=NaN"], "--stress"),
        (&["--stress", "xx=inf"], "--stress"),
        (&["--stress", "xx=1e999"], "--stress"),
        (&["--stress", "xx=1e300", "--unit", "ksi"], "--stress"),
        (&["--stress", "xx=1", "--normal", "0,0,0"], "--normal"),
        (&["--stress", "xx=1", "--normal", "1,x,0"], "--normal"),
        (&["--stress", "xx=1", "--unit", "atm"], "--unit"),
        (
            &[
                "--stress",
                "xx=1",
                "--normal",
                "1,0,0",
                "--dip",
                "30",
                "--dip-direction",
                "10",
            ],
            "--normal",
        ),
        (&["--stress", "xx=1", "--dip", "30"], "--dip"),
        (
            &["--stress", "xx=1", "--dip", "120", "--dip-direction", "10"],
            "--dip",
        ),
        (
            &["--stress", "xx=1", "--dip", "30", "--dip-direction", "east"],
            "--dip-direction",
        ),
        (&["--stress", "xx=1", "--bogus"], "--bogus"),
        (&["--unit", "MPa"], "--stress"),
    ];
    common::assert_bad_input("analyze", cases);
}

#[test]
fn without_a_display_the_window_says_so_in_one_line() {
    let out = std::process::Command::new(env!("CARGO_BIN_EXE_planewise"))
        .env_remove("DISPLAY")
        .env_remove("WAYLAND_DISPLAY")
        .output()
        .unwrap();
    assert_eq!(out.status.code(), Some(1));
    assert!(out.stdout.is_empty());
    let stderr = String::from_utf8_lossy(&out.stderr);
    assert_eq!(stderr.trim_end().lines().count(), 1, "{stderr}");
    assert!(stderr.contains("no display found"), "{stderr}");
    // Every subcommand, from the command definitions.
    for name in planewise::cli::subcommand_names() {
        assert!(stderr.contains(&name), "{name}: {stderr}");
    }
    assert!(
        stderr.contains("batch") && stderr.contains("report"),
        "{stderr}"
    );
    assert!(!stderr.contains(".rs"), "{stderr}");
}

/// Messages that say what to do instead (issue: the first hour at the command line).
#[test]
fn messages_say_what_was_meant() {
    let demo = concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/assets/demo-bracket-project.json"
    );
    common::assert_bad_input(
        "analyze",
        &[
            // Bare numbers: components are named, in no order guessed.
            (
                &["--stress", "120,-35,15,48,-12,22"],
                "6 bare numbers: components are named",
            ),
            (&["--stress", "1 2 3 4 5 6 7 8 9"], "9 bare numbers"),
            // A unit in the wrong case: did you mean; mPa stays refused as millipascals.
            (&["--stress", "xx=1", "--unit", "Mpa"], "did you mean MPa?"),
            (&["--stress", "xx=1", "--unit", "kpa"], "did you mean kPa?"),
            (&["--stress", "xx=1", "--unit", "Ksi"], "did you mean ksi?"),
            (
                &["--stress", "xx=1", "--unit", "mPa"],
                "mPa is millipascals",
            ),
            // A unit inside a value goes in --unit.
            (
                &["--stress", "xx=120MPa"],
                "'120MPa' has a unit in it: write 120 alone and give MPa once",
            ),
            (
                &["--stress", "xx=1", "--yield-strength", "275MPa"],
                "--yield-strength: '275MPa' has a unit in it",
            ),
            // An unknown case lists the project's names.
            (
                &["--project", demo, "--case", "ULS 3"],
                "no load case or combination named 'ULS 3' (the project has dead, live, thermal, ULS 1, ULS 2)",
            ),
        ],
    );
    let mpa = common::planewise(&["analyze", "--stress", "xx=1", "--unit", "mPa"]);
    assert!(!String::from_utf8_lossy(&mpa.stderr).contains("did you mean"));
    // A misspelled subcommand gets the one meant.
    for (typed, meant) in [("analyse", "'analyze'"), ("worstplane", "'worst-plane'")] {
        let out = common::planewise(&[typed]);
        let stderr = String::from_utf8_lossy(&out.stderr);
        assert_eq!(out.status.code(), Some(2));
        assert_eq!(stderr.trim_end().lines().count(), 1, "{stderr}");
        assert!(stderr.contains(meant), "{typed}: {stderr}");
    }
}

/// The conventions footer follows --help of the subcommands that take a stress convention,
/// not -h, and not the others; every long help ends with the caution.
#[test]
fn the_conventions_footer_is_where_its_options_are() {
    let help = |args: &[&str]| String::from_utf8(common::planewise_ok(args).stdout).unwrap();
    for sub in [
        "analyze",
        "figure",
        "worst-plane",
        "map",
        "mohr",
        "explain",
        "batch",
    ] {
        let long = help(&[sub, "--help"]);
        assert!(
            long.contains("--compression-positive"),
            "{sub} takes the option"
        );
        assert!(long.contains("Conventions:"), "{sub} --help");
        assert!(!help(&[sub, "-h"]).contains("Conventions:"), "{sub} -h");
    }
    for sub in ["project", "envelope", "rosette", "report"] {
        let long = help(&[sub, "--help"]);
        assert!(!long.contains("Conventions:"), "{sub} --help");
        assert!(
            long.contains("licensed engineering practice"),
            "{sub} --help"
        );
    }
    assert!(help(&["worst-plane", "--help"]).contains("largest, or smallest for normal-min"));
}

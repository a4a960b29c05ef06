//! Nothing crashes and nothing is lost: hostile numbers in a project file are refused with the
//! key named (never a panic in any front end), the window does not reopen a file that stopped
//! its last start, and no command writes its output over one of its inputs.

#![allow(
    clippy::unwrap_used,
    reason = "a test that cannot compute its reference should panic loudly"
)]

mod common;

use std::collections::HashMap;
use std::path::PathBuf;

use planewise::window::app::PlanewiseApp;

fn temp(name: &str) -> PathBuf {
    let dir = std::env::temp_dir().join(format!("planewise-hostile-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    dir.join(name)
}

/// The demo project with `annotation` added (an invented note), written to `name`.
fn with_annotation(name: &str, annotation: serde_json::Value) -> PathBuf {
    let demo = std::fs::read_to_string(concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/assets/demo-bracket-project.json"
    ))
    .unwrap();
    let mut v: serde_json::Value = serde_json::from_str(&demo).unwrap();
    v["annotations"].as_array_mut().unwrap().push(annotation);
    let file = temp(name);
    std::fs::write(&file, serde_json::to_string_pretty(&v).unwrap()).unwrap();
    file
}

fn hostile_files() -> Vec<(PathBuf, &'static str)> {
    vec![
        (
            with_annotation(
                "mohr-1e308.json",
                serde_json::json!({"case": "ULS 1", "figure": "mohr", "text": "far",
                    "pin": {"on": "mohr", "normal_stress_pa": 1e308, "shear_stress_pa": 1.0}}),
            ),
            "pin.normal_stress_pa",
        ),
        (
            with_annotation(
                "offset-huge.json",
                serde_json::json!({"case": "ULS 1", "figure": "mohr", "text": "far",
                    "pin": {"on": "mohr", "normal_stress_pa": 1e6, "shear_stress_pa": 1e6},
                    "offset": [1e30, 0.0]}),
            ),
            "offset[0]",
        ),
        (
            with_annotation(
                "space-1e308.json",
                serde_json::json!({"case": "ULS 1", "figure": "view3d", "text": "far",
                    "pin": {"on": "space", "at": [1e308, 0.0, 0.0]}}),
            ),
            "pin.at[0]",
        ),
        (
            with_annotation(
                "pole-zero.json",
                serde_json::json!({"case": "ULS 1", "figure": "map", "text": "none",
                    "pin": {"on": "pole", "normal": [0.0, 0.0, 0.0]}}),
            ),
            "pin.normal",
        ),
    ]
}

#[test]
fn hostile_numbers_are_refused_with_the_key_named_by_every_front_end() {
    for (file, key) in hostile_files() {
        let f = file.to_str().unwrap();
        let before = std::fs::read(&file).unwrap();
        let e = planewise::study::load(&file).unwrap_err().to_string();
        assert!(e.contains(key), "{f}: '{e}' does not name {key}");
        let out = temp("out.svg");
        let html = temp("out.html");
        let dir = temp("explained");
        for args in [
            vec!["project", "show", f],
            vec!["report", "--project", f, "--out", html.to_str().unwrap()],
            vec![
                "mohr",
                "--project",
                f,
                "--case",
                "ULS 1",
                "--out",
                out.to_str().unwrap(),
            ],
            vec![
                "figure",
                "--project",
                f,
                "--case",
                "ULS 1",
                "--out",
                out.to_str().unwrap(),
            ],
            vec![
                "explain",
                "--project",
                f,
                "--case",
                "ULS 1",
                "--out",
                dir.to_str().unwrap(),
            ],
            vec!["analyze", "--project", f, "--case", "ULS 1"],
        ] {
            let run = common::planewise(&args);
            let stderr = String::from_utf8_lossy(&run.stderr);
            assert_eq!(run.status.code(), Some(2), "{args:?}: {stderr}");
            assert!(stderr.contains(key), "{args:?}: {stderr}");
            assert!(!stderr.contains("panicked"), "{args:?}: {stderr}");
        }
        assert_eq!(std::fs::read(&file).unwrap(), before, "{f} was changed");
    }
}

#[test]
fn drawing_notes_is_total_for_any_number() {
    use planewise::picture::draw::place::{Pinned, draw_notes};
    let mut frame = planewise::picture::draw::Frame {
        width: 400.0,
        height: 300.0,
        background: planewise::picture::scene::style::BACKGROUND,
        prims: Vec::new(),
    };
    for v in [
        f32::INFINITY,
        f32::NEG_INFINITY,
        f32::NAN,
        f32::MAX,
        -f32::MAX,
        1e30,
    ] {
        let notes = vec![
            Pinned {
                pin: [v, 10.0],
                text: "a".into(),
                offset: [1.0, 1.0],
            },
            Pinned {
                pin: [10.0, 10.0],
                text: "b".into(),
                offset: [v, v],
            },
        ];
        draw_notes(
            &mut frame,
            &notes,
            planewise::picture::draw::Sizes::default(),
        );
    }
}

/// An in-memory stand-in for eframe's storage.
#[derive(Default)]
struct Memory(HashMap<String, String>);

impl eframe::Storage for Memory {
    fn get_string(&self, key: &str) -> Option<String> {
        self.0.get(key).cloned()
    }
    fn set_string(&mut self, key: &str, value: String) {
        self.0.insert(key.to_owned(), value);
    }
    fn remove_string(&mut self, key: &str) {
        self.0.remove(key);
    }
    fn flush(&mut self) {}
}

fn storage_with_last(file: &std::path::Path) -> Memory {
    let mut memory = Memory::default();
    let saved = planewise::window::app::Saved {
        file: Some(file.to_owned()),
        ..planewise::window::app::Saved::default()
    };
    eframe::set_value(&mut memory, "planewise-state", &saved);
    memory
}

#[test]
fn the_window_opens_the_demo_and_says_why_when_the_last_project_is_hostile() {
    let (file, key) = hostile_files().remove(0);
    let data = temp("data-hostile");
    let _ = std::fs::remove_dir_all(&data);
    let memory = storage_with_last(&file);
    let app = PlanewiseApp::start(Some(&memory), None, Some(data.clone()));
    assert_eq!(app.project, planewise::study::Project::demo());
    let status = app.status.as_ref().unwrap();
    assert!(status.error && status.text.contains(key), "{status:?}");
}

#[test]
fn a_start_that_did_not_finish_is_not_repeated() {
    // A project that loads: the marker alone says the last start stopped while opening it.
    let file = temp("fine.json");
    planewise::study::save(&file, &planewise::study::Project::demo()).unwrap();
    let data = temp("data-unfinished");
    let _ = std::fs::remove_dir_all(&data);
    let memory = storage_with_last(&file);
    // A start that ends normally leaves no marker once its first frames are drawn.
    let app = PlanewiseApp::start(Some(&memory), None, Some(data.clone()));
    assert_eq!(app.file.as_deref(), Some(file.as_path()));
    let mut h = egui_kittest::Harness::builder()
        .with_size(egui::vec2(1280.0, 800.0))
        .build_ui_state(|ui, app: &mut PlanewiseApp| app.show(ui), app);
    h.run_steps(4);
    assert!(!data.join("starting.txt").exists(), "the marker stayed");
    // A start that stops before its first frames leaves the marker: the next start does not
    // reopen the file and says why.
    let stopped = PlanewiseApp::start(Some(&memory), None, Some(data.clone()));
    drop(stopped);
    let next = PlanewiseApp::start(Some(&memory), None, Some(data.clone()));
    assert_eq!(next.file, None);
    let status = next.status.as_ref().unwrap();
    assert!(
        status.text.contains("did not finish") && status.text.contains("fine.json"),
        "{status:?}"
    );
}

#[test]
fn no_command_writes_its_output_over_an_input() {
    let project = temp("input.json");
    planewise::study::save(&project, &planewise::study::Project::demo()).unwrap();
    let p = project.to_str().unwrap();
    // The same file spelled another way, and through a symbolic link.
    let spelled = format!("{}/./input.json", project.parent().unwrap().display());
    let link = temp("link.json");
    let _ = std::fs::remove_file(&link);
    std::os::unix::fs::symlink(&project, &link).unwrap();
    let table = temp("t.csv");
    std::fs::write(&table, "id,xx,yy,zz,xy,yz,zx\nA,1,2,3,0,0,0\n").unwrap();
    let t = table.to_str().unwrap();
    let before = std::fs::read(&project).unwrap();
    let table_before = std::fs::read(&table).unwrap();
    for args in [
        vec![
            "batch",
            t,
            "--unit",
            "MPa",
            "--rank",
            "von-mises",
            "--out",
            t,
        ],
        vec![
            "figure",
            "--project",
            p,
            "--case",
            "dead",
            "--out",
            &spelled,
        ],
        vec![
            "map",
            "--project",
            p,
            "--case",
            "dead",
            "--out",
            link.to_str().unwrap(),
        ],
        vec!["mohr", "--project", &spelled, "--case", "dead", "--out", p],
        vec!["report", "--project", p, "--out", link.to_str().unwrap()],
    ] {
        // map/figure/mohr/report refuse on the extension first when it is .json; rename a
        // link and a copy with the right extension where the format matters.
        let run = common::planewise(&args);
        let stderr = String::from_utf8_lossy(&run.stderr);
        assert_eq!(run.status.code(), Some(2), "{args:?}: {stderr}");
        assert!(stderr.contains("--out"), "{args:?}: {stderr}");
    }
    // With the right extension the identity check itself refuses.
    let svg_link = temp("input-link.svg");
    let _ = std::fs::remove_file(&svg_link);
    std::os::unix::fs::symlink(&project, &svg_link).unwrap();
    let html_link = temp("input-link.html");
    let _ = std::fs::remove_file(&html_link);
    std::os::unix::fs::symlink(&project, &html_link).unwrap();
    for args in [
        vec![
            "figure",
            "--project",
            p,
            "--case",
            "dead",
            "--out",
            svg_link.to_str().unwrap(),
        ],
        vec![
            "mohr",
            "--project",
            p,
            "--case",
            "dead",
            "--out",
            svg_link.to_str().unwrap(),
        ],
        vec![
            "map",
            "--project",
            p,
            "--case",
            "dead",
            "--out",
            svg_link.to_str().unwrap(),
        ],
        vec![
            "report",
            "--project",
            p,
            "--out",
            html_link.to_str().unwrap(),
        ],
    ] {
        let run = common::planewise(&args);
        let stderr = String::from_utf8_lossy(&run.stderr);
        assert_eq!(run.status.code(), Some(2), "{args:?}: {stderr}");
        assert!(stderr.contains("destroy"), "{args:?}: {stderr}");
    }
    assert_eq!(
        std::fs::read(&project).unwrap(),
        before,
        "the project was changed"
    );
    assert_eq!(
        std::fs::read(&table).unwrap(),
        table_before,
        "the table was changed"
    );
    // explain: an existing index.html is left alone unless --replace is given.
    let dir = temp("walk");
    let _ = std::fs::remove_dir_all(&dir);
    std::fs::create_dir_all(&dir).unwrap();
    std::fs::write(dir.join("index.html"), "mine").unwrap();
    let d = dir.to_str().unwrap();
    let run = common::planewise(&["explain", "--project", p, "--case", "dead", "--out", d]);
    assert_eq!(
        run.status.code(),
        Some(2),
        "{}",
        String::from_utf8_lossy(&run.stderr)
    );
    assert_eq!(
        std::fs::read_to_string(dir.join("index.html")).unwrap(),
        "mine"
    );
    common::planewise_ok(&[
        "explain",
        "--project",
        p,
        "--case",
        "dead",
        "--out",
        d,
        "--replace",
    ]);
    assert_ne!(
        std::fs::read_to_string(dir.join("index.html")).unwrap(),
        "mine"
    );
}

proptest::proptest! {
    #![proptest_config(proptest::prelude::ProptestConfig::with_cases(64))]

    /// Any Unicode in the project's name, a caption and a note (control characters and
    /// bidirectional overrides included) gives SVG that a strict XML parser reads, for every
    /// figure, and a report without raw control characters.
    #[test]
    fn any_text_gives_svg_that_parses(text in proptest::prelude::any::<String>()) {
        use planewise::study::annotations::{Annotation, FigureKind, Pin};
        use planewise::picture::figures::{self, FigureInput};
        let mut p = planewise::study::Project::demo();
        p.name.clone_from(&text);
        let case = p.active_name().unwrap().to_owned();
        p.annotations.push(Annotation::caption(&case, FigureKind::Mohr, &text));
        p.annotations.push(Annotation::note(
            &case,
            Pin::Mohr { normal_stress_pa: 1e7, shear_stress_pa: 2e7 },
            &text,
        ));
        p.annotations.push(Annotation::note(&case, Pin::Space { at: [0.5, 0.5, 0.5] }, &text));
        let d = planewise::study::Derived::new(&p);
        let input = FigureInput::from_derived(&d, false);
        let sizes = planewise::picture::draw::Sizes::for_export(800.0, 600.0);
        let frames = [
            figures::mohr(&input, 800, 600, sizes),
            figures::view_3d(
                &input,
                planewise::picture::scene::Layers::default(),
                planewise::picture::scene::FaceChoice::FacingViewer,
                &planewise::picture::draw::camera::Camera::default(),
                800,
                600,
                sizes,
            ),
        ];
        for frame in &frames {
            let svg = planewise::picture::draw::svg::to_svg(frame, &text);
            if let Err(e) = roxmltree::Document::parse(&svg) {
                proptest::prop_assert!(false, "{e}: {text:?}");
            }
        }
        let html = planewise::output::report::html(&p, &planewise::output::report::ReportOptions {
            figures: Vec::new(),
            ..planewise::output::report::ReportOptions::default()
        }).unwrap();
        proptest::prop_assert!(
            !html.chars().any(|c| (c.is_control() && !matches!(c, '\n' | '\t' | '\r'))
                || ('\u{202a}'..='\u{202e}').contains(&c)),
            "a raw control or override character in the report"
        );
    }
}

#[test]
fn the_atomic_writer_keeps_permissions_follows_links_and_refuses_the_rest() {
    use planewise::study::atomic::write_atomic;
    use std::os::unix::fs::{FileTypeExt as _, PermissionsExt as _};
    let mode = |p: &std::path::Path| std::fs::metadata(p).unwrap().permissions().mode() & 0o777;
    // Permissions carry over.
    let file = temp("perm.json");
    std::fs::write(&file, "old").unwrap();
    std::fs::set_permissions(&file, std::fs::Permissions::from_mode(0o640)).unwrap();
    write_atomic(&file, b"new").unwrap();
    assert_eq!(std::fs::read_to_string(&file).unwrap(), "new");
    assert_eq!(mode(&file), 0o640);
    // A read-only file is refused and left alone (whoever runs the test, root included).
    let ro = temp("read-only.json");
    let _ = std::fs::set_permissions(&ro, std::fs::Permissions::from_mode(0o644));
    std::fs::write(&ro, "keep").unwrap();
    std::fs::set_permissions(&ro, std::fs::Permissions::from_mode(0o444)).unwrap();
    let e = write_atomic(&ro, b"new").unwrap_err().to_string();
    assert!(e.contains("read-only"), "{e}");
    assert_eq!(std::fs::read_to_string(&ro).unwrap(), "keep");
    assert_eq!(mode(&ro), 0o444);
    // A symbolic link is written through: the shared target changes, the link stays a link.
    let shared = temp("shared.json");
    std::fs::write(&shared, "old").unwrap();
    let link = temp("my-link.json");
    let _ = std::fs::remove_file(&link);
    std::os::unix::fs::symlink(&shared, &link).unwrap();
    write_atomic(&link, b"through").unwrap();
    assert_eq!(std::fs::read_to_string(&shared).unwrap(), "through");
    assert!(
        std::fs::symlink_metadata(&link)
            .unwrap()
            .file_type()
            .is_symlink()
    );
    // A pipe is not replaced by a regular file.
    let fifo = temp("pipe");
    let _ = std::fs::remove_file(&fifo);
    let made = std::process::Command::new("mkfifo")
        .arg(&fifo)
        .status()
        .unwrap();
    assert!(made.success());
    let e = write_atomic(&fifo, b"x").unwrap_err().to_string();
    assert!(e.contains("not a regular file"), "{e}");
    assert!(std::fs::metadata(&fifo).unwrap().file_type().is_fifo());
    // A temporary a killed write left behind (a process id that is not running) is removed on
    // the next save; one of a running process is not.
    let stale = temp(".perm.json.4000000.tmp");
    std::fs::write(&stale, "half").unwrap();
    write_atomic(&file, b"again").unwrap();
    assert!(!stale.exists(), "the stale temporary stayed");
}

/// The demo project's JSON with `change` applied, written to `name`.
fn demo_changed(name: &str, change: impl Fn(&mut serde_json::Value)) -> PathBuf {
    let demo = std::fs::read_to_string(concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/assets/demo-bracket-project.json"
    ))
    .unwrap();
    let mut v: serde_json::Value = serde_json::from_str(&demo).unwrap();
    change(&mut v);
    let file = temp(name);
    std::fs::write(&file, serde_json::to_string_pretty(&v).unwrap()).unwrap();
    file
}

#[test]
fn checks_that_were_missing_now_refuse() {
    for (file, says) in [
        (
            demo_changed("cohesion.json", |v| {
                v["material"]["cohesion_pa"] = (-5.0).into();
            }),
            "cohesion",
        ),
        (
            demo_changed("friction.json", |v| {
                v["material"]["friction_angle_deg"] = 95.0.into();
            }),
            "friction angle 95",
        ),
        (
            demo_changed("faults.json", |v| {
                v["faults"] = serde_json::json!([
                    {"name": "F", "dip_deg": 10.0, "dip_direction_deg": 20.0},
                    {"name": "F", "dip_deg": 30.0, "dip_direction_deg": 40.0}
                ]);
            }),
            "used twice",
        ),
        (
            demo_changed("version0.json", |v| v["format_version"] = 0.into()),
            "format_version 0",
        ),
    ] {
        let run = common::planewise(&["project", "show", file.to_str().unwrap()]);
        let stderr = String::from_utf8_lossy(&run.stderr);
        assert_eq!(run.status.code(), Some(2), "{file:?}: {stderr}");
        assert!(stderr.contains(says), "{file:?}: {stderr}");
    }
    // A byte-order mark before the JSON is accepted.
    let demo = std::fs::read_to_string(concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/assets/demo-bracket-project.json"
    ))
    .unwrap();
    let bom = temp("bom.json");
    std::fs::write(&bom, format!("\u{feff}{demo}")).unwrap();
    common::planewise_ok(&["project", "show", bom.to_str().unwrap()]);
    // A device is not read (it would never end).
    let run = common::planewise(&["project", "show", "/dev/zero"]);
    assert_eq!(run.status.code(), Some(2));
    assert!(String::from_utf8_lossy(&run.stderr).contains("not a regular file"));
    // SHmax below Shmin is refused, saying which is which.
    let run = common::planewise(&["analyze", "--in-situ", "sv=30,shmax=10,shmin=20,azimuth=0"]);
    let stderr = String::from_utf8_lossy(&run.stderr);
    assert_eq!(run.status.code(), Some(2), "{stderr}");
    assert!(
        stderr.contains("--in-situ") && stderr.contains("SHmax (10"),
        "{stderr}"
    );
    // Two columns naming one component are refused; a last line without its line end is said.
    let table = temp("dup.csv");
    std::fs::write(&table, "id,xx,xx,yy,zz,xy,yz,zx\nA,1,2,3,4,5,6,7\n").unwrap();
    let run = common::planewise(&[
        "batch",
        table.to_str().unwrap(),
        "--unit",
        "MPa",
        "--rank",
        "von-mises",
    ]);
    let stderr = String::from_utf8_lossy(&run.stderr);
    assert_eq!(run.status.code(), Some(2), "{stderr}");
    assert!(stderr.contains("both name xx"), "{stderr}");
    let cut = temp("cut.csv");
    std::fs::write(&cut, "id,xx,yy,zz,xy,yz,zx\nA,1,2,3,4,5,6\nB,1,2,3,4,5,6").unwrap();
    let run = common::planewise_ok(&[
        "batch",
        cut.to_str().unwrap(),
        "--unit",
        "MPa",
        "--rank",
        "von-mises",
        "--quiet",
        "--json",
    ]);
    assert!(String::from_utf8_lossy(&run.stderr).contains("may have been cut short"));
    let j: serde_json::Value = serde_json::from_slice(&run.stdout).unwrap();
    assert_eq!(j["last_line_unterminated"], true);
}

#[test]
fn messages_say_what_happened() {
    // A finite number that overflows once converted.
    common::assert_bad_input(
        "analyze",
        &[(
            &["--stress", "xx=1e308", "--unit", "GPa"],
            "exceeds the limit of 1e30 Pa once converted",
        )],
    );
    // add-case names the input, not the name.
    let file = temp("messages.json");
    let _ = std::fs::remove_file(&file);
    let f = file.to_str().unwrap();
    common::planewise_ok(&["project", "new", f]);
    common::assert_bad_input(
        "project",
        &[
            (
                &["add-case", f, "--name", "a", "--stress", "xx=1e308"],
                "--stress",
            ),
            (
                &["add-case", f, "--name", "a", "--stress", "xx=1e308"],
                "exceeds",
            ),
        ],
    );
    // Negative numbers name their argument.
    let table = temp("m.csv");
    std::fs::write(&table, "id,xx,yy,zz,xy,yz,zx\nA,1,2,3,0,0,0\n").unwrap();
    let t = table.to_str().unwrap();
    let out = temp("m.svg");
    let o = out.to_str().unwrap();
    common::assert_bad_input(
        "batch",
        &[(
            &[t, "--unit", "MPa", "--rank", "von-mises", "--top", "-5"],
            "--top",
        )],
    );
    common::assert_bad_input(
        "figure",
        &[(
            &["--stress", "xx=1", "--size", "-5x100", "--out", o],
            "--size",
        )],
    );
    common::assert_bad_input(
        "map",
        &[(
            &[
                "--stress",
                "xx=1",
                "--measure",
                "shear",
                "--resolution",
                "-5",
                "--out",
                o,
            ],
            "--resolution",
        )],
    );
    common::assert_bad_input(
        "rosette",
        &[(
            &[
                "--strains",
                "1,2,3",
                "--modulus",
                "-70GPa",
                "--poisson",
                "0.3",
            ],
            "--modulus",
        )],
    );
    // A folder given as the table is named.
    let dir = temp("a-folder");
    std::fs::create_dir_all(&dir).unwrap();
    common::assert_bad_input(
        "batch",
        &[(
            &[
                dir.to_str().unwrap(),
                "--unit",
                "MPa",
                "--rank",
                "von-mises",
            ],
            "FILE",
        )],
    );
    // A huge header is quoted short.
    let wide = temp("wide.csv");
    std::fs::write(
        &wide,
        format!(
            "{}\n1\n",
            (0..20_000)
                .map(|i| format!("c{i}"))
                .collect::<Vec<_>>()
                .join(",")
        ),
    )
    .unwrap();
    let run = common::planewise(&[
        "batch",
        wide.to_str().unwrap(),
        "--unit",
        "MPa",
        "--rank",
        "von-mises",
    ]);
    assert_eq!(run.status.code(), Some(2));
    assert!(
        run.stderr.len() < 1000,
        "{} bytes on stderr",
        run.stderr.len()
    );
    // Output that cannot be written says so; a reader that stops early is no error.
    let full = std::process::Command::new(env!("CARGO_BIN_EXE_planewise"))
        .args(["analyze", "--stress", "xx=1"])
        .stdout(std::fs::File::create("/dev/full").unwrap())
        .output()
        .unwrap();
    assert_eq!(full.status.code(), Some(1));
    assert!(String::from_utf8_lossy(&full.stderr).contains("could not write"));
    let mut child = std::process::Command::new(env!("CARGO_BIN_EXE_planewise"))
        .args([
            "batch",
            t,
            "--unit",
            "MPa",
            "--rank",
            "von-mises",
            "--quiet",
        ])
        .stdout(std::process::Stdio::piped())
        .stderr(std::process::Stdio::piped())
        .spawn()
        .unwrap();
    drop(child.stdout.take());
    let done = child.wait_with_output().unwrap();
    assert!(!String::from_utf8_lossy(&done.stderr).contains("Broken pipe"));
    // explain that cannot write exits 1, as every command does.
    let blocked = temp("blocker");
    std::fs::write(&blocked, "a file where the folder would go").unwrap();
    let run = common::planewise(&[
        "explain",
        "--stress",
        "xx=1",
        "--out",
        blocked.join("sub").to_str().unwrap(),
    ]);
    assert_eq!(
        run.status.code(),
        Some(1),
        "{}",
        String::from_utf8_lossy(&run.stderr)
    );
    // project show does not pass terminal escapes through.
    let mut p = planewise::study::Project::demo();
    p.name = "bad\u{1b}[2Jname".to_owned();
    let esc = temp("escape.json");
    planewise::study::save(&esc, &p).unwrap();
    let shown = common::planewise_ok(&["project", "show", esc.to_str().unwrap()]);
    assert!(
        !shown.stdout.contains(&0x1b),
        "an escape reached the terminal"
    );
    assert!(String::from_utf8_lossy(&shown.stdout).contains("\\u{1b}"));
}

#[test]
fn unknown_keys_survive_load_and_save_at_every_level() {
    let file = demo_changed("unknown.json", |v| {
        v["from_a_newer_version"] = serde_json::json!({"kept": [1, 2, 3]});
        v["cases"][0]["colour"] = "red".into();
        v["combinations"][0]["checked_by"] = "A. N. Other".into();
        v["combinations"][0]["terms"][0]["source"] = "table 4".into();
        v["material"]["grade"] = "S275 (invented)".into();
        v["faults"] = serde_json::json!([{"name": "F", "dip_deg": 10.0, "dip_direction_deg": 20.0, "survey": 7}]);
        // Inside objects without a map of their own: a case's input, the measure, a note and
        // its pin.
        v["cases"][1]["input"]["gauge"] = "G-12".into();
        v["measure"] =
            serde_json::json!({"measure": "shear", "pore_pressure_pa": 0.0, "smoothing": 3});
        v["annotations"][0]["layer"] = 2.into();
        v["annotations"][0]["pin"] = serde_json::json!({"on": "mohr", "normal_stress_pa": 1.0, "shear_stress_pa": 2.0, "marker": "star"});
    });
    let f = file.to_str().unwrap();
    // One warning naming each.
    let shown = common::planewise_ok(&["project", "show", f]);
    let stderr = String::from_utf8_lossy(&shown.stderr);
    assert_eq!(stderr.lines().count(), 1, "{stderr}");
    for key in [
        "from_a_newer_version",
        "cases[0].colour",
        "combinations[0].checked_by",
        "combinations[0].terms[0].source",
        "material.grade",
        "faults[0].survey",
        "cases[\"live\"].input.gauge",
        "measure.smoothing",
        "annotations[0].layer",
        "annotations[0].pin.marker",
    ] {
        assert!(stderr.contains(key), "{key}: {stderr}");
    }
    // A command that rewrites the file keeps them.
    common::planewise_ok(&[
        "project", "add-case", f, "--name", "new", "--stress", "xx=1",
    ]);
    let v: serde_json::Value =
        serde_json::from_str(&std::fs::read_to_string(&file).unwrap()).unwrap();
    assert_eq!(
        v["from_a_newer_version"],
        serde_json::json!({"kept": [1, 2, 3]})
    );
    assert_eq!(v["cases"][0]["colour"], "red");
    assert_eq!(v["combinations"][0]["checked_by"], "A. N. Other");
    assert_eq!(v["combinations"][0]["terms"][0]["source"], "table 4");
    assert_eq!(v["material"]["grade"], "S275 (invented)");
    assert_eq!(v["faults"][0]["survey"], 7);
    assert_eq!(v["cases"][1]["input"]["gauge"], "G-12");
    assert_eq!(v["measure"]["smoothing"], 3);
    assert_eq!(v["annotations"][0]["layer"], 2);
    assert_eq!(v["annotations"][0]["pin"]["marker"], "star");
    // In the order they were written: the project's own keys first, as always.
    let text = std::fs::read_to_string(&file).unwrap();
    assert!(
        text.trim_start().starts_with("{\n  \"format_version\""),
        "{text}"
    );
}

#[test]
fn unknown_keys_of_a_case_input_stay_with_its_kind_and_its_name() {
    use planewise::study::unknown::UnknownInside;
    use serde_json::json;
    let read = json!({"cases": [
        {"name": "a", "input": {"kind": "tensor", "unit": "MPa", "gauge": 1}},
        {"name": "b", "input": {"kind": "tensor", "unit": "MPa", "gauge": 2}},
    ]});
    let known = json!({"cases": [
        {"name": "a", "input": {"kind": "tensor", "unit": "MPa"}},
        {"name": "b", "input": {"kind": "tensor", "unit": "MPa"}},
    ]});
    let inside = UnknownInside::between(&read, &known).unwrap();
    // The cases reordered and b's input made another kind: a keeps its key, b's is dropped.
    let mut now = json!({"cases": [
        {"name": "b", "input": {"kind": "in-situ", "unit": "MPa"}},
        {"name": "c", "input": {"kind": "tensor", "unit": "MPa"}},
        {"name": "a", "input": {"kind": "tensor", "unit": "MPa"}},
    ]});
    inside.restore(&mut now);
    assert_eq!(now["cases"][2]["input"]["gauge"], 1);
    assert!(now["cases"][0]["input"].get("gauge").is_none());
    assert!(now["cases"][1]["input"].get("gauge").is_none());
}

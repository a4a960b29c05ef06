//! `planewise figure` from outside: files written with no window, and bad input.

#![allow(
    clippy::unwrap_used,
    reason = "a test helper that fails should panic loudly"
)]

mod common;

use common::planewise;

fn temp(name: &str) -> std::path::PathBuf {
    let dir = std::env::temp_dir().join(format!("planewise-cli-figure-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    dir.join(name)
}

#[test]
fn writes_png_and_svg_without_a_display() {
    let png = temp("fig.png");
    let out = planewise(&[
        "figure",
        "--stress",
        "xx=120,yy=-35,zz=15,xy=48,yz=-12,zx=22",
        "--normal",
        "1,0.5,0",
        "--out",
        png.to_str().unwrap(),
        "--size",
        "320x200",
        "--view",
        "-x",
    ]);
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let bytes = std::fs::read(&png).unwrap();
    assert_eq!(&bytes[..8], b"\x89PNG\r\n\x1a\n");
    assert_eq!(u32::from_be_bytes(bytes[16..20].try_into().unwrap()), 320);
    assert_eq!(u32::from_be_bytes(bytes[20..24].try_into().unwrap()), 200);
    let svg = temp("fig.svg");
    let out = planewise(&[
        "figure",
        "--stress",
        "xx=-10,yy=-10,zz=-10",
        "--out",
        svg.to_str().unwrap(),
        "--layers",
        "cube,axes,legend",
    ]);
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let text = std::fs::read_to_string(&svg).unwrap();
    assert!(text.starts_with("<svg") && text.contains("Convention: tension-positive"));
    assert!(
        text.contains("licensed engineering practice"),
        "the caution travels with the figure"
    );
}

#[test]
fn bad_figure_arguments_exit_2_with_one_line() {
    let out_png = temp("never.png");
    let out = out_png.to_str().unwrap();
    let cases: &[(&[&str], &str)] = &[
        (
            &["--stress", "xx=1", "--out", out, "--size", "10x10"],
            "--size",
        ),
        (
            &["--stress", "xx=1", "--out", out, "--size", "wide"],
            "--size",
        ),
        (
            &["--stress", "xx=1", "--out", out, "--view", "diagonal"],
            "--view",
        ),
        (&["--stress", "xx=1", "--out", "figure.jpg"], "--out"),
        (
            &["--stress", "xx=1", "--out", out, "--layers", "cube,stars"],
            "--layers",
        ),
        (&["--stress", "xx=abc", "--out", out], "--stress"),
        (&["--stress", "xx=1"], "--out"),
    ];
    common::assert_bad_input("figure", cases);
    assert!(!out_png.exists(), "nothing is written on bad input");
}

#[test]
fn text_size_follows_the_print_width_and_font_size() {
    let dir = std::env::temp_dir().join(format!("planewise-print-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let out = dir.join("f.svg");
    // 9 pt at 16 cm on a 1600-pixel-wide figure: 9 × 25.4/72 mm / 160 mm × 1600 px = 31.75 px
    // (1 pt = 1/72 in; common practice, no source).
    let r = common::planewise(&[
        "mohr",
        "--stress",
        "xx=100",
        "--out",
        out.to_str().unwrap(),
        "--size",
        "1600x1200",
        "--print-width",
        "16cm",
        "--font-size",
        "9pt",
    ]);
    assert!(r.status.success(), "{}", String::from_utf8_lossy(&r.stderr));
    let svg = std::fs::read_to_string(&out).unwrap();
    assert!(svg.contains(r#"font-size="31.75""#), "no 31.75 px text");
    // The defaults give at least 8 pt at 16 cm: 8 × 25.4/72/160 × 1600 = 28.2 px or more.
    let r = common::planewise(&[
        "figure",
        "--stress",
        "xx=100",
        "--out",
        out.to_str().unwrap(),
        "--size",
        "1600x1200",
    ]);
    assert!(r.status.success());
    let svg = std::fs::read_to_string(&out).unwrap();
    let sizes: Vec<f32> = svg
        .split(r#"font-size=""#)
        .skip(1)
        .filter_map(|t| t.split('"').next()?.parse().ok())
        .collect();
    let labels = sizes.iter().copied().fold(0.0_f32, f32::max);
    assert!(
        labels >= 28.2,
        "largest text {labels} px is below 8 pt at 16 cm"
    );
    common::assert_bad_input(
        "figure",
        &[
            (
                &["--stress", "xx=1", "--out", "f.svg", "--print-width", "16"],
                "--print-width",
            ),
            (
                &["--stress", "xx=1", "--out", "f.svg", "--font-size", "9"],
                "--font-size",
            ),
        ],
    );
    let _ = std::fs::remove_dir_all(&dir);
}

#[test]
fn the_map_colours_a_range_the_user_gives() {
    let dir = std::env::temp_dir().join(format!("planewise-range-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let out = dir.join("m.svg");
    let r = common::planewise(&[
        "map",
        "--stress",
        "xx=120,yy=-35,xy=48",
        "--measure",
        "shear",
        "--range",
        "0,50",
        "--out",
        out.to_str().unwrap(),
    ]);
    assert!(r.status.success(), "{}", String::from_utf8_lossy(&r.stderr));
    let svg = std::fs::read_to_string(&out).unwrap();
    assert!(
        svg.contains("colours span 0 MPa to 50 MPa"),
        "range not stated"
    );
    common::assert_bad_input(
        "map",
        &[(
            &[
                "--stress",
                "xx=1",
                "--measure",
                "shear",
                "--range",
                "5,1",
                "--out",
                "m.svg",
            ],
            "--range",
        )],
    );
    let _ = std::fs::remove_dir_all(&dir);
}

#[test]
fn the_title_block_states_the_inputs_below_the_picture() {
    let dir = std::env::temp_dir().join(format!("planewise-title-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let out = dir.join("t.svg");
    for sub in ["figure", "map", "mohr"] {
        let r = common::planewise(&[
            sub,
            "--project",
            "assets/demo-bracket-project.json",
            "--case",
            "ULS 1",
            "--title",
            "Check <A> & B",
            "--size",
            "1600x1200",
            "--out",
            out.to_str().unwrap(),
        ]);
        assert!(
            r.status.success(),
            "{sub}: {}",
            String::from_utf8_lossy(&r.stderr)
        );
        let svg = std::fs::read_to_string(&out).unwrap();
        // The requested size is kept; the block's text is escaped and complete.
        assert!(
            svg.contains(r#"width="1600" height="1200""#),
            "{sub}: size changed"
        );
        assert!(
            svg.contains(">Check &lt;A&gt; &amp; B</text>"),
            "{sub}: title"
        );
        assert!(
            svg.contains("Project: Demo (invented scenario)"),
            "{sub}: project"
        );
        assert!(
            svg.contains("Stress (MPa, tension-positive): σxx = 133.8"),
            "{sub}: tensor"
        );
        assert!(
            svg.contains(&format!("Planewise {}", env!("CARGO_PKG_VERSION"))),
            "{sub}"
        );
    }
    let _ = std::fs::remove_dir_all(&dir);
}

#[test]
fn the_map_states_the_cut_plane_value_and_the_worst_value() {
    // Uniaxial tension 100 MPa: the x face carries no shear; the worst shear is 50 MPa on the
    // 45° planes (common practice, no source).
    let dir = std::env::temp_dir().join(format!("planewise-mapvalues-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let out = dir.join("m.svg");
    let r = common::planewise(&[
        "map",
        "--stress",
        "xx=100",
        "--normal",
        "1,0,0",
        "--measure",
        "shear",
        "--out",
        out.to_str().unwrap(),
    ]);
    assert!(r.status.success(), "{}", String::from_utf8_lossy(&r.stderr));
    let svg = std::fs::read_to_string(&out).unwrap();
    assert!(
        svg.contains("● cut plane: 0 MPa"),
        "cut plane value missing"
    );
    assert!(
        svg.contains("▲ worst planes (line: their cone): 50 MPa"),
        "worst value missing"
    );
    let _ = std::fs::remove_dir_all(&dir);
}

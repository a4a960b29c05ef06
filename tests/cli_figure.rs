//! `planewise figure` from outside: files written with no window, and bad input.

#![allow(
    clippy::unwrap_used,
    reason = "a test helper that fails should panic loudly"
)]

mod common;

use std::process::{Command, Output};

fn planewise(args: &[&str]) -> Output {
    Command::new(env!("CARGO_BIN_EXE_planewise"))
        .args(args)
        .output()
        .unwrap()
}

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

//! The inputs engineers start from, against hand rotations, textbook rosette formulas and round
//! trips through the analysis.

#![allow(
    clippy::unwrap_used,
    reason = "a test that cannot compute its reference should panic loudly"
)]

use planewise::mechanics::inputs::{self, InputError, Rosette};
use planewise::mechanics::{Analysis, SignConvention};
use proptest::prelude::*;

const MPA: f64 = 1e6;

fn close(a: f64, b: f64, tol: f64, what: &str) {
    assert!((a - b).abs() <= tol, "{what}: {a} vs {b}");
}

#[test]
fn in_situ_stresses_match_a_hand_rotation() {
    // Sv = 50, SHmax = 40 at N30°E, Shmin = 30 MPa (compression positive). By hand, with
    // h = (sin 30°, cos 30°, 0) and k = (cos 30°, −sin 30°, 0), tension positive:
    // σxx = −(40 sin² 30° + 30 cos² 30°) = −32.5, σyy = −(40 cos² 30° + 30 sin² 30°) = −37.5,
    // σxy = −(40 − 30) sin 30° cos 30° = −4.330127…, σzz = −50 MPa.
    let t = inputs::in_situ(50.0 * MPA, 40.0 * MPA, 30.0 * MPA, 30.0).unwrap();
    let c = t.components_pa().map(|v| v / MPA);
    close(c[0], -32.5, 1e-12, "σxx");
    close(c[1], -37.5, 1e-12, "σyy");
    close(c[2], -50.0, 1e-12, "σzz");
    close(c[3], -10.0 * 0.5 * 3.0_f64.sqrt() / 2.0, 1e-12, "σxy");
    close(c[4], 0.0, 1e-12, "σyz");
    close(c[5], 0.0, 1e-12, "σzx");
    // Compression positive, σ1 = Sv is vertical and σ2 = SHmax points N30°E.
    let a = Analysis::new(&t, SignConvention::CompressionPositive);
    close(a.principal.values_pa[0] / MPA, 50.0, 1e-9, "σ1");
    assert!((a.principal.directions[0].z.abs() - 1.0).abs() < 1e-9);
    let h = a.principal.directions[1];
    let trend = h.x.atan2(h.y).to_degrees().rem_euclid(180.0);
    close(trend, 30.0, 1e-9, "SHmax azimuth");
}

#[test]
fn principal_axes_refuse_non_perpendicular_axes_and_say_by_how_much() {
    let e = inputs::principal_axes([3.0, 2.0, 1.0], 1.0, (0.0, 0.0), (89.0, 0.0)).unwrap_err();
    assert_eq!(
        e,
        InputError::NotPerpendicular(89.0_f64.to_radians().cos().acos().to_degrees())
    );
    assert!(e.to_string().contains("89.00°"), "{e}");
    // Within 0.5° they are squared up.
    assert!(inputs::principal_axes([3.0, 2.0, 1.0], 1.0, (0.0, 0.0), (90.3, 0.0)).is_ok());
    assert_eq!(
        inputs::principal_axes([1.0, 2.0, 3.0], 1.0, (0.0, 0.0), (90.0, 0.0)).unwrap_err(),
        InputError::Order
    );
    assert!(matches!(
        inputs::principal_axes([3.0, 2.0, 1.0], 1.0, (0.0, 95.0), (90.0, 0.0)),
        Err(InputError::Plunge(_))
    ));
}

proptest! {
    /// Principal values and axes in, the same principal values and axes out of the analysis.
    #[test]
    fn principal_axes_round_trip_through_the_analysis(
        v in prop::array::uniform3(-200.0..200.0_f64),
        trend in 0.0..360.0_f64,
        plunge in 0.0..90.0_f64,
        spin in 0.0..360.0_f64,
        compression in any::<bool>(),
    ) {
        let mut v = v;
        v.sort_by(|a, b| b.total_cmp(a));
        prop_assume!(v[0] - v[1] > 1.0 && v[1] - v[2] > 1.0);
        let values = v.map(|x| x * MPA);
        // A σ3 axis perpendicular to σ1: rotate the horizontal perpendicular by `spin` about n1.
        let n1 = inputs::axis(trend, plunge).unwrap();
        let (u, w) = planewise::mechanics::principal::orthogonal_complement(&n1);
        let s = spin.to_radians();
        let mut n3 = u * s.cos() + w * s.sin();
        if n3.z > 0.0 {
            n3 = -n3; // a downward line
        }
        let t3 = n3.x.atan2(n3.y).to_degrees().rem_euclid(360.0);
        let p3 = (-n3.z).clamp(-1.0, 1.0).asin().to_degrees();
        let (sign, convention) = if compression {
            (-1.0, SignConvention::CompressionPositive)
        } else {
            (1.0, SignConvention::TensionPositive)
        };
        let t = inputs::principal_axes(values, sign, (trend, plunge), (t3, p3)).unwrap();
        let a = Analysis::new(&t, convention);
        for i in 0..3 {
            prop_assert!((a.principal.values_pa[i] - values[i]).abs() < 1e-9 * 200.0 * MPA);
        }
        prop_assert!((a.principal.directions[0].dot(&n1).abs() - 1.0).abs() < 1e-9);
        prop_assert!((a.principal.directions[2].dot(&n3).abs() - 1.0).abs() < 1e-9);
    }

    /// The readings a rosette's stress would give are the readings it was made from.
    #[test]
    fn rosette_round_trips(
        strains in prop::array::uniform3(-2000.0..2000.0_f64),
        delta in any::<bool>(),
        e in 50.0..250.0_f64,
        nu in 0.0..0.49_f64,
    ) {
        let r = Rosette {
            angles_deg: if delta { [0.0, 60.0, 120.0] } else { [0.0, 45.0, 90.0] },
            strains: strains.map(|x| x * 1e-6),
            modulus_pa: e * 1e9,
            poisson: nu,
        };
        let s = r.solve().unwrap();
        let back = r.readings(&s.stress);
        for (b, want) in back.iter().zip(r.strains) {
            prop_assert!((b - want).abs() < 1e-12, "{back:?} vs {:?}", r.strains);
        }
    }
}

#[test]
fn rosettes_follow_the_textbook_formulas() {
    // Rectangular rosette (0°, 45°, 90°): εx = εa, εy = εc, γxy = 2εb − εa − εc; delta rosette
    // (0°, 60°, 120°): εy = (2εb + 2εc − εa)/3, γxy = 2(εb − εc)/√3 (e.g. Hibbeler, Mechanics of
    // Materials, §10.5; formulas recalled and confirmed by the transformation equation).
    let r = Rosette {
        angles_deg: [0.0, 45.0, 90.0],
        strains: [770e-6, 1180e-6, -350e-6],
        modulus_pa: 70e9,
        poisson: 0.33,
    };
    let s = r.solve().unwrap();
    close(s.strains[0], 770e-6, 1e-15, "εx");
    close(s.strains[1], -350e-6, 1e-15, "εy");
    close(s.strains[2], 2.0 * 1180e-6 - 770e-6 + 350e-6, 1e-15, "γxy");
    // Plane-stress Hooke's law by hand: σx = E(εx + ν εy)/(1 − ν²).
    let k = 70e9 / (1.0 - 0.33 * 0.33);
    let c = s.stress.components_pa();
    close(c[0], k * (770e-6 - 0.33 * 350e-6), 1e-3, "σx");
    close(c[1], k * (-350e-6 + 0.33 * 770e-6), 1e-3, "σy");
    close(c[3], 70e9 / (2.0 * 1.33) * s.strains[2], 1e-3, "τxy");
    assert_eq!([c[2], c[4], c[5]], [0.0, 0.0, 0.0]);
    // Principal strains: centre ± radius of Mohr's circle of strain.
    let (ex, ey, half): (f64, f64, f64) = (770e-6, -350e-6, 0.5 * s.strains[2]);
    let radius = (0.5 * (ex - ey)).hypot(half);
    close(s.principal[0], 0.5 * (ex + ey) + radius, 1e-15, "ε1");
    close(
        s.angle_deg.unwrap(),
        0.5 * (2.0 * half).atan2(ex - ey).to_degrees(),
        1e-12,
        "θp",
    );

    let d = Rosette {
        angles_deg: [0.0, 60.0, 120.0],
        strains: [300e-6, 500e-6, -100e-6],
        ..r
    };
    let s = d.solve().unwrap();
    close(
        s.strains[1],
        (2.0 * 500e-6 + 2.0 * -100e-6 - 300e-6) / 3.0,
        1e-15,
        "εy delta",
    );
    close(
        s.strains[2],
        2.0 * (500e-6 + 100e-6) / 3.0_f64.sqrt(),
        1e-15,
        "γxy delta",
    );

    // Equal readings: every direction alike, the principal angle is undefined, never NaN.
    let same = Rosette {
        strains: [100e-6; 3],
        ..r
    };
    assert_eq!(same.solve().unwrap().angle_deg, None);
    // Bad rosettes.
    for (bad, want) in [
        (
            Rosette {
                angles_deg: [0.0, 45.0, 45.0],
                ..r
            },
            "gauge angles",
        ),
        (
            Rosette {
                angles_deg: [0.0, 180.0, 90.0],
                ..r
            },
            "gauge angles",
        ),
        (Rosette { poisson: 0.5, ..r }, "Poisson"),
        (
            Rosette {
                modulus_pa: 0.0,
                ..r
            },
            "modulus",
        ),
    ] {
        let e = bad.solve().unwrap_err().to_string();
        assert!(e.contains(want), "{e}");
    }
}

mod common;

fn json(args: &[&str]) -> serde_json::Value {
    let out = common::planewise(args);
    assert!(
        out.status.success(),
        "{args:?}: {}",
        String::from_utf8_lossy(&out.stderr)
    );
    serde_json::from_slice(&out.stdout).unwrap()
}

#[test]
fn the_command_line_takes_each_input() {
    // In-situ: σ1 (compression positive) is Sv.
    let j = json(&[
        "analyze",
        "--in-situ",
        "sv=50,shmax=40,shmin=30,azimuth=30",
        "--compression-positive",
        "--json",
    ]);
    close(
        j["principal"]["values"][0].as_f64().unwrap(),
        50.0,
        1e-9,
        "σ1",
    );
    close(j["stress"]["xx"].as_f64().unwrap(), 32.5, 1e-9, "σxx");
    // Principal values and axes come back out of analyze.
    let j = json(&[
        "analyze",
        "--principal",
        "s1=100,s2=50,s3=10",
        "--axes",
        "1=30/0,3=120/0",
        "--json",
    ]);
    let v: Vec<f64> = j["principal"]["values"]
        .as_array()
        .unwrap()
        .iter()
        .map(|x| x.as_f64().unwrap())
        .collect();
    assert_eq!(v, vec![100.0, 50.0, 10.0]);
    let n1 = &j["principal"]["directions"][0];
    close(n1[0].as_f64().unwrap().abs(), 0.5, 1e-12, "n1 east");
    // A rosette: the readings come back from the stress (round trip through the JSON).
    let j = json(&[
        "rosette",
        "--angles",
        "0,45,90",
        "--strains",
        "770,1180,-350",
        "--modulus",
        "70GPa",
        "--poisson",
        "0.33",
        "--json",
    ]);
    close(j["gamma_xy"].as_f64().unwrap(), 1940.0, 1e-9, "γxy");
    let sx = j["stress"]["stress"]["xx"].as_f64().unwrap() * 1e6;
    let sy = j["stress"]["stress"]["yy"].as_f64().unwrap() * 1e6;
    let txy = j["stress"]["stress"]["xy"].as_f64().unwrap() * 1e6;
    let r = Rosette {
        angles_deg: [0.0, 45.0, 90.0],
        strains: [770e-6, 1180e-6, -350e-6],
        modulus_pa: 70e9,
        poisson: 0.33,
    };
    let t = planewise::mechanics::StressTensor::from_pa([sx, sy, 0.0, txy, 0.0, 0.0]).unwrap();
    for (got, want) in r.readings(&t).iter().zip(r.strains) {
        close(*got, want, 1e-12, "reading");
    }
    // Equal readings: the angle is null, never NaN.
    let j = json(&[
        "rosette",
        "--strains",
        "100,100,100",
        "--modulus",
        "200GPa",
        "--poisson",
        "0.3",
        "--json",
    ]);
    assert!(j["principal_angle_deg"].is_null());
}

#[test]
fn bad_inputs_exit_2_with_one_line() {
    common::assert_bad_input(
        "rosette",
        &[
            (&["--strains", "1,2,3", "--poisson", "0.3"], "--modulus"),
            (
                &["--strains", "1,2,3", "--modulus", "70", "--poisson", "0.3"],
                "--modulus",
            ),
            (
                &[
                    "--strains",
                    "1,2,3",
                    "--modulus",
                    "70GPa",
                    "--poisson",
                    "0.5",
                ],
                "--poisson",
            ),
            (
                &[
                    "--angles",
                    "0,45,45",
                    "--strains",
                    "1,2,3",
                    "--modulus",
                    "70GPa",
                    "--poisson",
                    "0.3",
                ],
                "--angles",
            ),
            (
                &["--strains", "1,2", "--modulus", "70GPa", "--poisson", "0.3"],
                "--strains",
            ),
        ],
    );
    common::assert_bad_input(
        "analyze",
        &[
            (
                &["--principal", "s1=3,s2=2,s3=1", "--axes", "1=0/0,3=80/0"],
                "--axes",
            ),
            (&["--principal", "s1=3,s2=2,s3=1"], "--axes"),
            (&["--in-situ", "sv=1,shmax=2"], "--in-situ"),
            (
                &[
                    "--in-situ",
                    "sv=1,shmax=2,shmin=1,azimuth=0",
                    "--stress",
                    "xx=1",
                ],
                "--stress",
            ),
            (
                &["--principal", "s1=1,s2=2,s3=3", "--axes", "1=0/0,3=90/0"],
                "--principal",
            ),
        ],
    );
}

#[test]
fn plane_stress_shows_the_in_plane_principal_angle() {
    // σx = 80, σy = −40, τxy = 30 MPa: centre 20, radius √(60² + 30²) = 67.082 MPa,
    // θp = ½ atan(2τxy / (σx − σy)) = ½ atan(0.5) = 13.2825° (Mohr's circle by hand).
    let j = json(&["analyze", "--stress", "xx=80,yy=-40,xy=30", "--json"]);
    let p = &j["in_plane"];
    let r = 60.0_f64.hypot(30.0);
    close(p["values"][0].as_f64().unwrap(), 20.0 + r, 1e-9, "σmax");
    close(p["values"][1].as_f64().unwrap(), 20.0 - r, 1e-9, "σmin");
    close(
        p["angle_deg"].as_f64().unwrap(),
        0.5 * 0.5_f64.atan().to_degrees(),
        1e-9,
        "θp",
    );
    // Not plane stress: no in-plane block.
    let j = json(&["analyze", "--stress", "xx=80,zz=1", "--json"]);
    assert!(j.get("in_plane").is_none());
}

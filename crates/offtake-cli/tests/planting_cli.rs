//! End-to-end tests of `offtake planting` on a small generated weather file
//! (invented weather, labelled so), written in each test's temporary folder.
#![allow(clippy::unwrap_used, missing_docs)]

use std::fmt::Write as _;
use std::path::{Path, PathBuf};
use std::process::{Command, Output};

const HEADER: &str = "date,et0_mm,kc,etc_mm,etc_adj_mm,rain_mm,peff_mm,irrigation_mm,runoff_mm,deep_perc_mm,depletion_mm,taw_mm,raw_mm,ks";

/// Two years of invented daily weather from 1 Jan 2003 (2004 is a leap year).
fn write_weather(dir: &Path) -> PathBuf {
    let mut s = String::from("date,tmax_c,tmin_c,rhmax_pct,rhmin_pct,wind_ms,solar_mj,rain_mm\n");
    let mut date = chrono::NaiveDate::from_ymd_opt(2003, 1, 1).unwrap();
    for i in 0..731 {
        let phase = 2.0 * std::f64::consts::PI * (f64::from(i % 365) - 100.0) / 365.0;
        let tmax = 27.0 + 7.0 * phase.sin();
        let tmin = 13.0 + 5.0 * phase.sin();
        let solar = 19.0 + 7.0 * phase.sin();
        let rain = if i % 9 == 0 { 14.0 } else { 0.0 };
        writeln!(
            s,
            "{date},{tmax:.1},{tmin:.1},85,{:.0},2.4,{solar:.1},{rain:.1}",
            35.0 - 10.0 * phase.sin()
        )
        .unwrap();
        date = date.succ_opt().unwrap();
    }
    let path = dir.join("w.csv");
    std::fs::write(&path, s).unwrap();
    path
}

fn offtake(args: &[&str]) -> Output {
    Command::new(env!("CARGO_BIN_EXE_offtake"))
        .args(args)
        .output()
        .unwrap()
}

#[test]
fn planting_writes_the_daily_table_and_season_totals() {
    let dir = tempfile::tempdir().unwrap();
    let w = write_weather(dir.path());
    let out = dir.path().join("daily.csv");
    let o = offtake(&[
        "planting",
        "--weather",
        w.to_str().unwrap(),
        "--lat",
        "-15.5",
        "--elevation",
        "600",
        "--crop",
        "maize-grain",
        "--plant",
        "2003-11-20",
        "--every-year",
        "--out",
        out.to_str().unwrap(),
    ]);
    let stdout = String::from_utf8_lossy(&o.stdout);
    let stderr = String::from_utf8_lossy(&o.stderr);
    assert!(o.status.success(), "{stderr}");
    // 2003 season crosses 31 December and is complete; 2002's ran into the
    // record start and 2004's past its end: both flagged.
    assert!(stdout.contains("2003-11-20 to 2004-04-17"), "{stdout}");
    assert_eq!(
        stdout.matches("excluded from statistics").count(),
        2,
        "{stdout}"
    );
    assert!(stdout.contains("mm"));
    let csv = std::fs::read_to_string(&out).unwrap();
    let mut lines = csv.lines();
    let header = lines.next().unwrap();
    assert!(header.starts_with(HEADER), "{header}");
    assert_eq!(header, format!("{HEADER},season"));
    let mut rows = 0;
    let mut irrigation = 0.0;
    for line in lines {
        let cells: Vec<&str> = line.split(',').collect();
        assert_eq!(cells.len(), 15, "{line}");
        chrono::NaiveDate::parse_from_str(cells[0], "%Y-%m-%d").unwrap();
        for c in &cells[1..] {
            let v: f64 = c.parse().unwrap();
            assert!(v.is_finite(), "{line}");
        }
        irrigation += cells[7].parse::<f64>().unwrap();
        rows += 1;
    }
    assert!(rows > 150);
    assert!(irrigation > 0.0);
}

#[test]
fn single_season_without_every_year() {
    let dir = tempfile::tempdir().unwrap();
    let w = write_weather(dir.path());
    let o = offtake(&[
        "planting",
        "--weather",
        w.to_str().unwrap(),
        "--lat",
        "30",
        "--elevation",
        "100",
        "--wind-height",
        "10",
        "--crop",
        "wheat-spring",
        "--plant",
        "2004-02-01",
        "--strategy",
        "rainfed",
        "--soil",
        "clay",
    ]);
    let stdout = String::from_utf8_lossy(&o.stdout);
    assert!(o.status.success(), "{}", String::from_utf8_lossy(&o.stderr));
    assert_eq!(stdout.matches("2004-02-01 to").count(), 1, "{stdout}");
    assert!(!stdout.contains("2003-02-01"));
}

#[test]
fn unknown_crop_lists_the_valid_ids() {
    let dir = tempfile::tempdir().unwrap();
    let w = write_weather(dir.path());
    let o = offtake(&[
        "planting",
        "--weather",
        w.to_str().unwrap(),
        "--lat",
        "10",
        "--elevation",
        "0",
        "--crop",
        "mango-x",
        "--plant",
        "2003-05-01",
    ]);
    assert!(!o.status.success());
    let stderr = String::from_utf8_lossy(&o.stderr);
    assert!(stderr.contains("mango-x"), "{stderr}");
    assert!(
        stderr.contains("maize-grain") && stderr.contains("sugarcane"),
        "{stderr}"
    );
}

#[test]
fn bad_planting_date_is_an_error() {
    let dir = tempfile::tempdir().unwrap();
    let w = write_weather(dir.path());
    for bad in ["2003-02-30", "20030501", "2003-13-01"] {
        let o = offtake(&[
            "planting",
            "--weather",
            w.to_str().unwrap(),
            "--lat",
            "10",
            "--elevation",
            "0",
            "--crop",
            "maize-grain",
            "--plant",
            bad,
        ]);
        assert!(!o.status.success());
        let stderr = String::from_utf8_lossy(&o.stderr);
        assert!(
            stderr.contains("--plant") && stderr.contains(bad),
            "{stderr}"
        );
        assert!(stderr.contains("YYYY-MM-DD"), "{stderr}");
    }
}

#[test]
fn blank_rain_is_taken_as_zero_with_a_positioned_warning() {
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("gap.csv");
    std::fs::write(
        &path,
        "date,tmax_c,tmin_c,rain_mm\n2003-01-01,30,15,0\n2003-01-02,31,16,\n",
    )
    .unwrap();
    let o = offtake(&[
        "planting",
        "--weather",
        path.to_str().unwrap(),
        "--lat",
        "10",
        "--elevation",
        "0",
        "--crop",
        "maize-grain",
        "--plant",
        "2003-01-01",
    ]);
    let stderr = String::from_utf8_lossy(&o.stderr);
    assert!(o.status.success(), "{stderr}");
    assert!(
        stderr.contains("gap.csv:3:1: warning: rain_mm blank on 2003-01-02, taken as 0 mm"),
        "{stderr}"
    );
}

#[test]
fn dual_kc_appends_kcb_and_ke_columns() {
    let dir = tempfile::tempdir().unwrap();
    let w = write_weather(dir.path());
    let daily = |extra: &[&str], name: &str| {
        let out = dir.path().join(name);
        let mut args = vec![
            "planting",
            "--weather",
            w.to_str().unwrap(),
            "--lat",
            "-15.5",
            "--elevation",
            "600",
            "--crop",
            "tomato",
            "--plant",
            "2003-03-01",
            "--out",
            out.to_str().unwrap(),
        ];
        args.extend_from_slice(extra);
        let o = offtake(&args);
        assert!(o.status.success(), "{}", String::from_utf8_lossy(&o.stderr));
        (
            String::from_utf8_lossy(&o.stdout).into_owned(),
            std::fs::read_to_string(&out).unwrap(),
        )
    };
    let (stdout, csv) = daily(&["--dual-kc", "--wetting", "drip"], "dual.csv");
    assert!(
        stdout.contains("dual crop coefficient (wetting drip, fw 0.35)"),
        "{stdout}"
    );
    assert!(stdout.contains("soil evaporation"), "{stdout}");
    let mut lines = csv.lines();
    assert_eq!(lines.next().unwrap(), format!("{HEADER},season,kcb,ke"));
    let mut rows = 0;
    let mut ke_positive = 0;
    for line in lines {
        let f: Vec<&str> = line.split(',').collect();
        assert_eq!(f.len(), 17, "{line}");
        let kc: f64 = f[2].parse().unwrap();
        let kcb: f64 = f[15].parse().unwrap();
        let ke: f64 = f[16].parse().unwrap();
        // Kc = Kcb + Ke (FAO-56 eq. 69), to the printed 4 decimals.
        assert!((kc - (kcb + ke)).abs() <= 2e-4, "{line}");
        assert!((0.0..=1.4).contains(&kcb) && ke >= 0.0, "{line}");
        if ke > 0.0 {
            ke_positive += 1;
        }
        rows += 1;
    }
    assert!(
        rows > 100 && ke_positive > 10,
        "{rows} rows, {ke_positive} with Ke > 0"
    );

    // Without --dual-kc the table keeps its columns and the Kc curve.
    let (stdout, single) = daily(&[], "single.csv");
    assert!(!stdout.contains("dual crop coefficient"));
    assert_eq!(single.lines().next().unwrap(), format!("{HEADER},season"));
    assert_eq!(single.lines().count(), csv.lines().count());
    // Sprinkler wets all the surface: more soil evaporation than drip.
    let (_, sprinkler) = daily(&["--dual-kc", "--wetting", "sprinkler"], "sprinkler.csv");
    let sum_ke = |t: &str| -> f64 {
        t.lines()
            .skip(1)
            .map(|l| l.split(',').nth(16).unwrap().parse::<f64>().unwrap())
            .sum()
    };
    assert!(sum_ke(&sprinkler) > sum_ke(&csv));
}

#[test]
fn bad_wetting_is_an_error() {
    let dir = tempfile::tempdir().unwrap();
    let w = write_weather(dir.path());
    let base = [
        "planting",
        "--weather",
        w.to_str().unwrap(),
        "--lat",
        "-15.5",
        "--elevation",
        "600",
        "--crop",
        "tomato",
        "--plant",
        "2003-03-01",
    ];
    let mut args = base.to_vec();
    args.extend_from_slice(&["--dual-kc", "--wetting", "bucket"]);
    let o = offtake(&args);
    assert!(!o.status.success());
    let stderr = String::from_utf8_lossy(&o.stderr);
    assert!(
        stderr.contains("--wetting") && stderr.contains("bucket"),
        "{stderr}"
    );
    // --wetting also sets Kc ini's fw (FAO-56 eq. 60-61) without --dual-kc,
    // and a bad name is refused there too.
    let mut args = base.to_vec();
    args.extend_from_slice(&["--wetting", "bucket"]);
    let o = offtake(&args);
    assert!(!o.status.success());
    assert!(String::from_utf8_lossy(&o.stderr).contains("bucket"));
}

#[test]
fn a_mediterranean_winter_wheat_at_18_degrees_north_warns() {
    // FAO-56 Table 11: winter wheat, November, Mediterranean, 240 days; the
    // station at 18° N lies far outside the Mediterranean latitudes.
    let dir = tempfile::tempdir().unwrap();
    let w = write_weather(dir.path());
    let args = |crop: &'static str, lat: &'static str| {
        offtake(&[
            "planting",
            "--weather",
            w.to_str().unwrap(),
            "--lat",
            lat,
            "--elevation",
            "350",
            "--crop",
            crop,
            "--plant",
            "2003-11-01",
        ])
    };
    let o = args("wheat-winter", "18");
    assert!(o.status.success(), "{}", String::from_utf8_lossy(&o.stderr));
    let err = String::from_utf8_lossy(&o.stderr);
    assert!(
        err.contains("season plausibility: crop wheat-winter") && err.contains("18.0° N"),
        "{err}"
    );
    // At 38° N (inside the Mediterranean band) it does not.
    let o = args("wheat-winter", "38");
    assert!(!String::from_utf8_lossy(&o.stderr).contains("season plausibility"));
}

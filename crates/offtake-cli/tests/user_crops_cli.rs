//! `offtake run` computes with the project's own crops
//! (`Project::user_crops`), which replace or extend the built-in library.
//! The scheme is the invented demo scheme.

#![allow(clippy::unwrap_used, clippy::expect_used)]

use std::path::{Path, PathBuf};
use std::process::Command;

use offtake_io::library::Libraries;
use offtake_io::project_file::{load_project, save_project};

const DEMO_DIR: &str = concat!(
    env!("CARGO_MANIFEST_DIR"),
    "/../../demo-projects/demo-scheme"
);

/// Runs `offtake run` on `project` saved in `dir`; returns the headworks row
/// of design_values.csv: (design flow l/s, seasonal volume m³).
fn headworks(dir: &Path, project: &offtake_core::project::Project) -> (f64, f64) {
    let file = dir.join("scheme.ron");
    save_project(&file, project).unwrap();
    let out_dir = dir.join("results");
    let out = Command::new(env!("CARGO_BIN_EXE_offtake"))
        .arg("run")
        .arg(&file)
        .arg("--out")
        .arg(&out_dir)
        .output()
        .unwrap();
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let text = std::fs::read_to_string(out_dir.join("design_values.csv")).unwrap();
    let row: Vec<String> = text
        .lines()
        .map(|l| l.split(',').map(str::to_owned).collect::<Vec<_>>())
        .find(|r| r[0] == "headworks")
        .unwrap();
    (row[2].parse().unwrap(), row[8].parse().unwrap())
}

#[test]
fn run_uses_a_projects_own_copy_of_maize() {
    let demo = PathBuf::from(DEMO_DIR);
    let mut project = load_project(&demo.join("scheme.ron")).unwrap();
    // The copies live in a temp folder: point at the demo weather absolutely.
    project.weather.path = demo
        .join(&project.weather.path)
        .canonicalize()
        .unwrap()
        .display()
        .to_string();
    let base_dir = tempfile::tempdir().unwrap();
    let (base_flow, base_volume) = headworks(base_dir.path(), &project);

    // A copied maize with a higher Kc mid under a new id, and the maize
    // plantings pointed at it.
    let libs = Libraries::builtin().unwrap();
    let mut mine = libs.crop("maize-grain").unwrap().clone();
    mine.id = "maize-grain-mine".into();
    mine.kc.mid = 1.6;
    project.user_crops.push(mine);
    let mut moved = 0;
    for p in &mut project.plantings {
        if p.crop == "maize-grain" {
            p.crop = "maize-grain-mine".into();
            moved += 1;
        }
    }
    assert!(moved > 0);
    let mine_dir = tempfile::tempdir().unwrap();
    let (flow, volume) = headworks(mine_dir.path(), &project);
    assert!(volume > base_volume, "{volume} vs {base_volume}");
    assert!(flow > base_flow, "{flow} vs {base_flow}");

    // Without the own crop the new id is unknown: the run refuses it.
    project.user_crops.clear();
    let file = mine_dir.path().join("scheme.ron");
    save_project(&file, &project).unwrap();
    let out = Command::new(env!("CARGO_BIN_EXE_offtake"))
        .arg("run")
        .arg(&file)
        .arg("--out")
        .arg(mine_dir.path().join("r2"))
        .output()
        .unwrap();
    assert!(!out.status.success());
}

//! Project files with the project's own crops and soils
//! (`Project::user_crops`, `user_soils`), and files without them.
#![allow(clippy::unwrap_used)]

use std::path::{Path, PathBuf};

use offtake_io::library::Libraries;
use offtake_io::project_file::{load_project, project_to_string, save_project};

fn corpus(name: &str) -> PathBuf {
    Path::new(concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/../../tests/project-files"
    ))
    .join(name)
}

#[test]
fn a_project_file_with_own_crops_and_soils_loads() {
    let p = load_project(&corpus("user-library.ron")).unwrap();
    assert_eq!(p.user_crops.len(), 1);
    assert_eq!(p.user_crops[0].id, "maize-grain-mine");
    assert!((p.user_crops[0].kc.mid - 1.05).abs() < 1e-12);
    assert_eq!(p.user_soils.len(), 1);
    assert_eq!(p.user_soils[0].id, "loam-mine");
    p.user_crops[0].validate().unwrap();
    p.user_soils[0].validate().unwrap();
    // Saving and loading again keeps them.
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("again.ron");
    save_project(&path, &p).unwrap();
    assert_eq!(load_project(&path).unwrap(), p);
}

#[test]
fn files_without_own_entries_still_load_and_are_written_unchanged() {
    for name in ["minimal.ron", "schema1.ron", "schema0.ron"] {
        let p = load_project(&corpus(name)).unwrap();
        assert!(p.user_crops.is_empty() && p.user_soils.is_empty(), "{name}");
        // The empty lists are not written: such files keep their old layout.
        assert!(!project_to_string(&p).unwrap().contains("user_"), "{name}");
    }
    let demo = Path::new(concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/../../demo-projects/demo-scheme/scheme.ron"
    ));
    assert!(load_project(demo).unwrap().user_crops.is_empty());
}

#[test]
fn own_entries_replace_library_entries_with_the_same_id_and_add_new_ones() {
    let libs = Libraries::builtin().unwrap();
    let p = load_project(&corpus("user-library.ron")).unwrap();
    let mut replacing = p.user_crops[0].clone();
    replacing.id = "maize-grain".into();
    replacing.kc.mid = 0.9;
    let merged = libs.overlaid(&[replacing, p.user_crops[0].clone()], &p.user_soils);
    assert_eq!(merged.crops.len(), libs.crops.len() + 1);
    assert!((merged.crop("maize-grain").unwrap().kc.mid - 0.9).abs() < 1e-12);
    assert!(merged.crop("maize-grain-mine").is_some());
    assert!(merged.soil("loam-mine").is_some());
    let for_project = libs.for_project(&p);
    assert!(for_project.crop("maize-grain-mine").is_some());
    assert_eq!(for_project.soils.len(), libs.soils.len() + 1);
}

//! Loading the built-in crop and soil libraries and reporting bad files.
#![allow(clippy::unwrap_used)]

use offtake_core::crop::{CycleKind, Provenance};
use offtake_io::library::{
    Libraries, LibraryError, builtin_crops, builtin_soils, parse_crops, parse_soils,
};

const REQUIRED_CROPS: [&str; 14] = [
    "maize-grain",
    "wheat-spring",
    "wheat-winter",
    "rice-paddy",
    "cotton",
    "potato",
    "tomato",
    "sugarcane",
    "alfalfa-hay",
    "sorghum-grain",
    "soybean",
    "dry-bean",
    "onion-dry",
    "sugar-beet",
];

const REQUIRED_SOILS: [&str; 9] = [
    "sand",
    "loamy-sand",
    "sandy-loam",
    "loam",
    "silt-loam",
    "silt",
    "silty-clay-loam",
    "silty-clay",
    "clay",
];

#[test]
fn builtin_crop_library_has_required_ids_and_sources() {
    let crops = builtin_crops().unwrap();
    assert!(
        crops.len() >= 25,
        "at least 25 crops, found {}",
        crops.len()
    );
    for id in REQUIRED_CROPS {
        assert!(crops.iter().any(|c| c.id == id), "missing crop {id}");
    }
    for c in &crops {
        for l in c.stages.as_array() {
            assert!(l > 0, "{}: stage length 0", c.id);
        }
        if let CycleKind::Repeated { later } = c.cycle {
            assert!(later.as_array().iter().all(|&l| l > 0), "{}", c.id);
            assert!(
                c.sources.cycles.is_some(),
                "{}: later cycles need a source",
                c.id
            );
        }
        let s = &c.sources;
        for src in [&s.stages, &s.kc, &s.height, &s.root] {
            assert!(
                src.cite.contains("FAO-56") || src.provenance == Provenance::Assumption,
                "{}: {src:?}",
                c.id
            );
        }
        assert!(
            c.kcb.is_none() || s.kcb.is_some(),
            "{}: kcb without a source",
            c.id
        );
        assert!(
            c.ky_seasonal.is_none() || s.ky.is_some(),
            "{}: ky without a source",
            c.id
        );
        assert!(
            c.salinity.is_none() || s.salinity.is_some(),
            "{}: salinity without a source",
            c.id
        );
    }
}

#[test]
fn library_covers_every_group() {
    use offtake_core::crop::CropGroup;
    let crops = builtin_crops().unwrap();
    for g in [
        CropGroup::FieldCrop,
        CropGroup::Vegetable,
        CropGroup::Fodder,
        CropGroup::OrchardVine,
        CropGroup::PaddyRice,
    ] {
        assert!(crops.iter().any(|c| c.group == g), "no crop in {g:?}");
    }
}

/// Values the shared reference file reads from the printed FAO-56 tables
/// (Tables 11, 12, 22, 23, 24).
#[test]
fn reference_values_of_selected_crops() {
    let libs = Libraries::builtin().unwrap();
    let maize = libs.crop("maize-grain").unwrap();
    assert!((maize.kc.mid - 1.20).abs() < 1e-9); // FAO-56 Table 12 p.110
    assert!((maize.depletion_p - 0.55).abs() < 1e-9); // Table 22 p.163
    assert!((maize.ky_seasonal.unwrap() - 1.25).abs() < 1e-9); // Table 24 p.181
    let beans = libs.crop("dry-bean").unwrap();
    assert_eq!(beans.stages.as_array(), [25, 25, 30, 20]); // Table 11 row used in Example 28
    let sal = beans.salinity.unwrap();
    assert!(
        (sal.ece_threshold_ds_m - 1.0).abs() < 1e-9
            && (sal.slope_b_pct_per_ds_m - 19.0).abs() < 1e-9
    ); // Table 23
    let cane = libs.crop("sugarcane").unwrap();
    assert_eq!(cane.stages.as_array(), [35, 60, 190, 120]); // Table 11, virgin
    match cane.cycle {
        CycleKind::Repeated { later } => assert_eq!(later.as_array(), [25, 70, 135, 50]), // Table 11, ratoon
        other => panic!("sugarcane should have ratoon cycles, found {other:?}"),
    }
}

#[test]
fn builtin_soil_library_has_required_ids_within_table19_ranges() {
    let soils = builtin_soils().unwrap();
    for id in REQUIRED_SOILS {
        assert!(soils.iter().any(|s| s.id == id), "missing soil {id}");
    }
    for s in &soils {
        assert!(s.theta_fc_range.contains(s.theta_fc), "{}", s.id);
        assert!(s.theta_wp_range.contains(s.theta_wp), "{}", s.id);
        assert!(s.rew_range_mm.contains(s.rew_mm), "{}", s.id);
        // TEW from FAO-56 eq. 73 at Ze = 0.10 m falls in the Table 19 (p.144) range.
        assert!(
            s.tew_range_mm.contains(s.tew_mm().unwrap()),
            "{}: TEW {}",
            s.id,
            s.tew_mm().unwrap()
        );
    }
}

#[test]
fn malformed_crop_file_reports_line_and_column() {
    let path = concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/../../tests/malformed/crops-missing-comma.ron"
    );
    let text = std::fs::read_to_string(path).unwrap();
    let err = parse_crops(&text, "crops-missing-comma.ron").unwrap_err();
    match &err {
        LibraryError::Parse { line, column, .. } => {
            assert_eq!(*line, 6, "{err}");
            assert!(*column >= 9, "{err}");
        }
        other => panic!("expected a parse error, found {other:?}"),
    }
    assert!(
        err.to_string().starts_with("crops-missing-comma.ron:6:"),
        "{err}"
    );
}

#[test]
fn invalid_values_and_duplicate_ids_are_reported() {
    let crops = builtin_crops().unwrap();
    let mut one = crops[0].clone();
    one.stages.dev_days = 0;
    let text = ron::to_string(&vec![one]).unwrap();
    assert!(matches!(
        parse_crops(&text, "u.ron"),
        Err(LibraryError::Invalid { .. })
    ));
    let twice = ron::to_string(&vec![crops[0].clone(), crops[0].clone()]).unwrap();
    assert!(matches!(
        parse_crops(&twice, "u.ron"),
        Err(LibraryError::BadId { .. })
    ));
    let soils = builtin_soils().unwrap();
    let mut s = soils[0].clone();
    s.theta_wp = s.theta_fc + 0.01;
    let text = ron::to_string(&vec![s]).unwrap();
    assert!(matches!(
        parse_soils(&text, "s.ron"),
        Err(LibraryError::Invalid { .. })
    ));
}

#[test]
fn user_file_replaces_builtin_entry() {
    let dir = tempfile::tempdir().unwrap();
    let mut maize = builtin_crops()
        .unwrap()
        .into_iter()
        .find(|c| c.id == "maize-grain")
        .unwrap();
    maize.kc.mid = 1.10;
    let mut mine = maize.clone();
    mine.id = "maize-local".into();
    let path = dir.path().join("my-crops.ron");
    std::fs::write(
        &path,
        ron::ser::to_string_pretty(&vec![maize, mine], ron::ser::PrettyConfig::default()).unwrap(),
    )
    .unwrap();
    let libs = Libraries::with_user_files(&[path], &[]).unwrap();
    assert!((libs.crop("maize-grain").unwrap().kc.mid - 1.10).abs() < 1e-12);
    assert!(libs.crop("maize-local").is_some());
    assert_eq!(libs.crops.len(), builtin_crops().unwrap().len() + 1);
    let missing = Libraries::with_user_files(&[dir.path().join("nope.ron")], &[]).unwrap_err();
    assert!(matches!(missing, LibraryError::Io { .. }));
}

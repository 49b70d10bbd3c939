//! The invented demo scheme must be a clean example: it validates without a
//! single problem against the built-in crop library and the invented demo
//! weather record it points to.

use std::path::PathBuf;

use offtake_core::project::ValidationContext;
use offtake_io::library::Libraries;
use offtake_io::project_file::{load_project, weather_path};
use offtake_io::weather::{ImportOptions, import_weather_file};

fn demo_path() -> PathBuf {
    PathBuf::from(concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/../../demo-projects/demo-scheme/scheme.ron"
    ))
}

#[test]
fn demo_scheme_validates_against_library_and_demo_weather() {
    let path = demo_path();
    let project = load_project(&path).expect("demo scheme loads");
    let libraries = Libraries::builtin().expect("built-in libraries load");
    let weather_file = weather_path(&path, &project);
    let series = import_weather_file(&weather_file, &ImportOptions::default())
        .expect("demo weather imports");
    let first = series.days.first().expect("weather has days").date;
    let last = series.days.last().expect("weather has days").date;
    let lengths = |id: &str| libraries.crop(id).map(|c| c.stages.total_days());
    let ctx = ValidationContext {
        crops: &lengths,
        weather_range: Some((first, last)),
    };
    let problems = project.validate(&ctx);
    assert!(
        problems.is_empty(),
        "demo scheme problems:\n{}",
        problems
            .iter()
            .map(ToString::to_string)
            .collect::<Vec<_>>()
            .join("\n")
    );
}

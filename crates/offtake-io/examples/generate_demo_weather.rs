//! Writes the invented demo weather of Offtake's demo projects.
//!
//! ```text
//! cargo run -p offtake-io --example generate_demo_weather -- [OUT.csv] [--seed N]
//! ```
//!
//! Without arguments it rewrites `demo-projects/demo-weather/weather.csv` with
//! the demo seed. The data are INVENTED by the seeded generator
//! `offtake_core::weather_gen` for a fictional station; they describe no real
//! place. The columns are the weather CSV columns of DESIGN.md.

use std::path::PathBuf;
use std::process::ExitCode;

use offtake_core::weather_gen::{GeneratorSettings, generate_invented_weather};

fn cell(value: Option<f64>) -> String {
    value.map_or_else(String::new, |v| format!("{v:.1}"))
}

fn run() -> Result<PathBuf, Box<dyn std::error::Error>> {
    let mut settings = GeneratorSettings::demo();
    let mut out = PathBuf::from(concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/../../demo-projects/demo-weather/weather.csv"
    ));
    let mut args = std::env::args().skip(1);
    while let Some(arg) = args.next() {
        if arg == "--seed" {
            let value = args.next().ok_or("--seed needs a number")?;
            settings.seed = value
                .parse()
                .map_err(|e| format!("--seed {value:?}: {e}; expected a whole number"))?;
        } else {
            out = PathBuf::from(arg);
        }
    }

    let weather = generate_invented_weather(&settings)?;

    // Write next to the target, then rename, so a failed run never leaves a
    // half-written file behind.
    let tmp = out.with_extension("csv.tmp");
    {
        let mut writer = csv::Writer::from_path(&tmp)?;
        writer.write_record([
            "date",
            "tmax_c",
            "tmin_c",
            "rhmax_pct",
            "rhmin_pct",
            "wind_ms",
            "solar_mj",
            "rain_mm",
        ])?;
        for day in &weather.days {
            writer.write_record([
                day.date.format("%Y-%m-%d").to_string(),
                cell(day.tmax_c),
                cell(day.tmin_c),
                cell(day.rhmax_pct),
                cell(day.rhmin_pct),
                cell(day.wind_ms),
                cell(day.solar_mj),
                cell(day.rain_mm),
            ])?;
        }
        writer.flush()?;
    }
    std::fs::rename(&tmp, &out)?;
    for defect in &weather.defects {
        eprintln!(
            "planted {:?} in {} from {} to {}",
            defect.kind, defect.columns, defect.first, defect.last
        );
    }
    Ok(out)
}

fn main() -> ExitCode {
    match run() {
        Ok(path) => {
            eprintln!("wrote {}", path.display());
            ExitCode::SUCCESS
        }
        Err(e) => {
            eprintln!("error: {e}");
            ExitCode::FAILURE
        }
    }
}

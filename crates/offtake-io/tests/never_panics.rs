//! The importer never panics, whatever the bytes: it returns a series or a
//! typed error, and accepted values are always finite.
#![allow(clippy::unwrap_used, clippy::expect_used)]

use offtake_io::weather::{ImportOptions, import_weather_reader};
use proptest::prelude::*;

const GOOD: &str = "date,tmax_c,tmin_c,rhmax_pct,rhmin_pct,wind_ms,solar_mj,rain_mm\n\
2021-03-01,31.2,18.4,82,35,2.1,22.5,0\n\
2021-03-02,32.0,19.1,80,33,2.4,23.0,0\n\
2021-03-03,30.5,18.9,85,40,1.9,19.8,4.2\n";

fn check(bytes: &[u8]) {
    if let Ok(s) = import_weather_reader(bytes, "fuzz.csv", &ImportOptions::default()) {
        for d in &s.days {
            for v in [
                d.tmax_c,
                d.tmin_c,
                d.rhmax_pct,
                d.rhmin_pct,
                d.wind_ms,
                d.solar_mj,
                d.rain_mm,
            ]
            .into_iter()
            .flatten()
            {
                assert!(v.is_finite());
            }
        }
        assert_eq!(s.days.len(), s.lines.len());
        assert!(s.days.windows(2).all(|w| w[0].date < w[1].date));
    }
}

proptest! {
    #[test]
    fn arbitrary_bytes(bytes in proptest::collection::vec(any::<u8>(), 0..400)) {
        check(&bytes);
    }

    #[test]
    fn mutated_good_file(pos in 0usize..GOOD.len(), ch in prop::sample::select(
        vec![b',', b';', b'\t', b'\n', b'\r', b'"', b'x', b'-', b'.', b'9', b' ', 0xFF, 0xEF]
    ), cut in 0usize..GOOD.len()) {
        let mut bytes = GOOD.as_bytes().to_vec();
        bytes[pos] = ch;
        check(&bytes);
        bytes.truncate(cut);
        check(&bytes);
    }
}

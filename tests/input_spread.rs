//! The standard uncertainties of the flash-point and cetane inputs (`dropcut::post::input_spread`) are the
//! numbers that `validation/estimator_spread.py` computed from the compilations shipped in `chemicals` 1.5.2
//! (IEC 60079-20-1:2010, NFPA 497 (2008), DIPPR experimental set of Serat et al. 2017; vom Lehn et al. 2021 and
//! Kessler CombustDB cetane numbers) and committed in `validation/estimator_spread.csv`.

use dropcut::post::input_spread::*;

fn table() -> Vec<(String, String, usize, Option<f64>)> {
    let text = std::fs::read_to_string(concat!(env!("CARGO_MANIFEST_DIR"), "/validation/estimator_spread.csv")).unwrap();
    assert!(text.starts_with("# produced by validation/estimator_spread.py with chemicals 1.5.2"), "provenance line missing");
    text.lines()
        .filter(|l| !l.starts_with('#'))
        .skip(1)
        .map(|l| {
            let f: Vec<&str> = l.split(',').collect();
            (f[0].to_string(), f[1].to_string(), f[2].parse().unwrap(), f[3].parse().ok())
        })
        .collect()
}

fn value(rows: &[(String, String, usize, Option<f64>)], quantity: &str, basis: &str) -> (f64, usize) {
    let r = rows.iter().find(|r| r.0 == quantity && r.1 == basis).unwrap_or_else(|| panic!("{quantity}/{basis} missing"));
    (r.3.unwrap(), r.2)
}

#[test]
fn constants_match_the_committed_table() {
    let rows = table();
    assert_eq!(value(&rows, "flash_point_published", "pooled").0, PUBLISHED_FLASH_POINT_SD);
    assert_eq!(value(&rows, "flash_point_boiling_point_estimate", "butler-1956-vs-measured").0, BOILING_POINT_FLASH_POINT_SD);
    assert_eq!(value(&rows, "cetane_published", "vom-lehn-vs-kessler").0, PUBLISHED_CETANE_SD);
    for (class, sd, n) in CLASS_TREND_CETANE_SD {
        assert_eq!(value(&rows, "cetane_class_trend", class), (sd, n), "{class}");
    }
    // an estimate is less certain than a published value (from the table, not the constants)
    assert!(value(&rows, "flash_point_boiling_point_estimate", "butler-1956-vs-measured").0 > value(&rows, "flash_point_published", "pooled").0);
    let published_cn = value(&rows, "cetane_published", "vom-lehn-vs-kessler").0;
    assert!(rows.iter().filter(|r| r.0 == "cetane_class_trend").all(|r| r.3.is_none_or(|sd| sd > published_cn)));
}

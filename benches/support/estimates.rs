//! Reading back this run's criterion estimates, so a benchmark can print its ratios against
//! its yardsticks after measuring them.

/// A measurement's mean, ns, from criterion's estimates of this run (`id` as criterion
/// names its directory, e.g. `floor_100k/at`).
pub fn mean_ns(id: &str) -> Option<f64> {
    let dir = std::env::var_os("CARGO_TARGET_DIR").map_or_else(
        || std::path::PathBuf::from("target"),
        std::path::PathBuf::from,
    );
    let path = dir.join("criterion").join(id).join("new/estimates.json");
    let text = std::fs::read_to_string(path).ok()?;
    let v: serde_json::Value = serde_json::from_str(&text).ok()?;
    v["mean"]["point_estimate"].as_f64()
}

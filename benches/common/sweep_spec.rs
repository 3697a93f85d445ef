//! The sweep the `sweep` benchmark and the `counts` driver run: a ten-component well-mixed fuel (tests/data) over
//! 64 conditions.

/// Sweep specification (fuel paths relative to tests/data).
pub const SPEC: &str = r#"
fuels = ["ten-component.toml"]
[conditions]
ambient-temperature = { from = "600K", to = "1000K", steps = 8 }
pressure = ["1bar", "10bar"]
diameter = ["20um", "50um"]
velocity = [0, 10]
max-time = "2s"
"#;

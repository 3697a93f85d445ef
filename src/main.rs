//! The `dropcut` binary: a thin shell over [`dropcut::cli::run`].
fn main() {
    std::process::exit(dropcut::cli::run(std::env::args_os()));
}

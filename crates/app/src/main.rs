//! The `saltwise` binary: opens the workbench window.

fn main() -> std::process::ExitCode {
    saltwise::run()
}

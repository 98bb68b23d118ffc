//! The `eyrie` command: a thin shell over the library. `main` hands the work
//! to [`cli::run`] and turns its result into a documented exit code.

mod cli;

fn main() -> std::process::ExitCode {
    cli::main()
}

//! `phdose completions SHELL` and `phdose manpage`: shell completion scripts and a roff man
//! page, generated from the same clap definitions that parse the command line, so they never
//! drift from the real flags.

use clap::CommandFactory;
use clap_complete::Shell;

use super::Cli;
use crate::error::{Error, Result};

#[derive(Debug, clap::Args)]
pub struct CompletionArgs {
    /// The shell to write completions for.
    #[arg(value_enum)]
    pub shell: Shell,
}

/// The completion script for `shell`.
pub fn completions(args: &CompletionArgs) -> Result<String> {
    let mut out = Vec::new();
    clap_complete::generate(args.shell, &mut Cli::command(), "phdose", &mut out);
    String::from_utf8(out).map_err(|e| Error::Internal(format!("completions: {e}")))
}

/// The man page in roff, for `man -l -` or installing as phdose.1.
pub fn manpage() -> Result<String> {
    let mut out = Vec::new();
    clap_mangen::Man::new(Cli::command()).render(&mut out)?;
    String::from_utf8(out).map_err(|e| Error::Internal(format!("man page: {e}")))
}

/// `--version` text: the program version and the version of its built-in data tables.
pub fn long_version() -> &'static str {
    static TEXT: std::sync::OnceLock<String> = std::sync::OnceLock::new();
    TEXT.get_or_init(|| {
        format!(
            "{} (data tables {})",
            env!("CARGO_PKG_VERSION"),
            crate::store::builtin::data_version()
        )
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn completions_and_man_page_name_the_commands() {
        let bash = completions(&CompletionArgs { shell: Shell::Bash }).unwrap();
        assert!(bash.contains("adjust") && bash.contains("--to-ph"));
        let man = manpage().unwrap();
        assert!(man.contains("phdose") && man.contains("adjust"));
    }

    #[test]
    fn version_names_the_data_tables() {
        assert!(long_version().contains("data tables"));
    }
}

//! Everything the command line writes and reads outside itself goes through here: standard
//! output, notes on standard error, progress bars, and the files of `--out`, `--qr`, `--csv`
//! and the set and code files it reads.
//!
//! Writing can fail in two ways that a command cannot prevent, and they mean different
//! things:
//!
//! - **The reader of standard output went away** (`fivefold show | head -1`, a pager that
//!   was quit). The reader has what it wanted, so there is nothing to report: the command
//!   ends at once, quietly, with exit status 0. We chose 0 over the status a process killed
//!   by SIGPIPE would have (141 in a shell) so that a pipeline under `set -o pipefail` does
//!   not fail because its last stage stopped reading early. The Rust runtime ignores SIGPIPE,
//!   so the closed pipe arrives as an error from `write`, which [`print()`] records (see
//!   [`stdout_closed`]); `main` then exits with 0 whatever the command returned.
//! - **Any other write error** (a full disk, `> /dev/full`, an I/O error) means the output
//!   is incomplete: one line on standard error naming what could not be written, exit 1.
//!
//! Standard error is the channel of last resort: a note that cannot be written is dropped
//! ([`note`]), since there is nowhere left to report it, and the exit status still tells.
//! Progress bars (indicatif) draw on standard error only when it is a terminal and ignore
//! their own write errors; the notes printed beside them go through [`note`].
//!
//! A file named by an option is written whole or not at all ([`write_file`]): the bytes go to
//! a temporary file in the same folder, which is flushed to disk and then renamed over the
//! target, so a failed write leaves the old file (or no file) and never half a set. Targets
//! that are not regular files (`/dev/stdout`, a named pipe) cannot be replaced by renaming
//! and are written directly.
//!
//! Files are read with a limit ([`read_text`]): a set file is at most
//! [`limits::MAX_FILE_BYTES`], and reading stops one byte past it, so naming `/dev/zero` or a
//! huge file costs that much and no more.

use std::fs::{self, File, OpenOptions};
use std::io::{self, Read, Write};
use std::path::{Path, PathBuf};
use std::sync::atomic::{AtomicBool, Ordering};

use engine::formats::limits;
use indicatif::{ProgressBar, ProgressStyle};

/// Set once a write to standard output found the pipe closed.
static STDOUT_CLOSED: AtomicBool = AtomicBool::new(false);

/// The message a command returns when standard output was closed; `main` does not print it.
const CLOSED: &str = "standard output was closed";

/// Whether standard output was found closed: the command is to end quietly, status 0.
pub fn stdout_closed() -> bool {
    STDOUT_CLOSED.load(Ordering::Relaxed)
}

/// Writes `text` to standard output and flushes it. A closed pipe is recorded (the caller
/// returns the error, and `main` ends quietly); any other failure is a one-line message.
pub fn print(text: &str) -> Result<(), String> {
    let mut out = io::stdout().lock();
    out.write_all(text.as_bytes())
        .and_then(|()| out.flush())
        .map_err(|e| stdout_error(&e))
}

/// The message for a failed write to standard output, recording a closed pipe.
pub fn stdout_error(e: &io::Error) -> String {
    if e.kind() == io::ErrorKind::BrokenPipe {
        STDOUT_CLOSED.store(true, Ordering::Relaxed);
        return CLOSED.to_string();
    }
    format!("cannot write to standard output: {e}")
}

/// Writes one line to standard error; a failure is dropped (there is nowhere left to say it).
pub fn note(line: &str) {
    let mut err = io::stderr().lock();
    let _ = writeln!(err, "{line}");
}

/// A progress bar of `len` steps on standard error (hidden with `quiet`, and by indicatif
/// itself when standard error is not a terminal). `template` is an indicatif template; should
/// it not parse, the bar falls back to indicatif's plain style rather than stopping the run.
pub fn progress(len: u64, quiet: bool, template: &str) -> ProgressBar {
    let bar = if quiet {
        ProgressBar::hidden()
    } else {
        ProgressBar::new(len)
    };
    let style = ProgressStyle::with_template(template)
        .map(|s| s.progress_chars("=> "))
        .unwrap_or_else(|_| ProgressStyle::default_bar());
    bar.set_style(style);
    bar
}

/// Reads the UTF-8 text file at `path`, of at most `limit` bytes. `what` names the kind of
/// file in messages, e.g. "a set file".
pub fn read_text(path: &str, limit: usize, what: &str) -> Result<String, String> {
    let file = File::open(path).map_err(|e| format!("cannot read {path}: {e}"))?;
    read_limited(path, file, limit, what)
}

/// Reads standard input as UTF-8 text of at most `limit` bytes.
pub fn read_stdin(limit: usize, what: &str) -> Result<String, String> {
    read_limited("standard input", io::stdin().lock(), limit, what)
}

fn read_limited(name: &str, reader: impl Read, limit: usize, what: &str) -> Result<String, String> {
    let mut bytes = Vec::new();
    reader
        .take(limit as u64 + 1)
        .read_to_end(&mut bytes)
        .map_err(|e| format!("cannot read {name}: {e}"))?;
    if bytes.len() > limit {
        return Err(format!(
            "{name}: more than {limit} bytes; {what} is at most {limit} bytes"
        ));
    }
    String::from_utf8(bytes).map_err(|e| {
        format!(
            "{name}: not UTF-8 text (byte {} is not part of a character)",
            e.utf8_error().valid_up_to()
        )
    })
}

/// The most bytes read from a file of result codes: as much as a set file may hold.
pub const MAX_CODES_BYTES: usize = limits::MAX_FILE_BYTES;

/// Writes `bytes` to the file at `path`, whole or not at all (see the module doc). The
/// message of a failure names the file.
pub fn write_file(path: &str, bytes: &[u8]) -> Result<(), String> {
    replace_with(Path::new(path), |f| f.write_all(bytes))
        .map_err(|e| format!("cannot write {path}: {e}"))
}

/// Replaces the file at `path` with what `fill` writes, through a temporary file in the same
/// folder: if `fill`, the flush or the rename fails, the temporary file is removed and the
/// old file is left as it was. A symbolic link is followed, so the link stays and its target
/// is replaced. A target that exists and is not a regular file is written in place.
fn replace_with(path: &Path, fill: impl FnOnce(&mut File) -> io::Result<()>) -> io::Result<()> {
    let target: PathBuf = match fs::metadata(path) {
        Ok(meta) if !meta.is_file() && !meta.is_dir() => {
            let mut f = OpenOptions::new().write(true).truncate(true).open(path)?;
            fill(&mut f)?;
            return f.flush();
        }
        // A link to a file: replace the file it points to, so the link survives.
        Ok(_) if path.is_symlink() => fs::canonicalize(path)?,
        _ => path.to_path_buf(),
    };
    let folder = match target.parent() {
        Some(p) if !p.as_os_str().is_empty() => p.to_path_buf(),
        _ => PathBuf::from("."),
    };
    let mut builder = tempfile::Builder::new();
    builder.prefix(".fivefold-").suffix(".part");
    // Temporary files are private (0600) by default; the file we leave behind should have the
    // permissions of any new file (0666 less the umask), as if written directly.
    #[cfg(unix)]
    {
        use std::os::unix::fs::PermissionsExt;
        builder.permissions(fs::Permissions::from_mode(0o666));
    }
    let mut temp = builder.tempfile_in(&folder)?;
    fill(temp.as_file_mut())?;
    temp.as_file_mut().flush()?;
    temp.as_file().sync_all()?;
    // On failure the temporary file is dropped, which removes it.
    temp.persist(&target).map_err(|e| e.error)?;
    Ok(())
}

#[cfg(test)]
mod tests {
    use super::*;

    /// A fresh folder, removed at the end of the test.
    fn folder() -> tempfile::TempDir {
        tempfile::tempdir().unwrap()
    }

    fn listing(dir: &Path) -> Vec<String> {
        let mut names: Vec<String> = fs::read_dir(dir)
            .unwrap()
            .map(|e| e.unwrap().file_name().to_string_lossy().into_owned())
            .collect();
        names.sort();
        names
    }

    #[test]
    fn a_write_that_fails_halfway_leaves_the_old_file_and_no_litter() {
        let tmp = folder();
        let dir = tmp.path();
        let path = dir.join("set.json");
        fs::write(&path, "the old set\n").unwrap();
        let result = replace_with(&path, |f| {
            f.write_all(b"{ \"format\": \"fivefold-set\", \"puz")?;
            Err(io::Error::new(io::ErrorKind::StorageFull, "disk full"))
        });
        assert_eq!(result.unwrap_err().kind(), io::ErrorKind::StorageFull);
        assert_eq!(fs::read_to_string(&path).unwrap(), "the old set\n");
        assert_eq!(listing(dir), ["set.json"]);
        // With no old file, a failed write leaves no file at all.
        let fresh = dir.join("fresh.json");
        let result = replace_with(&fresh, |f| {
            f.write_all(b"half")?;
            Err(io::Error::other("gone"))
        });
        assert!(result.is_err());
        assert_eq!(listing(dir), ["set.json"]);
    }

    #[test]
    fn a_write_that_succeeds_replaces_the_file_whole() {
        let tmp = folder();
        let dir = tmp.path();
        let path = dir.join("set.json");
        fs::write(
            &path,
            "a longer old content that must not survive as a tail\n",
        )
        .unwrap();
        write_file(path.to_str().unwrap(), b"new\n").unwrap();
        assert_eq!(fs::read_to_string(&path).unwrap(), "new\n");
        assert_eq!(listing(dir), ["set.json"]);
    }

    #[cfg(unix)]
    #[test]
    fn a_link_is_kept_and_its_target_replaced() {
        let tmp = folder();
        let dir = tmp.path();
        let real = dir.join("real.json");
        let link = dir.join("link.json");
        fs::write(&real, "old\n").unwrap();
        std::os::unix::fs::symlink(&real, &link).unwrap();
        write_file(link.to_str().unwrap(), b"new\n").unwrap();
        assert!(link.is_symlink());
        assert_eq!(fs::read_to_string(&real).unwrap(), "new\n");
    }

    #[test]
    fn reading_stops_one_byte_past_the_limit() {
        let tmp = folder();
        let dir = tmp.path();
        let path = dir.join("big.txt");
        fs::write(&path, "x".repeat(11)).unwrap();
        let p = path.to_str().unwrap();
        assert_eq!(read_text(p, 11, "a test file").unwrap().len(), 11);
        let e = read_text(p, 10, "a test file").unwrap_err();
        assert!(e.contains("more than 10 bytes"), "{e}");
        fs::write(&path, b"ok\xff").unwrap();
        let e = read_text(p, 10, "a test file").unwrap_err();
        assert!(e.contains("not UTF-8") && e.contains("byte 2"), "{e}");
    }
}

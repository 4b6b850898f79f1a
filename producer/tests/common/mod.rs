//! What the command-line tests share: running the built `tubecert` and a scratch folder.

use std::process::Command;

/// (exit code, stdout, stderr) of `tubecert ARGS…`.
pub fn tubecert(args: &[&str]) -> (i32, String, String) {
    let out = Command::new(env!("CARGO_BIN_EXE_tubecert")).args(args).output().unwrap();
    (
        out.status.code().unwrap(),
        String::from_utf8_lossy(&out.stdout).into(),
        String::from_utf8_lossy(&out.stderr).into(),
    )
}

/// A scratch folder of this test binary (`tag` keeps the binaries apart).
pub fn scratch(tag: &str) -> std::path::PathBuf {
    let d = std::env::temp_dir().join(format!("tubecert-{tag}-{}", std::process::id()));
    std::fs::create_dir_all(&d).unwrap();
    d
}

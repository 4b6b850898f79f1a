//! `tubecheck`: the independent checker. It reads a certificate, recomputes its canonical
//! hash, and re-verifies every claim by sparse arithmetic over `F2[U,V]` ([`verify`]).
//! It contains no search: every witness must be in the certificate.
//!
//! - [`algebra`]: vectors and sparse maps over F2[v_1..v_n];
//! - [`load`]: from the data model to indexed objects, with precise errors;
//! - [`verify`]: one check per claim kind;
//! - [`bordered`]: the bordered claims (type D structures, type A modules, box tensor products);
//! - [`maslov`]: the certified Maslov normalization of a box tensor product;
//! - [`report_text`] / [`report_json`]: presentation of verified results (not trusted code).
#![forbid(unsafe_code)]

pub mod algebra;
pub mod bordered;
pub mod load;
pub mod maslov;
pub mod report_appendix;
pub mod report_cli;
pub mod report_json;
pub mod report_terms;
pub mod report_text;
pub mod verify;

use tubecert_format::canonical::body_sha256;
use tubecert_format::{Certificate, CERTIFICATE_FORMAT, CERTIFICATE_VERSION};

/// The result of checking one certificate file.
#[derive(Debug)]
pub struct FileReport {
    pub file: String,
    /// The hash recomputed from the body.
    pub sha256: String,
    /// The hash the file states.
    pub stated_sha256: String,
    /// The certificate's format version (outside the hash): what its claims' gradings mean.
    pub version: u32,
    pub claims: Vec<verify::ClaimResult>,
    /// What was checked, for reports.
    pub body: tubecert_format::Body,
}

impl FileReport {
    pub fn hash_ok(&self) -> bool {
        self.sha256 == self.stated_sha256
    }
    pub fn ok(&self) -> bool {
        self.hash_ok() && self.claims.iter().all(|c| c.outcome.is_ok())
    }
}

/// Parses a certificate (bytes read by `limits::read_file`, which refuses a file beyond the
/// size limit before reading it); the error says what is malformed (exit 2).
pub fn parse_certificate(bytes: &[u8]) -> Result<Certificate, String> {
    let cert: Certificate = serde_json::from_slice(bytes).map_err(|e| format!("not a certificate: {e}"))?;
    let (format, version) = (&cert.format, cert.version);
    if format != CERTIFICATE_FORMAT || !(1..=CERTIFICATE_VERSION).contains(&version) {
        return Err(format!(
            "format \"{format}\" version {version} is not \"{CERTIFICATE_FORMAT}\" version 1 to {CERTIFICATE_VERSION}"
        ));
    }
    if version == 1 && cert.body.bordered.is_some() {
        return Err("a version-1 certificate has no bordered section (bordered objects came with version 2)".into());
    }
    Ok(cert)
}

/// Checks certificate bytes. `Err` means malformed (unreadable, or objects that do not resolve).
pub fn check_bytes(file: &str, bytes: &[u8]) -> Result<FileReport, String> {
    let cert = parse_certificate(bytes).map_err(|e| shown(&e))?;
    // The hash and the arithmetic are independent: compute them on the machine's two cores.
    let (sha256, claims) = std::thread::scope(|s| {
        let hash = s.spawn(|| body_sha256(&cert.body));
        let limit = tubecert_format::limits::work_limit(bytes.len() as u64);
        let claims = verify::check_body(&cert.body, cert.version, limit)
            .map_err(|errs| errs.iter().map(|e| shown(e)).collect::<Vec<_>>().join("\n  "));
        (hash.join().unwrap_or_else(|_| Err("hashing failed".into())), claims)
    });
    let (sha256, claims) = (sha256?, claims?);
    let (stated_sha256, version) = (cert.sha256, cert.version);
    Ok(FileReport { file: file.to_string(), sha256, stated_sha256, version, claims, body: cert.body })
}

/// A refusal as printed. It quotes the file (an undeclared name, a term, a key), whose text may
/// hold line breaks, terminal escapes and invisible or bidirectional characters that would print
/// a "verified" line or hide the verdict: each of those is shown as <U+XXXX>. (File names too.)
pub fn shown(e: &str) -> String {
    let hidden = |c: char| {
        c.is_control()
            || matches!(c, '\u{061C}' | '\u{200B}'..='\u{200F}' | '\u{2028}'..='\u{202E}' | '\u{2060}'..='\u{206F}' | '\u{FEFF}')
    };
    e.chars().map(|c| if hidden(c) { format!("<U+{:04X}>", c as u32) } else { c.to_string() }).collect()
}

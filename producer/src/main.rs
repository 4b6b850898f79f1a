//! `tubecert`: prove goals about complexes and maps, writing checkable certificates.
//! Exit codes: 0 every goal proved as stated; 3 some goal false and its opposite proved;
//! 2 bad input; 4 internal error.

use clap::{Parser, Subcommand};
use std::path::PathBuf;
use std::process::ExitCode;
use tubecheck::say;

/// The goal lines of the text format, each with an example (shown by `prove`, `check-input`
/// and `build --help`; the README's table says the same). A macro, so `concat!` can join it.
macro_rules! goals_help {
    () => {
        "Goals of the text format (one a line; all proved in examples/goals.problem.txt):
  goal torsion_order F G U surfaces          ord_U(F − G); options: surfaces, order K, max_order N
  goal homotopic F G times U^3               U^3·F ≃ U^3·G (times optional)
  goal distinct F G times U^2                U^2·F, U^2·G not homotopic (times optional)
  goal null_homotopic U^3·(F + G)            the map is ∂H + H∂
  goal not_null_homotopic (U^2·(F + G))∘id_P no homotopy exists (a dual witness)
  goal equivalent K K2 f g                   f: K → K2, g: K2 → K mutually inverse equivalences
  goal homology K                            H_*(K) over F2 or F2[U]
  goal tau T                                 τ(T); also: tau T alexander GRADING
  goal torsion_order_of_complex K U          the largest k with F2[U]/(U^k) in H_*(K)
Map expressions: F, id_C, F + G (F - G is the same over F2), F∘G (ASCII F @ G: F after G),
U^2·F (or U^2 F), parentheses; a multiple binds tightest, then ∘, then +."
    };
}

#[derive(Parser)]
#[command(
    name = "tubecert",
    version,
    about = "Find and certify chain homotopies, non-homotopy witnesses and homology bases"
)]
struct Cli {
    #[command(subcommand)]
    command: Command,
    /// No progress on stderr (it is shown only when stderr is a terminal anyway).
    #[arg(long, global = true)]
    quiet: bool,
    /// Threads for independent pieces of work (1: one at a time). Certificates are the same
    /// byte for byte whatever the number.
    #[arg(long, global = true, default_value_t = 2, value_parser = clap::value_parser!(u16).range(1..))]
    threads: u16,
}

#[derive(Subcommand)]
enum Command {
    /// Prove the goals of a problem file and write a certificate.
    #[command(
        after_help = concat!("Example:\n  tubecert prove certificates/disk-pair-p2.problem.json -o /tmp/p2.cert.json\n  tubecheck /tmp/p2.cert.json\n\nExit codes: 0 all goals proved as stated; 3 a goal is false and its opposite was proved (certificate still written); 2 bad input.\n\n", goals_help!())
    )]
    Prove {
        problem: PathBuf,
        /// Where to write the certificate (default: beside PROBLEM, its name with .problem.json,
        /// .problem.txt, .json or .txt replaced by .cert.json).
        #[arg(short, long)]
        output: Option<PathBuf>,
        /// Also certify each reduced model used (C ≃ C_reduced, as a homotopy_equivalence claim).
        #[arg(long)]
        emit_reduction: bool,
    },
    /// Validate a problem file only (exit 0 if valid, 2 with every error otherwise).
    #[command(after_help = concat!("Example:\n  tubecert check-input my.problem.json\n\n", goals_help!()))]
    CheckInput { problem: PathBuf },
    /// Time the whole pipeline on a synthetic problem with a known answer (prints one row).
    #[command(
        after_help = "Examples:\n  tubecert bench --generators 100000 --seed 1\n  tubecert bench --generators 100000 --density 9.4  # denser: 9.4 arrows per generator\n  tubecert bench --case reduced-identity             # id of T(13,14)^⊗3 over F2[U,V]\n  tubecert bench --case reduced-uv --torus 11,12     # U·V·id of T(11,12)^⊗3\n\nExit codes: 0 the planted answer was proved and checked; 4 a wrong answer or a failed run."
    )]
    Bench {
        /// Which problem: an inflated complex with a planted torsion order, or a Hom question
        /// between reduced complexes over F2[U,V].
        #[arg(long, value_enum, default_value = "inflated")]
        case: tubecert::bench::Case,
        #[arg(long, default_value_t = 100_000)]
        generators: usize,
        /// Inflate the source complex too, to this many generators (maps between two big complexes).
        #[arg(long)]
        source_generators: Option<usize>,
        /// Arrows per generator of the inflated complexes, about (default: five rounds of random
        /// basis change, about 4.4).
        #[arg(long, value_parser = parse_density)]
        density: Option<f64>,
        /// P,Q: the torus knot T(P,Q) of the reduced cases (default 13,14 for reduced-identity, 11,12 for reduced-uv).
        #[arg(long, value_parser = parse_torus)]
        torus: Option<(u32, u32)>,
        #[arg(long, default_value_t = 1)]
        seed: u64,
        /// Also write the problem and certificate into this folder.
        #[arg(long)]
        out: Option<PathBuf>,
        /// Omit the header line (for tables of several runs).
        #[arg(long)]
        no_header: bool,
    },
    /// Prove every member of a family of problems given by a template.
    #[command(
        after_help = "In a JSON template, \"{expr}\" inside a string is replaced by the value of an integer\nexpression in the parameter; a string that is exactly \"{expr}\" becomes an integer. In a text\ntemplate, {expr} is replaced wherever it stands outside comments.\n\nEach member is written to OUT as STEM-NAMEv.problem.json and STEM-NAMEv.cert.json (STEM: the\ntemplate's file name without .template.json, .template.txt, .json or .txt); the table gives,\nfor each value, the claims its goals proved.\n\n--shard I/N runs only the members at positions I, I+N, I+2N, … of the parameter order and\nwrites the same files a whole run writes for them: run shards 1/N … N/N anywhere (a job array,\na CI matrix), gather the folders, then tubecheck the result.\n\nExit codes: 0 every goal of every member proved as stated; 3 some goal false (its opposite\nproved); 2 bad input or a bad --shard.\n\nExample:\n  tubecert family examples/stair-tower.template.json --param p=1..6 --out certificates\n  tubecert family examples/stair-tower.template.json --param p=1..6 --shard 2/3 --out part2"
    )]
    Family {
        template: PathBuf,
        /// NAME=LO..HI, e.g. p=1..8
        #[arg(long)]
        param: String,
        /// I/N: prove only the members at positions I, I+N, I+2N, … (1 ≤ I ≤ N).
        #[arg(long, value_name = "I/N")]
        shard: Option<String>,
        /// Folder for the members' problems and certificates.
        #[arg(long, default_value = ".")]
        out: PathBuf,
    },
    /// Build explicit complexes from constructions given on the command line; writes a problem
    /// file (text or JSON) ready for `prove`.
    #[command(
        after_help = concat!("Each --complex is one text-format definition NAME = CONSTRUCTION, in order:\n  staircase torus_knot P Q | staircase alexander A… | tensor A B | dual A | shift A (…)\n  | direct_sum A B | quotient V of staircase … | cable P Q of staircase …\nGenerated names and gradings: staircase x0 … x2n; tensor x⊗y at gr(x) + gr(y); dual: same\nnames, gradings negated; direct_sum A.x, B.y (README: \"Where generated complexes sit\").\nEach --goal is one text-format goal line without the word goal (below).\n\nExample:\n  tubecert build --ring 'F2[U]' --complex 'T = staircase torus_knot 3 4' --complex 'M = dual T' \\\n    --complex 'S = tensor T M' --goal 'tau S' -o sum.problem.txt\n  tubecert prove sum.problem.txt\n\n", goals_help!())
    )]
    Build {
        /// F2, F2[U] (Maslov, Alexander; the minus version) or F2[U,V] (gr_U, gr_V).
        #[arg(long, default_value = "F2[U]")]
        ring: String,
        /// NAME = CONSTRUCTION (repeatable, in order).
        #[arg(long = "complex", value_name = "DEFINITION", required = true)]
        complexes: Vec<String>,
        /// A goal line (repeatable).
        #[arg(long = "goal", value_name = "GOAL")]
        goals: Vec<String>,
        /// Output format (default: text, or json when OUT ends in .json).
        #[arg(long, value_parser = ["text", "json"])]
        to: Option<String>,
        /// Where to write the problem (default: standard output).
        #[arg(short, long)]
        output: Option<PathBuf>,
    },
    /// Convert a problem file between the JSON and the text format.
    #[command(after_help = "Example:\n  tubecert convert examples/tower.problem.json --to text -o tower.problem.txt")]
    Convert {
        file: PathBuf,
        /// The format to write.
        #[arg(long, value_parser = ["text", "json"])]
        to: String,
        /// Where to write it (default: standard output).
        #[arg(short, long)]
        output: Option<PathBuf>,
    },
    /// Draw a complex as an SVG picture, optionally highlighting a claim's witness.
    #[command(
        after_help = "To scale: over F2[U,V] the plane of the two filtration levels (an arrow x → U^a·V^b·y goes a\nunits left and b down: U arrows horizontal, V arrows vertical, mixed monomials diagonal); over\nF2[U] or F2 the lattice of the gradings (Alexander across, Maslov up). Generators at one point are\nstacked and named together; a legend explains colours and the highlighted witness.\n\nExample:\n  tubecert draw certificates/stair-tower-p3.cert.json --complex K --highlight 1 -o k.svg\n  rsvg-convert k.svg -o k.png"
    )]
    Draw {
        /// A problem file or a certificate.
        file: PathBuf,
        /// The complex to draw (its name in the file).
        #[arg(long)]
        complex: String,
        /// Claim number (1-based) whose witness support is highlighted.
        #[arg(long)]
        highlight: Option<usize>,
        /// Above this many generators, draw a summary (generators counted per cell, arrows
        /// counted by kind) instead of every generator.
        #[arg(long, default_value_t = tubecert::draw::DEFAULT_MAX_GENERATORS)]
        max_generators: usize,
        /// The SVG file to write.
        #[arg(short, long)]
        output: PathBuf,
    },
    /// What changed between two certificates (exit 0 same, 1 different, 2 unreadable).
    #[command(after_help = "Example:\n  tubecert diff old.cert.json new.cert.json")]
    Diff { a: PathBuf, b: PathBuf },
    /// (Used by `bench`: times a plain parse and a full check of FILE in a fresh process.)
    #[command(hide = true)]
    BenchCheck { file: PathBuf },
    /// Write the demo scenario's problems and certificates.
    #[command(after_help = "Example:\n  tubecert demo --out /tmp/demo && tubecheck /tmp/demo")]
    Demo {
        #[arg(long, default_value = "tubecert-demo")]
        out: PathBuf,
    },
}

/// Arrows per generator for `--density`.
fn parse_density(text: &str) -> Result<f64, String> {
    match text.parse::<f64>() {
        Ok(d) if (1.0..=40.0).contains(&d) => Ok(d),
        _ => Err(format!("expected a number of arrows per generator between 1 and 40 (got \"{text}\")")),
    }
}

/// `P,Q` for `--torus`.
fn parse_torus(text: &str) -> Result<(u32, u32), String> {
    let err = || format!("expected P,Q with 2 ≤ P, Q ≤ 40, e.g. 13,14 (got \"{text}\")");
    let (p, q) = text.split_once(',').ok_or_else(err)?;
    let (p, q): (u32, u32) = (p.trim().parse().map_err(|_| err())?, q.trim().parse().map_err(|_| err())?);
    if !(2..=40).contains(&p) || !(2..=40).contains(&q) {
        return Err(err());
    }
    Ok((p, q))
}

fn default_output(problem: &std::path::Path) -> PathBuf {
    let name = problem.file_name().map(|n| n.to_string_lossy().to_string()).unwrap_or_default();
    let stem =
        [".problem.json", ".problem.txt", ".json", ".txt"].iter().find_map(|s| name.strip_suffix(s)).unwrap_or(&name);
    problem.with_file_name(format!("{stem}.cert.json"))
}

fn report_errors(errs: &[String]) -> ExitCode {
    for e in errs {
        eprintln!("error: {e}");
    }
    ExitCode::from(2)
}

/// Writes `text` to the file `output`, or to standard output.
fn write_output(text: &str, output: Option<PathBuf>) -> ExitCode {
    match output {
        None => {
            tubecheck::report_cli::emit(text);
            ExitCode::SUCCESS
        }
        Some(o) => match std::fs::write(&o, text) {
            Ok(()) => ExitCode::SUCCESS,
            Err(e) => report_errors(&[format!("{}: {e}", o.display())]),
        },
    }
}

fn main() -> ExitCode {
    // The checker's crates panic on an integer overflow even in release (the last line of
    // defence behind the bounds every number is read under): reported as an internal error
    // (exit 4), never as a bare panic.
    std::panic::set_hook(Box::new(|info| {
        let at = info.location().map_or(String::new(), |l| format!(" at {}:{}", l.file(), l.line()));
        eprintln!("tubecert: internal error{at}: {}", panic_text(info.payload()));
    }));
    std::panic::catch_unwind(run).unwrap_or(ExitCode::from(4))
}

fn panic_text(payload: &(dyn std::any::Any + Send)) -> &str {
    payload.downcast_ref::<&str>().copied().or(payload.downcast_ref::<String>().map(|s| s.as_str())).unwrap_or("")
}

fn run() -> ExitCode {
    let cli = Cli::parse();
    let options = tubecert::prove::Options { threads: cli.threads.into(), ..Default::default() };
    tubecert::progress::enable(!cli.quiet && std::io::IsTerminal::is_terminal(&std::io::stderr()));
    match cli.command {
        Command::CheckInput { problem } => match tubecert::check_input(&problem) {
            Ok((p, ctx)) => {
                say!(
                    "{}: valid ({} complexes, {} maps, {} goals; ring {})",
                    problem.display(),
                    ctx.complexes.len(),
                    ctx.maps.len(),
                    p.goals.len(),
                    tubecert_format::statement::ring_name(&ctx.ring.variables)
                );
                ExitCode::SUCCESS
            }
            Err(errs) => report_errors(&errs),
        },
        Command::Prove { problem, output, emit_reduction } => {
            let (p, ctx, bytes) = match tubecert::load_problem(&problem) {
                Ok(x) => x,
                Err(errs) => return report_errors(&errs),
            };
            let options = tubecert::prove::Options { emit_reduction, ..options };
            let proved = match tubecert::prove::prove_with(p, &ctx, &bytes, options) {
                Ok(x) => x,
                Err(e) => {
                    let lines = tubecert::text_format::SourceLines::of(&bytes);
                    eprintln!("error: {}", lines.locate(&problem.display().to_string(), &e));
                    return ExitCode::from(if e.starts_with("internal") { 4 } else { 2 });
                }
            };
            let out = output.unwrap_or_else(|| default_output(&problem));
            if let Err(e) = std::fs::write(&out, &proved.file) {
                eprintln!("error: cannot write {}: {e}", out.display());
                return ExitCode::from(2);
            }
            for l in &proved.lines {
                say!("{l}");
            }
            say!("certificate {} sha256 {}", out.display(), proved.certificate.sha256);
            say!("verify with: tubecheck {}", out.display());
            if proved.all_as_stated {
                ExitCode::SUCCESS
            } else {
                say!("some goals were false; the certificate proves their opposites (exit 3)");
                ExitCode::from(3)
            }
        }
        Command::Bench { case, generators, source_generators, density, torus, seed, out, no_header } => {
            let o = tubecert::bench::Options { case, generators, source_generators, density, seed, torus };
            match tubecert::bench::run(&o, out.as_deref()) {
                Ok((header, row)) => {
                    if !no_header {
                        say!("{header}");
                    }
                    say!("{row}");
                    ExitCode::SUCCESS
                }
                Err(e) => {
                    eprintln!("error: {e}");
                    ExitCode::from(4)
                }
            }
        }
        Command::Family { template, param, shard, out } => match shard
            .as_deref()
            .map(tubecert::family::parse_shard)
            .transpose()
            .map_err(|e| vec![e])
            .and_then(|shard| tubecert::family::run(&template, &param, shard, &out, options))
        {
            Ok((rows, all)) => {
                if rows.is_empty() {
                    say!("this shard has no members (there are fewer members than shards)");
                }
                for r in rows {
                    say!("{r}");
                }
                say!("\nverify with: tubecheck {}", out.display());
                if all {
                    ExitCode::SUCCESS
                } else {
                    say!("some goals were false; the certificates prove their opposites (exit 3)");
                    ExitCode::from(3)
                }
            }
            Err(errs) => report_errors(&errs),
        },
        Command::Build { ring, complexes, goals, to, output } => {
            let json = to.as_deref() == Some("json")
                || (to.is_none() && output.as_ref().is_some_and(|o| o.extension().is_some_and(|e| e == "json")));
            let built = tubecert::text_format::from_command_line(&ring, &complexes, &goals)
                .and_then(|v| serde_json::from_value(v).map_err(|e| vec![e.to_string()]))
                .and_then(|w| tubecert::problem::from_written(tubecert::problem::WrittenProblem { text: true, ..w }))
                // The same validation as `check-input`, so a built problem never names what it lacks.
                .and_then(|p| tubecert::validate::validate(&p).map(|_| p))
                .and_then(|p| match json {
                    true => Ok(String::from_utf8(tubecert::demo::problem_bytes(&p)).expect("JSON is UTF-8")),
                    false => tubecert::text_format::render(&serde_json::to_value(&p).expect("problems serialize"))
                        .map_err(|e| vec![e]),
                });
            match built {
                Ok(text) => write_output(&text, output),
                Err(errs) => report_errors(&errs),
            }
        }
        Command::Convert { file, to, output } => {
            let name = file.display().to_string();
            let converted = tubecert_format::limits::read_file(&file)
                .map_err(|e| vec![format!("{name}: {e}")])
                .and_then(|b| {
                    tubecert::problem::written_value(&b)
                        .map_err(|es| es.into_iter().map(|e| format!("{name}:{e}")).collect())
                })
                .and_then(|v| match to.as_str() {
                    "text" => tubecert::text_format::render(&v).map_err(|e| vec![format!("{name}: {e}")]),
                    _ => Ok(tubecert::problem::json_for_reading(&v)),
                });
            match converted {
                Ok(text) => write_output(&text, output),
                Err(errs) => report_errors(&errs),
            }
        }
        Command::Draw { file, complex, highlight, max_generators, output } => {
            match tubecert::draw::draw_file(&file, &complex, highlight, max_generators) {
                Ok(drawing) => match std::fs::write(&output, drawing.svg) {
                    Ok(()) => {
                        if let Some(note) = drawing.note {
                            eprintln!("note: {note}");
                        }
                        say!("wrote {}", output.display());
                        ExitCode::SUCCESS
                    }
                    Err(e) => report_errors(&[format!("{}: {e}", output.display())]),
                },
                Err(errs) => report_errors(&errs),
            }
        }
        Command::Diff { a, b } => {
            let read = |p: &PathBuf| {
                tubecert_format::limits::read_file(p)
                    .and_then(|bytes| tubecheck::parse_certificate(&bytes))
                    .map_err(|e| format!("{}: {e}", p.display()))
            };
            match (read(&a), read(&b)) {
                (Ok(ca), Ok(cb)) => {
                    let lines = tubecert::diff::diff(&ca.body, &cb.body);
                    if lines.is_empty() {
                        say!("no differences (sha256 {})", ca.sha256);
                        ExitCode::SUCCESS
                    } else {
                        say!("sha256 {} → {}", ca.sha256, cb.sha256);
                        for l in lines {
                            say!("{l}");
                        }
                        ExitCode::from(1)
                    }
                }
                (ra, rb) => report_errors(&[ra.err(), rb.err()].into_iter().flatten().collect::<Vec<_>>()),
            }
        }
        Command::BenchCheck { file } => match tubecert::bench::check_timing(&file) {
            Ok((parse, check)) => {
                say!("{parse:.6} {check:.6}");
                ExitCode::SUCCESS
            }
            Err(e) => report_errors(&[e]),
        },
        Command::Demo { out } => match tubecert::demo::write_demo(&out) {
            Ok(lines) => {
                for l in lines {
                    say!("{l}");
                }
                say!("\nverify everything with:\n  cargo run --release --bin tubecheck -- {}", out.display());
                ExitCode::SUCCESS
            }
            Err(e) => {
                eprintln!("error: {e}");
                ExitCode::from(4)
            }
        },
    }
}

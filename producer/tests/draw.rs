//! `tubecert draw`: pictures to scale. The tests read the SVG's own geometry (arrow ends,
//! label boxes) and check it against the monomials, then render it to PNG with rsvg-convert.

use std::process::Command;

mod common;
use common::tubecert;

fn dir() -> std::path::PathBuf {
    common::scratch("draw")
}

fn write(name: &str, text: &str) -> String {
    let p = dir().join(name);
    std::fs::write(&p, text).unwrap();
    p.to_string_lossy().into()
}

/// The value of attribute `name` in one SVG element.
fn attr<'a>(element: &'a str, name: &str) -> Option<&'a str> {
    let start = element.find(&format!(" {name}=\""))? + name.len() + 3;
    Some(&element[start..start + element[start..].find('"')?])
}

/// Every element `<tag …>` with `class="class"`.
fn elements<'a>(svg: &'a str, tag: &str, class: &str) -> Vec<&'a str> {
    // Each element from the space after its tag name, so every attribute follows a space.
    svg.match_indices(&format!("<{tag} "))
        .map(|(i, m)| &svg[i + m.len() - 1..])
        .map(|e| &e[..e.find('>').unwrap()])
        .filter(|e| attr(e, "class") == Some(class))
        .collect()
}

/// (coefficient, dx, dy) of each arrow, in pixels (SVG y grows downwards).
fn arrows(svg: &str) -> Vec<(String, f64, f64, bool)> {
    elements(svg, "line", "arrow")
        .into_iter()
        .map(|e| {
            let n = |k: &str| attr(e, k).unwrap().parse::<f64>().unwrap();
            let dashed = attr(e, "stroke-dasharray").is_some();
            (attr(e, "data-coef").unwrap().to_string(), n("x2") - n("x1"), n("y2") - n("y1"), dashed)
        })
        .collect()
}

/// Exponents of U and V in a written monomial (`U^2*V`).
fn exps(m: &str) -> (f64, f64) {
    let mut e = (0.0, 0.0);
    for f in m.split('*').filter(|f| *f != "1") {
        let (v, k) = f.split_once('^').map_or((f, 1.0), |(v, k)| (v, k.parse().unwrap()));
        if v == "U" {
            e.0 += k;
        } else {
            e.1 += k;
        }
    }
    e
}

/// Renders with rsvg-convert and returns the PNG's width and height, or None (with a message)
/// where the converter is not installed; CI installs it, so there it must be present.
fn render_png(svg_path: &str) -> Option<(u32, u32)> {
    if Command::new("rsvg-convert").arg("--version").output().is_err() {
        assert!(std::env::var("CI").is_err(), "CI must install rsvg-convert (librsvg2-bin)");
        eprintln!("rsvg-convert is not installed: the PNG rendering check is skipped here");
        return None;
    }
    let png = format!("{svg_path}.png");
    let st = Command::new("rsvg-convert").arg(svg_path).arg("-o").arg(&png).status().unwrap();
    assert!(st.success(), "rsvg-convert failed on {svg_path}");
    let bytes = std::fs::read(&png).unwrap();
    assert_eq!(&bytes[..8], b"\x89PNG\r\n\x1a\n");
    let be = |i: usize| u32::from_be_bytes(bytes[i..i + 4].try_into().unwrap());
    Some((be(16), be(20)))
}

const UV: &str = "ring F2[U,V]\ngradings gr_U gr_V\ndegree U (-2, 0)\ndegree V (0, -2)\ndegree d (-1, -1)\n";

#[test]
fn over_f2_uv_arrows_are_to_scale_in_the_plane_of_filtration_levels() {
    // The staircase of T(3,4) (U, U^2, V, V^2 arrows), a U^3 arrow and a mixed one.
    let text = format!(
        "{UV}complex T = staircase torus_knot 3 4\ncomplex E\n  x (0, 0)\n  y (1, 1)\n  z (0, 0)\n  w (5, -1)\n  x -> U*V y\n  z -> U^3 w\ncomplex S = direct_sum T E\n"
    );
    let p = write("plane.problem.txt", &text);
    let svg_path = dir().join("plane.svg").to_string_lossy().to_string();
    let (code, _, err) = tubecert(&["draw", &p, "--complex", "S", "-o", &svg_path]);
    assert_eq!(code, 0, "{err}");
    let svg = std::fs::read_to_string(&svg_path).unwrap();
    let a = arrows(&svg);
    assert_eq!(a.len(), 6, "{a:?}");
    // One unit: the length of the U arrow.
    let unit = a.iter().find(|x| x.0 == "U").map(|x| -x.1).unwrap();
    assert!(unit > 10.0, "{unit}");
    for (coef, dx, dy, dashed) in &a {
        let (u, v) = exps(coef);
        assert!(!dashed, "{coef} should be to scale");
        // U^a·V^b: a units left, b units down.
        assert!((dx + u * unit).abs() < 0.01 && (dy - v * unit).abs() < 0.01, "{coef}: ({dx}, {dy}), unit {unit}");
    }
    let len = |c: &str| a.iter().find(|x| x.0 == c).map(|x| x.1.hypot(x.2)).unwrap();
    assert!((len("U^3") - 3.0 * len("U")).abs() < 0.01, "a U^3 arrow is three times a U arrow");
    assert!((len("U^2") - 2.0 * len("U")).abs() < 0.01);
    assert!((len("V^2") - 2.0 * len("V")).abs() < 0.01);
    let uv = a.iter().find(|x| x.0 == "U*V").unwrap();
    assert!(uv.1 < 0.0 && (uv.1 + uv.2).abs() < 0.01, "a mixed monomial is diagonal: {uv:?}");
    assert!(
        a.iter().filter(|x| x.0.starts_with('U') && !x.0.contains('V')).all(|x| x.2.abs() < 0.01),
        "U arrows horizontal"
    );
    assert!(a.iter().filter(|x| x.0.starts_with('V')).all(|x| x.1.abs() < 0.01), "V arrows vertical");
    assert!(svg.contains("Legend") && svg.contains("horizontal, a units left") && svg.contains("diagonal"));
    labels_never_collide(&svg);
    if let Some((w, h)) = render_png(&svg_path) {
        let width: f64 = attr(&svg, "width").unwrap().parse().unwrap();
        assert!((w as f64 - width).abs() < 1.5, "PNG {w}×{h}, SVG width {width}");
    }
}

#[test]
fn over_f2_u_the_lattice_is_to_scale_and_points_stack() {
    let pair = format!("{}/../examples/pair.problem.txt", env!("CARGO_MANIFEST_DIR"));
    let svg_path = dir().join("pair.svg").to_string_lossy().to_string();
    let (code, _, err) = tubecert(&["draw", &pair, "--complex", "K", "-o", &svg_path]);
    assert_eq!(code, 0, "{err}");
    let svg = std::fs::read_to_string(&svg_path).unwrap();
    // b (-5, -3) → U^3 a (0, 0): 3 units right (Alexander), 5 up (Maslov).
    let a = arrows(&svg);
    assert_eq!(a.len(), 1);
    let (_, dx, dy, _) = &a[0];
    assert!(dx > &0.0 && (dy / dx + 5.0 / 3.0).abs() < 1e-6, "({dx}, {dy})");
    // The staircase over F2[U]: x1 → U·x0 is (1, 1), so a U^3 arrow is (3, 5) of the same units.
    let p = write(
        "t.problem.txt",
        "ring F2[U]\ngradings maslov alexander\ndegree U (-2, -1)\ndegree d (-1, 0)\ncomplex T = staircase torus_knot 3 4\n",
    );
    let t_path = dir().join("t.svg").to_string_lossy().to_string();
    assert_eq!(tubecert(&["draw", &p, "--complex", "T", "-o", &t_path]).0, 0);
    let t = arrows(&std::fs::read_to_string(&t_path).unwrap());
    let u = t.iter().find(|x| x.0 == "U").unwrap();
    assert!((u.1 + u.2).abs() < 0.01, "U: one right, one up: {u:?}");
    assert!((dx - 3.0 * u.1).abs() < 0.01 && (dy - 5.0 * u.2).abs() < 0.01, "U^3 = (3, 5) units: {a:?} vs {u:?}");
    // z and a share (0, 0): one stack of two circles, labelled with both names and the count.
    let labels: Vec<&str> = svg.split("<text class=\"label\"").skip(1).collect();
    assert!(labels.iter().any(|l| l.contains(">2× a, z</text>")), "{svg}");
    assert_eq!(elements(&svg, "circle", "generator").len(), 3);
    labels_never_collide(&svg);
    render_png(&svg_path);
}

/// No two labels (generator names and coefficients) overlap, and none covers a circle.
fn labels_never_collide(svg: &str) {
    let boxes: Vec<[f64; 4]> = svg
        .split("<text class=\"")
        .skip(1)
        .filter(|e| e.starts_with("label") || e.starts_with("coef"))
        .map(|e| {
            let head = &e[..e.find('>').unwrap()];
            let head = format!(" {head}");
            let n = |k: &str| attr(&head, k).unwrap().parse::<f64>().unwrap();
            let text: String = {
                let inner = &e[e.find('>').unwrap() + 1..e.find("</text>").unwrap()];
                let mut s = String::new();
                let mut tag = false;
                for ch in inner.chars() {
                    match ch {
                        '<' => tag = true,
                        '>' => tag = false,
                        c if !tag => s.push(c),
                        _ => {}
                    }
                }
                s
            };
            // 7 px a character at 11 px (the producer's estimate, wider than the glyphs).
            let w = 7.0 * text.chars().count() as f64;
            let x = n("x");
            let x = if head.contains("text-anchor=\"middle\"") { x - w / 2.0 } else { x };
            [x, n("y") - 10.0, x + w, n("y") + 2.0]
        })
        .collect();
    let circles: Vec<[f64; 4]> = elements(svg, "circle", "generator")
        .into_iter()
        .map(|e| {
            let n = |k: &str| attr(e, k).unwrap().parse::<f64>().unwrap();
            let r = n("r");
            [n("cx") - r, n("cy") - r, n("cx") + r, n("cy") + r]
        })
        .collect();
    let apart = |a: &[f64; 4], b: &[f64; 4]| {
        a[2] <= b[0] + 0.5 || b[2] <= a[0] + 0.5 || a[3] <= b[1] + 0.5 || b[3] <= a[1] + 0.5
    };
    for (i, a) in boxes.iter().enumerate() {
        for b in &boxes[i + 1..] {
            assert!(apart(a, b), "labels overlap: {a:?} {b:?}");
        }
        for c in &circles {
            assert!(apart(a, c), "a label covers a circle: {a:?} {c:?}");
        }
    }
}

#[test]
fn above_the_limit_a_summary_is_drawn_and_said() {
    // T(3,4)^⊗4 over F2[U,V]: 625 generators, above the default limit of 400.
    let text = format!("{UV}complex T = staircase torus_knot 3 4\ncomplex A = tensor T T\ncomplex B = tensor A A\n");
    let p = write("big.problem.txt", &text);
    let svg_path = dir().join("big.svg").to_string_lossy().to_string();
    let (code, out, err) = tubecert(&["draw", &p, "--complex", "B", "-o", &svg_path]);
    assert_eq!(code, 0, "{err}");
    assert!(err.contains("625 generators, more than the drawing limit of 400"), "{out}{err}");
    let svg = std::fs::read_to_string(&svg_path).unwrap();
    assert!(svg.len() < 200_000, "{} bytes", svg.len());
    assert!(svg.contains("drawn as a summary"));
    let total: usize =
        elements(&svg, "circle", "cell").iter().map(|e| attr(e, "data-count").unwrap().parse::<usize>().unwrap()).sum();
    assert_eq!(total, 625);
    assert!(arrows(&svg).is_empty());
    render_png(&svg_path);
    // A limit chosen above the size draws every generator, to scale.
    let (code, _, err) = tubecert(&["draw", &p, "--complex", "B", "--max-generators", "1000", "-o", &svg_path]);
    assert_eq!(code, 0, "{err}");
    let svg = std::fs::read_to_string(&svg_path).unwrap();
    assert!(!svg.contains("drawn as a summary"));
    let a = arrows(&svg);
    let unit = a.iter().find(|x| x.0 == "U").map(|x| -x.1).unwrap();
    for (coef, dx, dy, _) in &a {
        let (u, v) = exps(coef);
        assert!((dx + u * unit).abs() < 0.01 && (dy - v * unit).abs() < 0.01, "{coef}: ({dx}, {dy})");
    }
}

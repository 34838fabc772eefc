//! A small SVG writer: elements with escaped attributes and text, numbers rounded to what a
//! screen or a printer can show. Written by hand because a chart needs only a dozen element
//! kinds, and a dependency would not make the output any more correct.
//!
//! Output is meant to be embedded as well as saved: no `id`s, no `<style>` block, no external
//! references, every style as a presentation attribute. Two SVGs pasted into one HTML page
//! therefore cannot clash.

use std::fmt::Write as _;

/// Escapes text for an XML attribute value or element content.
pub fn escape(text: &str) -> String {
    let mut out = String::with_capacity(text.len());
    for c in text.chars() {
        match c {
            '&' => out.push_str("&amp;"),
            '<' => out.push_str("&lt;"),
            '>' => out.push_str("&gt;"),
            '"' => out.push_str("&quot;"),
            '\'' => out.push_str("&apos;"),
            // Control characters are not allowed in XML 1.0; a SMILES never holds one.
            c if (c as u32) < 0x20 && !matches!(c, '\t' | '\n' | '\r') => {}
            c => out.push(c),
        }
    }
    out
}

/// A coordinate with at most two decimals and no trailing zeros (`12.5`, `3`, `-0.25`).
pub fn num(x: f64) -> String {
    let r = (x * 100.0).round() / 100.0;
    // -0 would print as "-0".
    let r = if r == 0.0 { 0.0 } else { r };
    let s = format!("{r:.2}");
    s.trim_end_matches('0').trim_end_matches('.').to_string()
}

/// An SVG document being written, element by element.
#[derive(Debug, Default)]
pub struct Svg {
    body: String,
    depth: usize,
}

impl Svg {
    pub fn new() -> Svg {
        Svg::default()
    }

    fn indent(&mut self) {
        for _ in 0..self.depth {
            self.body.push_str("  ");
        }
    }

    fn open_tag(&mut self, name: &str, attrs: &[(&str, String)]) {
        self.indent();
        self.body.push('<');
        self.body.push_str(name);
        for (key, value) in attrs {
            let _ = write!(self.body, " {key}=\"{}\"", escape(value));
        }
    }

    /// An empty element: `<name a="..."/>`.
    pub fn leaf(&mut self, name: &str, attrs: &[(&str, String)]) {
        self.open_tag(name, attrs);
        self.body.push_str("/>\n");
    }

    /// An element holding text: `<name a="...">text</name>`.
    pub fn text(&mut self, name: &str, attrs: &[(&str, String)], text: &str) {
        self.open_tag(name, attrs);
        let _ = writeln!(self.body, ">{}</{name}>", escape(text));
    }

    /// Opens a group-like element; close it with [`Svg::close`].
    pub fn open(&mut self, name: &str, attrs: &[(&str, String)]) {
        self.open_tag(name, attrs);
        self.body.push_str(">\n");
        self.depth += 1;
    }

    pub fn close(&mut self, name: &str) {
        self.depth = self.depth.saturating_sub(1);
        self.indent();
        let _ = writeln!(self.body, "</{name}>");
    }

    /// The `<svg>` element around everything written, sized in user units with a `viewBox`
    /// so that an HTML page can scale it. No XML declaration: ready to inline.
    pub fn finish(self, width: f64, height: f64, title: &str, desc: &str) -> String {
        let mut out = String::new();
        let _ = writeln!(
            out,
            "<svg xmlns=\"http://www.w3.org/2000/svg\" width=\"{w}\" height=\"{h}\" \
             viewBox=\"0 0 {w} {h}\" role=\"img\">",
            w = num(width),
            h = num(height)
        );
        let _ = writeln!(out, "  <title>{}</title>", escape(title));
        let _ = writeln!(out, "  <desc>{}</desc>", escape(desc));
        for line in self.body.lines() {
            let _ = writeln!(out, "  {line}");
        }
        out.push_str("</svg>\n");
        out
    }
}

/// `(key, value)` attribute pair from anything printable.
pub fn attr(key: &'static str, value: impl ToString) -> (&'static str, String) {
    (key, value.to_string())
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn escapes_markup_characters() {
        assert_eq!(
            escape("C[NH3+].[Cl-] & <\"'>"),
            "C[NH3+].[Cl-] &amp; &lt;&quot;&apos;&gt;"
        );
        assert_eq!(escape("a\u{1}b"), "ab");
    }

    #[test]
    fn numbers_are_short() {
        assert_eq!(num(12.5), "12.5");
        assert_eq!(num(3.0), "3");
        assert_eq!(num(-0.001), "0");
        assert_eq!(num(1.236), "1.24");
        assert_eq!(num(-7.1), "-7.1");
    }

    #[test]
    fn nests_and_closes() {
        let mut s = Svg::new();
        s.open("g", &[attr("fill", "none")]);
        s.text("text", &[attr("x", 1)], "pH & more");
        s.close("g");
        let out = s.finish(10.0, 20.0, "t", "d");
        assert!(out.starts_with("<svg xmlns=\"http://www.w3.org/2000/svg\" width=\"10\""));
        assert!(out.contains("<text x=\"1\">pH &amp; more</text>"));
        assert!(out.trim_end().ends_with("</svg>"));
    }
}

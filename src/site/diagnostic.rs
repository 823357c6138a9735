//! Problems found in a site file, each with where it stands: file, line, column and key path.

use super::yaml::{Loc, Node, Value};
use std::fmt;

/// A key path such as `ground.layers[2].conductivity`.
#[derive(Clone, Debug, Default, PartialEq, Eq)]
pub struct KeyPath(Vec<Seg>);

#[derive(Clone, Debug, PartialEq, Eq)]
enum Seg {
    Key(String),
    Index(usize),
}

impl KeyPath {
    pub fn root() -> Self {
        KeyPath(Vec::new())
    }

    pub fn key(&self, name: &str) -> Self {
        let mut p = self.clone();
        p.0.push(Seg::Key(name.to_string()));
        p
    }

    pub fn index(&self, i: usize) -> Self {
        let mut p = self.clone();
        p.0.push(Seg::Index(i));
        p
    }

    /// Where this path points in the tree: the value's location, or that of the deepest parent
    /// that exists (a missing key is reported at its mapping).
    pub fn locate(&self, root: &Node) -> Loc {
        let mut node = root;
        for seg in &self.0 {
            let next = match (seg, &node.value) {
                (Seg::Key(k), Value::Map(entries)) => {
                    entries.iter().find(|(key, _)| &key.name == k).map(|(_, v)| v)
                }
                (Seg::Index(i), Value::Seq(items)) => items.get(*i),
                _ => None,
            };
            match next {
                Some(n) => node = n,
                None => break,
            }
        }
        node.loc
    }
}

impl fmt::Display for KeyPath {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        if self.0.is_empty() {
            return f.write_str("(top level)");
        }
        for (i, seg) in self.0.iter().enumerate() {
            match seg {
                Seg::Key(k) if i == 0 => write!(f, "{k}")?,
                Seg::Key(k) => write!(f, ".{k}")?,
                Seg::Index(n) => write!(f, "[{n}]")?,
            }
        }
        Ok(())
    }
}

#[derive(Clone, Copy, Debug, PartialEq, Eq, PartialOrd, Ord)]
pub enum Severity {
    /// The value is accepted but outside the usual engineering range.
    Warning,
    /// The site file cannot be run.
    Error,
}

/// One problem, located.
#[derive(Clone, Debug, PartialEq)]
pub struct Diagnostic {
    pub severity: Severity,
    pub file: String,
    pub loc: Loc,
    pub path: KeyPath,
    /// One sentence: what is wrong and what is allowed.
    pub message: String,
}

impl fmt::Display for Diagnostic {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        let word = match self.severity {
            Severity::Error => "error",
            Severity::Warning => "warning",
        };
        write!(
            f,
            "{}:{}:{}: {word}: {}: {}",
            printable(&self.file),
            self.loc.line,
            self.loc.column,
            printable(&self.path.to_string()),
            printable(&self.message)
        )
    }
}

/// Text with its control characters (a NUL, an escape sequence, a line break in a key) shown as
/// escapes, so that a message quoting the user's input prints as the one line it is.
pub fn printable(text: &str) -> std::borrow::Cow<'_, str> {
    if text.chars().any(char::is_control) {
        text.chars()
            .map(|c| {
                if c.is_control() {
                    c.escape_default().to_string()
                } else {
                    c.to_string()
                }
            })
            .collect::<String>()
            .into()
    } else {
        text.into()
    }
}

/// Collects diagnostics while a site file is read; locates each path in the YAML tree.
pub struct Collector<'a> {
    pub file: String,
    pub tree: &'a Node,
    pub items: Vec<Diagnostic>,
}

impl<'a> Collector<'a> {
    pub fn new(file: &str, tree: &'a Node) -> Self {
        Collector {
            file: file.to_string(),
            tree,
            items: Vec::new(),
        }
    }

    pub fn error(&mut self, path: &KeyPath, message: impl Into<String>) {
        self.push(Severity::Error, path, message.into());
    }

    pub fn warning(&mut self, path: &KeyPath, message: impl Into<String>) {
        self.push(Severity::Warning, path, message.into());
    }

    /// An error at an explicit location (for example an unknown key, reported at the key).
    pub fn error_at(&mut self, loc: Loc, path: &KeyPath, message: impl Into<String>) {
        self.items.push(Diagnostic {
            severity: Severity::Error,
            file: self.file.clone(),
            loc,
            path: path.clone(),
            message: message.into(),
        });
    }

    fn push(&mut self, severity: Severity, path: &KeyPath, message: String) {
        let loc = path.locate(self.tree);
        self.items.push(Diagnostic {
            severity,
            file: self.file.clone(),
            loc,
            path: path.clone(),
            message,
        });
    }

    pub fn has_errors(&self) -> bool {
        self.items.iter().any(|d| d.severity == Severity::Error)
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::site::yaml::parse;

    #[test]
    fn paths_print_like_the_site_file_reads() {
        let p = KeyPath::root()
            .key("ground")
            .key("layers")
            .index(2)
            .key("conductivity");
        assert_eq!(p.to_string(), "ground.layers[2].conductivity");
    }

    #[test]
    fn a_path_locates_its_value_or_its_nearest_parent() {
        let tree = parse("ground:\n  layers:\n    - name: a\n      conductivity: 1\n").unwrap();
        let p = KeyPath::root()
            .key("ground")
            .key("layers")
            .index(0)
            .key("conductivity");
        assert_eq!(p.locate(&tree), Loc { line: 4, column: 21 });
        let missing = KeyPath::root()
            .key("ground")
            .key("layers")
            .index(0)
            .key("thickness");
        assert_eq!(missing.locate(&tree), Loc { line: 3, column: 7 });
    }
}

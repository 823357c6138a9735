//! YAML text → a tree of located nodes.
//!
//! The tree keeps the line and column of every value so that every later problem can be reported
//! where it stands in the file. Aliases are expanded here, under a budget: a document whose
//! expansion would exceed [`MAX_NODES`] is rejected (the "billion laughs" alias bomb), as is one
//! nested deeper than [`MAX_DEPTH`]. Scalars are resolved with the YAML 1.2 core schema
//! (`true`/`false`, `null`/`~`, integers and floats); quoted scalars are always strings.

use saphyr_parser::{Event, Parser, ScalarStyle};
use std::collections::HashMap;
use std::sync::Arc;

/// Most nodes a document may expand to, aliases included.
pub const MAX_NODES: usize = 200_000;
/// Most bytes of scalar text a document may expand to, aliases included (a site file is a few
/// kilobytes; the budget bounds memory whatever the aliases do).
pub const MAX_TEXT_BYTES: usize = 8 << 20;
/// Longest single scalar, in bytes (a site name, a description, a path).
pub const MAX_SCALAR_BYTES: usize = 10_000;
/// Deepest nesting of mappings and sequences.
pub const MAX_DEPTH: usize = 64;

/// A position in the source text: 1-based line and column.
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq)]
pub struct Loc {
    pub line: usize,
    pub column: usize,
}

#[derive(Clone, Debug, PartialEq)]
pub enum Value {
    Null,
    Bool(bool),
    Number(f64),
    String(String),
    Seq(Vec<Node>),
    /// Keys in document order; duplicates are rejected while parsing.
    Map(Vec<(Key, Node)>),
}

#[derive(Clone, Debug, PartialEq)]
pub struct Key {
    pub name: String,
    pub loc: Loc,
}

#[derive(Clone, Debug, PartialEq)]
pub struct Node {
    pub value: Value,
    pub loc: Loc,
}

/// A problem found while reading the YAML text itself.
#[derive(Clone, Debug, PartialEq)]
pub struct YamlError {
    pub loc: Loc,
    pub message: String,
}

/// Parses one YAML document. An empty document (only comments or blanks) is `Value::Null`.
pub fn parse(text: &str) -> Result<Node, YamlError> {
    let mut builder = Builder::default();
    for item in Parser::new_from_str(text) {
        let (event, span) = item.map_err(|e| YamlError {
            loc: Loc {
                line: e.marker().line(),
                column: e.marker().col() + 1,
            },
            message: format!("the YAML is malformed: {}", e.info()),
        })?;
        let loc = Loc {
            line: span.start.line(),
            column: span.start.col() + 1,
        };
        builder.event(event, loc)?;
    }
    Ok(builder.finish())
}

enum Frame {
    Seq {
        anchor: usize,
        loc: Loc,
        items: Vec<Node>,
    },
    Map {
        anchor: usize,
        loc: Loc,
        entries: Vec<(Key, Node)>,
        pending_key: Option<Key>,
        /// Where each key of `entries` stands, for the duplicate check in constant time.
        seen: HashMap<String, Loc>,
    },
}

#[derive(Default)]
struct Builder {
    stack: Vec<Frame>,
    /// Each anchor's node with its size in nodes and in scalar bytes.
    anchors: HashMap<usize, (Arc<Node>, usize, usize)>,
    nodes: usize,
    text_bytes: usize,
    aliases_used: bool,
    root: Option<Node>,
    documents: usize,
}

impl Builder {
    fn event(&mut self, event: Event<'_>, loc: Loc) -> Result<(), YamlError> {
        match event {
            Event::DocumentStart(_) => {
                self.documents += 1;
                if self.documents > 1 {
                    return Err(YamlError {
                        loc,
                        message: "a site file holds one YAML document, but a second one starts here; remove the `---` separator or split the file".into(),
                    });
                }
            }
            Event::Scalar(text, style, anchor, tag) => {
                let value = if tag.is_some() {
                    return Err(YamlError {
                        loc,
                        message: "YAML tags (`!name`) are not used in site files; remove the tag".into(),
                    });
                } else if text.len() > MAX_SCALAR_BYTES {
                    return Err(YamlError {
                        loc,
                        message: format!(
                            "this value is {} bytes long; a site file's values are at most {MAX_SCALAR_BYTES} bytes",
                            text.len()
                        ),
                    });
                } else {
                    resolve_scalar(&text, style)
                };
                self.spend_text(text.len(), loc)?;
                self.push(Node { value, loc }, anchor, loc)?;
            }
            Event::Alias(id) => {
                let (node, size, bytes) = self.anchors.get(&id).cloned().ok_or(YamlError {
                    loc,
                    message: "this alias refers to an anchor that is not defined before it".into(),
                })?;
                self.aliases_used = true;
                self.count(size, loc)?;
                self.spend_text(bytes, loc)?;
                let mut node = (*node).clone();
                node.loc = loc;
                self.attach(node, loc)?;
            }
            Event::SequenceStart(anchor, tag) | Event::MappingStart(anchor, tag) if tag.is_some() => {
                let _ = anchor;
                return Err(YamlError {
                    loc,
                    message: "YAML tags (`!name`) are not used in site files; remove the tag".into(),
                });
            }
            Event::SequenceStart(anchor, _) => {
                self.open(loc)?;
                self.stack.push(Frame::Seq {
                    anchor,
                    loc,
                    items: Vec::new(),
                });
            }
            Event::MappingStart(anchor, _) => {
                self.open(loc)?;
                self.stack.push(Frame::Map {
                    anchor,
                    loc,
                    entries: Vec::new(),
                    pending_key: None,
                    seen: HashMap::new(),
                });
            }
            Event::SequenceEnd | Event::MappingEnd => {
                let (node, anchor) = match self.stack.pop() {
                    Some(Frame::Seq { anchor, loc, items }) => (
                        Node {
                            value: Value::Seq(items),
                            loc,
                        },
                        anchor,
                    ),
                    Some(Frame::Map {
                        anchor, loc, entries, ..
                    }) => (
                        Node {
                            value: Value::Map(entries),
                            loc,
                        },
                        anchor,
                    ),
                    None => return Ok(()),
                };
                self.remember(anchor, &node);
                self.attach(node, loc)?;
            }
            Event::StreamStart | Event::StreamEnd | Event::DocumentEnd | Event::Nothing => {}
        }
        Ok(())
    }

    fn open(&mut self, loc: Loc) -> Result<(), YamlError> {
        if self.stack.len() >= MAX_DEPTH {
            return Err(YamlError {
                loc,
                message: format!("the YAML is nested more than {MAX_DEPTH} levels deep"),
            });
        }
        self.count(1, loc)
    }

    fn count(&mut self, n: usize, loc: Loc) -> Result<(), YamlError> {
        self.nodes = self.nodes.saturating_add(n);
        if self.nodes > MAX_NODES {
            return Err(YamlError {
                loc,
                message: if self.aliases_used {
                    format!(
                        "the document expands to more than {MAX_NODES} values through its aliases; a site file needs far fewer, so this looks like an alias bomb"
                    )
                } else {
                    format!(
                        "the document holds more than {MAX_NODES} values; a site file needs far fewer (long series belong in a CSV file named by the site file)"
                    )
                },
            });
        }
        Ok(())
    }

    fn spend_text(&mut self, bytes: usize, loc: Loc) -> Result<(), YamlError> {
        self.text_bytes = self.text_bytes.saturating_add(bytes);
        if self.text_bytes > MAX_TEXT_BYTES {
            return Err(YamlError {
                loc,
                message: format!(
                    "the document expands to more than {} MB of text{}; a site file needs far less",
                    MAX_TEXT_BYTES >> 20,
                    if self.aliases_used {
                        " through its aliases"
                    } else {
                        ""
                    }
                ),
            });
        }
        Ok(())
    }

    fn push(&mut self, node: Node, anchor: usize, loc: Loc) -> Result<(), YamlError> {
        self.count(1, loc)?;
        self.remember(anchor, &node);
        self.attach(node, loc)
    }

    fn remember(&mut self, anchor: usize, node: &Node) {
        if anchor != 0 {
            let (size, bytes) = node_size(node);
            self.anchors.insert(anchor, (Arc::new(node.clone()), size, bytes));
        }
    }

    fn attach(&mut self, node: Node, loc: Loc) -> Result<(), YamlError> {
        match self.stack.last_mut() {
            None => self.root = Some(node),
            Some(Frame::Seq { items, .. }) => items.push(node),
            Some(Frame::Map {
                entries,
                pending_key,
                seen,
                ..
            }) => match pending_key.take() {
                None => {
                    let name = match node.value {
                        Value::String(s) => s,
                        Value::Number(x) => format_number(x),
                        Value::Bool(b) => b.to_string(),
                        Value::Null => "null".into(),
                        Value::Seq(_) | Value::Map(_) => {
                            return Err(YamlError {
                                loc,
                                message: "a mapping key must be a plain name, not a list or a mapping".into(),
                            });
                        }
                    };
                    if name == "<<" {
                        return Err(YamlError {
                            loc,
                            message: "merge keys (`<<`) are not supported in site files; repeat the keys or use an alias for the whole value".into(),
                        });
                    }
                    if let Some(first) = seen.get(&name) {
                        return Err(YamlError {
                            loc,
                            message: format!(
                                "the key `{name}` appears twice in this mapping (first at line {}); keep one",
                                first.line
                            ),
                        });
                    }
                    seen.insert(name.clone(), node.loc);
                    *pending_key = Some(Key { name, loc: node.loc });
                }
                Some(key) => entries.push((key, node)),
            },
        }
        Ok(())
    }

    fn finish(self) -> Node {
        self.root.unwrap_or(Node {
            value: Value::Null,
            loc: Loc { line: 1, column: 1 },
        })
    }
}

/// Nodes and scalar bytes of a (sub)tree, keys included.
fn node_size(node: &Node) -> (usize, usize) {
    let add = |(n, b): (usize, usize), (m, c): (usize, usize)| (n.saturating_add(m), b.saturating_add(c));
    match &node.value {
        Value::Seq(items) => items.iter().map(node_size).fold((1, 0), add),
        Value::Map(entries) => entries
            .iter()
            .map(|(k, v)| add((1, k.name.len()), node_size(v)))
            .fold((1, 0), add),
        Value::String(s) => (1, s.len()),
        _ => (1, 8),
    }
}

fn format_number(x: f64) -> String {
    if x.fract() == 0.0 && x.abs() < 1e15 {
        format!("{}", x as i64)
    } else {
        format!("{x}")
    }
}

/// YAML 1.2 core schema resolution of a scalar (YAML 1.2.2 spec, §10.3.2).
fn resolve_scalar(text: &str, style: ScalarStyle) -> Value {
    if style != ScalarStyle::Plain {
        return Value::String(text.to_string());
    }
    match text {
        "" | "~" | "null" | "Null" | "NULL" => return Value::Null,
        "true" | "True" | "TRUE" => return Value::Bool(true),
        "false" | "False" | "FALSE" => return Value::Bool(false),
        _ => {}
    }
    if let Some(x) = parse_core_number(text) {
        return Value::Number(x);
    }
    Value::String(text.to_string())
}

/// Integers and finite floats of the core schema. `.nan` and `.inf` stay strings so that the
/// quantity reader can reject them with a clear message (they are never valid inputs here).
fn parse_core_number(text: &str) -> Option<f64> {
    let body = text.strip_prefix(['-', '+']).unwrap_or(text);
    if let Some(hex) = body.strip_prefix("0x") {
        return i64::from_str_radix(hex, 16).ok().map(|v| {
            let v = v as f64;
            if text.starts_with('-') { -v } else { v }
        });
    }
    if let Some(oct) = body.strip_prefix("0o") {
        return i64::from_str_radix(oct, 8).ok().map(|v| {
            let v = v as f64;
            if text.starts_with('-') { -v } else { v }
        });
    }
    let numeric = !body.is_empty()
        && body
            .chars()
            .all(|c| c.is_ascii_digit() || matches!(c, '.' | 'e' | 'E' | '+' | '-'))
        && body
            .chars()
            .next()
            .is_some_and(|c| c.is_ascii_digit() || c == '.')
        && body.chars().any(|c| c.is_ascii_digit());
    if !numeric {
        return None;
    }
    text.parse::<f64>().ok().filter(|x| x.is_finite())
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn scalars_follow_the_core_schema() {
        let n = parse("a: 1.5\nb: '1.5'\nc: true\nd: ~\ne: 110 mm\nf: .nan\ng: -3e2\n").unwrap();
        let Value::Map(entries) = n.value else {
            panic!("not a map")
        };
        let v: Vec<&Value> = entries.iter().map(|(_, n)| &n.value).collect();
        assert_eq!(v[0], &Value::Number(1.5));
        assert_eq!(v[1], &Value::String("1.5".into()));
        assert_eq!(v[2], &Value::Bool(true));
        assert_eq!(v[3], &Value::Null);
        assert_eq!(v[4], &Value::String("110 mm".into()));
        assert_eq!(v[5], &Value::String(".nan".into()));
        assert_eq!(v[6], &Value::Number(-300.0));
    }

    #[test]
    fn locations_are_one_based() {
        let n = parse("site:\n  name: x\n").unwrap();
        let Value::Map(e) = n.value else { panic!() };
        assert_eq!(e[0].0.loc, Loc { line: 1, column: 1 });
        let Value::Map(inner) = &e[0].1.value else {
            panic!()
        };
        assert_eq!(inner[0].1.loc, Loc { line: 2, column: 9 });
    }

    #[test]
    fn alias_bomb_is_refused() {
        let mut text = String::from("a0: &a0 [x, x, x, x, x, x, x, x, x, x]\n");
        for i in 1..9 {
            let p = i - 1;
            text.push_str(&format!(
                "a{i}: &a{i} [*a{p}, *a{p}, *a{p}, *a{p}, *a{p}, *a{p}, *a{p}, *a{p}, *a{p}, *a{p}]\n"
            ));
        }
        let err = parse(&text).unwrap_err();
        assert!(err.message.contains("alias bomb"), "{}", err.message);
    }

    #[test]
    fn small_aliases_are_expanded() {
        let n = parse("a: &l {k: 1}\nb: *l\n").unwrap();
        let Value::Map(e) = n.value else { panic!() };
        assert_eq!(e[0].1.value, e[1].1.value);
    }

    #[test]
    fn duplicate_keys_are_refused_with_both_lines() {
        let err = parse("a: 1\nb: 2\na: 3\n").unwrap_err();
        assert_eq!(err.loc.line, 3);
        assert!(err.message.contains("line 1"));
    }

    #[test]
    fn empty_text_is_null() {
        assert_eq!(parse("# nothing\n").unwrap().value, Value::Null);
    }

    #[test]
    fn syntax_error_is_located() {
        let err = parse("a: [1, 2\nb: 3\n").unwrap_err();
        assert!(err.loc.line >= 1);
        assert!(err.message.starts_with("the YAML is malformed"));
    }
}

//! Setting values at key paths of a site file *as written*, on its located tree, before the tree
//! is checked and validated as usual — the mechanism by which one site file is varied (the
//! uncertainty study) or filled in per row (an inventory).
//!
//! A path names keys from the top: `ground.layers[1].conductivity`,
//! `studies[trunk].pipes[0].layers[1].conductivity`. In brackets: a 0-based index, the `id` of an
//! element (a study, a pipe), or `*` for every element of the list. The last key may be new (its
//! mapping must exist), so an optional key can be set; every other step must exist. The new
//! value keeps the location of the value it replaces (or of its mapping), so every later
//! message about it points at the key in the file.

use super::yaml::{Key, Loc, Node, Value};

/// One step of a key path.
#[derive(Clone, Debug, PartialEq)]
pub enum Step {
    Key(String),
    Index(usize),
    Id(String),
    All,
}

/// A parsed key path.
#[derive(Clone, Debug, PartialEq)]
pub struct Path {
    pub text: String,
    pub steps: Vec<Step>,
}

/// Longest key path accepted, in characters.
pub const MAX_PATH_LEN: usize = 500;

impl std::str::FromStr for Path {
    type Err = String;

    fn from_str(text: &str) -> Result<Self, String> {
        parse(text)
    }
}

/// Parses `a.b[2].c[id].d[*]`. A path that YAML split (an unquoted `[` starts a list there) or
/// one with empty parts is refused with a sentence saying so.
pub fn parse(text: &str) -> Result<Path, String> {
    if text.chars().count() > MAX_PATH_LEN {
        return Err(format!(
            "a key path may be at most {MAX_PATH_LEN} characters long"
        ));
    }
    let mut steps = Vec::new();
    let mut rest = text.trim();
    if rest.is_empty() {
        return Err("the key path is empty; name a key such as `ground.layers[0].conductivity`".into());
    }
    let mut expect_key = true;
    while !rest.is_empty() {
        if let Some(r) = rest.strip_prefix('[') {
            let end = r
                .find(']')
                .ok_or_else(|| format!("the key path `{text}` opens a `[` it does not close"))?;
            let inside = r[..end].trim();
            steps.push(if inside == "*" {
                Step::All
            } else if let Ok(i) = inside.parse::<usize>() {
                Step::Index(i)
            } else if inside.is_empty() {
                return Err(format!(
                    "the key path `{text}` has an empty `[]`; give an index, an id or `*`"
                ));
            } else {
                Step::Id(inside.to_string())
            });
            rest = &r[end + 1..];
            expect_key = false;
            continue;
        }
        if let Some(r) = rest.strip_prefix('.') {
            if expect_key {
                return Err(format!("the key path `{text}` has a `.` with no key before it"));
            }
            rest = r;
            expect_key = true;
            continue;
        }
        if !expect_key {
            return Err(format!("the key path `{text}` needs a `.` before `{rest}`"));
        }
        let end = rest.find(['.', '[']).unwrap_or(rest.len());
        let key = rest[..end].trim();
        if key.is_empty() || key.contains(']') {
            return Err(format!("the key path `{text}` has an empty or broken key"));
        }
        steps.push(Step::Key(key.to_string()));
        rest = &rest[end..];
        expect_key = false;
    }
    if expect_key {
        return Err(format!("the key path `{text}` ends with a `.`"));
    }
    if !matches!(steps.first(), Some(Step::Key(_))) {
        return Err(format!(
            "the key path `{text}` must start with a key such as `ground` or `studies`"
        ));
    }
    Ok(Path {
        text: text.to_string(),
        steps,
    })
}

/// What a successful set did.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Set {
    /// Values replaced (an existing key) and created (a key that was not in the file).
    pub replaced: usize,
    pub created: usize,
}

/// Sets `value` at `path` in `tree` (every element where the path holds `[*]`). Fails, changing
/// nothing, with one sentence naming the step that does not exist.
pub fn set(tree: &mut Node, path: &Path, value: &Value) -> Result<Set, String> {
    // Resolve first on a shared borrow so that a failure changes nothing.
    walk(tree, &path.steps, &path.text, &mut |_| {})?;
    let mut set = Set {
        replaced: 0,
        created: 0,
    };
    walk(tree, &path.steps, &path.text, &mut |target| match target {
        Target::Existing(node) => {
            node.value = value.clone();
            set.replaced += 1;
        }
        Target::New(map, loc, key) => {
            map.push((
                Key {
                    name: key.to_string(),
                    loc,
                },
                Node {
                    value: value.clone(),
                    loc,
                },
            ));
            set.created += 1;
        }
    })?;
    Ok(set)
}

/// Reads the value at `path` (the first element where it holds `[*]`); `None` when a step is
/// missing.
pub fn get<'a>(tree: &'a Node, path: &Path) -> Option<&'a Node> {
    let mut node = tree;
    for step in &path.steps {
        node = match (step, &node.value) {
            (Step::Key(k), Value::Map(items)) => &items.iter().find(|(key, _)| key.name == *k)?.1,
            (Step::Index(i), Value::Seq(items)) => items.get(*i)?,
            (Step::Id(id), Value::Seq(items)) => items.iter().find(|n| element_id(n) == Some(id))?,
            (Step::All, Value::Seq(items)) => items.first()?,
            _ => return None,
        };
    }
    Some(node)
}

enum Target<'a> {
    Existing(&'a mut Node),
    New(&'a mut Vec<(Key, Node)>, Loc, &'a str),
}

fn element_id(node: &Node) -> Option<&String> {
    match &node.value {
        Value::Map(items) => items
            .iter()
            .find(|(k, _)| k.name == "id")
            .and_then(|(_, v)| match &v.value {
                Value::String(s) => Some(s),
                _ => None,
            }),
        _ => None,
    }
}

fn ids(items: &[Node]) -> String {
    let ids: Vec<&str> = items.iter().filter_map(element_id).map(String::as_str).collect();
    if ids.is_empty() {
        "its elements have no ids".into()
    } else {
        format!("the ids are {}", ids.join(", "))
    }
}

fn walk<'a>(
    node: &'a mut Node,
    steps: &'a [Step],
    text: &str,
    f: &mut dyn FnMut(Target<'_>),
) -> Result<(), String> {
    let Some((step, rest)) = steps.split_first() else {
        f(Target::Existing(node));
        return Ok(());
    };
    let loc = node.loc;
    match (step, &mut node.value) {
        (Step::Key(k), Value::Map(items)) => match items.iter().position(|(key, _)| key.name == *k) {
            Some(i) => walk(&mut items[i].1, rest, text, f),
            None if rest.is_empty() => {
                f(Target::New(items, loc, k));
                Ok(())
            }
            None => Err(format!(
                "the key path `{text}` names `{k}`, which the site file does not have there"
            )),
        },
        (Step::Index(i), Value::Seq(items)) => {
            let n = items.len();
            match items.get_mut(*i) {
                Some(item) => walk(item, rest, text, f),
                None => Err(format!(
                    "the key path `{text}` asks for element [{i}] of a list of {n} (indices start at 0)"
                )),
            }
        }
        (Step::Id(id), Value::Seq(items)) => {
            let listed = ids(items);
            match items.iter_mut().find(|n| element_id(n) == Some(id)) {
                Some(item) => walk(item, rest, text, f),
                None => Err(format!(
                    "the key path `{text}` names the id `{id}`, which no element has ({listed})"
                )),
            }
        }
        (Step::All, Value::Seq(items)) => {
            if items.is_empty() {
                return Err(format!(
                    "the key path `{text}` takes every element of an empty list"
                ));
            }
            for item in items.iter_mut() {
                walk(item, rest, text, f)?;
            }
            Ok(())
        }
        (Step::Key(k), _) => Err(format!(
            "the key path `{text}` looks for `{k}` inside a value that is not a mapping"
        )),
        (_, _) => Err(format!(
            "the key path `{text}` uses `[..]` on a value that is not a list"
        )),
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::site::yaml::parse as yaml;

    const SITE: &str = "\
ground:
  layers:
    - {name: fill, thickness: 0.6 m, conductivity: 1.4}
    - {name: clay, conductivity: 1.1}
studies:
  - id: trunk
    pipes:
      - {id: supply, depth: 1.0 m}
      - {id: return, depth: 1.0 m}
";

    fn at(tree: &Node, p: &str) -> Value {
        get(tree, &parse(p).unwrap()).unwrap().value.clone()
    }

    #[test]
    fn paths_parse_into_keys_indices_ids_and_every_element() {
        let p = parse("studies[trunk].pipes[*].layers[1].conductivity").unwrap();
        assert_eq!(
            p.steps,
            vec![
                Step::Key("studies".into()),
                Step::Id("trunk".into()),
                Step::Key("pipes".into()),
                Step::All,
                Step::Key("layers".into()),
                Step::Index(1),
                Step::Key("conductivity".into()),
            ]
        );
        for bad in ["", "a.", ".a", "a[", "a[]", "[0].a", "a[0]b", "a..b"] {
            assert!(parse(bad).is_err(), "{bad:?} should be refused");
        }
    }

    #[test]
    fn a_value_is_replaced_by_index_and_by_id_keeping_its_location() {
        let mut tree = yaml(SITE).unwrap();
        let before = get(&tree, &parse("ground.layers[1].conductivity").unwrap())
            .unwrap()
            .loc;
        let s = set(
            &mut tree,
            &parse("ground.layers[1].conductivity").unwrap(),
            &Value::Number(1.3),
        )
        .unwrap();
        assert_eq!(
            s,
            Set {
                replaced: 1,
                created: 0
            }
        );
        assert_eq!(at(&tree, "ground.layers[1].conductivity"), Value::Number(1.3));
        assert_eq!(
            get(&tree, &parse("ground.layers[1].conductivity").unwrap())
                .unwrap()
                .loc,
            before
        );
        assert_eq!(at(&tree, "ground.layers[0].conductivity"), Value::Number(1.4));
        set(
            &mut tree,
            &parse("studies[trunk].pipes[return].depth").unwrap(),
            &Value::String("1.2 m".into()),
        )
        .unwrap();
        assert_eq!(
            at(&tree, "studies[0].pipes[1].depth"),
            Value::String("1.2 m".into())
        );
        assert_eq!(
            at(&tree, "studies[0].pipes[0].depth"),
            Value::String("1.0 m".into())
        );
    }

    #[test]
    fn every_element_takes_the_value_and_a_missing_last_key_is_created() {
        let mut tree = yaml(SITE).unwrap();
        let s = set(
            &mut tree,
            &parse("studies[0].pipes[*].cover").unwrap(),
            &Value::Number(0.9),
        )
        .unwrap();
        assert_eq!(
            s,
            Set {
                replaced: 0,
                created: 2
            }
        );
        assert_eq!(at(&tree, "studies[0].pipes[1].cover"), Value::Number(0.9));
        let s = set(
            &mut tree,
            &parse("ground.layers[*].water_content").unwrap(),
            &Value::Number(0.2),
        )
        .unwrap();
        assert_eq!(s.created, 2);
    }

    #[test]
    fn a_missing_step_is_refused_and_changes_nothing() {
        let mut tree = yaml(SITE).unwrap();
        let copy = tree.clone();
        let e = set(
            &mut tree,
            &parse("studies[main].pipes[0].depth").unwrap(),
            &Value::Number(1.0),
        )
        .unwrap_err();
        assert!(e.contains("`main`") && e.contains("trunk"), "{e}");
        let e = set(
            &mut tree,
            &parse("ground.layers[5].conductivity").unwrap(),
            &Value::Number(1.0),
        )
        .unwrap_err();
        assert!(e.contains("[5]") && e.contains("2"), "{e}");
        let e = set(&mut tree, &parse("climate.mean").unwrap(), &Value::Number(1.0)).unwrap_err();
        assert!(e.contains("climate"), "{e}");
        // `[*]` over pipes where the second lacks the step: nothing is set on the first either.
        let e = set(
            &mut tree,
            &parse("ground.layers[*].thickness.x").unwrap(),
            &Value::Number(1.0),
        )
        .unwrap_err();
        assert!(e.contains("not a mapping") || e.contains("does not have"), "{e}");
        assert_eq!(tree, copy);
    }
}

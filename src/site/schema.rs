//! The JSON Schema of the site file, generated from the types in `doc`, and the structural check
//! of a YAML tree against it.
//!
//! The check runs before deserialisation so that *every* structural problem (missing key, unknown
//! key, wrong type, unknown enum value) is reported at once with its location, instead of the
//! first one serde meets. It understands the subset of JSON Schema that schemars emits for our
//! types: `$ref`/`$defs`, `type`, `properties`, `required`, `additionalProperties`, `enum`,
//! `const`, `oneOf`/`anyOf` (internally tagged enums are dispatched on their tag), `items`,
//! `minItems`/`maxItems`, `minimum`/`maximum`.

use super::diagnostic::{Collector, KeyPath};
use super::doc::SiteDoc;
use super::yaml::{Node, Value};
use serde_json::{Map, Value as Json};

/// The site-file schema, with each physical field's unit spelled out in its description.
pub fn site_schema() -> Json {
    let schema = schemars::schema_for!(SiteDoc);
    let mut json = schema.to_value();
    if let Some(obj) = json.as_object_mut() {
        obj.insert(
            "$id".into(),
            Json::String("https://burrow.invalid/schemas/site.schema.json".into()),
        );
    }
    add_units_to_descriptions(&mut json);
    json
}

/// The schema as the committed `schemas/site.schema.json` holds it.
pub fn site_schema_text() -> String {
    let mut text = serde_json::to_string_pretty(&site_schema()).expect("a JSON value prints");
    text.push('\n');
    text
}

fn add_units_to_descriptions(json: &mut Json) {
    match json {
        Json::Object(obj) => {
            if let (Some(Json::String(unit)), Some(Json::String(desc))) =
                (obj.get("x-unit").cloned(), obj.get_mut("description"))
                && !desc.contains("plain number")
            {
                let sep = if desc.ends_with('.') { " " } else { ". " };
                if unit.is_empty() {
                    desc.push_str(&format!(
                        "{sep}A plain number is a fraction of 1 (0.25), or write a percentage (`25 %`)."
                    ));
                } else {
                    desc.push_str(&format!(
                        "{sep}A plain number is in {unit}; a string may carry its own unit."
                    ));
                }
            }
            for v in obj.values_mut() {
                add_units_to_descriptions(v);
            }
        }
        Json::Array(items) => items.iter_mut().for_each(add_units_to_descriptions),
        _ => {}
    }
}

/// Checks the tree's structure against the schema; every problem goes into `out`.
pub fn check_structure(tree: &Node, schema: &Json, out: &mut Collector<'_>) {
    let checker = Checker { root: schema };
    checker.check(tree, schema, &KeyPath::root(), out);
}

struct Checker<'s> {
    root: &'s Json,
}

impl<'s> Checker<'s> {
    fn resolve(&self, schema: &'s Json) -> &'s Json {
        let mut s = schema;
        for _ in 0..16 {
            match s.get("$ref").and_then(Json::as_str) {
                Some(r) => {
                    let name = r.trim_start_matches("#/$defs/");
                    match self.root.get("$defs").and_then(|d| d.get(name)) {
                        Some(target) => s = target,
                        None => return s,
                    }
                }
                None => return s,
            }
        }
        s
    }

    fn check(&self, node: &Node, schema: &'s Json, path: &KeyPath, out: &mut Collector<'_>) {
        let schema = self.resolve(schema);
        if let Some(all) = schema.get("allOf").and_then(Json::as_array) {
            for s in all {
                self.check(node, s, path, out);
            }
        }
        if let Some(alts) = schema
            .get("oneOf")
            .or_else(|| schema.get("anyOf"))
            .and_then(Json::as_array)
        {
            self.check_alternatives(node, schema, alts, path, out);
        }
        if let Some(types) = schema.get("type")
            && !type_matches(node, types)
        {
            out.error(
                path,
                format!(
                    "expected {}, but found {}",
                    describe_types(types),
                    describe_node(node)
                ),
            );
            return;
        }
        if let Some(options) = schema.get("enum").and_then(Json::as_array)
            && !options.iter().any(|o| node_equals(node, o))
        {
            let given = describe_node(node);
            out.error(
                path,
                format!(
                    "{given} is not allowed here; use one of: {}",
                    list_values(options)
                ),
            );
        }
        if let Some(c) = schema.get("const")
            && !node_equals(node, c)
        {
            out.error(path, format!("expected {c}, but found {}", describe_node(node)));
        }
        match &node.value {
            Value::Map(entries) => self.check_object(node, entries, schema, path, out),
            Value::Seq(items) => self.check_array(node, items, schema, path, out),
            Value::Number(x) => check_bounds(*x, schema, path, out),
            _ => {}
        }
    }

    fn check_object(
        &self,
        node: &Node,
        entries: &[(super::yaml::Key, Node)],
        schema: &'s Json,
        path: &KeyPath,
        out: &mut Collector<'_>,
    ) {
        let empty = Map::new();
        let props = schema
            .get("properties")
            .and_then(Json::as_object)
            .unwrap_or(&empty);
        let closed = schema.get("additionalProperties") == Some(&Json::Bool(false));
        for (key, value) in entries {
            let child = path.key(&key.name);
            match props.get(&key.name) {
                Some(s) => self.check(value, s, &child, out),
                None if closed => {
                    if let Some(new) = schema
                        .get("x-renamed")
                        .and_then(|r| r.get(&key.name))
                        .and_then(Json::as_str)
                    {
                        out.error_at(
                            key.loc,
                            &child,
                            format!(
                                "`{}` is not a key of burrow's site file: write `{new}` instead",
                                key.name
                            ),
                        );
                        continue;
                    }
                    let allowed: Vec<&str> = props.keys().map(String::as_str).collect();
                    let hint = closest(&key.name, &allowed)
                        .map(|c| format!(" (did you mean `{c}`?)"))
                        .unwrap_or_default();
                    out.error_at(
                        key.loc,
                        &child,
                        format!(
                            "unknown key `{}`{hint}; allowed here: {}",
                            key.name,
                            allowed.join(", ")
                        ),
                    );
                }
                None => {}
            }
        }
        if let Some(required) = schema.get("required").and_then(Json::as_array) {
            for r in required.iter().filter_map(Json::as_str) {
                if !entries.iter().any(|(k, _)| k.name == r) {
                    let what = props
                        .get(r)
                        .map(|s| self.resolve(s))
                        .and_then(|s| s.get("description"))
                        .and_then(Json::as_str)
                        .map(|d| format!(" ({})", first_sentence(d)))
                        .unwrap_or_default();
                    out.error_at(
                        node.loc,
                        &path.key(r),
                        format!("the required key `{r}` is missing{what}"),
                    );
                }
            }
        }
    }

    fn check_array(
        &self,
        _node: &Node,
        items: &[Node],
        schema: &'s Json,
        path: &KeyPath,
        out: &mut Collector<'_>,
    ) {
        let min = schema.get("minItems").and_then(Json::as_u64);
        let max = schema.get("maxItems").and_then(Json::as_u64);
        let n = items.len() as u64;
        match (min, max) {
            (Some(a), Some(b)) if a == b && n != a => out.error(
                path,
                format!("expected a list of exactly {a} values, but it has {n}"),
            ),
            (Some(a), _) if n < a => out.error(
                path,
                format!("expected a list of at least {a} values, but it has {n}"),
            ),
            (_, Some(b)) if n > b => out.error(
                path,
                format!("expected a list of at most {b} values, but it has {n}"),
            ),
            _ => {}
        }
        if let Some(item_schema) = schema.get("items") {
            for (i, item) in items.iter().enumerate() {
                self.check(item, item_schema, &path.index(i), out);
            }
        }
    }

    fn check_alternatives(
        &self,
        node: &Node,
        parent: &'s Json,
        alts: &'s [Json],
        path: &KeyPath,
        out: &mut Collector<'_>,
    ) {
        let alts: Vec<&Json> = alts.iter().map(|a| self.resolve(a)).collect();
        if let (Value::Map(entries), Some(tag)) = (&node.value, tag_key(&alts)) {
            let options: Vec<&str> = alts.iter().filter_map(|a| tag_value(a, &tag)).collect();
            let given = entries.iter().find(|(k, _)| k.name == tag);
            match given {
                None => out.error(
                    &path.key(&tag),
                    format!(
                        "the required key `{tag}` is missing; use one of: {}",
                        options.join(", ")
                    ),
                ),
                Some((_, v)) => {
                    let chosen = alts
                        .iter()
                        .find(|a| matches!(&v.value, Value::String(s) if tag_value(a, &tag) == Some(s)));
                    match chosen {
                        Some(a) => self.check(node, a, path, out),
                        None => {
                            // Kinds the product defines but this version cannot run yet.
                            let planned = parent
                                .get(format!("x-planned-{tag}s"))
                                .and_then(Json::as_array)
                                .is_some_and(|p| p.iter().any(|k| node_equals(v, k)));
                            let what = if planned {
                                format!("the {tag} {} is not supported yet", describe_node(v))
                            } else {
                                format!("{} is not a known `{tag}`", describe_node(v))
                            };
                            out.error(
                                &path.key(&tag),
                                format!("{what}; use one of: {}", options.join(", ")),
                            );
                        }
                    }
                }
            }
            return;
        }
        let mut trial = Collector::new(&out.file, out.tree);
        for a in &alts {
            trial.items.clear();
            self.check(node, a, path, &mut trial);
            if !trial.has_errors() {
                return;
            }
        }
        // No alternative fits: explain against the one whose type matches, if exactly one does.
        let typed: Vec<&&Json> = alts
            .iter()
            .filter(|a| a.get("type").is_some_and(|t| type_matches(node, t)))
            .collect();
        if typed.len() == 1 {
            self.check(node, typed[0], path, out);
        } else {
            let expected: Vec<String> = alts
                .iter()
                .filter_map(|a| a.get("type"))
                .map(describe_types)
                .collect();
            out.error(
                path,
                format!(
                    "expected {}, but found {}",
                    if expected.is_empty() {
                        "a different value".to_string()
                    } else {
                        expected.join(" or ")
                    },
                    describe_node(node)
                ),
            );
        }
    }
}

/// The key that tags an internally tagged enum: a property that every alternative requires and
/// fixes to one string.
fn tag_key(alts: &[&Json]) -> Option<String> {
    let first = alts.first()?;
    let props = first.get("properties")?.as_object()?;
    props
        .keys()
        .find(|k| alts.iter().all(|a| tag_value(a, k).is_some()))
        .cloned()
}

fn tag_value<'a>(alt: &'a Json, key: &str) -> Option<&'a str> {
    let p = alt.get("properties")?.get(key)?;
    if let Some(c) = p.get("const").and_then(Json::as_str) {
        return Some(c);
    }
    match p.get("enum").and_then(Json::as_array) {
        Some(e) if e.len() == 1 => e[0].as_str(),
        _ => None,
    }
}

fn check_bounds(x: f64, schema: &Json, path: &KeyPath, out: &mut Collector<'_>) {
    if let Some(min) = schema.get("minimum").and_then(Json::as_f64)
        && x < min
    {
        out.error(path, format!("{x} is below the smallest allowed value, {min}"));
    }
    if let Some(max) = schema.get("maximum").and_then(Json::as_f64)
        && x > max
    {
        out.error(path, format!("{x} is above the largest allowed value, {max}"));
    }
}

fn type_matches(node: &Node, types: &Json) -> bool {
    let one = |t: &str| match (t, &node.value) {
        ("null", Value::Null)
        | ("boolean", Value::Bool(_))
        | ("number", Value::Number(_))
        | ("string", Value::String(_))
        | ("array", Value::Seq(_))
        | ("object", Value::Map(_)) => true,
        ("integer", Value::Number(x)) => x.fract() == 0.0,
        _ => false,
    };
    match types {
        Json::String(t) => one(t),
        Json::Array(ts) => ts.iter().filter_map(Json::as_str).any(one),
        _ => true,
    }
}

fn describe_types(types: &Json) -> String {
    let one = |t: &str| match t {
        "null" => "nothing",
        "boolean" => "true or false",
        "number" => "a number",
        "integer" => "a whole number",
        "string" => "text",
        "array" => "a list",
        "object" => "a mapping of keys to values",
        _ => "a value",
    };
    match types {
        Json::String(t) => one(t).to_string(),
        Json::Array(ts) => {
            // "null" only says the key may be left empty: not worth a word in the message.
            let words: Vec<&str> = ts
                .iter()
                .filter_map(Json::as_str)
                .filter(|t| *t != "null" || ts.len() == 1)
                .map(one)
                .collect();
            if words == ["a number", "text"] {
                "a number or a quantity with a unit".to_string()
            } else {
                words.join(" or ")
            }
        }
        _ => "a value".to_string(),
    }
}

/// How a value reads in a message.
pub fn describe_node(node: &Node) -> String {
    match &node.value {
        Value::Null => "nothing (an empty value)".to_string(),
        Value::Bool(b) => format!("`{b}`"),
        Value::Number(x) => format!("the number {x}"),
        Value::String(s) => format!("`{}`", truncate(s, 40)),
        Value::Seq(_) => "a list".to_string(),
        Value::Map(_) => "a mapping".to_string(),
    }
}

fn truncate(s: &str, n: usize) -> String {
    if s.chars().count() <= n {
        s.to_string()
    } else {
        format!("{}…", s.chars().take(n).collect::<String>())
    }
}

fn node_equals(node: &Node, json: &Json) -> bool {
    match (&node.value, json) {
        (Value::String(s), Json::String(j)) => s == j,
        (Value::Number(x), Json::Number(j)) => j.as_f64() == Some(*x),
        (Value::Bool(b), Json::Bool(j)) => b == j,
        (Value::Null, Json::Null) => true,
        _ => false,
    }
}

fn list_values(options: &[Json]) -> String {
    options
        .iter()
        .map(|o| match o {
            Json::String(s) => s.clone(),
            other => other.to_string(),
        })
        .collect::<Vec<_>>()
        .join(", ")
}

/// The first sentence of a description, on one line (doc comments wrap).
fn first_sentence(text: &str) -> String {
    let text = text.split_whitespace().collect::<Vec<_>>().join(" ");
    let end = text.find(". ").map(|i| i + 1).unwrap_or(text.len());
    text[..end].trim_end_matches('.').to_string()
}

/// The allowed name nearest to a misspelt one, when it is close enough to be a likely typo.
fn closest<'a>(given: &str, allowed: &[&'a str]) -> Option<&'a str> {
    allowed
        .iter()
        .map(|a| (edit_distance(given, a), *a))
        .filter(|(d, a)| *d <= 2.max(a.len() / 4))
        .min_by_key(|(d, _)| *d)
        .map(|(_, a)| a)
}

fn edit_distance(a: &str, b: &str) -> usize {
    let b: Vec<char> = b.chars().collect();
    let mut prev: Vec<usize> = (0..=b.len()).collect();
    for (i, ca) in a.chars().enumerate() {
        let mut cur = vec![i + 1];
        for (j, cb) in b.iter().enumerate() {
            let sub = prev[j] + usize::from(ca != *cb);
            cur.push(sub.min(prev[j + 1] + 1).min(cur[j] + 1));
        }
        prev = cur;
    }
    prev[b.len()]
}

/// The tree as JSON, for serde to deserialise once the structure has been checked.
pub fn to_json(node: &Node) -> Json {
    match &node.value {
        Value::Null => Json::Null,
        Value::Bool(b) => Json::Bool(*b),
        Value::Number(x) if x.fract() == 0.0 && x.abs() < 9.0e15 => Json::from(*x as i64),
        Value::Number(x) => serde_json::Number::from_f64(*x)
            .map(Json::Number)
            .unwrap_or(Json::Null),
        Value::String(s) => Json::String(s.clone()),
        Value::Seq(items) => Json::Array(items.iter().map(to_json).collect()),
        Value::Map(entries) => Json::Object(
            entries
                .iter()
                .map(|(k, v)| (k.name.clone(), to_json(v)))
                .collect(),
        ),
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn edit_distance_counts_single_edits() {
        assert_eq!(edit_distance("conductivty", "conductivity"), 1);
        assert_eq!(edit_distance("abc", "abc"), 0);
        assert_eq!(closest("thicknes", &["thickness", "name"]), Some("thickness"));
        assert_eq!(closest("zzz", &["thickness", "name"]), None);
    }
}

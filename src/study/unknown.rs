//! Keys of a project file this version does not know, kept inside the objects that have no
//! map of their own (a case's input, the measure, a note's pin), found again by name or place
//! and written back on save.

/// Keys of a project file this version of Planewise does not know (written by a newer one, or
/// by hand): kept as they were read, written back on save, and named in one warning.
pub type UnknownKeys = serde_json::Map<String, serde_json::Value>;

/// Unknown keys inside the objects this version knows but keeps no map of its own for (a
/// case's input, the measure, a note's pin…): what the file held less what the project writes
/// back, kept so that a save writes them back where they were.
#[derive(Clone, Debug, PartialEq, Default)]
pub struct UnknownInside {
    /// Keys of this object this version does not know, with their values.
    pub keys: UnknownKeys,
    /// Keys not written back whose value is empty (null, "", [] or {}): most are known keys
    /// left out when empty (a caption's pin, an empty revision); restored, never warned about.
    pub empty: UnknownKeys,
    /// Known keys whose objects or lists hold unknown keys.
    pub within: std::collections::BTreeMap<String, UnknownInside>,
    /// The items of a list holding unknown keys: found again by their `name` where they have
    /// one, else by place (then only while the list keeps its length).
    pub items: Vec<(ItemAt, UnknownInside)>,
    /// The list's length when it was read.
    pub length: usize,
    /// The object's `kind` when it was read (a case input): an object of another kind now
    /// takes none of the old kind's keys.
    pub kind: Option<serde_json::Value>,
}

/// Where an item of a list is found again.
#[derive(Clone, Debug, PartialEq)]
pub enum ItemAt {
    /// By its `name`.
    Name(String),
    /// By its place.
    Index(usize),
}

impl UnknownInside {
    /// What `read` (the file's JSON) holds that `known` (the same project written back) does
    /// not; `None` when nothing.
    #[must_use]
    pub fn between(read: &serde_json::Value, known: &serde_json::Value) -> Option<Self> {
        use serde_json::Value;
        let mut out = Self::default();
        match (read, known) {
            (Value::Object(r), Value::Object(k)) => {
                out.kind = r.get("kind").cloned();
                for (key, value) in r {
                    let empty = match value {
                        Value::Null => true,
                        Value::String(t) => t.is_empty(),
                        Value::Array(a) => a.is_empty(),
                        Value::Object(o) => o.is_empty(),
                        _ => false,
                    };
                    match k.get(key) {
                        None if empty => {
                            out.empty.insert(key.clone(), value.clone());
                        }
                        None => {
                            out.keys.insert(key.clone(), value.clone());
                        }
                        Some(known) => {
                            if let Some(inside) = Self::between(value, known) {
                                out.within.insert(key.clone(), inside);
                            }
                        }
                    }
                }
            }
            (Value::Array(r), Value::Array(k)) => {
                out.length = r.len();
                for (i, (value, known)) in r.iter().zip(k).enumerate() {
                    if let Some(inside) = Self::between(value, known) {
                        let at = value
                            .get("name")
                            .and_then(Value::as_str)
                            .map_or(ItemAt::Index(i), |n| ItemAt::Name(n.to_owned()));
                        out.items.push((at, inside));
                    }
                }
            }
            _ => {}
        }
        (!out.keys.is_empty()
            || !out.empty.is_empty()
            || !out.within.is_empty()
            || !out.items.is_empty())
        .then_some(out)
    }

    /// Writes the kept keys back into `value` (the project as it is now): into the same object
    /// while its `kind` is unchanged; never over a key the project writes.
    pub fn restore(&self, value: &mut serde_json::Value) {
        use serde_json::Value;
        match value {
            Value::Object(map) => {
                if self.kind.is_some() && map.get("kind") != self.kind.as_ref() {
                    return;
                }
                for (key, v) in self.keys.iter().chain(&self.empty) {
                    map.entry(key.clone()).or_insert_with(|| v.clone());
                }
                for (key, inside) in &self.within {
                    if let Some(target) = map.get_mut(key) {
                        inside.restore(target);
                    }
                }
            }
            Value::Array(items) => {
                let same_length = items.len() == self.length;
                for (at, inside) in &self.items {
                    let target = match at {
                        ItemAt::Name(n) => items
                            .iter_mut()
                            .find(|v| v.get("name").and_then(Value::as_str) == Some(n)),
                        ItemAt::Index(i) if same_length => items.get_mut(*i),
                        ItemAt::Index(_) => None,
                    };
                    if let Some(target) = target {
                        inside.restore(target);
                    }
                }
            }
            _ => {}
        }
    }

    /// Where each kept key sits (`measure.colour`, `cases[2].input.gauge_factor`), under
    /// `place`.
    pub fn paths(&self, place: &str, out: &mut Vec<String>) {
        let join = |k: &str| {
            if place.is_empty() {
                k.to_owned()
            } else {
                format!("{place}.{k}")
            }
        };
        out.extend(self.keys.keys().map(|k| join(k)));
        for (k, inside) in &self.within {
            inside.paths(&join(k), out);
        }
        for (at, inside) in &self.items {
            let here = match at {
                ItemAt::Name(n) => format!("{place}[{n:?}]"),
                ItemAt::Index(i) => format!("{place}[{i}]"),
            };
            inside.paths(&here, out);
        }
    }
}

//! Reading and writing the stored documents (the review deck, the practice history) by hand.
//!
//! Like the set file, a stored document is a compatibility boundary, so its JSON is written
//! and read by hand over `serde_json::Value` rather than derived: the shape on disk is spelled
//! out in one place, and the code is small. On a test crate, derived readers and writers for
//! the deck and the history came to about 250 KB of WebAssembly, the hand-written ones to about
//! a third of that, most of the rest being the `Value` reader the set file already brings.
//!
//! Readers return a message that starts with the field it is about, so that the document's
//! own error can say where. They are kept out of line (`#[inline(never)]`): inlined into every
//! call site they double the size of the readers for no measurable speed. Numbers that are stored as decimals are rounded to six places
//! first ([`six_places`]) so that a document reads back bit for bit.

use std::fmt::Display;
use std::str::FromStr;

use serde_json::{Map, Value};

/// A JSON object.
pub(crate) type Object = Map<String, Value>;

/// Why stored text is not a versioned document of ours (see [`open`]).
pub(crate) enum Opening {
    /// Not JSON at all: the reader's message.
    NotJson(String),
    /// JSON, but not an object.
    NotObject,
    /// Written by a newer version.
    Newer(u64),
    /// No usable version.
    NoVersion,
}

/// Reads stored text as a JSON object whose `version` is `version`: the common first step of
/// the deck's and the logbook's readers, which turn an [`Opening`] into their own errors.
pub(crate) fn open(text: &str, version: u64) -> Result<Object, Opening> {
    let value: Value = serde_json::from_str(text).map_err(|e| Opening::NotJson(e.to_string()))?;
    let Value::Object(obj) = value else {
        return Err(Opening::NotObject);
    };
    match obj.get("version").and_then(Value::as_u64) {
        Some(v) if v > version => Err(Opening::Newer(v)),
        Some(v) if v == version => Ok(obj),
        _ => Err(Opening::NoVersion),
    }
}

/// `x` rounded to six decimal places, for numbers that are stored as JSON. A number with so
/// few digits is read back exactly (the JSON reader's exact path: a whole number of at most 15
/// digits divided by a power of ten), so a stored card or history reads back bit for bit and
/// writes back as the same text; a full-precision number may come back one unit in the last
/// place off.
pub(crate) fn six_places(x: f64) -> f64 {
    (x * 1e6).round() / 1e6
}

/// The value as an object.
#[inline(never)]
pub(crate) fn object<'a>(v: &'a Value, what: &str) -> Result<&'a Object, String> {
    v.as_object()
        .ok_or_else(|| format!("{what}: not an object"))
}

/// A field that must be there.
#[inline(never)]
pub(crate) fn field<'a>(obj: &'a Object, key: &str) -> Result<&'a Value, String> {
    obj.get(key).ok_or_else(|| format!("'{key}': missing"))
}

/// A whole number from 0 to `u32::MAX`.
#[inline(never)]
pub(crate) fn uint(obj: &Object, key: &str) -> Result<u32, String> {
    field(obj, key)?
        .as_u64()
        .and_then(|n| u32::try_from(n).ok())
        .ok_or_else(|| format!("'{key}': not a whole number from 0 to {}", u32::MAX))
}

/// A whole number, or `null` (or missing) for none.
#[inline(never)]
pub(crate) fn opt_uint(obj: &Object, key: &str) -> Result<Option<u32>, String> {
    match obj.get(key) {
        None | Some(Value::Null) => Ok(None),
        Some(_) => uint(obj, key).map(Some),
    }
}

/// A finite number.
#[inline(never)]
pub(crate) fn number(obj: &Object, key: &str) -> Result<f64, String> {
    field(obj, key)?
        .as_f64()
        .filter(|x| x.is_finite())
        .ok_or_else(|| format!("'{key}': not a number"))
}

/// Text.
#[inline(never)]
pub(crate) fn text<'a>(obj: &'a Object, key: &str) -> Result<&'a str, String> {
    field(obj, key)?
        .as_str()
        .ok_or_else(|| format!("'{key}': not text"))
}

/// `true` or `false`; missing means `default`.
#[inline(never)]
pub(crate) fn flag(obj: &Object, key: &str, default: bool) -> Result<bool, String> {
    match obj.get(key) {
        None => Ok(default),
        Some(v) => v
            .as_bool()
            .ok_or_else(|| format!("'{key}': not true or false")),
    }
}

/// A list.
#[inline(never)]
pub(crate) fn list<'a>(obj: &'a Object, key: &str) -> Result<&'a [Value], String> {
    field(obj, key)?
        .as_array()
        .map(Vec::as_slice)
        .ok_or_else(|| format!("'{key}': not a list"))
}

/// A name, read with the type's own parser (rule, theme, outcome, grade, ...).
pub(crate) fn name<T>(obj: &Object, key: &str) -> Result<T, String>
where
    T: FromStr,
    T::Err: Display,
{
    text(obj, key)?.parse().map_err(|e| format!("'{key}': {e}"))
}

/// Builds an object from key and value pairs. (One plain function, inserting one pair at a
/// time: a generic builder, or collecting into the map, would put a copy of the map code in
/// the page for every call site.)
#[inline(never)]
pub(crate) fn build(pairs: Vec<(&'static str, Value)>) -> Value {
    let mut map = Object::new();
    for (k, v) in pairs {
        map.insert(k.to_string(), v);
    }
    Value::Object(map)
}

/// The document as compact JSON text.
pub(crate) fn write(document: &Value) -> String {
    serde_json::to_string(document).expect("a JSON value always serialises")
}

/// A whole number or `null`.
pub(crate) fn opt(n: Option<u32>) -> Value {
    n.map_or(Value::Null, Value::from)
}

//! Compact link values: a long text value (a design, a corners table, measured data)
//! travels in a link deflated (RFC 1951) and base64url-encoded (RFC 4648 section 5)
//! behind the mark [`MARK`], so that a design of hundreds of rows fits in a link of a few
//! kilobytes. `RawInputs::from_query` (in `params`) unpacks such values, so the page and
//! the command line's `--from-url` read packed and plain links alike. This module depends
//! on no other of the crate.

/// The mark a packed value starts with (`~` is not in the base64url alphabet, and no
/// table's header can start with it).
pub const MARK: &str = "~1";

/// The most bytes a packed value may unpack to: 4 MiB, about 130,000 design rows (the
/// page shows a 100,000-row design in about 0.6 s; at the former 16 MiB a link opened
/// 1,048,574 rows and the page froze for 6 s). It also bounds what a hostile link can make
/// the page allocate. Larger designs travel as CSV files.
pub const MOST_UNPACKED: usize = 4 << 20;

/// Values shorter than this stay plain: packing pays only on tables.
const PACK_FROM: usize = 120;

const ALPHABET: &[u8; 64] = b"ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789-_";

fn base64url(bytes: &[u8]) -> String {
    let mut out = String::with_capacity(bytes.len().div_ceil(3) * 4);
    for chunk in bytes.chunks(3) {
        let n = chunk
            .iter()
            .enumerate()
            .fold(0u32, |n, (i, &b)| n | u32::from(b) << (16 - 8 * i));
        for i in 0..=chunk.len() {
            out.push(char::from(ALPHABET[(n >> (18 - 6 * i) & 63) as usize]));
        }
    }
    out
}

fn unbase64url(text: &str) -> Result<Vec<u8>, String> {
    let mut out = Vec::with_capacity(text.len() * 3 / 4);
    let (mut acc, mut bits) = (0u32, 0u32);
    for c in text.bytes() {
        let v = match c {
            b'A'..=b'Z' => c - b'A',
            b'a'..=b'z' => c - b'a' + 26,
            b'0'..=b'9' => c - b'0' + 52,
            b'-' => 62,
            b'_' => 63,
            _ => return Err(format!("'{}' is not a base64url character", char::from(c))),
        };
        acc = (acc << 6) | u32::from(v);
        bits += 6;
        if bits >= 8 {
            bits -= 8;
            out.push((acc >> bits) as u8);
            acc &= (1 << bits) - 1;
        }
    }
    if bits >= 6 {
        return Err("its length is not that of base64url text".into());
    }
    Ok(out)
}

/// `text` packed: [`MARK`] then the base64url of its raw deflate stream.
///
/// # Examples
/// ```
/// use latchwise::link::{pack, unpack};
/// let design = "name,fclk,fdata,stages\n".to_string() + &"bus,1GHz,100MHz,2\n".repeat(40);
/// let packed = pack(&design);
/// assert!(packed.starts_with("~1") && packed.len() < design.len() / 4);
/// assert_eq!(unpack(&packed), Some(Ok(design)));
/// ```
pub fn pack(text: &str) -> String {
    let deflated = miniz_oxide::deflate::compress_to_vec(text.as_bytes(), 9);
    format!("{MARK}{}", base64url(&deflated))
}

/// The text of a packed value; `None` when `value` is not packed, an error saying what is
/// wrong when it is packed but cannot be read (cut short, altered, or too large).
pub fn unpack(value: &str) -> Option<Result<String, String>> {
    let body = value.strip_prefix(MARK)?;
    Some(unbase64url(body.trim()).and_then(|bytes| {
        let text = miniz_oxide::inflate::decompress_to_vec_with_limit(&bytes, MOST_UNPACKED)
            .map_err(|e| match e.status {
                miniz_oxide::inflate::TINFLStatus::HasMoreOutput => {
                    format!(
                        "it unpacks to more than {} MiB, the most a link carries (about \
                         130,000 design rows; beyond it the page would stall for seconds): \
                         open the design as a CSV file instead",
                        MOST_UNPACKED >> 20
                    )
                }
                _ => "its compressed data is cut short or altered".to_string(),
            })?;
        String::from_utf8(text).map_err(|_| "it unpacks to text that is not UTF-8".to_string())
    }))
}

/// A query of `pairs` with the long values of `fields` packed where that makes them
/// shorter; other values are kept as they are. Keys and plain values are percent-encoded
/// as a browser's form encoding does.
pub fn pack_pairs(pairs: &[(String, String)], fields: &[&str]) -> String {
    pairs
        .iter()
        .map(|(k, v)| {
            let packed = (fields.contains(&k.as_str()) && v.len() >= PACK_FROM)
                .then(|| pack(v))
                .filter(|p| p.len() < encode(v).len());
            format!("{}={}", encode(k), packed.unwrap_or_else(|| encode(v)))
        })
        .collect::<Vec<_>>()
        .join("&")
}

/// A query of `pairs`, nothing packed: what [`pack_pairs`] gives without data tables,
/// without its packing code.
pub fn encode_pairs(pairs: &[(String, String)]) -> String {
    pairs
        .iter()
        .map(|(k, v)| format!("{}={}", encode(k), encode(v)))
        .collect::<Vec<_>>()
        .join("&")
}

/// Percent-encoding as `application/x-www-form-urlencoded` (WHATWG URL standard): space
/// is `+`, and only `*-._` and alphanumerics stay as they are.
pub fn encode(s: &str) -> String {
    let mut out = String::with_capacity(s.len());
    for b in s.bytes() {
        match b {
            b'a'..=b'z' | b'A'..=b'Z' | b'0'..=b'9' | b'*' | b'-' | b'.' | b'_' => {
                out.push(char::from(b));
            }
            b' ' => out.push('+'),
            _ => out.push_str(&format!("%{b:02X}")),
        }
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn base64url_matches_rfc_4648_test_vectors() {
        // RFC 4648 section 10, without padding and in the URL-safe alphabet.
        for (plain, coded) in [
            ("", ""),
            ("f", "Zg"),
            ("fo", "Zm8"),
            ("foo", "Zm9v"),
            ("foob", "Zm9vYg"),
            ("fooba", "Zm9vYmE"),
            ("foobar", "Zm9vYmFy"),
        ] {
            assert_eq!(base64url(plain.as_bytes()), coded);
            assert_eq!(unbase64url(coded).unwrap(), plain.as_bytes());
        }
        // Bytes that use both URL-safe characters.
        assert_eq!(base64url(&[0xfb, 0xff]), "-_8");
        assert_eq!(unbase64url("-_8").unwrap(), vec![0xfb, 0xff]);
    }

    #[test]
    fn reads_deflate_written_by_another_implementation() {
        // Made with Python's zlib (compressobj(9, DEFLATED, -15): raw deflate, RFC 1951)
        // and base64.urlsafe_b64encode with the padding removed.
        let theirs = "~1y0vMTdVJS87J1klLSSxJ1CkuSUxPLeZKKi3WMXT3qNIxNDDwBVJGWEQSk7N1TCAcw2wgYcwFAA";
        assert_eq!(
            unpack(theirs),
            Some(Ok(
                "name,fclk,fdata,stages\nbus,1GHz,100MHz,2\nbus,1GHz,100MHz,2\n\
                     ack,400MHz,1kHz,3\n"
                    .to_string()
            ))
        );
    }

    #[test]
    fn damaged_values_say_so() {
        let p = pack(&"name,fclk,fdata,stages\nx,1GHz,1MHz,2\n".repeat(20));
        let cut = &p[..p.len() / 2];
        assert_eq!(
            unpack(cut),
            Some(Err("its compressed data is cut short or altered".into()))
        );
        assert!(unpack("~1ab$").unwrap().unwrap_err().contains("'$'"));
        assert!(unpack("~1a").unwrap().unwrap_err().contains("length"));
        assert_eq!(unpack("name,fclk"), None);
        // A bomb: 32 MiB of zeros deflate to a few kilobytes.
        let bomb = pack(&"0".repeat(32 << 20));
        assert!(bomb.len() < 100_000);
        assert!(unpack(&bomb)
            .unwrap()
            .unwrap_err()
            .contains("more than 4 MiB"));
    }
}

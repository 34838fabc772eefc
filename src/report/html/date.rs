//! The time stamp on a report, in UTC, from the system clock: a printed page needs a date, and
//! a whole date-time crate would be a large dependency for one line.

use std::time::{SystemTime, UNIX_EPOCH};

/// Now, as `2025-03-14 09:26 UTC`.
pub fn now_utc() -> String {
    let secs = SystemTime::now()
        .duration_since(UNIX_EPOCH)
        .map_or(0, |d| d.as_secs());
    stamp(secs)
}

/// Seconds since 1970-01-01 00:00 UTC as `YYYY-MM-DD hh:mm UTC`.
pub fn stamp(secs: u64) -> String {
    let days = (secs / 86_400) as i64;
    let minutes = (secs % 86_400) / 60;
    let (y, m, d) = civil_from_days(days);
    format!(
        "{y:04}-{m:02}-{d:02} {:02}:{:02} UTC",
        minutes / 60,
        minutes % 60
    )
}

/// Proleptic Gregorian date of a day count from 1970-01-01: the `civil_from_days` algorithm
/// of H. Hinnant, "chrono-Compatible Low-Level Date Algorithms" (2013), which counts in
/// 400-year eras that begin on 1 March so that the leap day falls at the end of a year.
fn civil_from_days(z: i64) -> (i64, u32, u32) {
    let z = z + 719_468;
    let era = z.div_euclid(146_097);
    let doe = z.rem_euclid(146_097);
    let yoe = (doe - doe / 1460 + doe / 36_524 - doe / 146_096) / 365;
    let doy = doe - (365 * yoe + yoe / 4 - yoe / 100);
    let mp = (5 * doy + 2) / 153;
    let d = (doy - (153 * mp + 2) / 5 + 1) as u32;
    let m = if mp < 10 { mp + 3 } else { mp - 9 } as u32;
    let y = yoe + era * 400 + i64::from(m <= 2);
    (y, m, d)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn known_instants() {
        // The epoch itself, and instants checked with GNU `date -u -d @SECONDS`.
        assert_eq!(stamp(0), "1970-01-01 00:00 UTC");
        assert_eq!(stamp(951_782_400), "2000-02-29 00:00 UTC");
        assert_eq!(stamp(951_868_800), "2000-03-01 00:00 UTC");
        assert_eq!(stamp(1_709_251_199), "2024-02-29 23:59 UTC");
        assert_eq!(stamp(4_102_444_800), "2100-01-01 00:00 UTC");
    }
}

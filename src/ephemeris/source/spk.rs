//! Body states from SPICE SPK kernels (NAIF's binary ephemeris files).
//!
//! The file is read by the `spicekit` crate (a pure-Rust reader of NAIF's
//! DAF container and SPK segments). This module adds what a design tool
//! needs around it: checks that turn a corrupt kernel into an error
//! instead of a crash, the chain of segments from a target to a centre
//! (e.g. Earth -> Earth-Moon barycentre -> solar-system barycentre <- Sun),
//! the coverage of that chain, and explicit frames and time scale.
//!
//! SPK epochs are TDB seconds past J2000; [`Epoch`] counts TDB days, so
//! the conversion is a factor of 86400.

use std::collections::HashMap;
use std::fmt;
use std::io::Read;
use std::panic::{catch_unwind, AssertUnwindSafe};
use std::path::{Path, PathBuf};
use std::sync::Arc;

use nalgebra::Vector3;

use super::coverage::Coverage;
use super::frame::Frame;
use crate::orbit::State;
use crate::time::Epoch;

/// Seconds in a day (SPK epochs count seconds, [`Epoch`] days).
const DAY_S: f64 = 86400.0;

/// NAIF frame code of `J2000` (the ICRF axes for planetary ephemerides).
const NAIF_J2000: i32 = 1;
/// NAIF frame code of `ECLIPJ2000` (mean ecliptic and equinox of J2000).
const NAIF_ECLIPJ2000: i32 = 17;

/// Doubles in one DAF record (1024 bytes).
const RECORD_DOUBLES: u32 = 128;

/// Why a kernel or a body in it gives no state.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
#[non_exhaustive]
pub enum SpkError {
    /// The file could not be opened or read.
    #[error("{}: cannot read the SPK kernel: {reason}", path.display())]
    Io {
        /// The kernel.
        path: PathBuf,
        /// The operating system's explanation.
        reason: String,
    },
    /// The file is not a readable SPK kernel (truncated, corrupt, another
    /// kind of file, or big-endian).
    #[error("{}: not a readable SPK kernel: {reason}", path.display())]
    Corrupt {
        /// The kernel.
        path: PathBuf,
        /// What is wrong, in words.
        reason: String,
    },
    /// No segment of the kernel has this NAIF id as target or centre.
    #[error(
        "{}: NAIF id {id} is not in this kernel; it holds {}",
        path.display(),
        known.iter().map(|i| i.to_string()).collect::<Vec<_>>().join(", ")
    )]
    UnknownId {
        /// The kernel.
        path: PathBuf,
        /// The id asked for.
        id: i32,
        /// The ids the kernel has.
        known: Vec<i32>,
    },
    /// Both ids are in the kernel but no chain of segments joins them.
    #[error("{}: no chain of segments joins NAIF id {target} to centre {center}", path.display())]
    NoChain {
        /// The kernel.
        path: PathBuf,
        /// Target id.
        target: i32,
        /// Centre id.
        center: i32,
    },
    /// A segment the chain needs is of a kind this reader does not take.
    #[error("{}: segment {name:?} ({target} relative to {center}): {reason}", path.display())]
    Unsupported {
        /// The kernel.
        path: PathBuf,
        /// The segment's name.
        name: String,
        /// Its target id.
        target: i32,
        /// Its centre id.
        center: i32,
        /// What is not supported and what is.
        reason: String,
    },
    /// The epoch lies outside the dates where the chain is covered.
    #[error(
        "{}: {epoch} is outside the kernel's coverage of NAIF id {target} relative to {center}: {coverage}",
        path.display()
    )]
    OutsideCoverage {
        /// The kernel.
        path: PathBuf,
        /// The epoch asked for, ISO TDB.
        epoch: String,
        /// Target id.
        target: i32,
        /// Centre id.
        center: i32,
        /// Where the chain has data.
        coverage: Coverage,
    },
}

/// One segment's description, as listed by [`SpkKernel::segments`].
#[derive(Debug, Clone, PartialEq)]
pub struct SegmentInfo {
    /// NAIF id of the body the segment gives.
    pub target: i32,
    /// NAIF id of the centre it is relative to.
    pub center: i32,
    /// NAIF frame code (1 = J2000, 17 = ECLIPJ2000).
    pub frame_code: i32,
    /// SPK data type (2 and 3 are read).
    pub data_type: i32,
    /// The segment's name.
    pub name: String,
    /// The dates it covers.
    pub coverage: Coverage,
}

/// An opened SPK kernel, shared by the bodies taken from it.
///
/// # Example
/// ```
/// use synodic::ephemeris::source::{Frame, SpkKernel};
/// use synodic::time::Epoch;
/// let path = concat!(env!("CARGO_MANIFEST_DIR"), "/tests/fixtures/de421/de421-excerpt.bsp");
/// let kernel = SpkKernel::open(path)?;
/// let mars = kernel.body(4, 10)?; // Mars barycentre relative to the Sun
/// let s = mars.state(&Epoch::parse("1997-09-12")?, Frame::EclipticJ2000)?;
/// assert!((s.r_km.norm() - 2.1e8).abs() < 0.1e8);
/// # Ok::<(), Box<dyn std::error::Error>>(())
/// ```
#[derive(Clone)]
pub struct SpkKernel {
    inner: Arc<Kernel>,
}

struct Kernel {
    path: PathBuf,
    file: spicekit::SpkFile,
    segments: Vec<SegmentInfo>,
}

impl fmt::Debug for SpkKernel {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.debug_struct("SpkKernel")
            .field("path", &self.inner.path)
            .field("segments", &self.inner.segments)
            .finish()
    }
}

impl SpkKernel {
    /// Opens a kernel and checks its structure.
    ///
    /// # Method
    /// The `spicekit` crate maps the file and reads its segment summaries.
    /// Before its evaluators are trusted, every segment of data type 2 or 3
    /// (Chebyshev polynomials, the types of JPL's planetary ephemerides;
    /// NAIF, *SPK Required Reading*) has its directory checked: record
    /// size `2 + 3 (degree + 1)` (type 2) or `2 + 6 (degree + 1)` (type 3),
    /// at least one record, records filling the segment exactly, a
    /// positive interval length, and the addresses inside the file. The
    /// chain of summary records is walked first with a bound on its length,
    /// so a looping chain cannot stall the reader.
    ///
    /// # Errors
    /// [`SpkError::Io`] if the file cannot be read; [`SpkError::Corrupt`]
    /// for a truncated or malformed kernel.
    pub fn open(path: impl AsRef<Path>) -> Result<SpkKernel, SpkError> {
        let path = path.as_ref().to_path_buf();
        let corrupt = |reason: String| SpkError::Corrupt {
            path: path.clone(),
            reason,
        };
        let file_len = std::fs::metadata(&path)
            .map_err(|e| SpkError::Io {
                path: path.clone(),
                reason: e.to_string(),
            })?
            .len();
        let fward = first_summary_record(&path)?;
        let daf = spicekit::DafFile::open(&path).map_err(|e| corrupt(daf_reason(&e)))?;
        if daf.nd() != 2 || daf.ni() != 6 {
            return Err(corrupt(format!(
                "summary format ND={}, NI={} is not an SPK's (2, 6)",
                daf.nd(),
                daf.ni()
            )));
        }
        check_summary_chain(&daf, fward, file_len).map_err(&corrupt)?;
        let summaries = daf.summaries().map_err(|e| corrupt(daf_reason(&e)))?;
        let mut segments = Vec::with_capacity(summaries.len());
        for s in &summaries {
            let info = segment_info(s).map_err(&corrupt)?;
            if matches!(info.data_type, 2 | 3) {
                check_chebyshev_segment(&daf, s, file_len)
                    .map_err(|reason| corrupt(format!("segment {:?}: {reason}", info.name)))?;
            }
            segments.push(info);
        }
        // The crate's constructor also reads segments of other types; a
        // malformed one must give an error, never a crash.
        let file = catch_unwind(AssertUnwindSafe(|| spicekit::SpkFile::from_daf(daf)))
            .map_err(|_| corrupt("a segment's directory is malformed".to_string()))?
            .map_err(|e| corrupt(e.to_string()))?;
        Ok(SpkKernel {
            inner: Arc::new(Kernel {
                path,
                file,
                segments,
            }),
        })
    }

    /// The kernel's path.
    pub fn path(&self) -> &Path {
        &self.inner.path
    }

    /// Every segment, in file order.
    pub fn segments(&self) -> &[SegmentInfo] {
        &self.inner.segments
    }

    /// The body `target` relative to `center` (NAIF ids), through the
    /// chain of segments that joins them.
    ///
    /// # Method
    /// Each body's parent is the centre of its last segment in the file
    /// (later segments take precedence in SPK files, as in NAIF's
    /// toolkit); the chains of target and centre are walked up to their
    /// common ancestor (usually the solar-system barycentre, id 0). The
    /// state is the sum of the links on the target's side minus those on
    /// the centre's side, each rotated to one frame first; the coverage is
    /// the intersection of the links' coverages.
    ///
    /// # Errors
    /// [`SpkError::UnknownId`] for an id in no segment;
    /// [`SpkError::NoChain`] if the chains never meet;
    /// [`SpkError::Unsupported`] if a link uses a data type other than 2
    /// or 3, or a frame other than J2000 and ECLIPJ2000.
    pub fn body(&self, target: i32, center: i32) -> Result<SpkBody, SpkError> {
        let k = &self.inner;
        for id in [target, center] {
            if !k.segments.iter().any(|s| s.target == id || s.center == id) {
                let mut known: Vec<i32> = k
                    .segments
                    .iter()
                    .flat_map(|s| [s.target, s.center])
                    .collect();
                known.sort_unstable();
                known.dedup();
                return Err(SpkError::UnknownId {
                    path: k.path.clone(),
                    id,
                    known,
                });
            }
        }
        // Parent of each body: the centre of its last segment.
        let mut parent: HashMap<i32, i32> = HashMap::new();
        for s in &k.segments {
            parent.insert(s.target, s.center);
        }
        let up = |mut id: i32| {
            let mut path = vec![id];
            while let Some(&p) = parent.get(&id) {
                if path.contains(&p) {
                    break;
                }
                path.push(p);
                id = p;
            }
            path
        };
        let (t_path, c_path) = (up(target), up(center));
        let Some(meet) = t_path.iter().copied().find(|id| c_path.contains(id)) else {
            return Err(SpkError::NoChain {
                path: k.path.clone(),
                target,
                center,
            });
        };
        let mut links = Vec::new();
        for (chain, sign) in [(&t_path, 1.0), (&c_path, -1.0)] {
            for pair in chain.windows(2).take_while(|w| w[0] != meet) {
                links.push(self.link(pair[0], pair[1], sign)?);
            }
        }
        let coverage = match links.split_first() {
            Some((first, rest)) => rest
                .iter()
                .fold(first.coverage.clone(), |c, l| c.intersect(&l.coverage)),
            // A body relative to itself: zero at every date.
            None => Coverage::from_spans([(f64::MIN, f64::MAX)]),
        };
        Ok(SpkBody {
            kernel: self.clone(),
            target,
            center,
            links,
            coverage,
        })
    }

    /// The link `target` -> `center` from the segments of that pair.
    fn link(&self, target: i32, center: i32, sign: f64) -> Result<Link, SpkError> {
        let k = &self.inner;
        let segs: Vec<&SegmentInfo> = k
            .segments
            .iter()
            .filter(|s| s.target == target && s.center == center)
            .collect();
        let unsupported = |s: &SegmentInfo, reason: String| SpkError::Unsupported {
            path: k.path.clone(),
            name: s.name.clone(),
            target,
            center,
            reason,
        };
        let mut frame = None;
        for s in &segs {
            if !matches!(s.data_type, 2 | 3) {
                return Err(unsupported(
                    s,
                    format!(
                        "SPK data type {} is not read (types 2 and 3, Chebyshev, are)",
                        s.data_type
                    ),
                ));
            }
            let f = match s.frame_code {
                NAIF_J2000 => Frame::Icrf,
                NAIF_ECLIPJ2000 => Frame::EclipticJ2000,
                code => {
                    return Err(unsupported(
                        s,
                        format!("frame code {code} is not read (1 = J2000, 17 = ECLIPJ2000 are)"),
                    ))
                }
            };
            if frame.is_some_and(|g| g != f) {
                return Err(unsupported(
                    s,
                    "segments of one pair in different frames".to_string(),
                ));
            }
            frame = Some(f);
        }
        Ok(Link {
            target,
            center,
            sign,
            frame: frame.unwrap_or(Frame::Icrf),
            coverage: segs
                .iter()
                .fold(Coverage::default(), |c, s| c.union(&s.coverage)),
        })
    }
}

/// One step of a chain: `target` relative to `center`, added (`sign` 1)
/// or subtracted (-1).
#[derive(Debug, Clone)]
struct Link {
    target: i32,
    center: i32,
    sign: f64,
    frame: Frame,
    coverage: Coverage,
}

/// A body's states from a kernel: `target` relative to `center`.
///
/// Answers [`SpkBody::state`] at any TDB epoch inside
/// [`SpkBody::coverage`].
#[derive(Debug, Clone)]
pub struct SpkBody {
    kernel: SpkKernel,
    target: i32,
    center: i32,
    links: Vec<Link>,
    coverage: Coverage,
}

impl SpkBody {
    /// NAIF id of the body.
    pub fn target(&self) -> i32 {
        self.target
    }

    /// NAIF id of the centre the states are relative to.
    pub fn center(&self) -> i32 {
        self.center
    }

    /// The kernel's path.
    pub fn path(&self) -> &Path {
        self.kernel.path()
    }

    /// The dates where every link of the chain has data.
    pub fn coverage(&self) -> &Coverage {
        &self.coverage
    }

    /// Position and velocity of the target relative to the centre at `t`,
    /// in `frame`.
    ///
    /// # Method
    /// Each link is a Chebyshev series evaluated by `spicekit` (type 2:
    /// velocity from the derivative of the position series; type 3: its
    /// own series), at `et = 86400 * (days since J2000 TDB)` seconds, then
    /// rotated from its segment's frame ([`Frame::rotate_state`]) and
    /// summed along the chain.
    ///
    /// # Units
    /// km and km/s.
    ///
    /// # Errors
    /// [`SpkError::OutsideCoverage`] outside [`SpkBody::coverage`] (the
    /// message names the file and prints the coverage);
    /// [`SpkError::Corrupt`] if the file's numbers give no finite state.
    pub fn state(&self, t: &Epoch, frame: Frame) -> Result<State, SpkError> {
        let k = &self.kernel.inner;
        if !self.coverage.contains(t) {
            return Err(SpkError::OutsideCoverage {
                path: k.path.clone(),
                epoch: t.to_iso_tdb(),
                target: self.target,
                center: self.center,
                coverage: self.coverage.clone(),
            });
        }
        let et = t.days_since_j2000_tdb() * DAY_S;
        let mut r = Vector3::zeros();
        let mut v = Vector3::zeros();
        for link in &self.links {
            let s = k
                .file
                .state(link.target, link.center, et)
                .map_err(|e| SpkError::Corrupt {
                    path: k.path.clone(),
                    reason: e.to_string(),
                })?;
            let part = link.frame.rotate_state(
                &State {
                    r_km: Vector3::new(s[0], s[1], s[2]),
                    v_km_s: Vector3::new(s[3], s[4], s[5]),
                },
                frame,
            );
            r += part.r_km * link.sign;
            v += part.v_km_s * link.sign;
        }
        if r.iter().chain(v.iter()).all(|x| x.is_finite()) {
            Ok(State { r_km: r, v_km_s: v })
        } else {
            Err(SpkError::Corrupt {
                path: k.path.clone(),
                reason: format!("the state at {} is not finite", t.to_iso_tdb()),
            })
        }
    }
}

/// The file record's FWARD (first summary record), read from the first
/// record's fixed layout (NAIF, *DAF Required Reading*: integer at bytes
/// 76-79), only to bound the walk in [`check_summary_chain`].
fn first_summary_record(path: &Path) -> Result<u32, SpkError> {
    let mut head = [0u8; 1024];
    let mut f = std::fs::File::open(path).map_err(|e| SpkError::Io {
        path: path.to_path_buf(),
        reason: e.to_string(),
    })?;
    f.read_exact(&mut head).map_err(|_| SpkError::Corrupt {
        path: path.to_path_buf(),
        reason: "shorter than one 1024-byte record (truncated?)".to_string(),
    })?;
    let mut word = [0u8; 4];
    word.copy_from_slice(&head[76..80]);
    Ok(u32::from_le_bytes(word))
}

/// Walks the summary records' NEXT pointers through the crate's reader:
/// at most one visit per record of the file.
fn check_summary_chain(daf: &spicekit::DafFile, fward: u32, file_len: u64) -> Result<(), String> {
    let records = file_len / 1024;
    let mut rec = fward;
    let mut seen = 0u64;
    while rec != 0 {
        seen += 1;
        if u64::from(rec) + 1 > records || seen > records {
            return Err(format!(
                "the summary records run past the end of the file (record {rec} of {records}; truncated?)"
            ));
        }
        let first = (rec - 1) * RECORD_DOUBLES + 1;
        let control = daf
            .read_doubles(first, first + 2)
            .map_err(|e| daf_reason(&e))?;
        let (next, nsum) = (control[0], control[2]);
        // An SPK summary is 5 doubles: at most 25 fit in a record.
        if !(0.0..=25.0).contains(&nsum) || nsum.fract() != 0.0 {
            return Err(format!("summary record {rec} claims {nsum} summaries"));
        }
        if !(0.0..=records as f64).contains(&next) || next.fract() != 0.0 {
            return Err(format!("summary record {rec} points to record {next}"));
        }
        rec = next as u32;
    }
    Ok(())
}

/// A summary's fields as a [`SegmentInfo`].
fn segment_info(s: &spicekit::Summary) -> Result<SegmentInfo, String> {
    let (start_s, end_s) = (s.doubles[0], s.doubles[1]);
    if !(start_s.is_finite() && end_s.is_finite() && start_s <= end_s) {
        return Err(format!(
            "segment {:?} has the epoch span {start_s} .. {end_s} s",
            s.name
        ));
    }
    Ok(SegmentInfo {
        target: s.integers[0],
        center: s.integers[1],
        frame_code: s.integers[2],
        data_type: s.integers[3],
        name: s.name.clone(),
        coverage: Coverage::from_spans([(start_s / DAY_S, end_s / DAY_S)]),
    })
}

/// Checks a type 2 or 3 segment's directory (its last four doubles: INIT,
/// INTLEN, RSIZE, N) against its addresses and the file size.
fn check_chebyshev_segment(
    daf: &spicekit::DafFile,
    s: &spicekit::Summary,
    file_len: u64,
) -> Result<(), String> {
    let (start, end) = (i64::from(s.integers[4]), i64::from(s.integers[5]));
    let file_doubles = (file_len / 8) as i64;
    if start < 1 || end < start + 3 || end > file_doubles {
        return Err(format!(
            "addresses {start} .. {end} lie outside the file's {file_doubles} doubles (truncated?)"
        ));
    }
    let dir = daf
        .read_doubles((end - 3) as u32, end as u32)
        .map_err(|e| daf_reason(&e))?;
    let (init, intlen, rsize, n) = (dir[0], dir[1], dir[2], dir[3]);
    let per_axis = if s.integers[3] == 2 { 3.0 } else { 6.0 };
    let whole = |x: f64| x.is_finite() && x >= 1.0 && x.fract() == 0.0;
    if !whole(rsize) || !whole(n) || rsize < 2.0 + per_axis || (rsize - 2.0) % per_axis != 0.0 {
        return Err(format!(
            "record size {rsize} and count {n} are not a Chebyshev layout"
        ));
    }
    // Whole numbers checked above; beyond the file's size they cannot fit.
    let (rsize_words, records) = (rsize.min(1e15) as i64, n.min(1e15) as i64);
    if rsize_words.saturating_mul(records).saturating_add(4) != end - start + 1 {
        return Err(format!(
            "{n} records of {rsize} doubles do not fill addresses {start} .. {end}"
        ));
    }
    if !(init.is_finite() && intlen.is_finite() && intlen > 0.0) {
        return Err(format!("interval start {init} s and length {intlen} s"));
    }
    Ok(())
}

/// The crate's DAF error, in words.
fn daf_reason(e: &spicekit::DafError) -> String {
    match e {
        spicekit::DafError::TooSmall(n) => {
            format!("only {n} bytes, shorter than one record (truncated?)")
        }
        other => other.to_string(),
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn fixture(name: &str) -> PathBuf {
        Path::new(env!("CARGO_MANIFEST_DIR"))
            .join("tests/fixtures/de421")
            .join(name)
    }

    #[test]
    fn lists_segments_of_the_fixture() {
        let k = SpkKernel::open(fixture("de421-excerpt.bsp")).expect("fixture");
        // Five bodies over the first span, four over the second
        // (tests/fixtures/de421/README.md).
        assert_eq!(k.segments().len(), 9);
        assert!(k
            .segments()
            .iter()
            .all(|s| s.data_type == 2 && s.frame_code == NAIF_J2000));
        let earth = k.body(399, 10).expect("Earth wrt Sun");
        // Earth -> EMB -> SSB <- Sun: three links, covered on the first
        // span only.
        assert_eq!(earth.links.len(), 3);
        assert_eq!(earth.coverage().spans().count(), 1);
        assert_eq!(k.body(4, 10).expect("Mars").coverage().spans().count(), 2);
    }
}

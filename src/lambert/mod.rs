//! STUB
#![allow(missing_docs, clippy::all)]
use nalgebra::Vector3;
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Direction {
    Prograde,
    Retrograde,
}
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Branch {
    Single,
    Left,
    Right,
}
impl std::fmt::Display for Branch {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        write!(f, "x")
    }
}
#[derive(Debug, Clone)]
pub struct LambertProblem {
    pub r1: Vector3<f64>,
    pub r2: Vector3<f64>,
    pub tof: f64,
    pub mu: f64,
    pub direction: Direction,
    pub max_revs: u32,
    pub reference_normal: Option<Vector3<f64>>,
}
#[derive(Debug, Clone)]
pub struct LambertSolution {
    pub revs: u32,
    pub branch: Branch,
    pub v1: Vector3<f64>,
    pub v2: Vector3<f64>,
    pub iterations: u32,
    pub transfer_angle_rad: f64,
}
#[derive(Debug, thiserror::Error)]
#[non_exhaustive]
pub enum LambertError {
    #[error("bad {0}")]
    Bad(String),
}
pub fn solve(_p: &LambertProblem) -> Result<Vec<LambertSolution>, LambertError> {
    unimplemented!()
}
pub fn solve_revs(_p: &LambertProblem, _revs: u32) -> Result<Vec<LambertSolution>, LambertError> {
    unimplemented!()
}
pub fn solve_zero_rev(
    _r1: &Vector3<f64>,
    _r2: &Vector3<f64>,
    _tof: f64,
    _mu: f64,
    _direction: Direction,
    _n: Option<&Vector3<f64>>,
) -> Result<LambertSolution, LambertError> {
    unimplemented!()
}
pub fn is_not_converged(_e: &LambertError) -> bool {
    false
}

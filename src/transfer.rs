//! One transfer between two bodies of a system.

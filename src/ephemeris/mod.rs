//! Bodies of a system and their states from mean elements.

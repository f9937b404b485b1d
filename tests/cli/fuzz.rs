//! Parser fuzzing (filled in by the robustness work).

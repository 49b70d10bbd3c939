//! Rotation roster (pending).

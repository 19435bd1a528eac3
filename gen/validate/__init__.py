"""Measure generated geometry and compare it with the standard formulas (numpy only)."""

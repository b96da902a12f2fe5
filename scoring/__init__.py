"""Objectives, knot invariants used as guards, and bounds on the bridge number."""

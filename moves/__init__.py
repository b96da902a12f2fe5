"""The move graph of plat presentations: pairing-subgroup moves, rewrites, stabilization."""

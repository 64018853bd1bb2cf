"""Keep-out distances of every magnet at once, each face between two cells proven once.

One magnet on its own (:func:`planner.physics.zones.keep_out_radii`) proves its cell below a
threshold between its radius R and its start radius S through the cell's boundary there:
the sphere of radius R and the cell's faces out to S (:mod:`planner.physics.zones.shell`).
When every magnet is computed, most of those faces need no proof of their own. A face
between the cells of magnets i and j, at a distance s from both centres (the same, as the
face bisects them), lies beyond R_j for s > R_j, in the part of j's cell that j's own proof
covers. Take the region U made of every magnet's cell between its R and its S. It holds no
magnet (:func:`~planner.physics.zones.shell.source_free`, checked per cell), so |B|^2 is
subharmonic in it and |B| < t in U once it holds on U's boundary (weak maximum principle,
see :mod:`~planner.physics.zones.shell`). That boundary is made of

* each sphere of radius R_i within its cell (the caps of i's proof);
* each sphere of radius S_i within its cell (the start radii, proven by the bound of
  :func:`~planner.physics.zones.keep_out.farthest_start_radius`, which covers the cell beyond S_i);
* the parts of faces where U is on one side only: between the cells of i and j, the points
  with min(R_i, R_j) < s <= max(R_i, R_j) (and s below both start radii).

So each face is proven only between the two radii, by the magnet with the smaller one, and
not at all where that magnet's distance comes from elsewhere (its start radius, or the cone
walk, which covers its whole cell beyond it): about four fifths of the face patches that
the magnets proved one by one lie beyond the neighbour's radius.

**Order of the work.** (1) Per magnet, in worker processes (a group of neighbours per call,
:func:`caps_first_many`, whose proofs share their steps): start radii, the points found at
each threshold, and the caps of its sphere at the radius just outside them (retrying
farther out as on its own); the cone walk where the sphere proof does not apply. (2) Per
magnet (:func:`faces_next_many`), with every radius of step 1 known: the face between each
neighbour with a larger radius, between the two. Where that fails (a point at the threshold, or patches that cannot
be settled), the magnet tries again farther out, caps and faces (with the same limits).
(3) Here, in this process: a magnet whose radius grew in step 2 from R to R' leaves each
neighbour l with R_l < R' a piece of face between max(R_l, R) and R' that no proof has
covered; l proves it, or tries again itself, until nothing changes. Radii only grow, so this
ends. (4) The last steps of the one-magnet search: a lower threshold's distance bounds the
higher ones' and the sampling guard has the last word.

The distances carry the same guarantee as :func:`~planner.physics.zones.keep_out_radii` and
usually equal it; they differ where a face beyond a neighbour's radius could not be proven
on its own, or where a lower threshold's distance cut a higher one's start radius short in
the one-by-one search: either is then the better of two proven figures.

References
----------
D. Gilbarg and N. S. Trudinger, *Elliptic Partial Differential Equations of Second Order*,
Springer (2001), Theorem 3.1 (weak maximum principle).
"""
from __future__ import annotations

from typing import NamedTuple

import numpy as np

from planner.physics.zones import bounds, shell
from planner.physics.zones.keep_out import (_checked, _finish, _first_tries, _next_try, _prove_all, _prove_all_many,
                                            _refine, _starts_and_hits)

__all__ = ["MagnetProof", "caps_first", "caps_first_many", "faces_next", "faces_next_many", "settle"]


class MagnetProof(NamedTuple):
    """Where one magnet's search stands, per threshold (arrays (k,)).

    ``starts`` [m]: start radii; ``hits`` [m]: farthest points found on the rays; ``best``
    [m]: farthest points known at the threshold; ``radius`` [m]: the radius last tried;
    ``proven`` [m]: the radius proven (caps only after :func:`caps_first`); ``shell``: whether
    ``proven`` came from the sphere proof (whose faces then need the neighbours' radii) rather
    than from the start radius or the cone walk; ``distances`` [m]: the finished distances
    (after :func:`faces_next`; NaN before).
    """

    starts: np.ndarray
    hits: np.ndarray
    best: np.ndarray
    radius: np.ndarray
    proven: np.ndarray
    shell: np.ndarray
    distances: np.ndarray


def caps_first(bodies, index: int, thresholds) -> MagnetProof:
    """Step 1 of the module docstring for body ``index``: radii proven on the sphere only."""
    return caps_first_many(bodies, [index], thresholds)[0]


def caps_first_many(bodies, indices, thresholds) -> list[MagnetProof]:
    """:func:`caps_first` for the bodies ``indices``; their sphere proofs share the steps of
    :func:`~planner.physics.zones.shell.prove_many` (a few large numpy calls for all of them)."""
    table = bounds.body_table(bodies)
    thresholds = np.atleast_1d(np.asarray(thresholds, dtype=float))
    for index in indices:
        _checked(bodies, index, thresholds)
    searched = []
    for index in indices:
        starts, hits = _starts_and_hits(bodies, index, thresholds, table)
        searched.append((index, starts, hits) + _first_tries(bodies, index, hits))
    proofs = _prove_all_many(bodies, [(index, thresholds, starts, best, radius, None)
                                      for index, starts, hits, best, radius in searched],
                             table, phases=("caps",), lower_outer=False)
    result = []
    for (index, starts, hits, _, _), (proven, best, radius, from_shell) in zip(searched, proofs):
        proven = _walk_unproven(bodies, index, thresholds, starts, table, hits, proven)
        result.append(MagnetProof(starts, hits, best, radius, proven, from_shell, np.full(len(thresholds), np.nan)))
    return result


def faces_next(bodies, index: int, thresholds, proof: MagnetProof, radii) -> MagnetProof:
    """Step 2 of the module docstring for body ``index``, with every magnet's ``radii`` (b, k) [m]
    from :func:`caps_first`; also finishes the distances (step 4)."""
    return faces_next_many(bodies, [index], thresholds, [proof], radii)[0]


def faces_next_many(bodies, indices, thresholds, proofs, radii) -> list[MagnetProof]:
    """:func:`faces_next` for the bodies ``indices`` with their ``proofs``; their face proofs
    share the steps of :func:`~planner.physics.zones.shell.prove_many`."""
    thresholds = np.atleast_1d(np.asarray(thresholds, dtype=float))
    table = bounds.body_table(bodies)
    pending = [np.flatnonzero(proof.shell) for proof in proofs]
    jobs = [(index, [(proof.proven[k], proof.starts[k], thresholds[k], radii[:, k]) for k in ks])
            for index, proof, ks in zip(indices, proofs, pending)]
    result = []
    for index, proof, ks, outcomes in zip(indices, proofs, pending,
                                          shell.prove_many(bodies, jobs, table, phases=("faces",))):
        failed = [(k, outcome) for k, outcome in zip(ks, outcomes) if not outcome.proven]
        if failed:
            proof = _try_again(bodies, index, thresholds, proof, failed, radii, table)
        result.append(proof._replace(distances=_finish(bodies, index, thresholds, proof.starts, proof.proven, table,
                                                       proof.hits)))
    return result


def _walk_unproven(bodies, index, thresholds, starts, table, hits, proven):
    """``proven`` with each NaN (no sphere proof) replaced by the cone walk's radius, which
    covers the whole cell beyond it on its own."""
    proven = proven.copy()
    for k in np.flatnonzero(np.isnan(proven)):
        proven[k] = _refine(bodies, index, thresholds[k], starts[k], table, hits[k])
    return proven


def settle(bodies, thresholds, first: list[MagnetProof], second: list[MagnetProof]) -> np.ndarray:
    """Steps 3 and 4 of the module docstring: the distances (b, k) [m] once no radius changes.

    ``first`` and ``second``: every magnet's :class:`MagnetProof` after :func:`caps_first`
    and after :func:`faces_next`.
    """
    thresholds = np.atleast_1d(np.asarray(thresholds, dtype=float))
    table = bounds.body_table(bodies)
    proofs = list(second)
    radii = np.array([proof.proven for proof in proofs]).reshape(len(bodies), -1)
    # (magnet, threshold, old radius, new radius) whose faces the neighbours have not covered
    grown = [(i, k, first[i].proven[k], radii[i, k]) for i in range(len(bodies)) for k in range(len(thresholds))
             if radii[i, k] > first[i].proven[k]]
    changed = set()
    while grown:
        i, k, old, new = grown.pop(0)
        for neighbour in range(len(bodies)):
            proof = proofs[neighbour]
            if neighbour == i or not proof.shell[k]:
                continue
            low, high = max(radii[neighbour, k], old), min(new, proof.starts[k])
            if low >= high:
                continue
            only = np.zeros(len(bodies))  # the face towards magnet i alone
            only[i] = high
            (outcome,) = shell.prove_all_beyond(bodies, neighbour, [(low, high, thresholds[k], only)], table,
                                                phases=("faces",))
            if outcome.proven:
                continue
            proofs[neighbour] = _try_again(bodies, neighbour, thresholds, proof, [(k, outcome)], radii, table)
            grown.append((neighbour, k, radii[neighbour, k], proofs[neighbour].proven[k]))
            radii[neighbour, k] = proofs[neighbour].proven[k]
            changed.add(neighbour)
    distances = np.array([proof.distances for proof in proofs]).reshape(len(bodies), -1)
    for i in sorted(changed):
        distances[i] = _finish(bodies, i, thresholds, proofs[i].starts, proofs[i].proven, table, proofs[i].hits)
    return distances


def _try_again(bodies, index, thresholds, proof, failed, radii, table):
    """``proof`` with the thresholds of ``failed`` (pairs of a threshold's position and the
    failed outcome of its faces) proven again farther out: caps and faces, the faces out to
    the neighbours' current ``radii`` (b, k) [m]."""
    best, radius, proven, from_shell = (proof.best.copy(), proof.radius.copy(), proof.proven.copy(),
                                        proof.shell.copy())
    for k, outcome in failed:
        best[k], radius[k] = _next_try(bodies, index, outcome, proof.starts[k], thresholds[k], table, best[k],
                                       proven[k])
    again = np.array([k for k, _ in failed])
    retried, best[again], radius[again], from_shell[again] = _prove_all(
        bodies, index, thresholds[again], proof.starts[again], table, best[again], radius[again],
        limits=[radii[:, k] for k in again], lower_outer=False)
    proven[again] = _walk_unproven(bodies, index, thresholds[again], proof.starts[again], table, proof.hits[again],
                                   retried)
    return proof._replace(best=best, radius=radius, proven=proven, shell=from_shell)

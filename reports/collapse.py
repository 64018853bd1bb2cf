"""Rows of a figure table that differ only in the part they are about, printed once.

A setup with twelve identical stations gives twelve keep-out rows per threshold, twelve
induction blocks and twelve magnet rows that agree in every printed value and differ only in the
id of the part. :func:`collapse_rows` merges such rows into one that names all the parts, the way
:func:`hazards.grouping.group_findings` merges findings; the terminal summary and the PDF tables
both call it, each with the values exactly as it prints them, so rows merge only where the
printed text would be the same. Rows that differ in any printed value stay separate, and every
value of every row is still printed once. The JSON output does not pass through here: it keeps
every row for scripts.

How rows merge
--------------
Each row is ``(parts, values)``: the ids the row is about (one for a magnet, two for a pair) and
the values it prints. Rows merge when their values are equal and their parts differ in exactly one
position. Where rows of equal values could merge on either position (pairs), the position that
gives the fewest merged rows varies, the first such position on a tie, as in
:mod:`hazards.grouping`. A merged row stands where its first member stood; its varying parts are
listed in natural order (``drop-2`` before ``drop-10``), each once. Rows that name no part never
merge.
"""
from __future__ import annotations

from dataclasses import dataclass
from typing import Hashable, Iterable, Sequence

from hazards.grouping import name_parts, natural_key

__all__ = ["CollapsedRow", "collapse_rows"]


@dataclass(frozen=True)
class CollapsedRow:
    """One printed row standing for one or more input rows with the same values.

    Attributes
    ----------
    parts : tuple of tuple of str
        For each part position of the input rows, the ids this row names there: one id, or (in
        the one position that varies) every member's id in natural order.
    values : tuple
        The values every member prints, as given.
    members : tuple of int
        Indices of the input rows merged here, in input order.
    """

    parts: tuple[tuple[str, ...], ...]
    values: tuple
    members: tuple[int, ...]

    @property
    def merged(self) -> bool:
        """True when the row stands for more than one input row."""
        return len(self.members) > 1

    def names(self, position: int = 0, code: bool = True) -> str:
        """The ids at one part position as readable text (:func:`hazards.grouping.name_parts`).

        Parameters
        ----------
        position : int
            Which part of the row (0 for the first id column).
        code : bool
            Write each id between backticks.

        Returns
        -------
        str
            One id; a consecutive run as ``drop-01 to drop-12``; otherwise ``a, c and e``
            (each id between backticks when ``code``).
        """
        return name_parts(self.parts[position], code=code)


def collapse_rows(rows: Iterable[tuple[Sequence[str], Sequence[Hashable]]]) -> list[CollapsedRow]:
    """Merge rows that print the same values for different parts.

    Parameters
    ----------
    rows : iterable of (parts, values)
        ``parts``: the ids the row is about, in column order; ``values``: the row's printed
        values (hashable: strings, numbers, tuples).

    Returns
    -------
    list of CollapsedRow
        In the order of each row's first member. Every input row is a member of exactly one
        output row, whose values equal its own. The same input always gives the same output.

    Examples
    --------
    >>> rows = [(["drop-2"], ["1.8 V"]), (["drop-1"], ["1.8 V"]), (["drop-3"], ["2 V"])]
    >>> [(row.names(code=False), row.values) for row in collapse_rows(rows)]
    [('drop-1 and drop-2', ('1.8 V',)), ('drop-3', ('2 V',))]
    """
    rows = [(tuple(parts), tuple(values)) for parts, values in rows]
    buckets: dict[tuple, list[int]] = {}
    for index, (parts, values) in enumerate(rows):
        key = (len(parts), values) if parts else ("alone", index)
        buckets.setdefault(key, []).append(index)
    collapsed = []
    for indices in buckets.values():
        for members, varying in _split([(index, rows[index][0]) for index in indices]):
            parts = rows[members[0]][0]
            if varying is not None:
                names = sorted(dict.fromkeys(rows[index][0][varying] for index in members), key=natural_key)
                columns = tuple(tuple(names) if position == varying else (part,)
                                for position, part in enumerate(parts))
            else:
                columns = tuple((part,) for part in parts)
            collapsed.append(CollapsedRow(columns, rows[members[0]][1], tuple(members)))
    return sorted(collapsed, key=lambda row: row.members[0])


def _split(members: list[tuple[int, tuple[str, ...]]]) -> list[tuple[list[int], int | None]]:
    """Rows with equal values, as (indices in input order, the part position that varies).

    With no parts every row stands alone; with one position all rows form one group. With
    several, the position giving the fewest groups (the first of those on a tie) varies, and
    rows that agree on every other position form a group.
    """
    count = len(members[0][1])
    if count == 0:
        return [([index], None) for index, _ in members]
    best: list | None = None
    for position in range(count):
        groups: dict[tuple, list[int]] = {}
        for index, parts in members:
            groups.setdefault(parts[:position] + parts[position + 1:], []).append(index)
        if best is None or len(groups) < len(best):
            best = [(indices, position) for indices in groups.values()]
    return best

"""One finding per distinct hazard: findings that say the same thing about different parts merge.

A setup with twelve identical stations makes each rule say the same thing twelve times, once per
station. :func:`group_findings` merges such findings into one that names every part it applies to.
(A remark of the calculation that only repeats another finding is not written by its rule in
the first place: see :func:`hazards.rules.electrical._remarks`.) It is a pure function over a list of findings, called once at the end of
:func:`hazards.evaluate.evaluate`.

What counts as "the same thing"
-------------------------------
The *parts* of a finding are the ids its title writes between backticks (```drop-01```), in the
order they appear. Setting them aside (every occurrence, with or without backticks, in the id,
title, figures, reason, cautions and checklist) leaves the finding's *template*. Findings merge
when they share the concern, severity, deferral line and template, and differ in exactly one part
(in one position of the title). Figures therefore have to agree to the printed digit: findings
whose figures differ are not merged, because the title and the checklist quote those figures
(``at least 30.7 mm apart``) and one value cannot stand for several. Sources are not compared:
the merged finding cites the union of its members' sources. A finding that names no part is never
merged.

How a merged finding reads
--------------------------
The parts are listed in natural order (``drop-2`` before ``drop-10``); a run of three or more
consecutive numbers is written as a range, ``drop-01`` to ``drop-12``.

* A title that begins with the part (its subject) becomes ``Each of `drop-01` to `drop-12` drives
  the meter past full scale (17.9 x)``; any other title lists the parts where the one part stood.
* A checklist item, reason or caution names the parts in the first of these ways that fits
  (:func:`_several`), each of which keeps its counts and pronouns (``(1 piece)``, ``keep it
  apart``) true for each part on its own:

  - the part opens it as its subject: ``Each of `drop-01` to `drop-12` drives ...``;
  - the part is named once, after a preposition: the list stands in its place after ``each
    of``: ``The electrical check needs the electrical figures of each of `drop-01` to
    `drop-12`; without it ...``;
  - every mention can be said with a pronoun: the list goes up front and the text follows with
    ``it`` for the part, ``its circuit`` for ``the circuit of `drop-01```, ``its magnets`` for
    ``the `magnet-01` magnets``: ``For each of `magnet-01` to `magnet-12`: count its magnets out
    at the start and back in at the end (1 piece).``;
  - otherwise the wording for the first part is kept, then ``; the same for `drop-02` to
    `drop-12```.
* The first figure, ``applies to each of these 12``, lists every part in full, so each id can be
  found by searching the text; the other figures are those of each part.
* The id is the first member's id with its part written ``drop-01+11`` (the first part and how many
  more), e.g. ``electrical.drop-01+11.meter``: deterministic, and unlike any id a rule gives, since
  setup ids cannot contain ``+``.
"""
from __future__ import annotations

import dataclasses
import re

from hazards.findings import Finding

__all__ = ["group_findings", "named_parts", "finding_kind", "name_parts", "natural_key"]

_BACKTICKED = re.compile(r"`([^`]+)`")
_ID_CHARACTER = r"A-Za-z0-9_\-"
# Markers standing for a part in a template; \x00 never appears in text written by the rules.
_MARK = re.compile(r"\x00([BP])(\d+)\x00")

def natural_key(text: str) -> tuple:
    """Sort key putting ``drop-2`` before ``drop-10``: digit runs compare as numbers.

    Parameters
    ----------
    text : str
        An id.

    Returns
    -------
    tuple
        Compares digit runs by value, other runs case-insensitively.

    Examples
    --------
    >>> sorted(["drop-10", "drop-2", "Drop-1"], key=natural_key)
    ['Drop-1', 'drop-2', 'drop-10']
    """
    return tuple((0, int(piece), piece) if piece.isdigit() else (1, piece.lower(), piece)
                 for piece in re.split(r"(\d+)", text))


def named_parts(finding) -> list[str]:
    """The ids a finding's title writes between backticks, in order, each once.

    Parameters
    ----------
    finding : Finding

    Returns
    -------
    list of str
        The parts the finding is about; empty when the title names none.

    Examples
    --------
    >>> named_parts(Finding(id="x", severity="note", title="Handling `m-1` and `frame`"))
    ['m-1', 'frame']
    """
    return list(dict.fromkeys(_BACKTICKED.findall(str(getattr(finding, "title", "") or ""))))


def finding_kind(finding) -> str:
    """The finding's id with its parts set aside: which rule said it, whatever it is about.

    ``electrical.drop-01.meter`` and the merged ``electrical.drop-01+11.meter`` are both of kind
    ``electrical.*.meter``; a ``#2`` that :func:`group_findings` added to a repeated id is dropped.

    Parameters
    ----------
    finding : Finding

    Returns
    -------
    str
        The id with every part (``finding.parts`` and the ids in the title) written ``*``.

    Examples
    --------
    >>> finding_kind(Finding(id="electrical.drop-01+11.meter", severity="action",
    ...                      title="Each of `drop-01` to `drop-12` drives the meter", parts=["drop-01"]))
    'electrical.*.meter'
    """
    parts = list(getattr(finding, "parts", None) or []) + named_parts(finding)
    kind = re.sub(r"#\d+$", "", finding.id)          # the suffix that keeps a repeated id unique
    kind = _pattern(parts).sub("*", kind) if parts else kind
    return re.sub(r"\*\+\d+", "*", kind)


def name_parts(ids, code: bool = True, compact: bool = True) -> str:
    """Ids as a readable list: ``a``, ``a and b``, ``a, b and c``; with ``compact``, a run of three
    or more consecutive numbers with the same stem as ``first to last``.

    Parameters
    ----------
    ids : iterable of str
        The ids, in the order to name them (callers pass them in natural order).
    code : bool
        Write each id between backticks (the PDF sets those in a monospaced font).
    compact : bool
        Write runs such as ``drop-01``, ``drop-02``, ... ``drop-12`` as ``drop-01 to drop-12``.

    Returns
    -------
    str

    Examples
    --------
    >>> name_parts(["drop-01", "drop-02", "drop-03", "drop-05", "frame"], code=False)
    'drop-01 to drop-03, drop-05 and frame'
    >>> name_parts(["a-1", "a-2"])
    '`a-1` and `a-2`'
    """
    ids = list(ids)
    quote = (lambda text: f"`{text}`") if code else str
    pieces, index = [], 0
    while index < len(ids):
        end = index
        while compact and end + 1 < len(ids) and _follows(ids[end], ids[end + 1]):
            end += 1
        if end - index >= 2:
            pieces.append(f"{quote(ids[index])} to {quote(ids[end])}")
            index = end + 1
        else:
            pieces.append(quote(ids[index]))
            index += 1
    return pieces[0] if len(pieces) == 1 else ", ".join(pieces[:-1]) + " and " + pieces[-1]


def group_findings(findings) -> list:
    """Merge findings that say the same thing about different parts.

    Parameters
    ----------
    findings : list of Finding
        In the order to report them (most pressing first).

    Returns
    -------
    list of Finding
        Each merged finding stands where its first member stood; the others keep their order.
        The same input gives the same output, whatever order the merged members came in. Ids
        are unique (a repeated id, which no rule should give, gets ``#2``, ``#3``, ...).
        Inputs are not changed.

    Notes
    -----
    The rules for merging and for the wording of a merged finding are in the module docstring.
    """
    findings = list(findings)
    buckets: dict[tuple, list[tuple[int, tuple[str, ...]]]] = {}
    for index, finding in enumerate(findings):
        parts = named_parts(finding)
        if parts:
            buckets.setdefault(_template_key(finding, parts), []).append((index, tuple(parts)))
    merged: dict[int, Finding] = {}         # first member's index -> the merged finding
    absorbed: set[int] = set()
    for members in buckets.values():
        for indices, position in _split(members):
            if len(indices) > 1:
                merged[indices[0]] = _merge([findings[i] for i in indices], position)
                absorbed.update(indices[1:])
    result = [merged.get(index, finding) for index, finding in enumerate(findings) if index not in absorbed]
    return _unique_ids(result)


# --- templates ------------------------------------------------------------------------------------

def _pattern(parts) -> re.Pattern:
    """Any of the parts, backticked or bare, as a whole id (longest first, so `a-10` is not `a-1`)."""
    names = "|".join(re.escape(p) for p in sorted(set(parts), key=len, reverse=True))
    return re.compile(rf"`(?:{names})`|(?<![{_ID_CHARACTER}])(?:{names})(?![{_ID_CHARACTER}])")


def _template(text: str, parts) -> str:
    """The text with each part replaced by a marker of its position (and whether it was backticked)."""
    position = {part: number for number, part in enumerate(parts)}

    def mark(match):
        found = match.group(0)
        if found.startswith("`"):
            return f"\x00B{position[found[1:-1]]}\x00"
        return f"\x00P{position[found]}\x00"
    return _pattern(parts).sub(mark, str(text))


def _template_key(finding, parts) -> tuple:
    def t(text):
        return _template(text, parts)
    return (finding.concern, finding.severity, finding.deferral, len(parts), t(finding.id), t(finding.title),
            tuple((t(label), t(value)) for label, value in finding.figures), t(finding.why),
            tuple(t(c) for c in finding.cautions), tuple(t(c) for c in finding.checklist))


def _split(members) -> list[tuple[list[int], int]]:
    """Members of one template, as (indices in input order, the part position that varies).

    With one position, all members form one group. With several, the position that gives the
    fewest groups (the first of those on a tie) varies, and members that agree on every other
    position form a group.
    """
    best: list | None = None
    for position in range(len(members[0][1])):
        groups: dict[tuple, list[int]] = {}
        for index, parts in members:
            groups.setdefault(parts[:position] + parts[position + 1:], []).append(index)
        if best is None or len(groups) < len(best):
            best = [(sorted(indices), position) for indices in groups.values()]
    return best


# --- a merged finding -----------------------------------------------------------------------------

def _merge(members, varying: int) -> Finding:
    """One finding for members that differ only in the part at position ``varying`` of their titles."""
    members = sorted(members, key=lambda m: natural_key(named_parts(m)[varying]))  # stable: ties keep order
    base = members[0]
    values = named_parts(base)
    names = list(dict.fromkeys(named_parts(m)[varying] for m in members))
    sources = _union([(_template(tid, named_parts(m)), _template(text, named_parts(m))) for tid, text in m.sources]
                     for m in members)
    if len(names) == 1:     # the same finding twice: keep one, with every source
        return dataclasses.replace(base, sources=[(_render(tid, values), _render(text, values))
                                                  for tid, text in sources])
    others = names[1:]

    def plain(text):
        return _render(_template(text, values), values, varying, names)

    def prose(text, title=False):
        template = _template(text, values)
        marks = [m for m in _MARK.finditer(template) if int(m.group(2)) == varying]
        if not marks:
            return _render(template, values)
        if title:
            first = marks[0]
            if len(marks) == 1 and first.start() == 0 and template[first.end():first.end() + 1] == " ":
                return "Each of " + _render(template, values, varying, names)   # the part is the subject
            return _render(template, values, varying, names)
        return _several(template, marks, values, varying, names)

    id_template = _template(base.id, values)
    if any(int(m.group(2)) == varying for m in _MARK.finditer(id_template)):
        merged_id = _render(id_template, values, varying, [f"{names[0]}+{len(others)}"], code=False)
    else:
        merged_id = f"{base.id}.{names[0]}+{len(others)}"
    return dataclasses.replace(
        base, id=merged_id, title=prose(base.title, title=True),
        figures=[(f"applies to each of these {len(names)}", name_parts(names, compact=False))]
        + [(plain(label), plain(value)) for label, value in base.figures],
        why=prose(base.why) if base.why else base.why,
        cautions=[prose(c) for c in base.cautions], checklist=[prose(c) for c in base.checklist],
        sources=[(_render(tid, values, varying, names), _render(text, values, varying, names))
                 for tid, text in sources],
        parts=names)


# Words after which a part is the object of a preposition, so "each of" can stand before it.
_PREPOSITION = re.compile(r"(?:^|\s)(?:of|from|to|in|into|for|at|on|near|with|by|around|inside|outside|"
                          r"beside|over|under|through) $")
# Plural nouns a part's id can qualify ("the `magnet-01` magnets"); "its" stands for the id.
_QUALIFIED = re.compile(r" (?:magnets|pieces)\b")
# Words that make "the X ... of" a phrasal verb's object rather than a noun phrase.
_PARTICLES = {"out", "up", "off", "away", "back", "down", "clear", "free", "part", "most", "rest"}


def _several(template: str, marks, values, varying: int, names) -> str:
    """A reason, caution or checklist item of a merged finding, worded for every part.

    The four ways of the module docstring, tried in order: the part as subject (``Each of``),
    named once after a preposition (``each of`` in its place; not when ``and``/``or`` follows,
    which would join the list), said by pronouns (``For each of ...:`` up front), or the first
    part's wording and ``; the same for ...``.
    """
    backticked = marks[0].group(1) == "B"
    listed = name_parts(names, code=backticked)
    first = marks[0]
    joined = re.match(r" (?:and|or) ", template[first.end():]) is not None
    if len(marks) == 1 and first.start() == 0 and template[first.end():first.end() + 1] == " " and not joined:
        return "Each of " + _render(template, values, varying, names)
    if len(marks) == 1 and _PREPOSITION.search(template[:first.start()]) and not joined:
        return _render(template[:first.start()] + "each of " + template[first.start():], values, varying, names)
    body = _with_pronouns(template, marks)
    if body is not None:
        text = _render(body, values)
        if len(text) > 1 and text[1].islower():     # not an acronym or a backticked id
            text = text[0].lower() + text[1:]
        return f"For each of {listed}: {text}"
    own = _render(template, values)
    clause = "the same for " + name_parts(names[1:], code=backticked)
    return own[:-1] + "; " + clause + "." if own.endswith(".") else own + "; " + clause


def _with_pronouns(template: str, marks) -> str | None:
    """The template with each mention of the varying part said by a pronoun; None if one cannot be."""
    pieces, end = [], 0
    for mark in marks:
        before, after = template[end:mark.start()], template[mark.end():]
        sentence_start = not template[:mark.start()].strip() or re.search(r"[.!?] $", template[:mark.start()])
        possessive = re.search(r"(?:^|(?<=\s))([Tt])he ((?:[a-z]+ )?[a-z]+) of $", before)
        if possessive and set(possessive.group(2).split()) & _PARTICLES:    # "the cards out of"
            possessive = None
        article = re.search(r"(?:^|(?<=\s))([Tt])he $", before)
        if after.startswith("'s") or after.startswith("\u2019s"):
            return None
        if article and _QUALIFIED.match(after):              # the `a` magnets -> its magnets
            pieces.append(before[:article.start()] + ("Its" if article.group(1) == "T" else "its"))
        elif possessive:                                     # the circuit of `a` -> its circuit
            pieces.append(before[:possessive.start()] + ("Its " if possessive.group(1) == "T" else "its ")
                          + possessive.group(2))
        elif re.search(r"(?:^|\s)(?:a|an|the|A|An|The|of|every|each|any) $", before):
            return None
        else:
            pieces.append(before + ("It" if sentence_start else "it"))
        end = mark.end()
    return "".join(pieces) + template[end:]


def _render(template: str, values, varying: int | None = None, names=(), code: bool = True) -> str:
    """A template with each part put back, the one at ``varying`` as the list of ``names``.

    With ``code`` False the varying part is written as ``names`` joined, never backticked (ids).
    """
    def put(match):
        backticked, position = match.group(1) == "B", int(match.group(2))
        if position == varying:
            return name_parts(names, code=backticked) if code else "".join(names)
        return f"`{values[position]}`" if backticked else values[position]
    return _MARK.sub(put, template)


def _union(lists) -> list[tuple[str, str]]:
    result: list[tuple[str, str]] = []
    for entries in lists:
        for entry in entries:
            if tuple(entry) not in result:
                result.append(tuple(entry))
    return result


def _unique_ids(findings) -> list:
    seen: dict[str, int] = {}
    result = []
    for finding in findings:
        count = seen.get(finding.id, 0) + 1
        seen[finding.id] = count
        result.append(finding if count == 1 else dataclasses.replace(finding, id=f"{finding.id}#{count}"))
    return result


# --- helpers --------------------------------------------------------------------------------------

def _follows(previous: str, following: str) -> bool:
    """True when ``following`` is ``previous`` with its trailing number one higher, same stem and width."""
    a, b = re.fullmatch(r"(.*?)(\d+)", previous), re.fullmatch(r"(.*?)(\d+)", following)
    if not a or not b or a.group(1) != b.group(1) or int(b.group(2)) != int(a.group(2)) + 1:
        return False
    return len(a.group(2)) == len(b.group(2)) or not (a.group(2).startswith("0") or b.group(2).startswith("0"))

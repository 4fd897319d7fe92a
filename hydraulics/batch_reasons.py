"""The reasons of many reaches, kept as the texts added to them and joined only when read.

The check of an inventory (:mod:`hydraulics.many_reaches`) words each reach's
verdict and warnings in several steps: a reason may be set whole (a screening
problem, an unknown lining), and notes are added after it or, for the verdict's
own words, before it. Joining them as they come would build a new Python string
for every reach at every step, most of the check's time on a large inventory.
So :class:`Reasons` keeps each step's texts with the rows they belong to, and
joins them once, when they are read: :meth:`Reasons.joined` in Python, or by
whoever reads :meth:`Reasons.parts` (a results file's writer joins them in C++).

A reach's reason reads: the notes put before it (the newest first), then its
reason set whole, then the notes added after it (the oldest first), "; "
between two. Setting a reach's reason whole drops the notes it had until then.
An empty text adds nothing. Texts come as one ``str`` for every row, an object
array of ``str`` (one per row), :class:`Coded` (distinct texts and, per row,
the index of its own: a text shared by many reaches is then held once) or
:class:`Composed` (pieces of texts, such as the numbers a sentence quotes, put
together row by row only when the reasons are joined).
"""

from __future__ import annotations

from typing import NamedTuple

import numpy as np

#: What stands between two texts of one reason.
SEPARATOR = "; "


class Coded(NamedTuple):
    """Texts given as ``texts[which]``: ``texts`` an object array of distinct ``str``, ``which`` an index array."""

    texts: np.ndarray
    which: np.ndarray

    def expanded(self) -> np.ndarray:
        """One text per row (object array)."""
        return self.texts[self.which]


class Composed(NamedTuple):
    """Texts made row by row of ``pieces`` written one after the other, each piece one str for every row or
    Coded (one text per row); at least one is Coded. A text that quotes numbers is made of the numbers' texts,
    each distinct one written once, and of the words between them."""

    pieces: tuple

    def expanded(self) -> np.ndarray:
        """One text per row (object array)."""
        out = text_array(next(len(p.which) for p in self.pieces if isinstance(p, Coded)))
        for piece in self.pieces:
            out = out + (piece if isinstance(piece, str) else piece.expanded())
        return out


def text_array(size: int, text: str = "") -> np.ndarray:
    """An object array of ``size`` references to ``text`` (np.full would convert, making a new str each)."""
    out = np.empty(size, dtype=object)
    out.fill(text)
    return out


def object_array(texts) -> np.ndarray:
    """A list of str as a 1-D object array (np.array could make a 2-D array of characters or a U array)."""
    out = np.empty(len(texts), dtype=object)
    out[:] = texts
    return out


def _expanded(texts, count: int) -> np.ndarray:
    """``texts`` (str, object array, Coded or Composed) as an object array of ``count`` str, one per row."""
    if isinstance(texts, str):
        return text_array(count, texts)
    if isinstance(texts, (Coded, Composed)):
        return texts.expanded()
    return texts


def _taken(texts, keep):
    """The texts of the rows ``keep`` (a mask) of ``texts`` (str, object array, Coded or Composed)."""
    if isinstance(texts, str):
        return texts
    if isinstance(texts, Coded):
        return Coded(texts.texts, texts.which[keep])
    if isinstance(texts, Composed):
        return Composed(tuple(_taken(p, keep) for p in texts.pieces))
    return texts[keep]


class Reasons:
    """The reasons of ``size`` reaches (rows 0 .. size-1), as set whole and as noted; see the module notes.

    A batch's results hold a list of them, one for each consecutive group of reaches checked together
    (:attr:`hydraulics.many_reaches.BatchResult.reasons`).
    """

    def __init__(self, size: int):
        self.size = size
        #: Each row's reason as set whole ("" where none was).
        self.base = text_array(size)
        #: (rows, texts, before) for each note, in the order added; ``before``: put before the reason.
        self.notes: list = []
        # The number of notes there were when each row's reason was last set whole (those before it are dropped),
        # made on the first set that follows a note.
        self._since = None
        self._joined = None

    def __len__(self):
        return self.size

    def set(self, rows, texts) -> None:
        """Set the reasons of ``rows`` whole to ``texts`` (one str, or one str per row), dropping their notes."""
        rows = np.asarray(rows, dtype=np.intp)
        self.base[rows] = texts
        if self.notes:
            if self._since is None:
                self._since = np.zeros(self.size, dtype=np.intp)
            self._since[rows] = len(self.notes)
        self._joined = None

    def note(self, rows, texts, before: bool = False) -> None:
        """Add ``texts`` (str, object array of str with one per row, Coded or Composed) to the reasons of
        ``rows``: after what they say, or ``before`` it."""
        rows = np.asarray(rows, dtype=np.intp)
        if len(rows):
            self.notes.append((rows, texts, before))
            self._joined = None

    def parts(self):
        """The texts of every reason in the order they read: a list of (rows, texts) (texts as given to
        :meth:`set` or :meth:`note`), the first text of a row first. Rows whose notes were dropped are left out;
        a row may be missing from any part, and a text may be empty (it adds nothing)."""
        out = []
        for k, (rows, texts, before) in enumerate(self.notes):
            if self._since is not None:
                keep = self._since[rows] <= k
                if not keep.all():
                    rows, texts = rows[keep], _taken(texts, keep)
            out.append((rows, texts, before))
        front = [(rows, texts) for rows, texts, before in reversed(out) if before]
        back = [(rows, texts) for rows, texts, before in out if not before]
        return [*front, (np.arange(self.size), self.base), *back]

    def joined(self) -> np.ndarray:
        """Every reason as one str (object array), "; " between two texts; made once and kept until a change."""
        if self._joined is None:
            self._joined = self._join(self.parts(), self.size)
        return self._joined

    def joined_at(self, rows) -> np.ndarray:
        """The reasons of ``rows`` alone (object array, in the order of ``rows``), as :meth:`joined` words them."""
        rows = np.asarray(rows, dtype=np.intp)
        if self._joined is not None:
            return self._joined[rows]
        place = np.full(self.size, -1, dtype=np.intp)
        place[rows] = np.arange(len(rows))
        parts = []
        for at, texts in self.parts():
            mine = place[at] >= 0
            parts.append((place[at[mine]], _taken(texts, mine)))
        return self._join(parts, len(rows))

    @staticmethod
    def _join(parts, size: int) -> np.ndarray:
        out = text_array(size)
        for rows, texts in parts:
            new = _expanded(texts, len(rows))
            said = new != ""
            rows, new = rows[said], new[said]
            current = out[rows]
            first = current == ""
            new[~first] = current[~first] + SEPARATOR + new[~first]
            out[rows] = new
        return out

"""Numbers to text on whole arrays: exactly the text of Python's ``"%.{P}g" % x``, many values at a time.

This is the text of the numbers an inventory's results file holds (read back by a spreadsheet or a GIS), not of
what a person reads on a screen or a sheet, which :mod:`app.results` rounds.

Writing a results file of 100,000 rows means formatting some 700,000
numbers, and one Python format operation each is most of the time the write
takes. Here the digits come from numpy arithmetic and tables:

* the decimal exponent X of the rounded value and its P-digit mantissa m,
  |x| ~= m 10^(X-P+1), come from log10 and one scaling by a power of ten;
  m is rounded to nearest, as C's printf rounds the exact binary value;
* where the scaled value lies within 1e-6 of a rounding tie (the error of
  the scaling is below 1e-10 there, but a tie could go either way) or is
  too large or small to scale safely (|X| > 280), the value is formatted by
  Python's own ``%`` instead; so every text is Python's, digit for digit;
* the layout is that of ``%g`` (C99 7.21.6.1, the ``g`` conversion): fixed
  notation when -4 <= X < P, else d.ddde+XX with at least two exponent
  digits; trailing zeros and a trailing decimal point removed. The texts of
  the mantissas, with the decimal point in each place, are looked up in
  tables made once per P.

A non-finite value gives an empty text (a blank cell).
"""

from __future__ import annotations

import numpy as np

__all__ = ["MAX_DIGITS", "RowTexts", "format_rows", "format_rows_parallel"]

#: Largest P served from tables (9 * 10^(P-1) mantissas each).
MAX_DIGITS = 6
_TIE = 1e-6           # distance from a rounding tie below which Python formats the value
_EXP_RANGE = 280      # |X| beyond which Python formats the value (10^X scaling near over/underflow)


class _Tables:
    """Texts of the P-digit mantissas m (10^(P-1) <= m < 10^P), laid out for each %g form."""

    def __init__(self, p: int):
        self.p = p
        self.low = 10 ** (p - 1)
        count = 9 * self.low
        m = np.arange(self.low, 10 * self.low)
        digits = ((m[:, None] // 10 ** np.arange(p - 1, -1, -1)) % 10 + ord("0")).astype(np.uint8)
        shown = np.full(count, p)
        rest = m.copy()
        for _ in range(p - 1):  # digits shown: P minus the trailing zeros
            tz = (rest % 10 == 0) & (shown > 1)
            shown -= tz
            rest = np.where(tz, rest // 10, rest)

        # A part: the fixed forms with X = 0 .. P-1, the scientific mantissa, the "0.00" prefixes, "0", empty
        wa = max(p + 1, 5)   # the widest text: a mantissa with its point, or the prefix "0.000"
        rows_a = []
        lens_a = []
        for x in range(p):
            block = np.zeros((count, wa), dtype=np.uint8)
            whole = x + 1                                          # digits before the point
            block[:, :whole] = digits[:, :whole]
            frac = np.clip(shown - whole, 0, None)                 # digits after it
            has = frac > 0
            block[has, whole] = ord(".")
            block[:, whole + 1:p + 1] = digits[:, whole:]
            rows_a.append(block)
            lens_a.append(whole + frac + has)
        sci = np.zeros((count, wa), dtype=np.uint8)
        sci[:, 0] = digits[:, 0]
        sci[:, 1] = ord(".")
        sci[:, 2:p + 1] = digits[:, 1:]
        rows_a.append(sci)
        lens_a.append(np.where(shown > 1, shown + 1, 1))
        self.sci_a = p * count
        small = [b"0." + b"0" * z for z in range(4)]               # X = -1 .. -4
        self.prefix_a = (p + 1) * count
        extra = small + [b"0", b""]
        self.zero_a = self.prefix_a + 4
        self.empty_a = self.zero_a + 1
        tail = np.zeros((len(extra), wa), dtype=np.uint8)
        for i, t in enumerate(extra):
            tail[i, :len(t)] = np.frombuffer(t, dtype=np.uint8)
        rows_a.append(tail)
        lens_a.append(np.array([len(t) for t in extra]))
        # each A row unsigned, then with a minus sign: row + sign * (rows of A)
        table, length = np.concatenate(rows_a), np.concatenate(lens_a)
        table[np.arange(wa) >= length[:, None]] = 0   # a zero byte is no character
        signed = np.zeros((len(table), wa + 1), dtype=np.uint8)
        signed[:, 0] = ord("-")
        signed[:, 1:] = table
        unsigned = np.zeros_like(signed)
        unsigned[:, :wa] = table
        self.rows_a = len(table)
        self.a = np.ascontiguousarray(np.concatenate([unsigned, signed])).view(f"V{wa + 1}").ravel()
        self.len_a = np.concatenate([length, length + 1]).astype(np.uint8)

        # B part: the stripped mantissa digits (after a "0.00" prefix), the exponents, empty
        wb = max(p, 5)
        dig = np.zeros((count, wb), dtype=np.uint8)
        dig[:, :p] = digits
        exps = [("e%+03d" % x).encode() for x in range(-_EXP_RANGE - 1, _EXP_RANGE + 2)]
        self.exp_b = count + _EXP_RANGE + 1          # row of X = 0
        ex = np.zeros((len(exps) + 1, wb), dtype=np.uint8)
        for i, t in enumerate(exps):
            ex[i, :len(t)] = np.frombuffer(t, dtype=np.uint8)
        self.empty_b = count + len(exps)
        # each B row followed by a comma, then without it (a row's last field): row + last * (rows of B)
        table, length = np.concatenate([dig, ex]), np.concatenate([shown, [len(t) for t in exps], [0]])
        table[np.arange(wb) >= length[:, None]] = 0
        comma = np.zeros((len(table), wb + 1), dtype=np.uint8)
        comma[:, :wb] = table
        comma[np.arange(len(table)), length] = ord(",")
        bare = np.zeros_like(comma)
        bare[:, :wb] = table
        self.rows_b = len(table)
        self.b = np.ascontiguousarray(np.concatenate([comma, bare])).view(f"V{wb + 1}").ravel()
        self.len_b = np.concatenate([length + 1, length]).astype(np.uint8)
        self.count = count
        # per form, X + 5 for X = -5 .. P clipped (0 and P + 5: scientific; 1 .. 4: "0.00" prefix; 5 .. P + 4:
        # fixed with X = 0 .. P - 1), the rows of a value: base + step * (m - 10^(P-1)) [+ exp_step * X]
        forms = p + 6
        self.base_a = np.zeros(forms, dtype=np.intp)
        self.step_a = np.zeros(forms, dtype=np.intp)
        self.base_b = np.full(forms, self.empty_b, dtype=np.intp)
        self.step_b = np.zeros(forms, dtype=np.intp)
        self.exp_step_b = np.zeros(forms, dtype=np.intp)
        for f in (0, p + 5):
            self.base_a[f], self.step_a[f] = self.sci_a, 1
            self.base_b[f], self.exp_step_b[f] = self.exp_b, 1
        for x in range(-4, 0):
            self.base_a[x + 5] = self.prefix_a - 1 - x
            self.base_b[x + 5], self.step_b[x + 5] = 0, 1
        for x in range(p):
            self.base_a[x + 5], self.step_a[x + 5] = x * count, 1
        self.cell = np.dtype([("a", f"V{wa + 1}"), ("b", f"V{wb + 1}")])


_TABLES: dict = {}
_POWERS = {p: 10.0 ** np.arange(-_EXP_RANGE - p, _EXP_RANGE + p + 1) for p in range(1, MAX_DIGITS + 1)}


def _tables(p: int) -> _Tables:
    if p not in _TABLES:
        _TABLES[p] = _Tables(p)
    return _TABLES[p]


def _mantissa(a, p):
    """(m, X, exact) for values a > 0: m the rounded P-digit mantissa, X the exponent of the rounded value,
    exact False where Python has to format the value (near a tie, or |X| too large)."""
    x = np.floor(np.log10(a)).astype(np.intp)
    exact = np.abs(x) <= _EXP_RANGE
    x[~exact] = 0
    power = _POWERS[p]  # 10^k, k = -(280 + P) .. 280 + P
    base = _EXP_RANGE + p
    lo, hi = 10.0 ** (p - 1), 10.0 ** p
    scaled = a * power[base + p - 1 - x]
    for _ in range(3):  # log10 can be one off next to a power of ten; the unrounded mantissa settles it
        off = np.flatnonzero((scaled >= hi) | (scaled < lo))
        if not len(off):
            break
        x[off] += (scaled[off] >= hi).astype(np.intp) - (scaled[off] < lo)
        scaled[off] = a[off] * power[base + p - 1 - x[off]]
    else:
        exact[off] = False
    m = np.rint(scaled)
    exact &= np.abs(scaled - m) < 0.5 - _TIE
    carry = np.flatnonzero(m >= hi)  # rounded up to 10^P: 1.00.. times the next power of ten
    m[carry] = lo
    x[carry] += 1
    return m.astype(np.intp), x, exact


class RowTexts:
    """Texts of N rows as one ASCII buffer: row i is ``data[ends[i-1]:ends[i]]`` (``ends[-1]`` = len(data))."""

    def __init__(self, data: bytes, ends: np.ndarray):
        self.data, self.ends = data, ends

    def __len__(self):
        return len(self.ends)

    def offsets(self) -> np.ndarray:
        """Start of each row and the end of the last, int64 (N + 1 entries, from 0)."""
        return np.concatenate([[0], self.ends]).astype(np.int64)

    @classmethod
    def concat(cls, parts) -> "RowTexts":
        """The rows of ``parts`` one after the other, as one RowTexts."""
        parts = list(parts)
        shift = np.cumsum([0] + [len(p.data) for p in parts[:-1]], dtype=np.int64)
        ends = [p.ends + s for p, s in zip(parts, shift.tolist())]
        return cls(b"".join(p.data for p in parts), np.concatenate(ends) if ends else np.zeros(0, dtype=np.int64))

    def tolist(self) -> list[str]:
        text = self.data.decode("ascii")
        ends = self.ends.tolist()
        return [text[a:b] for a, b in zip([0] + ends[:-1], ends)]


def format_rows(values, digits: int, comma_after_last: bool = False) -> RowTexts:
    """Each row of ``values`` as its numbers in ``"%.{digits}g"`` form, separated by commas.

    Parameters
    ----------
    values : array_like of float, shape (N, C)
        C numbers per row; a non-finite one gives an empty field.
    digits : int
        Significant digits P, 1 to :data:`MAX_DIGITS`.
    comma_after_last : bool
        Also end each row with a comma (for a field that follows).

    Returns
    -------
    RowTexts
        N texts, e.g. ``"1.2346,0.5,,12"`` for C = 4 (``"1.2346,0.5,,12,"`` with ``comma_after_last``).
    """
    if not 1 <= digits <= MAX_DIGITS:
        raise ValueError(f"digits must be 1 to {MAX_DIGITS}, got {digits}")
    v = np.asarray(values, dtype=float)
    if v.ndim != 2:
        raise ValueError(f"values must be 2-D (rows, columns), got shape {v.shape}")
    rows, cols = v.shape
    if not cols:
        raise ValueError("values must have at least one column")
    if not rows:
        return RowTexts(b"", np.zeros(0, dtype=np.int64))
    t = _tables(digits)
    flat = v.ravel()
    a = np.abs(flat)
    finite = np.isfinite(a)
    nonzero = finite & (a > 0)
    live = np.flatnonzero(nonzero)  # blanks and zeros need no digits
    with np.errstate(over="ignore", invalid="ignore"):  # values beyond |X| = 280 are Python's to format
        m, x, exact = _mantissa(a[live], digits)
    # the form of each value: 0 .. P+5 by X (see _Tables); cells of zero and blank have their own rows
    form = np.clip(x, -5, digits) + 5
    i = m - t.low
    xc = np.clip(x, -_EXP_RANGE - 1, _EXP_RANGE + 1)
    # np.take rather than fancy indexing throughout: the same gathers, about twice as fast on these tables
    take = np.take
    cell_a = np.where(finite, t.zero_a, t.empty_a)
    cell_a[live] = take(t.base_a, form) + take(t.step_a, form) * i
    cell_b = np.full(flat.size, t.empty_b, dtype=np.intp)
    cell_b[live] = take(t.base_b, form) + take(t.step_b, form) * i + take(t.exp_step_b, form) * xc

    cell_a += (finite & np.signbit(flat)) * t.rows_a
    if not comma_after_last:
        cell_b.reshape(rows, cols)[:, -1] += t.rows_b  # no comma after a row's last field
    length = (take(t.len_a, cell_a) + take(t.len_b, cell_b)).reshape(rows, cols)
    out = np.empty((rows, cols), dtype=t.cell)
    out["a"] = take(t.a, cell_a).reshape(rows, cols)
    out["b"] = take(t.b, cell_b).reshape(rows, cols)
    for k in live[~exact].tolist():  # Python's own text where the arithmetic could be off
        r, c = divmod(k, cols)
        text = ("%.*g" % (digits, flat[k]) + ("," if comma_after_last or c < cols - 1 else "")).encode("ascii")
        cell = np.zeros(1, dtype=t.cell)
        cell.view(np.uint8)[:len(text)] = np.frombuffer(text, dtype=np.uint8)
        out[r, c] = cell[0]
        length[r, c] = len(text)
    raw = out.view(np.uint8)
    return RowTexts(raw.tobytes().translate(None, b"\0"), np.cumsum(length.sum(axis=1, dtype=np.int64)))




#: Rows below which splitting the work between threads costs more than it saves.
PARALLEL_MIN_ROWS = 20_000


class PendingRows:
    """Rows being formatted in blocks by a thread pool; :meth:`result` waits for them and joins them."""

    def __init__(self, blocks):
        self._blocks = blocks

    def result(self) -> RowTexts:
        return RowTexts.concat(b.result() if hasattr(b, "result") else b for b in self._blocks)


def format_rows_parallel(values, digits: int, comma_after_last: bool = False, pool=None,
                         parts: int = 2) -> PendingRows:
    """:func:`format_rows` on ``parts`` blocks of rows at once in the thread pool ``pool``.

    The work is numpy gathers and byte copies, which release the GIL, so the
    blocks run side by side on a machine with several cores while the
    caller's thread goes on with other work; ``.result()`` of the returned
    object gives the same text as one call of :func:`format_rows`. Without a
    pool, or for fewer than :data:`PARALLEL_MIN_ROWS` rows, the rows are
    formatted at once, in one block.
    """
    v = np.asarray(values, dtype=float)
    if pool is None or v.ndim != 2 or len(v) < PARALLEL_MIN_ROWS or parts < 2:
        return PendingRows([format_rows(v, digits, comma_after_last)])
    bounds = np.linspace(0, len(v), parts + 1).astype(int).tolist()
    return PendingRows([pool.submit(format_rows, v[a:b], digits, comma_after_last)
                        for a, b in zip(bounds[:-1], bounds[1:])])

"""Numbers to text on arrays (app.numtext) against Python's own printf-style formatting.

Reference: the Python Language Reference, "printf-style String Formatting" (the 'g'
conversion, after C99 7.21.6.1): "%.5g" % x, text for text.
"""

import numpy as np
import pytest

from app.numtext import MAX_DIGITS, format_rows

EDGES = [0.0, -0.0, 1.0, 10.0, 100.0, 1e5, 99999.5, 99999.49999, 9.99995, 9.99994999, 1e-4, 1e-5, 0.00009999951,
         123456.0, 1e-300, 1e300, 5e-324, 1.7976931348623157e308, 2.2250738585072014e-308, 0.5, 2.5, 1.00005,
         12345.5, 12346.5, 1e22, 1e23, 1e-22, 0.1, 0.3, 1 / 3, 9.9999e99, 9.99995e99, 1e280, 1e281, 1e-280, 1e-281,
         float("nan"), float("inf"), float("-inf")]


def python_rows(values, digits):
    return [",".join(("%.*g" % (digits, v) if np.isfinite(v) else "") for v in row) for row in values]


@pytest.mark.parametrize("digits", range(1, MAX_DIGITS + 1))
def test_every_text_is_pythons(digits):
    rng = np.random.default_rng(digits)
    values = np.concatenate([
        EDGES, [-v for v in EDGES],
        10 ** rng.uniform(-12, 12, 30000) * rng.choice([-1, 1], 30000),       # every decade
        10 ** rng.uniform(-320, 308, 3000),                                      # down to subnormals
        [round(x, k) for x, k in zip(rng.uniform(0, 1000, 6000), rng.integers(0, 6, 6000))],  # typed decimals
        (rng.integers(1, 10 ** digits, 6000) + 0.5) * 10.0 ** rng.integers(-8, 8, 6000),     # near rounding ties
    ])
    values = values[: len(values) // 6 * 6].reshape(-1, 6)
    texts = format_rows(values, digits)
    assert texts.tolist() == python_rows(values, digits)
    assert texts.data.decode() == "".join(python_rows(values, digits))
    assert format_rows(values, digits, comma_after_last=True).tolist() == [r + "," for r in python_rows(values, digits)]


def test_shapes_and_refusals():
    assert format_rows(np.zeros((0, 3)), 5).tolist() == []
    assert format_rows([[np.nan, 1.5, -2e-7], [0.0, -0.0, np.inf]], 5).tolist() == [",1.5,-2e-07", "0,-0,"]
    assert list(format_rows([[1.0, 22.0], [333.0, np.nan]], 5).offsets()) == [0, 4, 8]
    assert format_rows([[1.0, np.nan], [-0.5, 2.0]], 5, comma_after_last=True).tolist() == ["1,,", "-0.5,2,"]
    with pytest.raises(ValueError):
        format_rows(np.zeros((2, 0)), 5)
    with pytest.raises(ValueError):
        format_rows([1.0, 2.0], 5)
    with pytest.raises(ValueError):
        format_rows([[1.0]], MAX_DIGITS + 1)


def test_rows_formatted_in_threads_are_the_same_text():
    from concurrent.futures import ThreadPoolExecutor

    from app.numtext import PARALLEL_MIN_ROWS, RowTexts, format_rows_parallel

    rng = np.random.default_rng(7)
    rows = PARALLEL_MIN_ROWS + 1001
    values = (10 ** rng.uniform(-6, 6, (rows, 4))) * rng.choice([-1, 1], (rows, 4))
    values[::17, 2] = np.nan
    with ThreadPoolExecutor(2) as pool:
        for parts in (2, 3):
            got = format_rows_parallel(values, 5, comma_after_last=True, pool=pool, parts=parts).result()
            assert got.tolist() == [r + "," for r in python_rows(values, 5)]
            assert list(got.offsets()) == list(format_rows(values, 5, comma_after_last=True).offsets())
    small = format_rows_parallel(values[:10], 5, pool=None).result()  # no pool: one block, same text
    assert small.tolist() == python_rows(values[:10], 5)
    assert RowTexts.concat([]).tolist() == []

"""Names of what the user adds or renames, without Qt (app.editing): the window's document only pushes the edits.

The rules are the program's own (no publication): copies are numbered "name (2)", a channel the user adds is
"Ditch 1", "Ditch 2"..., and an empty or taken name is refused in words.
"""

from __future__ import annotations

import pytest

from app import project as pj
from app.editing import name_refusal, named_copies, new_name


def test_copies_are_named_apart_from_the_project_and_from_each_other():
    items = [pj.Channel(name="A"), pj.Channel(name="A"), pj.Channel(name="  "), pj.Channel(name="B")]
    taken = {"A", "Reach"}
    copies = named_copies(items, taken, "Reach")
    assert [c.name for c in copies] == ["A (2)", "A (3)", "Reach (2)", "B"]
    assert [c.name for c in items] == ["A", "A", "  ", "B"]          # the given items are left as they were
    assert all(c is not i for c, i in zip(copies, items))
    assert taken == {"A", "Reach", "A (2)", "A (3)", "Reach (2)", "B"}


@pytest.mark.parametrize("base, taken, expected", [
    ("Ditch", set(), "Ditch 1"),                    # a new channel always gets its number
    ("Ditch", {"Ditch 1", "Ditch 2"}, "Ditch 3"),
    ("Swale copy", {"Swale"}, "Swale copy"),       # a duplicate keeps "copy" while it is free
    ("Swale copy", {"Swale", "Swale copy"}, "Swale copy 1"),
])
def test_a_channel_added_or_duplicated_gets_a_free_name(base, taken, expected):
    assert new_name(base, taken) == expected


def test_an_empty_or_taken_name_is_refused_in_words():
    assert name_refusal("  ", {"A"}, "channel") == "A channel needs a name."
    assert name_refusal(" A ", {"A"}, "ditch run") == "Another ditch run is already called 'A'."
    assert name_refusal("B", {"A"}, "channel") is None

"""The window computes with the context it is given, and two contexts live side by side.

Two user catalogues price concrete differently (70 and 140 per m^2 of lined perimeter: invented prices, not data).
With an area basis a lining's cost per length is its unit cost times its lined width (the program's own rule,
hydraulics.stability.check_lining), so each window's costs must follow its own catalogue, however many other
windows are open.
"""

from __future__ import annotations

import copy

import pytest

from app import channel_display as display
from app import project as pj
from app.context import Context
from app.gui.mainwindow import MainWindow
from waiting import compared, evaluated

COSTS = (70.0, 140.0)
USER = 'schema_version = 1\n[[lining]]\nkey = "concrete"\nunit_cost = {cost}\nunit_cost_basis = "area"\n'


@pytest.fixture
def contexts(tmp_path):
    out = []
    for cost in COSTS:
        path = tmp_path / f"linings-{cost:g}.toml"
        path.write_text(USER.format(cost=cost), encoding="utf-8")
        out.append(Context.load(path, units="si"))
    return out


def demo():
    return pj.load(pj.demo_path())


def test_two_contexts_price_the_same_channel_each_by_its_own_catalogue(contexts):
    channel = demo().channel("East verge ditch")          # lined with concrete
    for context, cost in zip(contexts, COSTS):
        ev = display.evaluate(channel, context)
        assert context.catalogue_problem == "" and ev.lining.unit_cost == cost
        assert ev.lining.cost_per_length == pytest.approx(cost * ev.lining.lined_width, rel=1e-12)
    cheap, dear = (display.evaluate(channel, c).lining for c in contexts)
    assert dear.cost_per_length == pytest.approx(2 * cheap.cost_per_length, rel=1e-12)   # the first is unchanged
    assert display.evaluate(channel, Context.load(units="si")).lining.cost_per_length is None   # shipped: no price


def test_each_window_computes_with_the_context_it_was_given(contexts, qtbot):
    project = demo()
    windows = []
    for context in contexts:          # both windows open at once
        w = MainWindow(copy.deepcopy(project), persistent=False, context=context)
        qtbot.addWidget(w)
        windows.append(w)
    for w, context, cost in zip(windows, contexts, COSTS):
        assert w.doc.context.catalogue is context.catalogue
        w.doc.set_current([c.name for c in w.doc.project.channels].index("East verge ditch"))
        ev = evaluated(w, qtbot)
        assert ev.lining.unit_cost == cost
        assert ev.lining.cost_per_length == pytest.approx(cost * ev.lining.lined_width, rel=1e-12)
        shown = w.results.values["cost_per_length"].text().split()[0].replace(",", "")
        assert float(shown) == pytest.approx(ev.lining.cost_per_length, abs=0.005)   # SI project: $/m, 2 decimals
        w.doc.set_current(next(i for i, c in enumerate(w.doc.project.channels) if c.alternatives))
        w.comparison.refresh()        # the comparison view: the concrete alternative priced alike
        concrete = next(r for r in compared(w.comparison, qtbot) if r.choice.key == "concrete")
        assert concrete.cost_per_length == pytest.approx(cost * concrete.core.lined_width, rel=1e-12)
        w.doc.undo_stack.setClean()
    first = windows[0]                # still its own after the second window was made and used
    first.doc.set_current([c.name for c in first.doc.project.channels].index("East verge ditch"))
    assert evaluated(first, qtbot).lining.unit_cost == COSTS[0]


def test_a_user_catalogue_that_cannot_be_used_is_said_and_left_out(tmp_path, qtbot):
    path = tmp_path / "bad.toml"
    path.write_text('schema_version = 1\n[[lining]]\nkey = "concrete"\nunit_cost = -5.0\n', encoding="utf-8")
    context = Context.load(path)
    assert context.catalogue_problem.startswith(f"The user lining catalogue {path} was not used: ")
    assert "unit_cost" in context.catalogue_problem
    assert context.catalogue.get("concrete").unit_cost is None and len(context.catalogue) == len(Context.load().catalogue)
    w = MainWindow(demo(), persistent=False, context=context)
    qtbot.addWidget(w)
    assert w.statusBar().currentMessage() == context.catalogue_problem
    w.doc.undo_stack.setClean()


def test_the_document_refuses_to_open_without_a_context():
    """No default context: a document made without one would evaluate with the shipped catalogue unseen."""
    from app.gui.document import ProjectDocument

    with pytest.raises(TypeError, match="context"):
        ProjectDocument(demo())
    assert ProjectDocument(demo(), context=Context.load()).context.catalogue is not None

"""Method A of EN 1992-1-2 with mu_fi from the loads (5.3.2(3)) instead of the conservative 0.7.

mu_fi = NEd,fi / NRd with NEd,fi = eta_fi NEd (2.4.2) and NRd the design resistance at normal
temperature. Table 5.2a (EN 1992-1-2, R90 rows, columns mu_fi = 0.5 and 0.7) decides the minimum width
and axis distance; each pair reads the column at or above its mu_fi (no interpolation: on the safe side).
"""

from __future__ import annotations

import pytest

from design.fire import FireRating
from design.materials import Concrete, Reinforcement
from design.member import CheckSettings, ColumnActions, check_column
from design.resistance import DesignSection, SectionBatch
from design.sections import RectBars, RectSection

# 400 x 400, 8H20 at 27 + 8 + 10 = 45 mm axis distance, C30/37
DS = DesignSection(RectSection(400.0, 400.0, 27.0, 8.0, RectBars(20.0, 3, 3)), Concrete(30.0), Reinforcement(500.0))
NRD = float(SectionBatch([DS]).NRd()[0])


def _fire(eta_fi=None, NEd=None):
    NEd = 0.65 * NRD if NEd is None else NEd
    act = ColumnActions(NEd=NEd, l0y=2800.0, l0z=2800.0, l_clear=3000.0, phi_ef=1.0, l0_fi=2000.0, eta_fi=eta_fi)
    r = check_column(DS, act, CheckSettings(fire=FireRating.R90))
    return r.check("fire resistance R90"), r.values


def test_mu_fi_0_7_asks_for_53_mm():
    """Table 5.2a, R90, mu_fi = 0.7: b >= 350 mm with a = 53 mm (b >= 450 mm with 40 mm and 8 bars)."""
    f, v = _fire()
    assert v["mu_fi"] == pytest.approx(0.7)
    assert f.demand == pytest.approx(53.0) and f.capacity == pytest.approx(45.0) and not f.ok


def test_mu_fi_from_eta_fi_reads_the_0_5_column():
    """eta_fi = 0.65 at NEd = 0.65 NRd: mu_fi = 0.42 -> column 0.5: b >= 400 mm with a = 38 mm."""
    f, v = _fire(eta_fi=0.65)
    assert v["mu_fi"] == pytest.approx(0.65 * 0.65, rel=1e-9)
    assert f.demand == pytest.approx(38.0) and f.ok
    assert "column 0.5" in f.note


def test_mu_fi_above_0_7_has_no_table_value():
    f, v = _fire(eta_fi=0.9, NEd=0.95 * NRD)
    assert v["mu_fi"] == pytest.approx(0.855)
    assert not f.applicable and "no value" in f.note

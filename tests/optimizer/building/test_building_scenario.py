"""Scenario loading: good files become dataclasses; bad ones give one clear InputError."""

import dataclasses

import pytest

from optimizer.building.loads import Category, Combination, ImposedReduction
from optimizer.building.model import CellId, Orientation, SupportKind
from optimizer.building.scenario import load_scenario, load_scenario_text
from optimizer.errors import InputError

BASE = """
[project]
name = "Validation block (invented)"

[parameters]
set = "EN"

[materials]
concrete = "C30/37"
reinforcement_fyk_MPa = 500
ductility = "B"
aggregate_mm = 20
concrete_density_kN_m3 = 25.0

[[levels]]
name = "L1"
height_m = 4.0
slab_depth_mm = 250
[[levels]]
name = "L2"
height_m = 3.5
slab_depth_mm = 250
category = "B"
[[levels]]
name = "L3"
height_m = 3.5
slab_depth_mm = 250

[[stacks]]
id = "S1"
x_m = 0
y_m = 0
from_level = "L1"
to_level = "L3"
stands_on = "foundation"
[[stacks]]
id = "S2"
x_m = 8
y_m = 0
from_level = "L1"
to_level = "L3"
stands_on = "foundation"
[[stacks]]
id = "S3"
x_m = 4
y_m = 6
from_level = "L2"
to_level = "L3"
stands_on = { S1 = 0.5, S2 = 0.5 }

[[floors]]
levels = ["L1", "L3"]
outline_m = [[0, 0], [8, 0], [8, 6], [0, 6]]
sdl_kPa = 1.0
imposed_kPa = 2.5
category = "B"
facade_kN_m = 3.0

[[settings]]
exposure = "XC1"
fire = "R60"
braced = true
l0_factor = 1.0
trial_size_mm = [300, 300]

[takedown]
combination = "6.10"
imposed_reduction = "none"
"""


def load(text=BASE):
    return load_scenario_text(text, source="bad.toml")


def expect_error(text, field_part, value_part=None):
    with pytest.raises(InputError) as info:
        load(text)
    err = info.value
    msg = str(err)
    assert msg.startswith("bad.toml: "), msg
    assert field_part in err.field, msg
    if value_part is not None:
        assert value_part in repr(err.value), msg
    assert "\n" not in msg
    return err


def test_base_scenario_loads_into_frozen_dataclasses():
    s = load()
    assert s.project.name.endswith("(invented)")
    assert s.materials.fck_MPa == pytest.approx(30.0)  # C30/37, EN 1992-1-1 Table 3.1
    assert [lv.name for lv in s.levels] == ["L1", "L2", "L3"]
    # Elevations: 0, 4.0, 7.5; clear height 3.5 - 0.25 = 3.25 m.
    assert [lv.elevation_m for lv in s.levels] == [0.0, 4.0, 7.5]
    assert s.level("L2").clear_height_m == pytest.approx(3.25)
    assert s.stack("S1").orientation is Orientation.B_ALONG_X
    assert s.stack("S3").support is SupportKind.TRANSFER
    assert s.stack("S3").carried_by == (("S1", 0.5), ("S2", 0.5))
    assert s.takedown.combination is Combination.EQ_6_10
    assert s.takedown.imposed_reduction is ImposedReduction.NONE
    assert s.floor_at("L2").category is Category.B and s.floor_at("L2").psi0 == pytest.approx(0.7)
    assert len(s.cells) == 8 and [c.index for c in s.cells] == list(range(8))
    assert s.cells[0].id == CellId("S1", "L1")
    # l0 = 1.0 x clear height = 3750 mm at L1.
    assert s.cell(("S1", "L1")).l0y_mm == pytest.approx(3750.0)
    with pytest.raises(dataclasses.FrozenInstanceError):
        s.project = None


def test_reserved_tables_are_kept_opaque():
    text = BASE + '\n[catalogue]\nmodule_mm = 50\n\n[rules]\nanything = "later"\n'
    s = load(text)
    assert s.reserved["catalogue"]["module_mm"] == 50
    assert s.reserved["rules"]["anything"] == "later"


def test_settings_cascade_and_zones():
    text = BASE.replace(
        "[takedown]",
        '[[settings]]\nlevels = "L1"\nstacks = ["S1"]\nexposure = "XC3"\n'
        "k1y = 0.1\nk2y = 0.2\nk1z = 0.3\nk2z = 0.4\n\n"
        '[[materials.concrete_zones]]\nlevels = ["L1", "L1"]\nconcrete = "C40/50"\n\n[takedown]',
    )
    s = load(text)
    c = s.cell(("S1", "L1")).settings
    assert c.exposure == "XC3" and c.fire == "R60"
    assert c.effective_length.k1z == pytest.approx(0.3) and c.effective_length.l0y_factor is None
    assert c.fck_MPa == pytest.approx(40.0) and c.concrete == "C40/50"
    assert s.cell(("S2", "L1")).settings.exposure == "XC1"
    assert s.cell(("S2", "L2")).settings.fck_MPa == pytest.approx(30.0)


# ----------------------------------------------------------------------------- bad scenarios


def test_missing_key():
    err = expect_error(BASE.replace("height_m = 4.0\n", "", 1), "levels[0].height_m")
    assert "missing" in err.expected


def test_wrong_type():
    err = expect_error(BASE.replace("height_m = 4.0", 'height_m = "4.0"'), "levels[0].height_m", "'4.0'")
    assert "number" in err.expected


def test_negative_height():
    err = expect_error(BASE.replace("height_m = 4.0", "height_m = -4.0"), "levels[0].height_m", "-4.0")
    assert "positive" in err.expected


def test_slab_deeper_than_storey():
    expect_error(BASE.replace("slab_depth_mm = 250", "slab_depth_mm = 4000", 1), "levels[0].slab_depth_mm", "4000")


def test_unknown_level_name_suggests():
    err = expect_error(BASE.replace('to_level = "L3"', 'to_level = "L4"', 1), "stacks[0].to_level", "L4")
    assert "known level" in err.expected


def test_unknown_top_level_key_did_you_mean():
    err = expect_error(BASE + "\n[stack]\nid = 1\n", "stack")
    assert "did you mean 'stacks'" in err.expected


def test_unknown_nested_key_did_you_mean():
    err = expect_error(BASE.replace("sdl_kPa = 1.0", "sdl_kpa = 1.0"), "floors[0].sdl_kPa")
    assert "found 'sdl_kpa'" in err.expected
    err = expect_error(BASE.replace("aggregate_mm = 20", "aggregate_mm = 20\nagregate = 1"), "materials.agregate")
    assert "did you mean 'aggregate_mm'" in err.expected


def test_bad_enum_value():
    err = expect_error(BASE.replace('combination = "6.10"', 'combination = "6.10c"'), "takedown.combination", "6.10c")
    assert "'6.10'" in err.expected


def test_bad_concrete_class():
    expect_error(BASE.replace('concrete = "C30/37"', 'concrete = "C30/40"'), "materials.concrete", "C30/40")


def test_cycle_is_named():
    text = BASE.replace(
        'stands_on = "foundation"\n[[stacks]]\nid = "S2"', 'stands_on = { S3 = 1.0 }\n[[stacks]]\nid = "S2"'
    )
    err = expect_error(text, "stands_on")
    assert err.value == "S1 -> S3 -> S1"
    assert "cycle" in err.expected


def test_shares_must_sum_to_one():
    err = expect_error(BASE.replace("{ S1 = 0.5, S2 = 0.5 }", "{ S1 = 0.5, S2 = 0.4 }"), "stacks[2].stands_on")
    assert "sum to 0.9" in err.expected


def test_support_missing_at_level_below():
    # S3 moved down to start at L1: nothing below the lowest level.
    err = expect_error(BASE.replace('from_level = "L2"', 'from_level = "L1"'), "stacks[2].stands_on")
    assert "lowest level" in err.expected
    # S2 founded at L2 does not exist at L1, where S3 (from L2) needs it.
    text = BASE.replace(
        'id = "S2"\nx_m = 8\ny_m = 0\nfrom_level = "L1"', 'id = "S2"\nx_m = 8\ny_m = 0\nfrom_level = "L2"'
    )
    err = expect_error(text, "stacks[2].stands_on.S2", "S2")
    assert "runs through level 'L1'" in err.expected


def test_unknown_supporting_stack():
    expect_error(BASE.replace("{ S1 = 0.5, S2 = 0.5 }", "{ S1 = 0.5, S9 = 0.5 }"), "stacks[2].stands_on.S9", "S9")


def test_overlapping_stacks():
    text = BASE.replace('id = "S2"\nx_m = 8', 'id = "S2"\nx_m = 0.01')
    err = expect_error(text, "stacks[1].x_m/y_m")
    assert "S1" in err.expected


def test_duplicate_stack_id():
    expect_error(BASE.replace('id = "S2"', 'id = "S1"'), "stacks[1].id", "S1")


def test_floor_not_covering_a_level():
    err = expect_error(BASE.replace('levels = ["L1", "L3"]', 'levels = ["L1", "L2"]'), "floors", "L3")
    assert "floor plate" in err.expected


def test_missing_category():
    text = BASE.replace('category = "B"\nfacade', "facade")
    err = expect_error(text, "floors[0].category")
    assert "L1" in err.expected


def test_missing_setting_for_a_cell():
    err = expect_error(BASE.replace('exposure = "XC1"\n', ""), "settings.exposure")
    assert "(S1, L1)" in err.expected


def test_bad_exposure_and_fire():
    expect_error(BASE.replace('exposure = "XC1"', 'exposure = "XC9"'), "settings[0].exposure", "XC9")
    expect_error(BASE.replace('fire = "R60"', 'fire = "R65"'), "settings[0].fire", "R65")


def test_unbraced_is_refused():
    err = expect_error(BASE.replace("braced = true", "braced = false"), "settings[0].braced")
    assert "cores" in err.expected


def test_l0_factor_range():
    # Braced members: 0.5 <= l0/l <= 1.0, EN 1992-1-1, Eq. (5.15).
    expect_error(BASE.replace("l0_factor = 1.0", "l0_factor = 2.0"), "settings[0].l0_factor", "2.0")


def test_toml_syntax_error():
    err = expect_error(BASE.replace('name = "L1"', 'name = "L1'), "(syntax)")
    assert "TOML" in err.expected


def test_both_routes_refused(tmp_path):
    csv = tmp_path / "a.csv"
    csv.write_text("stack,level\n")
    with pytest.raises(InputError) as info:
        load_scenario_text(f'actions = "{csv.name}"\n' + BASE, source="bad.toml", base_dir=tmp_path)
    assert info.value.field == "actions"


def test_misplaced_actions_key_is_explained():
    text = BASE.split("[[floors]]")[0].replace("[[settings]]", "") + 'actions = "x.csv"\n'
    err = expect_error(text, "stacks[2].actions")
    assert "before the first [table]" in err.expected


def test_missing_file(tmp_path):
    with pytest.raises(InputError) as info:
        load_scenario(tmp_path / "none.toml")
    assert info.value.field == "(file)"


def test_parameter_overrides():
    s = load(BASE.replace('set = "EN"', 'set = "EN"\noverrides = { xi = 0.925 }'))
    assert s.params.xi == pytest.approx(0.925)
    expect_error(BASE.replace('set = "EN"', 'set = "EN"\noverrides = { gama_G = 1.2 }'), "parameters.overrides")


def test_external_support_and_k_values_reach_the_takedown():
    from optimizer.building.takedown import takedown

    text = BASE.replace("stands_on = { S1 = 0.5, S2 = 0.5 }", 'stands_on = "external"')
    text = text.replace(
        "[takedown]", '[[settings]]\nstacks = ["S3"]\nk1y = 0.2\nk2y = 0.4\nk1z = 0.3\nk2z = 0.5\n\n[takedown]'
    )
    s = load(text)
    r = takedown(s)
    ext = r.reactions[r.reactions["kind"] == "external"]
    assert ext["stack"].tolist() == ["S3"] and ext["level"].tolist() == ["L2"]
    row = r.actions[(r.actions["stack"] == "S3") & (r.actions["level"] == "L2")].iloc[0]
    assert (row["k1y"], row["k2y"], row["k1z"], row["k2z"]) == (0.2, 0.4, 0.3, 0.5)
    assert row["l0y_mm"] != row["l0y_mm"]  # NaN: l0 comes from k1/k2 in the member check
    other = r.actions[(r.actions["stack"] == "S1") & (r.actions["level"] == "L1")].iloc[0]
    assert other["l0y_mm"] == pytest.approx(3750.0)

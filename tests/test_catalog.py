"""The shipped catalog and the user's file (issue 2)."""

from __future__ import annotations

import math

import pytest

from cable_catalog.loader import (
    CATEGORIES,
    CatalogWriteError,
    append_user_cable,
    load_catalog,
)

BRANDS_AND_PART_NUMBERS = ("belden", "times microwave", "lmr-", "andrew", "heliax", "commscope",
                           "superflex", "ecoflex", "aircell", "9913")


def test_shipped_catalog_loads_without_problems():
    cat = load_catalog()
    assert cat.problems == ()
    assert len(cat.cables) >= 25
    assert {c.category for c in cat.cables.values()} == set(CATEGORIES)


def test_every_entry_names_a_source_and_no_brand():
    for c in load_catalog().cables.values():
        assert c.source.strip(), c.id
        text = f"{c.id} {c.description} {c.source} {c.notes}".lower()
        assert not any(b in text for b in BRANDS_AND_PART_NUMBERS), c.id


def test_both_coax_families_present():
    z0s = {c.z0_ohm for c in load_catalog().by_category("coax")}
    assert {50.0, 75.0} <= z0s


@pytest.mark.parametrize(
    "cable_id,z0,vf",
    [
        # REFERENCES.md coax table (MIL-DTL-17 families; VF of solid PE 1/sqrt(2.25)).
        ("rg58", 50.0, 0.66),
        ("rg213", 50.0, 0.66),
        ("rg59", 75.0, 0.66),
        ("rg11", 75.0, 0.66),
        ("rg174", 50.0, 0.66),
    ],
)
def test_solid_pe_families_match_reference_table(cable_id, z0, vf):
    c = load_catalog().get(cable_id)
    assert c.z0_ohm == z0 and c.vf == pytest.approx(vf, abs=0.01)


def test_solid_pe_cables_agree_with_dielectric_table():
    # VF of a homogeneous dielectric is 1/sqrt(eps_r); solid PE eps_r 2.25-2.3
    # (Ellingson appendix) gives 0.659-0.667.
    cat = load_catalog()
    pe = cat.dielectrics["solid-pe"]
    for c in cat.by_category("coax"):
        if c.dielectric == "solid-pe":
            assert 1 / math.sqrt(pe.eps_r_high) - 0.01 <= c.vf <= 1 / math.sqrt(pe.eps_r_low) + 0.01


def test_dielectric_table_vf_of_ptfe():
    # Ellingson appendix: PTFE eps_r 2.1 -> VF 0.690.
    assert load_catalog().dielectrics["solid-ptfe"].vf == pytest.approx(0.690, abs=1e-3)


def test_unknown_id_suggests_near_matches():
    with pytest.raises(KeyError, match="rg58"):
        load_catalog().get("rg-58")


GOOD = {"id": "roof-feeder", "description": "measured feeder on the roof", "category": "coax",
        "z0_ohm": 50.0, "vf": 0.83, "vf_tolerance": 0.01, "source": "measured on site"}


def test_user_cable_appended_and_merged(tmp_path):
    user = tmp_path / "cables.toml"
    user.write_text("# my cables\n", encoding="utf-8")
    append_user_cable(user, GOOD)
    text = user.read_text(encoding="utf-8")
    assert text.startswith("# my cables\n")
    cat = load_catalog(user)
    assert cat.get("roof-feeder").vf == 0.83 and cat.get("roof-feeder").origin == "user"


def test_broken_user_file_reported_and_untouched(tmp_path):
    user = tmp_path / "cables.toml"
    broken = b"[[cable]]\nid = 'x\n"
    user.write_bytes(broken)
    cat = load_catalog(user)
    assert len(cat.problems) == 1 and str(user) in cat.problems[0]
    assert "rg58" in cat.cables  # built-in catalog keeps working
    with pytest.raises(CatalogWriteError):
        append_user_cable(user, GOOD)
    assert user.read_bytes() == broken


def test_bad_user_entry_reports_file_entry_and_field(tmp_path):
    user = tmp_path / "cables.toml"
    user.write_text(
        '[[cable]]\nid = "wet-run"\ndescription = "d"\ncategory = "coax"\nz0_ohm = 50\n'
        'vf = 1.4\nvf_tolerance = 0.02\nsource = "measured"\n'
        '[[cable]]\nid = "typo"\ndescription = "d"\ncategory = "coax"\nz0_ohm = 50\n'
        'vf = 0.8\nvf_tolerence = 0.02\nsource = "measured"\n', encoding="utf-8")
    cat = load_catalog(user)
    joined = "\n".join(cat.problems)
    assert "entry 1 (wet-run)" in joined and "'vf'" in joined
    assert "entry 2 (typo)" in joined and "did you mean 'vf_tolerance'" in joined
    assert "wet-run" not in cat.cables


def test_duplicate_id_refused(tmp_path):
    with pytest.raises(CatalogWriteError):
        append_user_cable(tmp_path / "c.toml", dict(GOOD, id="rg58"))
    assert not (tmp_path / "c.toml").exists()

"""The caution text (tui/safety_text.toml): coverage of every hazard tag, the
published rules it points to, and the voltages it quotes.

Outside sources for the checks are named beside each one; the list of which
document covers what is the table in the project's design references
(REFERENCES.md, "Safety: published rules to point readers to").
"""

from __future__ import annotations

import math
import re
import tomllib

import pytest

from cable_catalog.loader import HAZARD_TAGS, load_catalog
from tui import safety


@pytest.fixture(scope="module")
def text():
    return safety.load_text()


def test_every_hazard_tag_in_the_shipped_catalog_has_cautions(text):
    used = {t for c in load_catalog().cables.values() for t in c.hazards}
    assert used, "the shipped catalog should tag its hazardous cables"
    missing = sorted(used - set(text.tags))
    assert not missing, f"hazard tags with no caution section in safety_text.toml: {missing}"


def test_every_allowed_hazard_tag_has_cautions(text):
    # A tag added to the loader's list must come with its caution text.
    assert set(HAZARD_TAGS) <= set(text.tags), set(HAZARD_TAGS) - set(text.tags)


def test_every_tag_section_is_complete(text):
    for tag in text.tags:
        s = text.sections[tag]
        assert s.short and s.points and s.rules, tag
        assert safety.cautions_for([tag])[:2] == [safety.general(), s]


def test_labels_fit_the_panel_list(text):
    assert all(len(s.label) <= 22 for s in text.sections.values())


def test_required_topics_are_present(text):
    kinds = {sid: s.kind for sid, s in text.sections.items()}
    for topic in ("instrument", "height", "weather"):
        assert kinds.get(topic) == "topic", topic


def _rule_names(section) -> str:
    return " | ".join(r.name for r in section.rules)


@pytest.mark.parametrize("section_id, documents", [
    # REFERENCES.md safety table: which published rules cover which work.
    ("general", ["NFPA 70E", "1910.333", "1910.269", "EN 50110-1", "IEC 61010-1"]),
    ("power", ["NFPA 70E", "1910.269", "IEEE Std 1234", "IEEE Std 400"]),
    ("stored-charge", ["IEEE Std 400", "1910.333"]),
    ("poe", ["IEEE Std 802.3"]),
    ("rf-transmitter", ["FCC OET Bulletin 65", "ICNIRP guidelines (2020)"]),
    ("instrument", ["IEC 61010-1", "IEC 61010-2-030"]),
])
def test_sections_name_the_published_rules(text, section_id, documents):
    names = _rule_names(text.sections[section_id])
    for doc in documents:
        assert doc in names, f"{section_id} should point to {doc}; it names {names}"


def test_every_voltage_names_a_standard_or_says_common_practice(text):
    standard = re.compile(r"\b(IEEE|IEC|EN|OSHA|NFPA|FCC|ICNIRP)\b")
    for s in text.sections.values():
        for v in s.voltages:
            assert v.source == "common practice" or standard.search(v.source), (s.id, v)


def _voltages(text, section_id) -> str:
    return " | ".join(f"{v.value} [{v.source}]" for v in text.sections[section_id].voltages)


def test_quoted_voltages_match_the_published_figures(text):
    # Power over Ethernet: at most 57 V DC at the source, IEEE Std 802.3
    # (802.3af/at/bt power sourcing equipment).
    poe = text.sections["poe"].voltages[0]
    assert "57 V DC" in poe.value and "802.3" in poe.source
    # Telephone: -48 V DC talk battery, ringing about 90 V AC at 20 Hz in
    # North America (common practice).
    tel = _voltages(text, "telephone")
    assert "48 V DC" in tel and "90 V AC at 20 Hz" in tel and "15-25 Hz" in tel
    # Powered coax plant: 60 V or 90 V AC quasi-square wave (common practice).
    assert "60 V or 90 V AC" in _voltages(text, "plant-power")
    # Stored charge after a DC test: the IEEE 400 series.
    assert "IEEE Std 400" in _voltages(text, "stored-charge")


def test_quoted_rf_line_voltage_follows_from_power_and_impedance(text):
    # P = V^2 / R for a matched line (definition of power in a resistance):
    # 100 W on 600 ohm gives sqrt(100 * 600) = 244.9 V RMS.
    row = text.sections["rf-transmitter"].voltages[0]
    power_w = float(re.search(r"(\d+) W", row.what).group(1))
    z0_ohm = float(re.search(r"(\d+) ohm", row.what).group(1))
    quoted_v = float(re.search(r"about (\d+) V RMS", row.value).group(1))
    assert quoted_v == pytest.approx(math.sqrt(power_w * z0_ohm), abs=0.5)


def test_precedence_and_notice_defer_to_local_codes(text):
    for words in (text.precedence, text.notice_text):
        assert "Local codes" in words or "local codes" in words
        assert "licensed practice" in words and "take precedence" in words
    lines = [line for _k, line in safety.text_lines(safety.cautions_for(["poe"]))]
    assert "take precedence" in " ".join(lines[-4:])


def test_one_line_caution_is_one_line_naming_each_hazard(text):
    line = safety.one_line_caution(["power", "stored-charge", "power"])
    assert "\n" not in line
    assert text.sections["power"].short in line and text.sections["stored-charge"].short in line
    assert "halftrip safety --tag power --tag stored-charge" in line
    assert "local codes" in line


def test_warning_line_fits_the_screen_and_is_empty_without_cause():
    assert safety.warning_line([]) == ""
    assert safety.warning_line([], possibly_live=True)
    worst = safety.warning_line(["rf-transmitter", "stored-charge"])
    assert "rf-transmitter" in worst and len(worst) <= 80


def test_text_lines_respect_the_width():
    lines = safety.text_lines(safety.cautions_for(list(HAZARD_TAGS)), width=60)
    assert max(len(line) for _k, line in lines) <= 60


def test_text_version_follows_the_content_not_the_comments(tmp_path):
    raw = safety.TEXT_PATH.read_text(encoding="utf-8")
    same = tmp_path / "same.toml"
    same.write_text("# an extra comment\n" + raw, encoding="utf-8")
    changed = tmp_path / "changed.toml"
    changed.write_text(raw.replace("Before you connect anything", "Before connecting"),
                       encoding="utf-8")
    assert safety.load_text(same).version == safety.text_version()
    assert safety.load_text(changed).version != safety.text_version()


def test_malformed_text_is_refused():
    data = tomllib.loads(safety.TEXT_PATH.read_text(encoding="utf-8"))
    data["section"]["poe"]["rules"] = ["no-such-rule"]
    with pytest.raises(safety.SafetyTextError, match="poe"):
        safety.parse_text(data)

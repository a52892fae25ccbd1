# SPDX-License-Identifier: MIT
"""Atomic writes, the overwrite guard for workbooks swaytune did not make, and the guard
against replacing a workbook edited after it was built (content digest).

Behaviour tests of our own rules: common practice, no source.
"""
from __future__ import annotations

import zipfile

import openpyxl
import pytest
from openpyxl.packaging.custom import CustomPropertyList
from openpyxl.styles import Font
from openpyxl.xml.functions import fromstring

from workbook_builder.build import write_workbook
from workbook_builder.project import load_project
from workbook_builder.xlsx.files import (DIGEST_PROPERTY, MARKER_NAME,
                                         PACKAGE_DIGEST_PROPERTY, OverwriteRefused,
                                         atomic_path, content_digest, guard_hand_edits,
                                         guard_overwrite, is_swaytune_workbook, mark_workbook,
                                         package_digest, read_property, save_workbook,
                                         set_digest, with_property)

from workbook_cases import MINIMAL


def test_atomic_path_failure_leaves_destination(tmp_path):
    dest = tmp_path / "book.xlsx"
    dest.write_bytes(b"old")
    with pytest.raises(RuntimeError, match="boom"):
        with atomic_path(dest) as tmp:
            tmp.write_bytes(b"half")
            raise RuntimeError("boom")
    assert dest.read_bytes() == b"old"
    assert [p.name for p in tmp_path.iterdir()] == ["book.xlsx"]


def test_marker_round_trip(tmp_path):
    wb = openpyxl.Workbook()
    mark_workbook(wb, "0.1.0")
    mark_workbook(wb, "0.1.1")            # re-marking replaces, never duplicates
    path = save_workbook(wb, tmp_path / "ours.xlsx")
    assert is_swaytune_workbook(path)
    back = openpyxl.load_workbook(path)
    assert [p.value for p in back.custom_doc_props.props] == ["swaytune 0.1.1"]
    assert back.defined_names[MARKER_NAME].hidden
    save_workbook(openpyxl.Workbook(), path)   # ours: overwritten without force
    assert not is_swaytune_workbook(path)


def test_defined_name_marker_alone_counts(tmp_path):
    wb = openpyxl.Workbook()
    mark_workbook(wb, "0.1.0")
    wb.custom_doc_props.props.clear()
    wb.save(tmp_path / "n.xlsx")
    assert is_swaytune_workbook(tmp_path / "n.xlsx")


def test_foreign_workbook_refused_unless_forced(tmp_path):
    theirs = tmp_path / "hand_made.xlsx"
    openpyxl.Workbook().save(theirs)
    before = theirs.read_bytes()
    with pytest.raises(OverwriteRefused, match="was not produced by swaytune; refusing"):
        save_workbook(openpyxl.Workbook(), theirs)
    assert theirs.read_bytes() == before
    ours = openpyxl.Workbook()
    mark_workbook(ours, "0.1.0")
    save_workbook(ours, theirs, force=True)
    assert is_swaytune_workbook(theirs)


@pytest.mark.parametrize("content", [b"", b"plain text", b"PK\x03\x04broken"])
def test_non_workbook_files_are_not_ours(tmp_path, content):
    p = tmp_path / "x.xlsx"
    p.write_bytes(content)
    assert not is_swaytune_workbook(p)
    with pytest.raises(OverwriteRefused):
        guard_overwrite(p)


def test_directory_refused(tmp_path):
    with pytest.raises(OverwriteRefused, match="is a directory"):
        guard_overwrite(tmp_path)
    guard_overwrite(tmp_path / "new.xlsx")   # a new file is always fine


def test_new_files_get_usual_mode_and_replacements_keep_theirs(tmp_path):
    import os
    import stat

    mask = os.umask(0o022)
    try:
        new = save_workbook(openpyxl.Workbook(), tmp_path / "new.xlsx")
        assert stat.S_IMODE(new.stat().st_mode) == 0o644   # not mkstemp's private 0o600
        os.chmod(new, 0o640)
        ours = openpyxl.Workbook()
        mark_workbook(ours, "0.1.0")
        save_workbook(ours, new, force=True)
        assert stat.S_IMODE(new.stat().st_mode) == 0o640
    finally:
        os.umask(mask)


# ----------------------------------------------------------------------------- hand-edit guard
def _digest_book():
    wb = openpyxl.Workbook()
    ws = wb.active
    ws.title = "Calculation"
    ws["A1"], ws["B1"], ws["C1"], ws["D1"] = "Period", 2.5, "=B1*2", True
    return wb


def test_digest_is_the_same_in_memory_and_read_back(tmp_path):
    wb = _digest_book()
    set_digest(wb)
    set_digest(wb)                          # setting again replaces, never duplicates
    wb.save(tmp_path / "d.xlsx")
    back = openpyxl.load_workbook(tmp_path / "d.xlsx")
    stored = [p.value for p in back.custom_doc_props.props if p.name == DIGEST_PROPERTY]
    assert stored == [content_digest(wb)] == [content_digest(back)]
    assert len(stored[0]) == 64             # SHA-256, hexadecimal


def test_digest_follows_values_and_formulas_not_styles():
    base = content_digest(_digest_book())
    styled = _digest_book()
    styled.active["B1"].font = Font(bold=True)
    styled.active["B1"].number_format = "0.000"
    assert content_digest(styled) == base
    for coord, value in (("B1", 2.6), ("C1", "=B1*3"), ("D1", False), ("E9", "note")):
        edited = _digest_book()
        edited.active[coord] = value
        assert content_digest(edited) != base, coord


def test_guard_hand_edits_refuses_an_edited_workbook_unless_forced(tmp_path):
    path = tmp_path / "ours.xlsx"
    wb = _digest_book()
    set_digest(wb)
    wb.save(path)
    guard_hand_edits(path)                  # unchanged: fine
    back = openpyxl.load_workbook(path)
    back["Calculation"]["B1"] = 3.0         # an engineer's edit, saved with the old digest
    back.save(path)
    with pytest.raises(OverwriteRefused, match=r"was changed after swaytune (built|wrote) it"):
        guard_hand_edits(path)
    guard_hand_edits(path, force=True)


def test_guard_hand_edits_leaves_other_files_to_guard_overwrite(tmp_path):
    guard_hand_edits(tmp_path / "new.xlsx")             # no file
    openpyxl.Workbook().save(tmp_path / "plain.xlsx")
    guard_hand_edits(tmp_path / "plain.xlsx")           # no digest
    (tmp_path / "junk.xlsx").write_bytes(b"not a workbook")
    guard_hand_edits(tmp_path / "junk.xlsx")            # not readable: guard_overwrite decides


# ----------------------------------------------------------------------------- package digest
# recalc rewrites a package part by part (no openpyxl round trip), so it guards its outputs with
# a digest of the package's bytes rather than of the cells as openpyxl reads them.
_CUSTOM = ('<?xml version="1.0" encoding="UTF-8" standalone="yes"?>\n<Properties xmlns='
           '"http://schemas.openxmlformats.org/officeDocument/2006/custom-properties" xmlns:vt='
           '"http://schemas.openxmlformats.org/officeDocument/2006/docPropsVTypes">'
           '<property fmtid="{D5CDD505-2E9C-101B-9397-08002B2CF9AE}" pid="2" name="Checked by">'
           '<vt:lpwstr>C.D.</vt:lpwstr></property></Properties>').encode()


def test_package_digest_covers_every_part_but_the_properties():
    parts = [("xl/workbook.xml", b"<workbook/>"), ("xl/worksheets/sheet1.xml", b"<ws>1</ws>"),
             ("docProps/custom.xml", b"a"), ("docProps/core.xml", b"b"), ("docProps/app.xml", b"c")]
    base = package_digest(parts)
    assert len(base) == 64 and package_digest(reversed(parts)) == base      # order of members
    props = [(n, b"other" if n.startswith("docProps/") else raw) for n, raw in parts]
    assert package_digest(props) == base          # the digest itself, timestamps: not hashed
    for k in range(2):
        edited = list(parts)
        edited[k] = (parts[k][0], parts[k][1] + b" ")
        assert package_digest(edited) != base
    assert package_digest(parts + [("xl/extra.xml", b"")]) != base
    assert package_digest([("xl/a", b"bc")]) != package_digest([("xl/ab", b"c")])


def test_properties_are_added_replaced_and_read_back():
    assert read_property(_CUSTOM, "Checked by") == "C.D."
    assert read_property(_CUSTOM, PACKAGE_DIGEST_PROPERTY) is None
    once = with_property(_CUSTOM, PACKAGE_DIGEST_PROPERTY, "a<b & c")
    assert read_property(once, PACKAGE_DIGEST_PROPERTY) == "a<b & c"
    assert b'pid="3"' in once and read_property(once, "Checked by") == "C.D."
    twice = with_property(once, PACKAGE_DIGEST_PROPERTY, "new")
    assert read_property(twice, PACKAGE_DIGEST_PROPERTY) == "new"
    assert twice.count(PACKAGE_DIGEST_PROPERTY.encode()) == 1 and b'pid="3"' in twice
    read_by_openpyxl = CustomPropertyList.from_tree(fromstring(twice))
    assert {p.name: p.value for p in read_by_openpyxl.props} == {
        "Checked by": "C.D.", PACKAGE_DIGEST_PROPERTY: "new"}
    with pytest.raises(ValueError, match="not a custom-properties part"):
        with_property(b"<other/>", PACKAGE_DIGEST_PROPERTY, "x")


def _package_with_digest(path, sheet=b"<ws>1</ws>"):
    members = [("xl/workbook.xml", b"<workbook/>"), ("xl/worksheets/sheet1.xml", sheet)]
    custom = with_property(_CUSTOM, PACKAGE_DIGEST_PROPERTY, package_digest(members))
    with zipfile.ZipFile(path, "w") as zf:
        for name, raw in members + [("docProps/custom.xml", custom)]:
            zf.writestr(name, raw)
    return path


def test_guard_hand_edits_checks_the_package_digest_when_there_is_one(tmp_path):
    path = _package_with_digest(tmp_path / "recalculated.xlsx")
    guard_hand_edits(path)                      # byte for byte as written: fine
    with zipfile.ZipFile(path) as zf:
        members = {i.filename: zf.read(i) for i in zf.infolist()}
    members["xl/worksheets/sheet1.xml"] = b"<ws>2</ws>"             # an edit, old digest kept
    with zipfile.ZipFile(path, "w") as zf:
        for name, raw in members.items():
            zf.writestr(name, raw)
    with pytest.raises(OverwriteRefused, match=r"was changed after swaytune wrote it .*--force"):
        guard_hand_edits(path)
    guard_hand_edits(path, force=True)


# ----------------------------------------------------------------------------- through the builder
def test_never_overwrites_a_foreign_file(tmp_path):
    src = tmp_path / "p.toml"
    src.write_text(MINIMAL, encoding="utf-8")
    project = load_project(src)
    foreign = tmp_path / "mine.xlsx"
    wb = openpyxl.Workbook()
    wb.active["A1"] = "hand-made"
    wb.save(foreign)
    before = foreign.read_bytes()
    with pytest.raises(OverwriteRefused, match=r"was not produced by swaytune"):
        write_workbook(project, foreign)
    assert foreign.read_bytes() == before
    write_workbook(project, foreign, force=True)
    assert openpyxl.load_workbook(foreign)["Summary"] is not None
    write_workbook(project, foreign)          # ours now: rebuilding over it is fine
    assert not list(tmp_path.glob("*.tmp"))   # atomic write left nothing behind


def test_refuses_to_overwrite_a_workbook_changed_after_the_build(tmp_path):
    src = tmp_path / "p.toml"
    src.write_text(MINIMAL, encoding="utf-8")
    project = load_project(src)
    out = tmp_path / "p.xlsx"
    b = write_workbook(project, out)
    wb = openpyxl.load_workbook(out)
    stored = [p.value for p in wb.custom_doc_props.props if p.name == DIGEST_PROPERTY]
    assert stored == [content_digest(wb)]            # digest of the cells as read back
    write_workbook(project, out)                     # unchanged: rebuilding is fine
    sheet, coord = b.names["clearance"]
    wb[sheet]["I5"] = "checked by hand, see my note"  # an engineer's edit
    wb.save(out)
    before = out.read_bytes()
    with pytest.raises(OverwriteRefused, match=r"was changed after swaytune (built|wrote) it"):
        write_workbook(project, out)
    assert out.read_bytes() == before
    write_workbook(project, out, force=True)

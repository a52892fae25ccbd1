# SPDX-License-Identifier: MIT
"""Reading packages: safety refusals (DTDs, entities, zip bombs, encryption), the part cache,
and the cells, strings, formulas and names read from a package written by hand.

Cell types and elements follow ECMA-376 Part 1 (5th ed., 2016): 18.3.1.4 c (cell), 18.3.1.40 f
(formula, shared formulas), 18.18.11 ST_CellType, 18.4 shared strings, 18.2.5 definedName. The
refusals are our own rules (module docstring of workbook_builder.xlsx.package).
"""
from __future__ import annotations

import zipfile
from pathlib import Path

import pytest

from workbook_builder import recalc
from workbook_builder.recalc import recalc_workbook
from workbook_builder.xlsx import package
from workbook_builder.xlsx.package import PackageError, open_package, sheet_parts, split_coord

# The fixture ``built`` (the example workbooks and a den_hartog one) is in conftest.py.

_MAIN = "http://schemas.openxmlformats.org/spreadsheetml/2006/main"
_REL = "http://schemas.openxmlformats.org/officeDocument/2006/relationships"
_PKG = "http://schemas.openxmlformats.org/package/2006/relationships"
WORKBOOK = (f'<workbook xmlns="{_MAIN}" xmlns:r="{_REL}"><sheets>'
            '<sheet name="Calc &amp; data" sheetId="1" r:id="rId1"/></sheets><definedNames>'
            "<definedName name=\"period\">'Calc &amp; data'!$B$1</definedName>"
            '<definedName name="TABLE">\'Calc &amp; data\'!$A$1:$A$3</definedName>'
            '<definedName name="local" localSheetId="0">\'Calc &amp; data\'!$A$1</definedName>'
            '<definedName name="MARK" hidden="1">"made by hand"</definedName>'
            '</definedNames></workbook>')
RELS = (f'<Relationships xmlns="{_PKG}"><Relationship Id="rId1" Type="{_REL}/worksheet" '
        'Target="worksheets/sheet1.xml"/></Relationships>')
STRINGS = (f'<sst xmlns="{_MAIN}" count="2" uniqueCount="2"><si><t>label</t></si>'
           '<si><r><t>rich </t></r><r><t>text</t></r><rPh><t>skipped</t></rPh></si></sst>')
SHEET = (f'<worksheet xmlns="{_MAIN}"><sheetData>'
         '<row r="1"><c r="A1"><v>2.5</v></c><c r="B1"><f t="shared" ref="B1:B3" si="0">A1*2'
         '</f><v>5</v></c><c r="C1" t="s"><v>0</v></c><c r="D1" t="s"><v>1</v></c></row>'
         '<row r="2"><c r="A2"><v>3</v></c><c r="B2"><f t="shared" si="0"/><v>6</v></c>'
         '<c r="C2" t="inlineStr"><is><t>inline</t></is></c><c r="D2" t="b"><v>1</v></c></row>'
         '<row r="3"><c r="B3"><f t="shared" si="0"/><v>0</v></c>'
         '<c r="C3" t="str"><f>IF(A1&gt;1,"big","small")</f><v>big</v></c>'
         '<c r="D3" t="e"><f>SQRT(-1)</f><v>#NUM!</v></c></row>'
         '</sheetData></worksheet>')
CUSTOM = ('<Properties xmlns="http://schemas.openxmlformats.org/officeDocument/2006/'
          'custom-properties" xmlns:vt="http://schemas.openxmlformats.org/officeDocument/2006/'
          'docPropsVTypes"><property fmtid="{D5CDD505-2E9C-101B-9397-08002B2CF9AE}" pid="2" '
          'name="Checked by"><vt:lpwstr>C.D.</vt:lpwstr></property></Properties>')


def _package(path: Path, parts: dict[str, bytes | str | None] | None = None) -> Path:
    """A package written by hand: the parts above, replaced or removed (None) by ``parts``."""
    members = {"xl/workbook.xml": WORKBOOK, "xl/_rels/workbook.xml.rels": RELS,
               "xl/sharedStrings.xml": STRINGS, "xl/worksheets/sheet1.xml": SHEET,
               "docProps/custom.xml": CUSTOM}
    members.update(parts or {})
    with zipfile.ZipFile(path, "w", zipfile.ZIP_DEFLATED) as zf:
        for name, data in members.items():
            if data is not None:
                zf.writestr(name, data)
    return path


# ----------------------------------------------------------------------------- safety
def test_defusedxml_is_active():
    import openpyxl.xml
    package.assert_defusedxml()
    assert openpyxl.xml.DEFUSEDXML is True


def test_entity_expansion_is_refused(built, tmp_path):
    # A "billion laughs" shared-strings part: defusedxml refuses entity declarations.
    src = built["den_hartog"]
    bomb = tmp_path / "bomb.xlsx"
    evil = (b'<?xml version="1.0"?><!DOCTYPE lolz [<!ENTITY lol "lol">'
            b'<!ENTITY lol2 "&lol;&lol;&lol;&lol;&lol;&lol;&lol;&lol;&lol;&lol;">]>'
            b'<sst xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main">'
            b'<si><t>&lol2;</t></si></sst>')
    with zipfile.ZipFile(src) as zin, zipfile.ZipFile(bomb, "w") as zout:
        for info in zin.infolist():
            zout.writestr(info, zin.read(info))
        zout.writestr("xl/sharedStrings.xml", evil)
    res = recalc_workbook(bomb, outdir=tmp_path / "out")
    assert res.status == "FAILED"
    assert "refused" in res.error and "entity" in res.error.lower()
    assert not (tmp_path / "out" / "bomb.xlsx").exists()


def test_dtd_is_refused_even_when_the_sheet_is_already_cached(built, tmp_path):
    # The part cache of a batch must never bypass the DTD check of a later file.
    src = built["den_hartog"]
    recalc.clear_caches()
    assert recalc_workbook(src, outdir=tmp_path / "ok").status in ("OK", "NOT OK")
    with zipfile.ZipFile(src) as zin:
        sheet = next(n for n in zin.namelist() if n.startswith("xl/worksheets/sheet"))
        body = zin.read(sheet)
    evil = body.replace(b"<worksheet", b'<!DOCTYPE worksheet [<!ENTITY e "x">]><worksheet', 1)
    bad = tmp_path / "dtd.xlsx"
    with zipfile.ZipFile(src) as zin, zipfile.ZipFile(bad, "w") as zout:
        for info in zin.infolist():
            zout.writestr(info, evil if info.filename == sheet else zin.read(info))
    res = recalc_workbook(bad, outdir=tmp_path / "out")
    assert res.status == "FAILED" and "refused" in res.error
    assert not (tmp_path / "out" / "dtd.xlsx").exists()


def test_reading_with_and_without_the_part_cache_agree(built):
    path = built["residential_tower"]
    plain = package.open_package(Path(path))
    cache = package.PartCache()
    first = package.open_package(Path(path), cache=cache)
    second = package.open_package(Path(path), cache=cache)
    def content(book):
        return {title: {key: (c.value, c.data_type) for key, c in sheet.cells.items()}
                for title, sheet in book.sheets.items()}
    assert content(first) == content(plain) == content(second)
    # each read owns its cells: changing one does not leak into the next read
    title = next(iter(first.sheets))
    first.sheets[title].cells.clear()
    assert content(package.open_package(Path(path), cache=cache)) == content(plain)


@pytest.mark.parametrize("content, words", [
    (b"", r"empty file \(0 bytes\)"),
    (b"\xd0\xcf\x11\xe0\xa1\xb1\x1a\xe1" + b"\0" * 4000, "password-protected"),
    (b"these are not the workbooks you are looking for\n", "not a workbook"),
    (b"PK\x03\x04 broken", "corrupted or truncated"),
])
def test_files_that_are_not_packages_are_refused(tmp_path, content, words):
    path = tmp_path / "x.xlsx"
    path.write_bytes(content)
    with pytest.raises(PackageError, match=words):
        open_package(path)


def test_missing_file_directory_and_zip_without_workbook(tmp_path):
    with pytest.raises(PackageError, match="file not found"):
        open_package(tmp_path / "nope.xlsx")
    with pytest.raises(PackageError, match="is a directory"):
        open_package(tmp_path)
    with zipfile.ZipFile(tmp_path / "z.xlsx", "w") as z:
        z.writestr("readme.txt", "hello")
    with pytest.raises(PackageError, match="not an Excel workbook"):
        open_package(tmp_path / "z.xlsx")


def test_zip_bomb_member_is_refused(tmp_path):
    # 2 MB of zeros deflates more than MAX_RATIO (200) times: refused before it is read.
    path = _package(tmp_path / "bomb.xlsx", {"docProps/filler": b"\0" * 2_000_000})
    with zipfile.ZipFile(path) as zf:
        info = zf.getinfo("docProps/filler")
        assert info.file_size > package.MAX_RATIO * info.compress_size
    with pytest.raises(PackageError, match=r"refused: package member docProps/filler is "
                                           r"2000000 bytes uncompressed"):
        open_package(path)


@pytest.mark.parametrize("part", ["xl/workbook.xml", "xl/sharedStrings.xml",
                                  "xl/worksheets/sheet1.xml", "docProps/custom.xml"])
def test_dtd_in_any_part_is_refused(tmp_path, part):
    original = {"xl/workbook.xml": WORKBOOK, "xl/sharedStrings.xml": STRINGS,
                "xl/worksheets/sheet1.xml": SHEET, "docProps/custom.xml": CUSTOM}[part]
    evil = '<?xml version="1.0"?><!DOCTYPE x [<!ENTITY e "x">]>' + original
    path = _package(tmp_path / "dtd.xlsx", {part: evil})
    with pytest.raises(PackageError, match=rf"refused: part {part} holds a DTD"):
        open_package(path)


def test_utf16_part_and_broken_xml_are_refused(tmp_path):
    path = _package(tmp_path / "u.xlsx", {"xl/sharedStrings.xml": STRINGS.encode("utf-16")})
    with pytest.raises(PackageError, match="is not UTF-8 encoded XML"):
        open_package(path)
    path = _package(tmp_path / "b.xlsx", {"xl/worksheets/sheet1.xml": SHEET[:-20]})
    with pytest.raises(PackageError, match=r"sheet1.xml is not well-formed XML"):
        open_package(path)


# The reproduction: a sheet whose DTD declares an internal entity and uses it in a cell
# text. Encoded as UTF-16 the bytes "<!DOCTYPE" never occur, so a byte search alone let it through
# and the entity's text came back as the cell's value.
_ENTITY_STRINGS = ('<?xml version="1.0" encoding="{enc}"?><!DOCTYPE sst [<!ENTITY e "INJECTED">]>'
                   + STRINGS.replace("label", "&e;"))


@pytest.mark.parametrize("codec, declared", [("utf-16", "UTF-16"), ("utf-16-le", "UTF-16"),
                                             ("utf-16-be", "UTF-16"), ("utf-32", "UTF-32"),
                                             ("iso-8859-1", "ISO-8859-1")])
def test_a_dtd_in_a_part_not_encoded_as_utf8_is_refused(tmp_path, codec, declared):
    data = _ENTITY_STRINGS.format(enc=declared).encode(codec)
    assert (b"<!DOCTYPE" in data) == (codec == "iso-8859-1")
    path = _package(tmp_path / "enc.xlsx", {"xl/sharedStrings.xml": data})
    with pytest.raises(PackageError, match=r"refused: part xl/sharedStrings\.xml is not UTF-8 "
                                           r"encoded XML"):
        open_package(path)


def test_a_dtd_in_an_ascii_part_is_refused_as_a_dtd(tmp_path):
    # US-ASCII is a subset of UTF-8, so the part is read as such and its DTD found by the search.
    data = _ENTITY_STRINGS.format(enc="US-ASCII").encode("ascii")
    path = _package(tmp_path / "ascii.xlsx", {"xl/sharedStrings.xml": data})
    with pytest.raises(PackageError, match=r"part xl/sharedStrings\.xml holds a DTD"):
        open_package(path)


def test_a_utf8_declaration_in_any_spelling_is_read(tmp_path):
    for spelling in ("UTF-8", "utf-8", "utf8", "UTF8"):
        text = f'<?xml version="1.0" encoding="{spelling}"?>' + STRINGS
        book = open_package(_package(tmp_path / f"{spelling}.xlsx",
                                     {"xl/sharedStrings.xml": text}))
        assert book["Calc & data"].get("C1").value == "label"


def test_many_members_each_under_the_member_limit_are_refused_as_a_whole(tmp_path):
    """250 members of 999,999 zero bytes: each passes the per-member check (under 1 MB, where a
    small part may be very compressible), the package as a whole is a bomb (~250 MB from ~250 KB)."""
    path = _package(tmp_path / "many.xlsx",
                    {f"docProps/f{k}.bin": b"\0" * 999_999 for k in range(250)})
    with zipfile.ZipFile(path) as zf:
        infos = [i for i in zf.infolist() if i.filename.startswith("docProps/f")]
    assert all(i.file_size < 1_000_000 for i in infos)
    assert path.stat().st_size < 400_000
    with pytest.raises(PackageError, match=r"refused: package is \d+ bytes uncompressed from "
                                           r"\d+ bytes \(limit \d+, ratio 200\)"):
        open_package(path)


def test_too_many_members_are_refused(tmp_path):
    extra = {f"docProps/m{k}": b"" for k in range(package.MAX_MEMBERS)}
    path = _package(tmp_path / "members.xlsx", extra)
    with pytest.raises(PackageError, match=rf"refused: the package has {package.MAX_MEMBERS + 5} "
                                           rf"members \(limit {package.MAX_MEMBERS}\)"):
        open_package(path)


def test_missing_sheet_part_and_bad_shared_string_index(tmp_path):
    path = _package(tmp_path / "m.xlsx", {"xl/worksheets/sheet1.xml": None})
    with pytest.raises(PackageError, match=r"sheet 'Calc & data' part xl/worksheets/sheet1.xml "
                                           r"is missing"):
        open_package(path)
    path = _package(tmp_path / "s.xlsx", {"xl/worksheets/sheet1.xml": SHEET.replace(
        '<c r="D1" t="s"><v>1</v>', '<c r="D1" t="s"><v>7</v>')})
    with pytest.raises(PackageError, match=r"D1 points at shared string '7', which does not"):
        open_package(path)


# ----------------------------------------------------------------------------- reading
def test_cells_strings_and_formulas_of_a_package_written_by_hand(tmp_path):
    book = open_package(_package(tmp_path / "hand.xlsx"))
    assert list(book.sheetnames) == ["Calc & data"]
    ws = book["Calc & data"]
    assert ws.get("A1").value == 2.5 and ws.get("A1").data_type == "n"
    assert ws.get("C1").value == "label" and ws.get("C1").data_type == "s"
    assert ws.get("D1").value == "rich text"            # runs joined, phonetic run skipped
    assert ws.get("C2").value == "inline"
    assert ws.get("D2").value is True and ws.get("D2").data_type == "b"
    # shared formula: the master's text, translated to each cell of its range
    assert [ws.get(f"B{r}").formula for r in (1, 2, 3)] == ["=A1*2", "=A2*2", "=A3*2"]
    assert [ws.get(f"B{r}").cached for r in (1, 2, 3)] == [5.0, 6.0, 0.0]
    assert ws.get("C3").formula == '=IF(A1>1,"big","small")' and ws.get("C3").cached == "big"
    assert ws.get("D3").cached == "#NUM!" and ws.get("D3").cached_type == "e"
    assert ws.get("Z9").value is None                   # an empty cell
    assert [[c.coordinate for c in row] for row in ws.iter_rows()] == [
        ["A1", "B1", "C1", "D1"], ["A2", "B2", "C2", "D2"], ["B3", "C3", "D3"]]


def test_defined_names_and_custom_properties(tmp_path):
    book = open_package(_package(tmp_path / "hand.xlsx"))
    assert book.name_cell("period") == ("Calc & data", "B1")
    assert book.named("period").formula == "=A1*2"
    assert book.name_cell("TABLE") == ("Calc & data", "A1")      # a range: its top-left cell
    assert book.name_cell("MARK") is None and book.defined_names["MARK"].hidden
    assert book.name_cell("nothing") is None
    assert "local" not in book.defined_names and book.local_names == {
        "local": "'Calc & data'!$A$1"}
    assert book.custom_props == {"Checked by": "C.D."}


def test_sheet_parts_and_split_coord(tmp_path):
    with zipfile.ZipFile(_package(tmp_path / "hand.xlsx")) as zf:
        assert sheet_parts(zf) == {"Calc & data": "xl/worksheets/sheet1.xml"}
    assert split_coord("$AB$12") == (12, 28)     # column AB = 26 + 2
    with pytest.raises(PackageError, match="cell reference 'A0B' is not valid"):
        split_coord("A0B")

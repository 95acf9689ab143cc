"""The Python package against the command line (same numbers) and against
colour-science (independent CIEDE2000 and sRGB → CIELAB).

The command line is the binary CI builds (``INKFIT_BIN``, default
``target/debug/inkfit`` of the repository)."""

import json
import os
import subprocess
import warnings
from pathlib import Path

import pytest

import inkfit

ROOT = Path(__file__).resolve().parents[2]
DEMO = ROOT / "fixtures" / "demo"
BIN = os.environ.get("INKFIT_BIN", str(ROOT / "target" / "debug" / "inkfit"))


def cli_json(*args):
    out = subprocess.run([BIN, *args, "--json"], capture_output=True, text=True, cwd=ROOT)
    assert out.returncode in (0, 1), out.stderr
    return json.loads(out.stdout)


@pytest.mark.parametrize(
    "palette, options, flags",
    [
        ("landuse.csv", {}, []),
        ("landuse.csv", {"cvd": ["protan", "deutan", "tritan"]}, ["--cvd", "protan,deutan,tritan"]),
        ("density.txt", {"scheme": "sequential"}, ["--scheme", "sequential"]),
        ("transport.json", {"intent": "perceptual", "bpc": False}, ["--intent", "perceptual", "--no-bpc"]),
        ("landuse.csv", {"press": "newsprint-coldset", "gamut_test": "round-trip"}, ["--press", "newsprint-coldset", "--gamut-test", "round-trip"]),
        ("rainfall.sld", {}, []),
    ],
)
def test_check_of_a_file_equals_the_command_line(palette, options, flags):
    path = f"fixtures/demo/{palette}"
    cwd = os.getcwd()
    os.chdir(ROOT)
    try:
        got = inkfit.check(path, **options).to_dict()
    finally:
        os.chdir(cwd)
    assert got == cli_json("check", path, *flags)


def test_check_of_pairs_equals_the_command_line_on_the_same_text_palette(tmp_path):
    pairs = [("Woodland", "#2f6b3a"), ("Lake", "#1a8cf0"), ("Heath", "lab(62% 8 14)"), ("Ink", "device-cmyk(0% 90% 80% 0%)")]
    text = tmp_path / "p.txt"
    text.write_text("".join(f"{c} {n}\n" for n, c in pairs))
    cli = cli_json("check", str(text))
    got = inkfit.check(pairs).to_dict()
    for key in ("entries", "summary", "verdict", "separation"):
        assert got[key] == cli[key], key
    # A bare colour text is its own name.
    assert inkfit.check(["#2f6b3a"]).entries[0]["name"] == "#2f6b3a"


def test_delta_inspect_and_gamut_equal_the_command_line():
    assert inkfit.delta("#2f6b3a", "device-cmyk(80% 30% 90% 20%)") == cli_json("delta", "#2f6b3a", "device-cmyk(80% 30% 90% 20%)")
    assert inkfit.inspect("offset-coated") == cli_json("inspect", "offset-coated")
    assert inkfit.gamut("srgb", "offset-coated") == cli_json("gamut", "srgb", "offset-coated")


def test_result_object_and_pandas():
    r = inkfit.check(str(DEMO / "landuse.csv"))
    assert r.passes is False and len(r.entries) == r.summary["count"] == 9
    assert "fails" in repr(r)
    pd = pytest.importorskip("pandas")
    df = r.to_pandas()
    assert isinstance(df, pd.DataFrame) and list(df["name"]) == [e["name"] for e in r.entries]


def test_errors_are_value_errors_and_files_os_errors():
    assert issubclass(inkfit.InkfitError, ValueError)
    with pytest.raises(inkfit.InkfitError, match='bad colour "#zz"'):
        inkfit.check(["#zz"])
    with pytest.raises(inkfit.InkfitError, match="intent"):
        inkfit.check(["#2f6b3a"], intent="colorimetric")
    with pytest.raises(OSError, match="missing.csv"):
        inkfit.check("missing.csv")
    with pytest.raises(inkfit.InkfitError):
        inkfit.check([("a", 3)])
    with pytest.raises(OSError):
        inkfit.inspect("/nonexistent/profile.icc")


# Independent checks with colour-science 0.4.x (colour.delta_E with
# method="CIE 2000"; colour.sRGB_to_XYZ, colour.XYZ_to_Lab). Skipped when it
# is not installed; CI installs it.
def _colour():
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        return pytest.importorskip("colour")


def test_ciede2000_agrees_with_colour_science():
    colour = _colour()
    import numpy as np

    # Sharma, Wu and Dalal (2005), pairs 1, 7 and 17.
    for a, b in [((50, 2.6772, -79.7751), (50, 0, -82.7485)), ((50, 0, 0), (50, -1, 2)), ((50, 2.5, 0), (73, 25, -18))]:
        ours = inkfit.delta(f"lab({a[0]}% {a[1]} {a[2]})", f"lab({b[0]}% {b[1]} {b[2]})")["de00"]
        theirs = float(colour.delta_E(np.array(a), np.array(b), method="CIE 2000"))
        assert abs(ours - theirs) < 1e-3, (a, b, ours, theirs)


def test_screen_lab_agrees_with_colour_science_srgb():
    colour = _colour()
    import numpy as np

    # IEC 61966-2-1 sRGB to XYZ (D65), Bradford to D50, CIELAB D50: the ICC
    # sRGB profile through lcms2 agrees within 0.2 ΔE*ab (its 16-bit tables
    # and the D50 adaptation of the profile's primaries).
    d50 = colour.CCS_ILLUMINANTS["CIE 1931 2 Degree Standard Observer"]["D50"]
    for hex_ in ["#2f6b3a", "#1a8cf0", "#e812c8", "#9a9894"]:
        e = inkfit.check([hex_]).entries[0]
        rgb = np.array([int(hex_[k : k + 2], 16) / 255 for k in (1, 3, 5)])
        xyz = colour.sRGB_to_XYZ(rgb, illuminant=d50, chromatic_adaptation_transform="Bradford")
        lab = colour.XYZ_to_Lab(xyz, d50)
        assert np.abs(np.array(e["screen_lab"]) - lab).max() < 0.2, (hex_, e["screen_lab"], lab)

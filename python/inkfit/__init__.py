"""inkfit: how screen colours print on an offset press, from Python.

The same library as the ``inkfit`` command line, so every number equals
the command line's: ``check(...).to_dict()`` is the JSON of
``inkfit check --json``.

>>> import inkfit
>>> r = inkfit.check(["#2f6b3a", ("Lake", "#1a8cf0")])
>>> r.entries[1]["name"]
'Lake'
"""

from __future__ import annotations

import json
import os
from typing import Any, Dict, Iterable, List, Optional, Sequence, Tuple, Union

from . import _inkfit
from ._inkfit import InkfitError

__all__ = ["check", "delta", "gamut", "inspect", "CheckResult", "InkfitError"]

Colour = Union[str, Tuple[str, str]]


class CheckResult:
    """The result of :func:`check`: every entry, the palette analyses and the verdict."""

    def __init__(self, data: Dict[str, Any]) -> None:
        self._data = data

    @property
    def entries(self) -> List[Dict[str, Any]]:
        """One dict per colour, in order, with the keys of the command line's JSON."""
        return self._data["entries"]

    @property
    def summary(self) -> Dict[str, Any]:
        """Counts and the largest and mean ΔE00."""
        return self._data["summary"]

    @property
    def verdict(self) -> Dict[str, Any]:
        """``{"passes": bool, "reasons": [{"check", "detail"}]}``."""
        return self._data["verdict"]

    @property
    def passes(self) -> bool:
        """Whether every colour and every palette check holds."""
        return bool(self._data["verdict"]["passes"])

    def to_dict(self) -> Dict[str, Any]:
        """The whole result, equal to the JSON of ``inkfit check --json``."""
        return json.loads(json.dumps(self._data))

    def to_pandas(self):  # type: ignore[no-untyped-def]
        """The entries as a pandas DataFrame (needs pandas, which inkfit does not install)."""
        try:
            import pandas as pd
        except ImportError as e:  # pragma: no cover - depends on the environment
            raise ImportError("to_pandas() needs pandas: pip install pandas") from e
        return pd.DataFrame(self.entries)

    def __repr__(self) -> str:
        s = self.summary
        return (
            f"<CheckResult {s['count']} colours, {'passes' if self.passes else 'fails'}: "
            f"{s['out_of_gamut']} outside the press gamut, {s['beyond_tolerance']} beyond the tolerance>"
        )


def _pairs(colours: Iterable[Colour]) -> List[Tuple[str, str]]:
    out = []
    for i, c in enumerate(colours):
        if isinstance(c, str):
            out.append((c, c))
        elif isinstance(c, (tuple, list)) and len(c) == 2 and all(isinstance(x, str) for x in c):
            out.append((c[0], c[1]))
        else:
            raise InkfitError(f"colour {i + 1}: give a colour text or a (name, colour text) pair, not {c!r}")
    return out


def check(
    colours: Union[str, "os.PathLike[str]", Sequence[Colour]],
    *,
    screen: str = "srgb",
    press: str = "offset-coated",
    intent: str = "relative",
    bpc: bool = True,
    paper_white: bool = False,
    tolerance: float = 3.0,
    gamut_test: str = "boundary",
    scheme: Optional[str] = None,
    cvd: Sequence[str] = (),
    min_separation: Optional[float] = None,
) -> CheckResult:
    """Checks colours against a press, as ``inkfit check`` does.

    ``colours`` is a palette file's path (any format the command line reads),
    or a sequence of colour texts in CSS syntax (``"#2f6b3a"``,
    ``"lab(50% 20 -30)"``, ``"device-cmyk(0% 50% 100% 0%)"``) or
    ``(name, colour text)`` pairs. ``screen`` and ``press`` are built-in
    names or ICC files; ``intent`` one of perceptual, relative, saturation,
    absolute; ``scheme`` qualitative, sequential or diverging; ``cvd`` any of
    protan, deutan, tritan.
    """
    options = {
        "screen": screen,
        "press": press,
        "intent": intent,
        "bpc": bool(bpc),
        "paper_white": bool(paper_white),
        "tolerance": float(tolerance),
        "gamut_test": gamut_test,
        "scheme": scheme,
        "cvd": list(cvd),
        "min_separation": None if min_separation is None else float(min_separation),
    }
    source = os.fspath(colours) if isinstance(colours, (str, os.PathLike)) else _pairs(colours)
    return CheckResult(json.loads(_inkfit.check(source, options)))


def delta(a: str, b: str, *, screen: str = "srgb", press: str = "offset-coated") -> Dict[str, Any]:
    """ΔE*ab, ΔE*94, CIEDE2000 and CMC between two colours, as ``inkfit delta --json``."""
    return json.loads(_inkfit.delta(a, b, screen, press))


def inspect(profile: str) -> Dict[str, Any]:
    """What an ICC profile (a built-in name or a file) is, as ``inkfit inspect --json``."""
    return json.loads(_inkfit.inspect(profile))


def gamut(*profiles: str) -> Dict[str, Any]:
    """Each profile's gamut and the coverage of every pair, as ``inkfit gamut --json``."""
    return json.loads(_inkfit.gamut(list(profiles)))

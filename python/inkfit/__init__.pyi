import os
from typing import Any, Dict, List, Optional, Sequence, Tuple, Union

Colour = Union[str, Tuple[str, str]]

class InkfitError(ValueError):
    """An input inkfit cannot use; the message is the command line's."""

class CheckResult:
    """The result of :func:`check`."""
    @property
    def entries(self) -> List[Dict[str, Any]]: ...
    @property
    def summary(self) -> Dict[str, Any]: ...
    @property
    def verdict(self) -> Dict[str, Any]: ...
    @property
    def passes(self) -> bool: ...
    def to_dict(self) -> Dict[str, Any]: ...
    def to_pandas(self) -> Any: ...

def check(
    colours: Union[str, "os.PathLike[str]", Sequence[Colour]],
    *,
    screen: str = ...,
    press: str = ...,
    intent: str = ...,
    bpc: bool = ...,
    paper_white: bool = ...,
    tolerance: float = ...,
    gamut_test: str = ...,
    scheme: Optional[str] = ...,
    cvd: Sequence[str] = ...,
    min_separation: Optional[float] = ...,
) -> CheckResult:
    """Checks colours against a press, as ``inkfit check`` does."""

def delta(a: str, b: str, *, screen: str = ..., press: str = ...) -> Dict[str, Any]:
    """Colour differences, as ``inkfit delta --json``."""

def inspect(profile: str) -> Dict[str, Any]:
    """A profile's description, as ``inkfit inspect --json``."""

def gamut(*profiles: str) -> Dict[str, Any]:
    """Gamuts and coverage, as ``inkfit gamut --json``."""

"""Where the data shipped with quasicert lives: the grammar and the bundled certificates."""
from __future__ import annotations

from pathlib import Path

__all__ = ["resource_dir"]


def resource_dir(package: str, fallback: str) -> Path:
    """Folder of shipped data: inside the installed package, else the repository's own.

    The wheel maps grammar/ and certificates/ to checker/grammar and
    checker/certificates; a source checkout has them beside checker/.
    """
    package_root = Path(__file__).resolve().parents[1]
    installed = package_root / package.rsplit(".", 1)[-1]
    if installed.is_dir():
        return installed
    return package_root.parent / fallback

# SPDX-License-Identifier: GPL-2.0-or-later
"""Loading and removing the plugin's Qt translation (i18n/seaway_comfort_<locale>.qm).

Strings are marked in each class with a class-level ``tr`` that calls
``QCoreApplication.translate(<class name>, text)``: pylupdate5 files ``self.tr('...')`` under
the enclosing class's name, so the context given to ``translate`` must be that same name (a
module-level ``tr()`` wrapper would be filed under ``@default`` and never match).

The locale comes from the QGIS setting ``locale/userLocale`` (e.g. ``de_DE``); when it is
unset, ``C`` or has no matching ``.qm`` file, no translator is installed and the plugin stays
in English.
"""
from __future__ import annotations

from pathlib import Path
from typing import List, Optional

from qgis.PyQt.QtCore import QCoreApplication, QTranslator

I18N_DIR = Path(__file__).resolve().parent.parent / "i18n"
QM_PREFIX = "seaway_comfort_"
FALLBACK_LOCALE = "en"


def normalise_locale(value: object) -> str:
    """The locale name to look for, from a QGIS ``locale/userLocale`` value.

    ``None``, ``''``, ``'C'`` and ``'POSIX'`` give the English fallback ``'en'``; otherwise the
    value is trimmed and ``-`` becomes ``_`` (``'de-DE'`` -> ``'de_DE'``).
    """
    if value is None:
        return FALLBACK_LOCALE
    text = str(value).strip().replace("-", "_")
    text = text.split(".")[0]  # drop an encoding suffix such as 'de_DE.UTF-8'
    if not text or text.upper() in {"C", "POSIX"}:
        return FALLBACK_LOCALE
    return text


def candidate_names(locale: str) -> List[str]:
    """File names tried for a locale, most specific first: 'de_DE' -> [..._de_DE.qm, ..._de.qm]."""
    loc = normalise_locale(locale)
    names = [f"{QM_PREFIX}{loc}.qm"]
    short = loc.split("_")[0].lower()
    if short and f"{QM_PREFIX}{short}.qm" not in names:
        names.append(f"{QM_PREFIX}{short}.qm")
    return names


def find_translation(locale: str, i18n_dir: Optional[Path] = None) -> Optional[Path]:
    """Path of the compiled translation for ``locale`` in ``i18n_dir``, or None if absent."""
    folder = Path(i18n_dir) if i18n_dir is not None else I18N_DIR
    for name in candidate_names(locale):
        path = folder / name
        if path.is_file():
            return path
    return None


def user_locale() -> str:
    """The locale QGIS is set to use (``locale/userLocale``), normalised; 'en' when unset."""
    try:
        from qgis.core import QgsSettings
    except ImportError:  # pragma: no cover - QGIS is always there when the plugin runs
        return FALLBACK_LOCALE
    return normalise_locale(QgsSettings().value("locale/userLocale", "", type=str))


def install_translator(locale: Optional[str] = None,
                       i18n_dir: Optional[Path] = None) -> Optional[QTranslator]:
    """Load and install the translator for ``locale`` (default: QGIS's user locale).

    Returns the installed QTranslator, which the caller must keep referenced and hand to
    :func:`remove_translator` on unload; None when no matching translation exists (English).
    """
    loc = normalise_locale(locale) if locale is not None else user_locale()
    path = find_translation(loc, i18n_dir)
    if path is None:
        return None
    translator = QTranslator()
    if not translator.load(str(path)):
        return None
    QCoreApplication.installTranslator(translator)
    return translator


def remove_translator(translator: Optional[QTranslator]) -> None:
    """Undo :func:`install_translator` (None is accepted and ignored)."""
    if translator is not None:
        QCoreApplication.removeTranslator(translator)

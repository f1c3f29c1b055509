# SPDX-License-Identifier: GPL-2.0-or-later
"""Desktop glue: plugin load/unload, menu actions, translator, vessel-profile manager dialog.

Checked against QGIS 3.22 itself (its Processing registry, Qt widgets and QTranslator) through
pytest-qgis's stub ``iface``; saved profile files are read back with Python's standard ``json``
module; translations are compiled with Qt's own ``lrelease``.
"""
from __future__ import annotations

import json
import shutil
import subprocess
from pathlib import Path
from typing import Any, Dict, List, Tuple

import pytest

pytestmark = pytest.mark.qgis
pytest.importorskip("qgis")

from qgis.core import QgsApplication, QgsSettings  # noqa: E402
from qgis.PyQt.QtCore import QCoreApplication, QEvent  # noqa: E402
from qgis.PyQt.QtWidgets import QAction, QComboBox  # noqa: E402

import seaway_comfort  # noqa: E402
from seaway_comfort.plugin import main as plugin_main  # noqa: E402
from seaway_comfort.plugin import translation  # noqa: E402
from seaway_comfort.plugin.profile_store import ProfileStore  # noqa: E402
from seaway_comfort.plugin.vessel_manager import VesselManagerDialog  # noqa: E402
from seaway_comfort.processing.core.flags import CAUTION  # noqa: E402
from seaway_comfort.processing.core.vessel import BUILTIN_DIR, builtin_profile_names  # noqa: E402

PROVIDER_ID = "seawaycomfort"
REPO = Path(__file__).resolve().parents[2]


class RecordingIface:
    """The pytest-qgis stub iface, plus a record of menu entries and toolbar icons.

    The stub's addPluginToMenu/addToolBarIcon do nothing, so without this record a plugin
    that forgot to remove its entries would pass.
    """

    def __init__(self, stub: Any) -> None:
        self._stub = stub
        self.menu: List[Tuple[str, QAction]] = []
        self.toolbar: List[QAction] = []

    def mainWindow(self):  # noqa: N802
        return self._stub.mainWindow()

    def addPluginToMenu(self, name: str, action: QAction) -> None:  # noqa: N802
        self.menu.append((name, action))

    def removePluginMenu(self, name: str, action: QAction) -> None:  # noqa: N802
        self.menu.remove((name, action))  # ValueError if it was never added

    def addToolBarIcon(self, action: QAction) -> None:  # noqa: N802
        self.toolbar.append(action)

    def removeToolBarIcon(self, action: QAction) -> None:  # noqa: N802
        self.toolbar.remove(action)

    def __getattr__(self, name: str) -> Any:
        return getattr(self._stub, name)


def _flush_deletes() -> None:
    QCoreApplication.sendPostedEvents(None, QEvent.Type.DeferredDelete)
    QCoreApplication.processEvents()


def _our_actions(window) -> List[QAction]:
    return [a for a in window.findChildren(QAction) if a.objectName().startswith("seaway_comfort_")]


# ---------------------------------------------------------------------- plugin lifecycle
def test_plugin_loads_and_unloads_cleanly(qgis_app, qgis_iface):
    registry = QgsApplication.processingRegistry()
    registered_before = registry.providerById(PROVIDER_ID) is not None
    iface = RecordingIface(qgis_iface)
    window = iface.mainWindow()
    actions_before = len(window.findChildren(QAction))

    plugin = seaway_comfort.classFactory(iface)
    assert isinstance(plugin, plugin_main.SeawayComfortPlugin)
    plugin.initGui()
    try:
        assert registry.providerById(PROVIDER_ID) is not None
        if registered_before:
            # Another test module registered the provider first: ours must back off (QGIS
            # deletes a duplicate) and must not remove the other one on unload.
            assert plugin.provider is None
        else:
            assert plugin.provider is not None
        texts = [a.text() for _, a in iface.menu]
        assert texts == ["Passage comfort along a route...", "Describe a forecast file...",
                         "Vessel profiles..."]
        assert {name for name, _ in iface.menu} == {plugin.MENU}
        assert [a.text() for a in iface.toolbar] == ["Passage comfort along a route..."]
        assert not iface.toolbar[0].icon().isNull()
        assert len(_our_actions(window)) == 3
    finally:
        plugin.unload()
    _flush_deletes()
    assert iface.menu == [] and iface.toolbar == []
    assert _our_actions(window) == []
    assert len(window.findChildren(QAction)) == actions_before
    assert plugin.translator is None
    assert (registry.providerById(PROVIDER_ID) is not None) == registered_before


def test_processing_only_start_has_no_gui(qgis_app):
    """qgis_process calls classFactory(None) then initProcessing(): no iface use, no crash."""
    registry = QgsApplication.processingRegistry()
    registered_before = registry.providerById(PROVIDER_ID) is not None
    plugin = seaway_comfort.classFactory(None)
    plugin.initProcessing()
    plugin.initProcessing()  # a second call adds nothing
    assert registry.providerById(PROVIDER_ID) is not None
    plugin.unload()
    assert (registry.providerById(PROVIDER_ID) is not None) == registered_before


def test_missing_algorithm_gives_message_not_crash(qgis_app, qgis_iface):
    plugin = plugin_main.SeawayComfortPlugin(qgis_iface)
    shown: List[Tuple[str, str]] = []
    plugin.show_message = lambda title, text: shown.append((title, text))  # type: ignore[method-assign]
    assert plugin.open_algorithm_dialog("seawaycomfort:no_such_algorithm") is False
    assert len(shown) == 1
    assert "seawaycomfort:no_such_algorithm" in shown[0][1]
    assert "not available" in shown[0][1]


def test_menu_actions_reach_their_slots(qgis_app, qgis_iface):
    iface = RecordingIface(qgis_iface)
    plugin = plugin_main.SeawayComfortPlugin(iface)
    plugin.initGui()
    calls: List[str] = []
    plugin.open_algorithm_dialog = lambda alg: calls.append(alg) or True  # type: ignore[method-assign]
    plugin.open_vessel_manager = lambda: calls.append("vessels")  # type: ignore[method-assign]
    try:
        for _, action in iface.menu:
            action.trigger()
    finally:
        plugin.unload()
        _flush_deletes()
    assert calls == ["seawaycomfort:routecomfort", "seawaycomfort:describeseastate", "vessels"]


def test_algorithm_dialog_uses_qgis_processing(qgis_processing, qgis_iface, monkeypatch):
    """An algorithm that exists (QGIS's native:buffer) is handed to processing.execAlgorithmDialog."""
    real = plugin_main.qgis_processing_module()
    assert hasattr(real, "execAlgorithmDialog")  # QGIS's package, not our processing/
    assert "seaway_comfort" not in real.__name__
    opened: List[str] = []

    class FakeProcessing:
        @staticmethod
        def execAlgorithmDialog(alg_id, params=None):  # noqa: N802
            opened.append(alg_id)

    monkeypatch.setattr(plugin_main, "qgis_processing_module", lambda: FakeProcessing)
    plugin = plugin_main.SeawayComfortPlugin(qgis_iface)
    assert plugin.open_algorithm_dialog("native:buffer") is True
    assert opened == ["native:buffer"]


# ---------------------------------------------------------------------- translation
@pytest.fixture(scope="module")
def compiled_de(tmp_path_factory) -> Path:
    """i18n/seaway_comfort_de.ts compiled by Qt's lrelease into a temporary folder."""
    lrelease = shutil.which("lrelease")
    if lrelease is None:
        pytest.skip("lrelease (qttools5-dev-tools) not installed")
    out = tmp_path_factory.mktemp("i18n") / "seaway_comfort_de.qm"
    proc = subprocess.run([lrelease, str(REPO / "i18n" / "seaway_comfort_de.ts"), "-qm", str(out)],
                          capture_output=True, text=True, timeout=60)
    assert proc.returncode == 0, proc.stdout + proc.stderr
    return out.parent


@pytest.mark.parametrize(
    "value, expected",
    [(None, "en"), ("", "en"), ("C", "en"), ("de_DE", "de_DE"), ("de-DE", "de_DE"),
     ("de_DE.UTF-8", "de_DE"), ("fr", "fr")],
)
def test_locale_normalisation(value, expected):
    assert translation.normalise_locale(value) == expected


def test_german_translation_loads_and_unloads(qgis_app, compiled_de: Path):
    tr = plugin_main.SeawayComfortPlugin.tr
    assert tr("Vessel profiles...") == "Vessel profiles..."
    assert translation.find_translation("fr_FR", compiled_de) is None
    assert translation.install_translator("fr_FR", compiled_de) is None  # no .qm: English
    # 'de_DE' falls back to seaway_comfort_de.qm.
    translator = translation.install_translator("de_DE", compiled_de)
    assert translator is not None
    try:
        assert tr("Vessel profiles...") == "Schiffsprofile..."
        assert QCoreApplication.translate("VesselManagerDialog", "Beam B (m)") == "Breite B (m)"
    finally:
        translation.remove_translator(translator)
    assert tr("Vessel profiles...") == "Vessel profiles..."


def test_init_gui_follows_qgis_locale(qgis_app, qgis_iface, compiled_de: Path, monkeypatch):
    settings = QgsSettings()
    old = settings.value("locale/userLocale", None)
    settings.setValue("locale/userLocale", "de_DE")
    monkeypatch.setattr(translation, "I18N_DIR", compiled_de)
    iface = RecordingIface(qgis_iface)
    plugin = plugin_main.SeawayComfortPlugin(iface)
    try:
        plugin.initGui()
        assert plugin.translator is not None
        assert [a.text() for _, a in iface.menu][2] == "Schiffsprofile..."
    finally:
        plugin.unload()
        _flush_deletes()
        if old is None:
            settings.remove("locale/userLocale")
        else:
            settings.setValue("locale/userLocale", old)
    assert plugin.translator is None
    assert plugin_main.SeawayComfortPlugin.tr("Vessel profiles...") == "Vessel profiles..."


# ---------------------------------------------------------------------- vessel manager
@pytest.fixture
def dialog(qgis_app, qgis_parent, tmp_path: Path):
    store = ProfileStore(tmp_path / "vessels")
    dlg = VesselManagerDialog(store=store, parent=qgis_parent)
    answers: List[bool] = []
    asked: List[str] = []

    def ask(title: str, question: str) -> bool:
        asked.append(question)
        assert answers, f"unexpected question: {question}"
        return answers.pop(0)

    dlg.ask = ask  # type: ignore[method-assign]
    dlg.answers, dlg.asked = answers, asked  # type: ignore[attr-defined]
    dlg.show()
    yield dlg
    dlg.close()
    dlg.deleteLater()
    _flush_deletes()


def test_dialog_lists_builtin_examples_read_only(dialog):
    shipped = sorted(p.stem for p in BUILTIN_DIR.glob("*.json"))  # the files on disk
    assert shipped and builtin_profile_names() == shipped
    assert dialog.item_labels() == [f"{n} (example)" for n in shipped]
    assert dialog.isVisible() and not dialog.isModal()
    assert dialog.current_kind() == "builtin" and dialog.is_read_only()
    assert dialog.name_edit.isReadOnly() and not dialog.save_button.isEnabled()
    assert dialog.duplicate_button.isEnabled() and not dialog.delete_button.isEnabled()
    assert dialog.save() is None and "read-only" in dialog.message()
    assert list(dialog.store.folder.glob("*.json")) == []
    assert CAUTION in dialog.findChild(type(dialog.message_label), "caution").text()


def test_every_form_label_shows_its_unit(dialog):
    labels = dialog.field_labels
    for key in dialog.spins:
        unit = {"_m": "(m)", "_s": "(s)", "_kn": "(kn)"}.get("_" + key.rsplit("_", 1)[-1])
        assert (unit or "fraction") in labels[key], (key, labels[key])
    headers = [dialog.station_table.horizontalHeaderItem(c).text() for c in range(1, 4)]
    assert headers == ["x (m)", "y (m)", "z (m)"]


def test_duplicate_save_and_read_back(dialog, tmp_path: Path):
    first = builtin_profile_names()[0]
    assert dialog.select("builtin", first)
    original = dialog.form_profile()
    copy = dialog.duplicate()
    assert copy is not None and not dialog.is_read_only() and dialog.save_button.isEnabled()
    dialog.name_edit.setText("Trial copy")
    dialog.spins["gm_m"].setValue(1.25)
    path = dialog.save()
    assert path is not None and path.parent == tmp_path / "vessels"
    data = json.loads(path.read_text(encoding="utf-8"))  # independent reader
    assert data["name"] == "Trial copy" and data["gm_m"] == 1.25
    assert data["length_wl_m"] == original.length_wl_m
    assert [s["name"] for s in data["stations"]] == list(original.station_names)
    assert [s["task"] for s in data["stations"]] == [s.task for s in original.stations]
    assert dialog.current_kind() == "user" and "Trial copy" in dialog.item_labels()
    assert dialog.store.load("Trial copy").gm_m == 1.25


def _editable(dialog) -> None:
    dialog.select("builtin", builtin_profile_names()[0])
    dialog.duplicate()


@pytest.mark.parametrize(
    "edit, must_contain",
    [
        (lambda d: d.spins["beam_m"].setValue(0.0), ["Beam B (m)", "beam_m", "0.0"]),
        (lambda d: d.spins["block_coeff"].setValue(0.2), ["Block coefficient Cb", "block_coeff", "0.2"]),
        (lambda d: d.spins["roll_damping_ratio"].setValue(0.0), ["Roll damping", "0.0"]),
        (lambda d: d.spins["service_speed_kn"].setValue(0.0), ["Service speed (kn)", "0.0"]),
        (lambda d: (d.spins["gm_m"].setValue(0.0), d.spins["roll_period_s"].setValue(0.0)),
         ["gm_m", "roll_period_s"]),
        (lambda d: d.name_edit.setText("  "), ["Profile name"]),
        (lambda d: d.station_table.item(0, 1).setText("abc"), ["row 1", "x (m)", "'abc'"]),
        (lambda d: d.station_table.item(0, 1).setText("999"), ["Stations table", "x_m", "999"]),
    ],
)
def test_invalid_input_is_rejected_naming_the_field(dialog, edit, must_contain):
    _editable(dialog)
    edit(dialog)
    assert dialog.validate() is None
    assert dialog.save() is None
    message = dialog.message()
    for text in must_contain:
        assert text in message, (text, message)
    assert list(dialog.store.folder.glob("*.json")) == []  # nothing written


def test_decimal_comma_accepted_in_station_table(dialog):
    _editable(dialog)
    dialog.station_table.item(0, 1).setText("1,5")
    profile = dialog.validate()
    assert profile is not None and profile.stations[0].x_m == 1.5


def test_station_rows_added_and_removed(dialog):
    _editable(dialog)
    n = dialog.station_table.rowCount()
    dialog.add_station_button.click()
    assert dialog.station_table.rowCount() == n + 1
    combo = dialog.station_table.cellWidget(n, 4)
    assert isinstance(combo, QComboBox) and combo.currentData() == "light_manual_work"
    dialog.station_table.item(n, 0).setText("lookout")
    assert dialog.validate().station_names[-1] == "lookout"
    dialog.station_table.selectRow(n)
    dialog.remove_station_button.click()
    assert dialog.station_table.rowCount() == n


def test_nothing_overwritten_without_asking(dialog):
    _editable(dialog)
    dialog.name_edit.setText("Same name")
    dialog.spins["gm_m"].setValue(1.0)
    path = dialog.save()
    assert path is not None and dialog.asked == []  # new file: no question
    # A second, different profile with the same name: the user is asked, says no.
    _editable(dialog)
    dialog.name_edit.setText("Same name")
    dialog.spins["gm_m"].setValue(2.0)
    dialog.answers.append(False)
    assert dialog.save() is None
    assert len(dialog.asked) == 1 and "exists already" in dialog.asked[0]
    assert json.loads(path.read_text(encoding="utf-8"))["gm_m"] == 1.0
    # Asked again, says yes: replaced.
    dialog.answers.append(True)
    assert dialog.save() == path
    assert json.loads(path.read_text(encoding="utf-8"))["gm_m"] == 2.0
    # Re-saving the profile that is open replaces its own file without a question.
    dialog.spins["gm_m"].setValue(2.5)
    assert dialog.save() == path and len(dialog.asked) == 2
    assert json.loads(path.read_text(encoding="utf-8"))["gm_m"] == 2.5


def test_example_name_cannot_be_reused(dialog):
    _editable(dialog)
    name = builtin_profile_names()[0]
    dialog.name_edit.setText(name)
    assert dialog.save() is None
    assert "example profile" in dialog.message() and name in dialog.message()


def test_delete_asks_for_confirmation(dialog):
    _editable(dialog)
    dialog.name_edit.setText("To be deleted")
    path = dialog.save()
    assert path is not None and path.exists()
    dialog.answers.append(False)
    assert dialog.delete_current() is False and path.exists()
    dialog.answers.append(True)
    assert dialog.delete_current() is True and not path.exists()
    assert "To be deleted" not in dialog.item_labels()
    assert len(dialog.asked) == 2


def test_unreadable_file_listed_and_deletable(dialog):
    folder = dialog.store.folder
    folder.mkdir(parents=True)
    (folder / "damaged.json").write_text('{"format": "something else"}', encoding="utf-8")
    dialog.reload()
    assert "damaged.json (cannot be read)" in dialog.item_labels()
    assert dialog.select("broken", str(folder / "damaged.json"))
    assert dialog.current_kind() == "broken" and "format" in dialog.message()
    dialog.answers.append(True)
    assert dialog.delete_current() is True
    assert not (folder / "damaged.json").exists()


def test_default_store_is_in_qgis_profile(qgis_app):
    from seaway_comfort.plugin.vessel_manager import default_store

    expected = Path(QgsApplication.qgisSettingsDirPath()) / "seaway_comfort" / "vessels"
    assert default_store().folder == expected

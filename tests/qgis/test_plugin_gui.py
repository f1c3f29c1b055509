# SPDX-License-Identifier: GPL-2.0-or-later
"""Desktop glue: plugin load/unload, menu actions, translator, vessel-profile manager dialog.

Checked against QGIS 3.22 itself (its Processing registry, Qt widgets and QTranslator) through
pytest-qgis's stub ``iface``; saved profile files are read back with Python's standard ``json``
module; translations are compiled with Qt's own ``lrelease``.
"""
from __future__ import annotations

import json
import os
import shutil
import subprocess
from pathlib import Path
from typing import Any, List, Tuple

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
from seaway_comfort.processing.core.vessel.profile import BUILTIN_DIR, builtin_profile_names  # noqa: E402

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
        assert texts == ["Passage comfort along a route...", "When to leave: departure sweep...",
                         "Seasonal comfort climate...", "Describe a forecast file...", "Vessel profiles..."]
        assert {name for name, _ in iface.menu} == {plugin.MENU}
        assert [a.text() for a in iface.toolbar] == ["Passage comfort along a route..."]
        assert not iface.toolbar[0].icon().isNull()
        # The menu opens algorithms that the provider really registers.
        assert registry.algorithmById(plugin_main.ROUTE_COMFORT_ALG) is not None
        for alg_id in (plugin_main.DESCRIBE_SEASTATE_ALG, plugin_main.DEPARTURE_SWEEP_ALG,
                       plugin_main.SEASONAL_CLIMATE_ALG):
            assert registry.algorithmById(alg_id) is not None, alg_id
        assert len(_our_actions(window)) == 5
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
    assert calls == ["seawaycomfort:routecomfort", "seawaycomfort:departuresweep", "seawaycomfort:seasonalclimate",
                     "seawaycomfort:describeseastate", "vessels"]


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
        installed = plugin.translator  # keep it alive: Qt removes a translator it destroys
        assert installed is not None
        assert [a.text() for _, a in iface.menu][-1] == "Schiffsprofile..."
    finally:
        plugin.unload()
        _flush_deletes()
        if old is None:
            settings.remove("locale/userLocale")
        else:
            settings.setValue("locale/userLocale", old)
    assert plugin.translator is None
    assert plugin_main.SeawayComfortPlugin.tr("Vessel profiles...") == "Vessel profiles..."
    assert installed.translate("SeawayComfortPlugin", "Vessel profiles...") == "Schiffsprofile..."


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
    dlg.ask = lambda title, question: True  # type: ignore[method-assign]
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
        (lambda d: d.spins["roll_damping_ratio"].setValue(1.0), ["Roll damping", "1.0"]),  # 0 = Ikeda estimate
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


def test_unsaved_edits_are_not_lost_silently(dialog):
    _editable(dialog)
    dialog.name_edit.setText("Work in progress")
    dialog.spins["draught_m"].setValue(1.9)
    assert dialog.has_unsaved_changes()
    row_before = dialog.profile_list.currentRow()
    # Switching to another profile asks; "no" keeps the edits and the selection.
    dialog.answers.append(False)
    dialog.profile_list.setCurrentRow(1)
    assert dialog.asked and "unsaved changes" in dialog.asked[-1]
    assert dialog.profile_list.currentRow() == row_before
    assert dialog.name_edit.text() == "Work in progress"
    # Closing asks too; "no" keeps the dialog open.
    dialog.answers.append(False)
    dialog.reject()
    assert dialog.isVisible() and len(dialog.asked) == 2
    # "yes" on switching discards the edits and loads the other profile.
    dialog.answers.append(True)
    dialog.profile_list.setCurrentRow(1)
    assert dialog.current_kind() == "builtin"
    assert dialog.name_edit.text() == builtin_profile_names()[1]
    assert not dialog.has_unsaved_changes()


def test_saved_profile_is_clean(dialog):
    _editable(dialog)
    dialog.name_edit.setText("Clean after save")
    assert dialog.has_unsaved_changes()
    assert dialog.save() is not None
    assert not dialog.has_unsaved_changes()
    dialog.profile_list.setCurrentRow(0)  # no question: the fixture would fail on one
    assert dialog.asked == []


def test_vessel_manager_slot_opens_dialog_on_the_qgis_store(qgis_app, qgis_iface, monkeypatch):
    from seaway_comfort.plugin import vessel_manager

    opened = []
    monkeypatch.setattr(vessel_manager.VesselManagerDialog, "exec",
                        lambda self: opened.append(self.store.folder) or 0)
    plugin = plugin_main.SeawayComfortPlugin(qgis_iface)
    plugin.open_vessel_manager()
    plugin.open_vessel_manager()  # reopened: the same dialog, list reloaded
    expected = Path(QgsApplication.qgisSettingsDirPath()) / "seaway_comfort" / "vessels"
    assert opened == [expected, expected]
    dlg = plugin.vessel_dialog
    assert dlg is not None and dlg.parent() is qgis_iface.mainWindow()
    # Unsaved edits must not block unloading with a question.
    asked_on_unload: List[str] = []
    dlg.ask = lambda title, question: asked_on_unload.append(question) or True
    dlg.select("builtin", builtin_profile_names()[0])
    dlg.duplicate()
    dlg.name_edit.setText("edited, not saved")
    assert dlg.has_unsaved_changes()
    plugin.unload()
    _flush_deletes()
    assert plugin.vessel_dialog is None
    assert asked_on_unload == []


# ---------------------------------------------------------------------- real desktop (Xvfb)
_DESKTOP_SCRIPT = r'''
import json
from qgis.PyQt.QtCore import QTimer
from qgis.core import QgsApplication, QgsProject
from qgis.utils import iface, plugins, unloadPlugin

OUT = {out!r}
report = {{}}


def ours_in_menu():
    names = []
    for action in iface.pluginMenu().actions():
        if action.menu() is not None and "Seaway Comfort" in action.text():
            names += [a.text() for a in action.menu().actions()]
    return names


def ours_in_toolbar():
    return [a.text() for a in iface.pluginToolBar().actions() if "Passage comfort" in a.text()]


def step1():
    plugin = plugins.get("seaway_comfort")
    report["loaded"] = plugin is not None
    report["menu"] = ours_in_menu()
    report["toolbar"] = ours_in_toolbar()
    report["provider"] = QgsApplication.processingRegistry().providerById("seawaycomfort") is not None
    iface.mainWindow().resize(1280, 900)
    QTimer.singleShot(1500, step2)
    QTimer.singleShot(200, lambda: plugin.actions[-1].trigger())  # modal vessel manager


def step2():
    QgsApplication.primaryScreen().grabWindow(0).save(OUT + "/desktop.png")
    dialog = plugins["seaway_comfort"].vessel_dialog
    report["dialog_visible"] = bool(dialog is not None and dialog.isVisible())
    report["dialog_items"] = dialog.item_labels() if dialog is not None else []
    if dialog is not None:
        dialog.reject()
    QTimer.singleShot(300, step3)


def step3():
    report["unloaded"] = unloadPlugin("seaway_comfort")
    report["menu_after"] = ours_in_menu()
    report["toolbar_after"] = ours_in_toolbar()
    report["provider_after"] = (
        QgsApplication.processingRegistry().providerById("seawaycomfort") is not None)
    with open(OUT + "/report.json", "w") as f:
        json.dump(report, f)
    QgsProject.instance().clear()
    iface.actionExit().trigger()


QTimer.singleShot(3000, step1)
'''


def test_desktop_qgis_under_xvfb(package_parent: Path, tmp_path: Path):
    """Real QGIS desktop: menu + toolbar entries, the dialog opens, unload leaves nothing."""
    xvfb, qgis_bin = shutil.which("xvfb-run"), "/usr/bin/qgis.bin"
    if xvfb is None or not Path(qgis_bin).exists():
        pytest.skip("xvfb-run or qgis.bin not installed")
    ini = tmp_path / "prof" / "profiles" / "default" / "QGIS" / "QGIS3.ini"
    ini.parent.mkdir(parents=True)
    ini.write_text("[PythonPlugins]\nseaway_comfort=true\n", encoding="utf-8")
    script = tmp_path / "shot.py"
    script.write_text(_DESKTOP_SCRIPT.format(out=str(tmp_path)), encoding="utf-8")
    env = dict(os.environ, QGIS_PLUGINPATH=str(package_parent))
    env.pop("QT_QPA_PLATFORM", None)  # a real (virtual) X display this time
    proc = subprocess.run(
        [xvfb, "-a", "-s", "-screen 0 1280x900x24", qgis_bin, "--noversioncheck", "--nologo",
         "--profiles-path", str(tmp_path / "prof"), "--code", str(script)],
        capture_output=True, text=True, timeout=180, env=env,
    )
    report_path = tmp_path / "report.json"
    assert report_path.exists(), proc.stdout[-2000:] + proc.stderr[-2000:]
    report = json.loads(report_path.read_text(encoding="utf-8"))
    assert report["loaded"] and report["provider"]
    assert report["menu"] == ["Passage comfort along a route...", "When to leave: departure sweep...",
                              "Seasonal comfort climate...", "Describe a forecast file...", "Vessel profiles..."]
    assert report["toolbar"] == ["Passage comfort along a route..."]
    assert report["dialog_visible"]
    assert report["dialog_items"] == [f"{n} (example)" for n in builtin_profile_names()]
    assert report["unloaded"] is True
    assert report["menu_after"] == [] and report["toolbar_after"] == []
    assert report["provider_after"] is False
    from qgis.PyQt.QtGui import QImage

    shot = QImage(str(tmp_path / "desktop.png"))
    assert not shot.isNull() and shot.width() == 1280


def test_renaming_saves_a_new_file_and_keeps_the_old(dialog):
    _editable(dialog)
    dialog.name_edit.setText("First name")
    first = dialog.save()
    dialog.name_edit.setText("Second name")
    second = dialog.save()
    assert first is not None and second is not None and first != second
    assert first.exists() and second.exists() and dialog.asked == []
    assert "is kept" in dialog.message() and str(first) in dialog.message()
    assert json.loads(second.read_text(encoding="utf-8"))["name"] == "Second name"


def test_enter_does_not_press_a_button(dialog):
    from qgis.PyQt.QtWidgets import QPushButton

    buttons = dialog.findChildren(QPushButton)
    assert buttons and not any(b.autoDefault() or b.isDefault() for b in buttons)


def test_route_dialogs_never_offer_an_output_as_route(qgis_app, tmp_path):
    """The project's route, not our passage segments (first in the tree), opens as ROUTE."""
    from qgis.core import QgsProject, QgsVectorLayer

    segments = QgsVectorLayer("LineString?crs=EPSG:4326&field=comfort_class:integer", "Passage segments", "memory")
    climate = QgsVectorLayer("LineString?crs=EPSG:4326&field=ok_sel:double", "Seasonal climate segments", "memory")
    route = QgsVectorLayer("LineString?crs=EPSG:4326&field=name:string", "Zz route", "memory")
    project = QgsProject.instance()
    project.addMapLayers([route, climate, segments])
    try:
        assert plugin_main.route_candidate(project, segments) is route
        assert plugin_main.route_candidate(project, None) is route
        plugin = plugin_main.SeawayComfortPlugin(None)
        for alg_id in plugin_main.ROUTE_ALGS:
            assert plugin.initial_parameters(alg_id) == {"ROUTE": route.id()}
        assert plugin.initial_parameters(plugin_main.DESCRIBE_SEASTATE_ALG) == {}
        project.removeMapLayer(route.id())
        assert plugin_main.route_candidate(project, segments) is None  # then nothing is forced
    finally:
        project.removeAllMapLayers()


def test_a_half_metre_beam_is_blamed_not_the_draught(dialog):
    _editable(dialog)
    draught = dialog.spins["draught_m"].value()
    assert draught > 0.5  # the built-in profile's draught (more than the mistyped beam)
    dialog.spins["beam_m"].setValue(0.5)
    assert dialog.validate() is None
    message = dialog.message()
    assert message.startswith("Beam B (m):"), message
    assert dialog.field_of_message(message) == "beam_m"


def test_rao_table_and_hull_sections_files_are_set_in_the_form(dialog, tmp_path):
    _editable(dialog)
    assert set(dialog.files) == {"rao_table", "hull_sections"}
    table = tmp_path / "raos.csv"
    dialog.files["rao_table"].setFilePath(str(table))
    assert dialog.has_unsaved_changes()
    assert dialog.form_dict()["rao_table"] == str(table)
    dialog.files["rao_table"].setFilePath("")
    assert dialog.form_dict()["rao_table"] is None
    sections = tmp_path / "sections.csv"
    dialog.files["hull_sections"].setFilePath(str(sections))
    from seaway_comfort.processing.core.vessel.profile import VesselProfile
    import dataclasses

    if "hull_sections" in {f.name for f in dataclasses.fields(VesselProfile)}:
        assert dialog.form_dict()["hull_sections"] == str(sections)
    else:  # this core does not read the key yet: it is not written into a profile it would refuse
        assert "hull_sections" not in dialog.form_dict() or dialog.form_dict()["hull_sections"] == str(sections)

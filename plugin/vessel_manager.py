# SPDX-License-Identifier: GPL-2.0-or-later
"""The vessel-profile manager dialog: create, edit, check, duplicate and delete profiles.

User profiles live as JSON files in ``<QGIS settings folder>/seaway_comfort/vessels/``
(:mod:`.profile_store`); the examples shipped with the plugin are listed read-only and can be
duplicated into an editable copy. Every check is the core's own validation
(:func:`..processing.core.vessel.profile_from_dict`); its message is shown in the dialog with
the form field it concerns. Nothing is overwritten or deleted without asking.
"""
from __future__ import annotations

import dataclasses
import re
from pathlib import Path
from typing import Any, Dict, List, Optional, Sequence, Tuple

from qgis.PyQt.QtCore import QCoreApplication, Qt
from qgis.PyQt.QtWidgets import (
    QAbstractItemView,
    QComboBox,
    QDialog,
    QDialogButtonBox,
    QDoubleSpinBox,
    QFormLayout,
    QGroupBox,
    QHBoxLayout,
    QHeaderView,
    QLabel,
    QLineEdit,
    QListWidget,
    QListWidgetItem,
    QMessageBox,
    QPlainTextEdit,
    QPushButton,
    QSplitter,
    QTableWidget,
    QTableWidgetItem,
    QVBoxLayout,
    QWidget,
)

from qgis.gui import QgsFileWidget

from ..processing.core.vessel import profile as vessel_core
from ..processing.core.comfort.criteria import NORDFORSK_TASKS
from ..processing.core.flags import CAUTION
from ..processing.core.validation import SeawayInputError
from ..processing.core.vessel.profile import (
    FORMAT_NAME,
    FORMAT_VERSION,
    Station,
    VesselProfile,
    builtin_profile,
    builtin_profile_names,
    profile_from_dict,
)
from .profile_store import ProfileExistsError, ProfileStore, vessel_folder

__all__ = ["VesselManagerDialog", "default_store", "FIELD_KEYS", "STATION_COLUMNS"]

KIND_BUILTIN = "builtin"
KIND_USER = "user"
KIND_BROKEN = "broken"
KIND_NEW = "new"

FIELD_KEYS: Tuple[str, ...] = (
    "name", "description", "length_wl_m", "beam_m", "draught_m", "block_coeff",
    "waterplane_coeff", "gm_m", "roll_period_s", "roll_damping_ratio", "service_speed_kn",
)
"""Profile fields edited in the form, in form order (keys of the JSON profile)."""

STATION_COLUMNS: Tuple[str, ...] = ("name", "x_m", "y_m", "z_m", "task")
"""Columns of the stations table (keys of a station in the JSON profile)."""

# Station tasks (key -> label) known to the core's seakeeping criteria.
STATION_TASKS: Dict[str, str] = {key: c.label for key, c in NORDFORSK_TASKS.items()}

# (key: minimum, maximum, decimals, step, optional); an optional field at its minimum shows a
# special text (see VesselManagerDialog._special_texts) and means "not given" (None).
_SPIN_SPECS: Dict[str, Tuple[float, float, int, float, bool]] = {
    "length_wl_m": (0.0, 500.0, 3, 0.5, False),
    "beam_m": (0.0, 100.0, 3, 0.1, False),
    "draught_m": (0.0, 50.0, 3, 0.1, False),
    "block_coeff": (0.0, 1.0, 4, 0.01, False),
    "waterplane_coeff": (0.0, 1.0, 4, 0.01, True),
    "gm_m": (0.0, 20.0, 3, 0.05, True),
    "roll_period_s": (0.0, 60.0, 3, 0.1, True),
    "roll_damping_ratio": (0.0, 1.0, 4, 0.01, True),
    "service_speed_kn": (0.0, 60.0, 2, 0.5, False),
}
_OPTIONAL_SPINS = {k for k, spec in _SPIN_SPECS.items() if spec[4]}
_PROFILE_KEYS = {f.name for f in dataclasses.fields(VesselProfile)}
"""Keys the vessel core of this version reads (the hull-sections file arrives with strip theory)."""


def default_store() -> ProfileStore:
    """The store in the active QGIS user profile: ``<qgisSettingsDirPath>/seaway_comfort/vessels``."""
    from qgis.core import QgsApplication

    return ProfileStore(vessel_folder(QgsApplication.qgisSettingsDirPath()))


def _parse_number(text: str) -> float:
    """A number typed in a table cell; accepts a decimal comma ('1,5' -> 1.5)."""
    cleaned = text.strip().replace(",", ".")
    return float(cleaned)


class VesselManagerDialog(QDialog):
    """Dialog listing built-in and user vessel profiles with an editing form.

    ``store`` defaults to :func:`default_store`; ``builtin_names`` defaults to the core's
    :func:`builtin_profile_names`. Open it with ``exec()`` (modal) or ``show()``.
    """

    def __init__(self, store: Optional[ProfileStore] = None, parent: Optional[QWidget] = None,
                 builtin_names: Optional[Sequence[str]] = None) -> None:
        super().__init__(parent)
        self.store = store if store is not None else default_store()
        self._builtin_names = list(builtin_names) if builtin_names is not None else None
        self._kind = KIND_NEW
        self._current_path: Optional[Path] = None
        self._rao_table: Optional[str] = None
        # profile keys kept as they are (not edited in the form): file and mass keys
        self._kept: Dict[str, Any] = {}
        self._base_dir: Optional[str] = None
        self.setObjectName("SeawayComfortVesselManager")
        self.setWindowTitle(self.tr("Seaway Comfort: vessel profiles"))
        self._build()
        self._mark_clean()
        self.reload()

    def tr(self, text: str) -> str:  # noqa: D401 - Qt naming
        """Translate ``text`` in this class's context (matches pylupdate5's context)."""
        return QCoreApplication.translate("VesselManagerDialog", text)

    # ================================================================== layout
    def _field_labels(self) -> Dict[str, str]:
        return {
            "name": self.tr("Profile name"),
            "description": self.tr("Description"),
            "length_wl_m": self.tr("Waterline length L (m)"),
            "beam_m": self.tr("Beam B (m)"),
            "draught_m": self.tr("Draught T (m)"),
            "block_coeff": self.tr("Block coefficient Cb (fraction)"),
            "waterplane_coeff": self.tr("Waterplane coefficient Cwp (fraction)"),
            "gm_m": self.tr("Metacentric height GM (m)"),
            "roll_period_s": self.tr("Natural roll period (s)"),
            "roll_damping_ratio": self.tr("Roll damping (fraction of critical)"),
            "service_speed_kn": self.tr("Service speed (kn)"),
        }

    def _special_texts(self) -> Dict[str, str]:
        """Texts shown when an optional field is at its minimum (= not given)."""
        return {
            "waterplane_coeff": self.tr("estimate from Cb"),
            "gm_m": self.tr("not given"),
            "roll_period_s": self.tr("estimate from GM"),
            "roll_damping_ratio": self.tr("Ikeda estimate (strip model)"),
        }

    def _station_headers(self) -> List[str]:
        return [
            self.tr("Name"),
            self.tr("x (m)"),
            self.tr("y (m)"),
            self.tr("z (m)"),
            self.tr("Task (criterion)"),
        ]

    def _build(self) -> None:
        """Lay out the dialog: profile list | form (hull, stations, actions), caution, Close."""
        self.field_labels = self._field_labels()
        outer = QVBoxLayout(self)
        splitter = QSplitter(Qt.Orientation.Horizontal, self)
        outer.addWidget(splitter, 1)
        left = self._build_profile_list(splitter)
        right = QWidget(splitter)
        right_layout = QVBoxLayout(right)
        self.state_label = QLabel(right)
        right_layout.addWidget(self.state_label)
        columns = QHBoxLayout()
        columns.addWidget(self._build_hull_box(right), 1)
        right_layout.addLayout(columns, 1)
        columns.addWidget(self._build_station_box(right), 1)
        self._build_actions(right, right_layout)
        left.setMinimumWidth(240)
        splitter.setStretchFactor(1, 3)

        caution = QLabel(self.tr(CAUTION), self)
        caution.setObjectName("caution")
        caution.setWordWrap(True)
        outer.addWidget(caution)
        buttons = QDialogButtonBox(QDialogButtonBox.StandardButton.Close, self)
        buttons.rejected.connect(self.reject)
        outer.addWidget(buttons)
        self.resize(1240, 660)
        splitter.setSizes([300, 940])
        # Enter in a field must not press New/Delete/Save by accident.
        for button in self.findChildren(QPushButton):
            button.setAutoDefault(False)
            button.setDefault(False)

    def _build_profile_list(self, splitter: QSplitter) -> QWidget:
        """Left pane: the list of profiles, New/Duplicate/Delete and the storage folder."""
        left = QWidget(splitter)
        left_layout = QVBoxLayout(left)
        left_layout.addWidget(QLabel(self.tr("Profiles (examples are read-only)"), left))
        self.profile_list = QListWidget(left)
        self.profile_list.setSelectionMode(QAbstractItemView.SelectionMode.SingleSelection)
        self.profile_list.currentItemChanged.connect(self._on_current_item_changed)
        left_layout.addWidget(self.profile_list, 1)
        row = QHBoxLayout()
        self.new_button = QPushButton(self.tr("New"), left)
        self.duplicate_button = QPushButton(self.tr("Duplicate"), left)
        self.delete_button = QPushButton(self.tr("Delete..."), left)
        for button in (self.new_button, self.duplicate_button, self.delete_button):
            row.addWidget(button)
        left_layout.addLayout(row)
        self.folder_label = QLabel(left)
        self.folder_label.setWordWrap(True)
        self.folder_label.setTextInteractionFlags(Qt.TextInteractionFlag.TextSelectableByMouse)
        left_layout.addWidget(self.folder_label)
        self.new_button.clicked.connect(lambda _checked=False: self.new_profile())
        self.duplicate_button.clicked.connect(lambda _checked=False: self.duplicate())
        self.delete_button.clicked.connect(lambda _checked=False: self.delete_current())
        return left

    def _build_hull_box(self, right: QWidget) -> QGroupBox:
        """The hull and stability form: name, description, one spin box per number, RAO table."""
        hull_box = QGroupBox(self.tr("Hull and stability"), right)
        form = QFormLayout(hull_box)
        self.name_edit = QLineEdit(hull_box)
        self.name_edit.setPlaceholderText(self.tr("e.g. my survey launch"))
        form.addRow(self.field_labels["name"], self.name_edit)
        self.description_edit = QPlainTextEdit(hull_box)
        self.description_edit.setFixedHeight(56)
        form.addRow(self.field_labels["description"], self.description_edit)
        self.spins: Dict[str, QDoubleSpinBox] = {}
        for key, (low, high, decimals, step, special) in _SPIN_SPECS.items():
            spin = QDoubleSpinBox(hull_box)
            spin.setObjectName(key)
            spin.setRange(low, high)
            spin.setDecimals(decimals)
            spin.setSingleStep(step)
            if special:
                spin.setSpecialValueText(self._special_texts()[key])
            self.spins[key] = spin
            form.addRow(self.field_labels[key], spin)
        self.rao_label = QLabel(hull_box)  # what the closed-form model uses when no table is set
        self.rao_label.setWordWrap(True)
        self.files: Dict[str, Any] = {}
        for key, label in (("rao_table", self.tr("Response table (CSV)")),
                           ("hull_sections", self.tr("Hull sections (CSV)"))):
            picker = QgsFileWidget(hull_box)
            picker.setObjectName(key)
            picker.setFilter(self.tr("CSV files (*.csv);;All files (*)"))
            picker.setStorageMode(QgsFileWidget.StorageMode.GetFile)
            self.files[key] = picker
            form.addRow(label, picker)
        form.addRow("", self.rao_label)
        self.model_combo = QComboBox(hull_box)
        for key, label in (("strip", self.tr("strip theory (default)")),
                           ("closed_form", self.tr("closed form (quick fallback)"))):
            self.model_combo.addItem(label, key)
        form.addRow(self.tr("Motion model"), self.model_combo)
        return hull_box

    def _build_station_box(self, right: QWidget) -> QGroupBox:
        """The stations table with its axes note and Add/Remove buttons."""
        station_box = QGroupBox(self.tr("Stations (where motions are evaluated)"), right)
        station_layout = QVBoxLayout(station_box)
        axes = QLabel(self.tr("x forward of midships, y to starboard, z above the waterline, "
                              "all in metres."), station_box)
        axes.setWordWrap(True)
        station_layout.addWidget(axes)
        self.station_table = QTableWidget(0, len(STATION_COLUMNS), station_box)
        self.station_table.setHorizontalHeaderLabels(self._station_headers())
        self.station_table.horizontalHeader().setSectionResizeMode(
            QHeaderView.ResizeMode.ResizeToContents)
        self.station_table.horizontalHeader().setStretchLastSection(True)
        self.station_table.setSelectionBehavior(QAbstractItemView.SelectionBehavior.SelectRows)
        station_layout.addWidget(self.station_table)
        srow = QHBoxLayout()
        self.add_station_button = QPushButton(self.tr("Add station"), station_box)
        self.remove_station_button = QPushButton(self.tr("Remove station"), station_box)
        srow.addWidget(self.add_station_button)
        srow.addWidget(self.remove_station_button)
        srow.addStretch(1)
        station_layout.addLayout(srow)
        self.add_station_button.clicked.connect(
            lambda _checked=False: self.add_station_row(Station("station", 0.0, 0.0, 0.0)))
        self.remove_station_button.clicked.connect(
            lambda _checked=False: self.remove_selected_station())
        return station_box

    def _build_actions(self, right: QWidget, right_layout: QVBoxLayout) -> None:
        """The message line and the Check/Save buttons under the form."""
        self.message_label = QLabel(right)
        self.message_label.setObjectName("message")
        self.message_label.setWordWrap(True)
        self.message_label.setTextInteractionFlags(Qt.TextInteractionFlag.TextSelectableByMouse)
        right_layout.addWidget(self.message_label)
        arow = QHBoxLayout()
        self.validate_button = QPushButton(self.tr("Check"), right)
        self.save_button = QPushButton(self.tr("Save"), right)
        arow.addStretch(1)
        arow.addWidget(self.validate_button)
        arow.addWidget(self.save_button)
        right_layout.addLayout(arow)
        self.validate_button.clicked.connect(lambda _checked=False: self.validate())
        self.save_button.clicked.connect(lambda _checked=False: self.save())

    # ================================================================== list
    def builtin_names(self) -> List[str]:
        return list(self._builtin_names) if self._builtin_names is not None else builtin_profile_names()

    def reload(self, select: Optional[Tuple[str, str]] = None) -> None:
        """Rebuild the list from the built-in examples and the store; reselect ``select``.

        ``select`` is ``(kind, key)`` with kind 'builtin' (key = example name) or 'user'
        (key = file path); by default the first entry is selected.
        """
        self.folder_label.setText(self.tr("Your profiles are stored in: {0}").format(self.store.folder))
        self.profile_list.blockSignals(True)
        self.profile_list.clear()
        target_row = 0
        for name in self.builtin_names():
            item = QListWidgetItem(self.tr("{0} (example)").format(name))
            item.setData(Qt.ItemDataRole.UserRole, (KIND_BUILTIN, name))
            self.profile_list.addItem(item)
            if select == (KIND_BUILTIN, name):
                target_row = self.profile_list.count() - 1
        for entry in self.store.entries():
            if entry.ok:
                item = QListWidgetItem(entry.name)
                item.setData(Qt.ItemDataRole.UserRole, (KIND_USER, str(entry.path)))
                item.setToolTip(str(entry.path))
            else:
                item = QListWidgetItem(self.tr("{0} (cannot be read)").format(entry.path.name))
                item.setData(Qt.ItemDataRole.UserRole, (KIND_BROKEN, str(entry.path)))
                item.setToolTip(entry.error)
            self.profile_list.addItem(item)
            if select is not None and select[1] == str(entry.path):
                target_row = self.profile_list.count() - 1
        self.profile_list.blockSignals(False)
        if self.profile_list.count():
            self.profile_list.blockSignals(True)
            self.profile_list.setCurrentRow(target_row)
            self.profile_list.blockSignals(False)
            self._load_item(self.profile_list.currentItem())
        else:
            self.new_profile()

    def item_labels(self) -> List[str]:
        """Texts of the list entries (for tests and accessibility tools)."""
        return [self.profile_list.item(i).text() for i in range(self.profile_list.count())]

    def select(self, kind: str, key: str) -> bool:
        """Select the list entry ``(kind, key)``; False when there is none."""
        for i in range(self.profile_list.count()):
            if tuple(self.profile_list.item(i).data(Qt.ItemDataRole.UserRole)) == (kind, key):
                self.profile_list.setCurrentRow(i)
                return True
        return False

    def _on_current_item_changed(self, current: Optional[QListWidgetItem],
                                 previous: Optional[QListWidgetItem]) -> None:
        if current is None:
            return
        if not self.confirm_discard():
            self.profile_list.blockSignals(True)
            self.profile_list.setCurrentItem(previous)
            self.profile_list.blockSignals(False)
            return
        self._load_item(current)

    def _load_item(self, current: QListWidgetItem) -> None:
        kind, key = tuple(current.data(Qt.ItemDataRole.UserRole))
        self.clear_message()
        try:
            if kind == KIND_BUILTIN:
                self.set_profile(builtin_profile(key), kind=KIND_BUILTIN)
            elif kind == KIND_USER:
                self.set_profile(vessel_core.load_vessel_profile(key), kind=KIND_USER, path=Path(key))
            else:
                self._kind, self._current_path = KIND_BROKEN, Path(key)
                self._update_state()
                self.show_error(self.tr("This file cannot be read: {0}").format(current.toolTip()))
        except SeawayInputError as exc:
            self._kind, self._current_path = KIND_BROKEN, Path(key)
            self._update_state()
            self.show_error(str(exc))
        self._mark_clean()

    # ================================================================== form
    def set_profile(self, profile: VesselProfile, *, kind: str = KIND_NEW,
                    path: Optional[Path] = None) -> None:
        """Fill the form from ``profile``; examples are shown read-only."""
        self._kind, self._current_path = kind, path
        self._rao_table, self._base_dir = profile.rao_table, profile.base_dir
        self.name_edit.setText(profile.name)
        self.description_edit.setPlainText(profile.description)
        for key, spin in self.spins.items():
            value = getattr(profile, key)
            spin.setValue(spin.minimum() if value is None else float(value))
        for key, picker in self.files.items():
            picker.setFilePath(str(getattr(profile, key, None) or ""))
            picker.setDefaultRoot(str(profile.base_dir or ""))
        self.rao_label.setText("" if profile.rao_table else self.tr("no response table: the hull model is used"))
        self._kept = {k: getattr(profile, k) for k in ("roll_gyradius_m", "pitch_gyradius_m")}
        self.model_combo.setCurrentIndex(max(self.model_combo.findData(profile.motion_model), 0))
        self.station_table.setRowCount(0)
        for station in profile.stations:
            self.add_station_row(station)
        self._update_state()
        self._mark_clean()

    # ================================================================== unsaved changes
    def _snapshot(self) -> Tuple[Any, ...]:
        """The raw state of the form (no parsing), to notice unsaved edits."""
        cells = []
        for row in range(self.station_table.rowCount()):
            items = [self.station_table.item(row, col) for col in range(4)]
            combo = self.station_table.cellWidget(row, 4)
            cells.append(tuple(i.text() if i is not None else "" for i in items)
                         + (combo.currentData() if isinstance(combo, QComboBox) else None,))
        return (self.name_edit.text(), self.description_edit.toPlainText(),
                tuple(spin.value() for spin in self.spins.values()), tuple(cells),
                tuple(picker.filePath() for picker in self.files.values()))

    def _mark_clean(self) -> None:
        self._clean_snapshot = self._snapshot()

    def has_unsaved_changes(self) -> bool:
        """True when the form of an editable profile was changed since it was loaded or saved."""
        if self.is_read_only():
            return False
        return self._snapshot() != getattr(self, "_clean_snapshot", None)

    def confirm_discard(self) -> bool:
        """True when there is nothing unsaved, or the user agrees to discard it."""
        if not self.has_unsaved_changes():
            return True
        return self.ask(self.tr("Discard changes?"),
                        self.tr("The profile {0!r} has unsaved changes. Discard them?")
                        .format(self.name_edit.text()))

    def reject(self) -> None:  # Close button, Esc
        if self.confirm_discard():
            self._mark_clean()  # the user chose to drop the edits
            super().reject()

    def closeEvent(self, event: Any) -> None:  # noqa: N802 (Qt API name)
        if self.confirm_discard():
            self._mark_clean()
            event.accept()
        else:
            event.ignore()

    def discard_and_close(self) -> None:
        """Close without asking (the plugin is being unloaded)."""
        self._mark_clean()
        self.close()

    def add_station_row(self, station: Station) -> None:
        row = self.station_table.rowCount()
        self.station_table.insertRow(row)
        for col, key in enumerate(STATION_COLUMNS[:4]):
            value = getattr(station, key)
            text = value if key == "name" else f"{value:g}"
            self.station_table.setItem(row, col, QTableWidgetItem(text))
        combo = QComboBox(self.station_table)
        for key, label in STATION_TASKS.items():
            combo.addItem(label, key)
        if station.task not in STATION_TASKS:
            combo.addItem(station.task, station.task)
        combo.setCurrentIndex(combo.findData(station.task))
        self.station_table.setCellWidget(row, 4, combo)
        self._apply_read_only()

    def remove_selected_station(self) -> None:
        rows = sorted({index.row() for index in self.station_table.selectedIndexes()}, reverse=True)
        if not rows and self.station_table.rowCount():
            rows = [self.station_table.rowCount() - 1]
        for row in rows:
            self.station_table.removeRow(row)

    def is_read_only(self) -> bool:
        return self._kind in (KIND_BUILTIN, KIND_BROKEN)

    def current_kind(self) -> str:
        """'builtin', 'user', 'broken' or 'new' (an unsaved profile)."""
        return self._kind

    def current_path(self) -> Optional[Path]:
        return self._current_path

    def _update_state(self) -> None:
        texts = {
            KIND_BUILTIN: self.tr("Example profile (read-only): use Duplicate to make an editable copy."),
            KIND_USER: self.tr("Your profile: {0}").format(self._current_path),
            KIND_BROKEN: self.tr("Unreadable file: {0}").format(self._current_path),
            KIND_NEW: self.tr("New profile, not saved yet."),
        }
        self.state_label.setText(texts[self._kind])
        self._apply_read_only()

    def _apply_read_only(self) -> None:
        ro = self.is_read_only()
        self.name_edit.setReadOnly(ro)
        self.description_edit.setReadOnly(ro)
        for spin in self.spins.values():
            spin.setReadOnly(ro)
        for picker in self.files.values():
            picker.setReadOnly(ro)
        triggers = (QAbstractItemView.EditTrigger.NoEditTriggers if ro else
                    QAbstractItemView.EditTrigger.DoubleClicked
                    | QAbstractItemView.EditTrigger.EditKeyPressed
                    | QAbstractItemView.EditTrigger.AnyKeyPressed)
        self.station_table.setEditTriggers(triggers)
        for row in range(self.station_table.rowCount()):
            widget = self.station_table.cellWidget(row, 4)
            if widget is not None:
                widget.setEnabled(not ro)
        self.add_station_button.setEnabled(not ro)
        self.remove_station_button.setEnabled(not ro)
        self.save_button.setEnabled(not ro)
        self.validate_button.setEnabled(self._kind != KIND_BROKEN)
        self.duplicate_button.setEnabled(self._kind != KIND_BROKEN)
        self.delete_button.setEnabled(self._kind in (KIND_USER, KIND_BROKEN))

    def form_dict(self) -> Dict[str, Any]:
        """The form as a profile mapping in the JSON layout (not yet validated).

        Raises SeawayInputError naming the stations-table row and column when a cell is not a
        number.
        """
        data: Dict[str, Any] = {"format": FORMAT_NAME, "format_version": FORMAT_VERSION,
                                "name": self.name_edit.text().strip(),
                                "description": self.description_edit.toPlainText().strip()}
        for key, spin in self.spins.items():
            value = float(spin.value())
            data[key] = None if key in _OPTIONAL_SPINS and value <= spin.minimum() else value
        for key, picker in self.files.items():
            text = picker.filePath().strip()
            if text or key in _PROFILE_KEYS:  # a key the core does not know yet stays out when empty
                data[key] = text or None
        data.update(self._kept)
        data["motion_model"] = self.model_combo.currentData() or "strip"
        headers = self._station_headers()
        stations: List[Dict[str, Any]] = []
        for row in range(self.station_table.rowCount()):
            cells = []
            for col in range(4):
                item = self.station_table.item(row, col)
                cells.append(item.text().strip() if item is not None else "")
            if not any(cells):
                continue  # an empty row is ignored
            station: Dict[str, Any] = {"name": cells[0]}
            for col, key in enumerate(STATION_COLUMNS[1:4], start=1):
                text = cells[col] or "0"
                try:
                    station[key] = _parse_number(text)
                except ValueError:
                    raise SeawayInputError(
                        self.tr("Stations table, row {0}, column '{1}': {2!r} is not a number")
                        .format(row + 1, headers[col], cells[col])
                    ) from None
            combo = self.station_table.cellWidget(row, 4)
            if isinstance(combo, QComboBox):
                station["task"] = combo.currentData()
            stations.append(station)
        data["stations"] = stations
        return data

    def form_profile(self) -> VesselProfile:
        """The validated profile in the form (SeawayInputError naming the field and value)."""
        data = self.form_dict()
        if not data["name"]:
            raise SeawayInputError(self.tr("{0} (name): a profile needs a name, got {1!r}")
                                   .format(self.field_labels["name"], data["name"]))
        return profile_from_dict(data, source="", base_dir=self._base_dir)

    # ================================================================== messages
    def field_of_message(self, message: str) -> Optional[str]:
        """The form field a core validation message is about (the first one it names).

        "draught_m (T) must not exceed beam_m (B)" blames the beam when the beam is the odd one
        out, i.e. narrower than a tenth of the waterline length (beam/length ratios of monohulls
        lie well above 0.1: common practice, no source), as for a 0.5 m beam typed by mistake.
        """
        # The profile name is quoted in core messages; keep it out of the search.
        message = re.sub(r"""vessel ('[^']*'|"[^"]*")""", "vessel", message)
        if re.search(r"\bdraught_m\b.*must not exceed beam_m\b", message) and \
                self.spins["beam_m"].value() < 0.1 * self.spins["length_wl_m"].value():
            return "beam_m"
        if re.search(r"\bstations?\b|\bstations\[", message):
            return "stations"  # a station's name, position or task, or the list itself
        best: Optional[Tuple[int, str]] = None
        for key in FIELD_KEYS[2:]:
            match = re.search(rf"\b{re.escape(key)}\b", message)
            if match and (best is None or match.start() < best[0]):
                best = (match.start(), key)
        if best is None and re.search(r"\bvessel name\b", message):
            return "name"
        return best[1] if best else None

    def show_error(self, message: str) -> None:
        """Show a validation problem in the dialog, naming the form field it concerns."""
        key = self.field_of_message(message)
        if key in self.field_labels:
            text = self.tr("{0}: {1}").format(self.field_labels[key], message)
            widget = self.spins.get(key) if key in self.spins else None
            if widget is not None:
                widget.setFocus()
        elif key == "stations":
            text = self.tr("Stations table: {0}").format(message)
        else:
            text = message
        self.message_label.setStyleSheet("color: #b00020;")
        self.message_label.setText(text)

    def show_info(self, message: str) -> None:
        self.message_label.setStyleSheet("color: #1b5e20;")
        self.message_label.setText(message)

    def clear_message(self) -> None:
        self.message_label.setStyleSheet("")
        self.message_label.setText("")

    def message(self) -> str:
        return self.message_label.text()

    def ask(self, title: str, question: str) -> bool:
        """Ask a yes/no question (a separate method so tests can answer it)."""
        answer = QMessageBox.question(
            self, title, question,
            QMessageBox.StandardButton.Yes | QMessageBox.StandardButton.No,
            QMessageBox.StandardButton.No,
        )
        return answer == QMessageBox.StandardButton.Yes

    # ================================================================== actions
    def validate(self) -> Optional[VesselProfile]:
        """Check the form; show the result in the dialog. Returns the profile or None."""
        try:
            profile = self.form_profile()
        except SeawayInputError as exc:
            self.show_error(str(exc))
            return None
        try:
            if profile.motion_model == "strip" and profile.rao_table is None:
                from ..processing.core.motions.strip_transfer import roll_summary

                roll = roll_summary(profile)  # computed roll period and damping (about 1 s)
            else:
                roll = self.tr("natural roll period {0:.2f} s").format(profile.natural_roll_period_s)
        except SeawayInputError as exc:  # the estimate has its own range of validity
            self.show_error(str(exc))
            return None
        self.show_info(self.tr("Profile {0!r} is valid: {1}.").format(profile.name, roll))
        return profile

    def save(self) -> Optional[Path]:
        """Validate and store the form's profile; asks before replacing another file."""
        if self.is_read_only():
            self.show_error(self.tr("Example profiles are read-only: use Duplicate first."))
            return None
        profile = self.validate()
        if profile is None:
            return None
        if profile.name in self.builtin_names():
            self.show_error(self.tr("{0}: {1!r} is the name of an example profile; choose "
                                    "another name.").format(self.field_labels["name"], profile.name))
            return None
        try:
            target = self.store.path_for(profile.name)
        except SeawayInputError as exc:
            self.show_error(self.tr("{0}: {1}").format(self.field_labels["name"], exc))
            return None
        same_file = self._current_path is not None and target == self._current_path
        renamed_from = self._current_path if self._kind == KIND_USER and not same_file else None
        try:
            path = self.store.save(profile, overwrite=same_file)
        except ProfileExistsError as exc:
            if not self.ask(self.tr("Replace vessel profile?"),
                            self.tr("{0}\n\nReplace it?").format(exc)):
                self.show_info(self.tr("Not saved: the existing file was kept."))
                return None
            path = self.store.save(profile, overwrite=True)
        except (SeawayInputError, OSError) as exc:
            self.show_error(str(exc))
            return None
        self._mark_clean()
        self.reload(select=(KIND_USER, str(path)))
        self.show_info(self.tr("Saved {0!r} to {1}").format(profile.name, path))
        if renamed_from is not None and renamed_from.exists():
            self.show_info(self.tr("Saved {0!r} to {1}; the profile in {2} is kept (delete it if "
                                   "it is no longer needed).").format(profile.name, path,
                                                                       renamed_from))
        return path

    def new_profile(self) -> None:
        """Start an unsaved profile from a neutral template (the name must be filled in)."""
        if not self.confirm_discard():
            return
        template = VesselProfile(
            name="new", length_wl_m=10.0, beam_m=3.5, draught_m=1.0, block_coeff=0.45,
            gm_m=0.8, roll_damping_ratio=0.10, service_speed_kn=8.0,
            stations=(Station("helm", 0.0, 0.0, 1.5),),
        )
        self.profile_list.blockSignals(True)
        self.profile_list.clearSelection()
        self.profile_list.setCurrentRow(-1)
        self.profile_list.blockSignals(False)
        self.set_profile(template, kind=KIND_NEW)
        self.name_edit.clear()
        self._mark_clean()
        self.name_edit.setFocus()
        self.show_info(self.tr("Fill in the name and your vessel's particulars, then Save."))

    def duplicate(self) -> Optional[VesselProfile]:
        """Copy the profile in the form into a new, editable, unsaved profile."""
        try:
            profile = self.form_profile()
        except SeawayInputError as exc:
            self.show_error(str(exc))
            return None
        taken = set(self.builtin_names()) | {e.name for e in self.store.entries()}
        base = self.tr("{0} copy").format(profile.name)
        name, n = base, 2
        while name in taken or self.store.exists(name):
            name, n = f"{base} {n}", n + 1
        copy = dataclasses.replace(profile, name=name)
        self.profile_list.blockSignals(True)
        self.profile_list.setCurrentRow(-1)
        self.profile_list.blockSignals(False)
        self.set_profile(copy, kind=KIND_NEW)
        self.show_info(self.tr("Editable copy {0!r} made; change it as needed, then Save.")
                       .format(name))
        return copy

    def delete_current(self) -> bool:
        """Delete the selected user profile after confirmation; True when deleted."""
        if self._kind not in (KIND_USER, KIND_BROKEN) or self._current_path is None:
            self.show_error(self.tr("Only your own saved profiles can be deleted."))
            return False
        path = self._current_path
        if not self.ask(self.tr("Delete vessel profile?"),
                        self.tr("Delete {0} permanently?").format(path)):
            return False
        try:
            self.store.delete_file(path)
        except (SeawayInputError, OSError) as exc:
            self.show_error(str(exc))
            return False
        self._mark_clean()  # the deleted profile's edits go with it
        self.reload()
        self.show_info(self.tr("Deleted {0}").format(path))
        return True

"""Forms declared as data: labelled fields bound to one value of the project each.

A field says how to read its value from a :class:`~hydraulics.model.Project` and how to
build the project with a new value; the form makes the editor, shows the value in the
units on display, parses what is typed (:func:`app.table_models.cells.parse_value`,
the same limits as the file reader) and hands the candidate project to the document.
A refused entry is put back to the stored value and the document says why.  Values
are shown rounded to a few significant digits; a field the user did not edit never
writes its rounded text back.
Forms hold no data: :meth:`FormPanel.refresh` re-reads everything from the project.
"""

from __future__ import annotations

from collections.abc import Callable, Sequence
from dataclasses import dataclass, field
from typing import Any

from PySide6.QtCore import QSignalBlocker
from PySide6.QtGui import QShowEvent
from PySide6.QtWidgets import (
    QCheckBox,
    QComboBox,
    QFormLayout,
    QGroupBox,
    QHBoxLayout,
    QLabel,
    QLineEdit,
    QVBoxLayout,
    QWidget,
)

from app.document import ProjectDocument, describe_model_error
from app.table_models.cells import CellError, display_text, parse_value, range_text, same_value, unit_suffix
from hydraulics.model import ModelError, Project
from hydraulics.validation import LIMITS

Getter = Callable[[Project], Any]
Setter = Callable[[Project, Any], Project]
Condition = Callable[[Project], bool]


LABEL_WIDTH = 190
"""Width of the field labels, the same in every group so the fields line up."""


def _always(_project: Project) -> bool:
    return True


def _show_text(editor: QLineEdit, text: str) -> None:
    """Show ``text`` from its start (a long project name is read from its beginning)."""
    editor.setText(text)
    if not editor.hasFocus():
        editor.setCursorPosition(0)


def _label(text: str) -> QLabel:
    label = QLabel(text)
    label.setMinimumWidth(LABEL_WIDTH)
    label.setWordWrap(True)
    return label


@dataclass(frozen=True)
class NumberField:
    """A number typed with units, checked against ``LIMITS[limit]``."""

    key: str
    label: str
    quantity: str
    limit: str
    get: Getter
    set: Setter
    optional: bool = False
    tooltip: str = ""
    visible: Condition = _always
    enabled: Condition = _always
    placeholder: Callable[[ProjectDocument], str] | None = None
    """Grey text shown when an optional value is blank; receives the document."""


@dataclass(frozen=True)
class ChoiceField:
    """A drop-down of ``(value, label)`` choices."""

    key: str
    label: str
    choices: Callable[[Project], list[tuple[Any, str]]]
    get: Getter
    set: Setter
    tooltip: str = ""
    visible: Condition = _always
    enabled: Condition = _always


@dataclass(frozen=True)
class CheckField:
    """A yes/no box."""

    key: str
    label: str
    get: Getter
    set: Setter
    tooltip: str = ""
    visible: Condition = _always
    enabled: Condition = _always


@dataclass(frozen=True)
class TextField:
    """A line of free text (a name, a currency)."""

    key: str
    label: str
    get: Getter
    set: Setter
    tooltip: str = ""
    visible: Condition = _always
    enabled: Condition = _always
    allow_empty: bool = False


Field = NumberField | ChoiceField | CheckField | TextField


@dataclass(frozen=True)
class Section:
    """A titled group of fields."""

    title: str
    fields: Sequence[Field]
    note: str = ""
    visible: Condition = _always


@dataclass
class _Bound:
    spec: Field
    editor: QWidget
    row_widget: QWidget
    form: QFormLayout
    unit_label: QLabel | None = None
    choice_values: list[Any] = field(default_factory=list)

    def line_edit(self) -> QLineEdit:
        """The editor of a number or text field."""
        if not isinstance(self.editor, QLineEdit):
            raise TypeError(f"field {self.spec.key!r} is not typed into")
        return self.editor

    def combo_box(self) -> QComboBox:
        """The editor of a choice field."""
        if not isinstance(self.editor, QComboBox):
            raise TypeError(f"field {self.spec.key!r} is not a drop-down")
        return self.editor

    def check_box(self) -> QCheckBox:
        """The editor of a yes/no field."""
        if not isinstance(self.editor, QCheckBox):
            raise TypeError(f"field {self.spec.key!r} is not a yes/no box")
        return self.editor


class FormPanel(QWidget):
    """Group boxes of fields bound to the document's project.

    ``area`` names the panel in focus targets: an edit of field ``k`` is undone with
    focus ``(area, k)`` so the window can bring the field back into view.
    """

    def __init__(self, document: ProjectDocument, area: str, sections: Sequence[Section],
                 parent: QWidget | None = None) -> None:
        super().__init__(parent)
        self._document = document
        self._area = area
        self._bound: dict[str, _Bound] = {}
        self._groups: list[tuple[Section, QGroupBox]] = []
        layout = QVBoxLayout(self)
        layout.setContentsMargins(4, 4, 4, 4)
        for section in sections:
            box = QGroupBox(section.title)
            form = QFormLayout(box)
            form.setFieldGrowthPolicy(QFormLayout.FieldGrowthPolicy.AllNonFixedFieldsGrow)
            if section.note:
                note = QLabel(section.note)
                note.setWordWrap(True)
                note.setStyleSheet("color: #505050;")
                form.addRow(note)
            for spec in section.fields:
                self._add_field(form, spec)
            layout.addWidget(box)
            self._groups.append((section, box))
        layout.addStretch(1)
        document.projectChanged.connect(self.refresh)
        document.unitSystemChanged.connect(self.refresh)
        document.solutionChanged.connect(self._refresh_placeholders)
        self.refresh()

    # ------------------------------------------------------------------ building
    def _add_field(self, form: QFormLayout, spec: Field) -> None:
        editor: QWidget
        if isinstance(spec, NumberField):
            number_editor = QLineEdit()
            number_editor.editingFinished.connect(lambda s=spec: self._commit_number(s))
            unit = QLabel()
            unit.setMinimumWidth(42)
            row = QWidget()
            box = QHBoxLayout(row)
            box.setContentsMargins(0, 0, 0, 0)
            box.addWidget(number_editor, 1)
            box.addWidget(unit)
            form.addRow(_label(spec.label), row)
            editor = number_editor
            self._bound[spec.key] = _Bound(spec, editor, row, form, unit)
        elif isinstance(spec, ChoiceField):
            combo = QComboBox()
            combo.activated.connect(lambda i, s=spec: self._commit_choice(s, i))
            form.addRow(_label(spec.label), combo)
            editor = combo
            self._bound[spec.key] = _Bound(spec, editor, editor, form)
        elif isinstance(spec, CheckField):
            check = QCheckBox(spec.label)
            check.clicked.connect(lambda checked, s=spec: self._commit(s, bool(checked)))
            form.addRow(_label(""), check)
            editor = check
            self._bound[spec.key] = _Bound(spec, editor, editor, form)
        else:
            text_editor = QLineEdit()
            text_editor.editingFinished.connect(lambda s=spec: self._commit_text(s))
            form.addRow(_label(spec.label), text_editor)
            editor = text_editor
            self._bound[spec.key] = _Bound(spec, editor, editor, form)
        editor.setObjectName(f"field_{spec.key}")
        editor.setToolTip(spec.tooltip)

    def showEvent(self, event: QShowEvent) -> None:
        if getattr(self, "_stale", False):
            self.refresh()
        super().showEvent(event)

    # ------------------------------------------------------------------ reading
    def editor(self, key: str) -> QWidget:
        """The editor widget of field ``key`` (for tests and focus)."""
        return self._bound[key].editor

    def keys(self) -> list[str]:
        return list(self._bound)

    def refresh(self, *_args: object) -> None:
        """Show the project's current values (and hide fields that do not apply).

        A form on a hidden tab only notes that it is stale and refreshes when shown, so
        an edit elsewhere does not rebuild every form of the window.
        """
        if self.window().isVisible() and not self.isVisible():
            self._stale = True
            return
        self._stale = False
        project = self._document.project
        system = self._document.unit_system
        for section, box in self._groups:
            box.setVisible(section.visible(project))
        for bound in self._bound.values():
            spec = bound.spec
            shown = spec.visible(project)
            bound.form.setRowVisible(bound.row_widget, shown)
            bound.editor.setEnabled(spec.enabled(project))
            if not shown:
                continue
            typing = isinstance(bound.editor, QLineEdit) and bound.editor.hasFocus() and bound.editor.isModified()
            if isinstance(spec, NumberField):
                if not typing:  # an edit elsewhere (Ctrl+Up, undo) must not wipe what is being typed
                    _show_text(bound.line_edit(), display_text(spec.get(project), spec.quantity, system))
                if bound.unit_label is not None:
                    bound.unit_label.setText(unit_suffix(spec.quantity, system).replace("–", ""))
                help_text = f"Allowed: {range_text(LIMITS[spec.limit], spec.quantity, system)}."
                bound.editor.setToolTip(f"{spec.tooltip} {help_text}".strip())
            elif isinstance(spec, ChoiceField):
                combo = bound.combo_box()
                with QSignalBlocker(combo):
                    combo.clear()
                    bound.choice_values = []
                    for value, label in spec.choices(project):
                        combo.addItem(label)
                        bound.choice_values.append(value)
                    current = spec.get(project)
                    combo.setCurrentIndex(
                        bound.choice_values.index(current) if current in bound.choice_values else -1)
            elif isinstance(spec, CheckField):
                check = bound.check_box()
                with QSignalBlocker(check):
                    check.setChecked(bool(spec.get(project)))
            elif not typing:
                _show_text(bound.line_edit(), str(spec.get(project) or ""))
        self._refresh_placeholders()

    def _refresh_placeholders(self, *_args: object) -> None:
        for bound in self._bound.values():
            spec = bound.spec
            if isinstance(spec, NumberField) and spec.placeholder is not None:
                bound.line_edit().setPlaceholderText(spec.placeholder(self._document))

    # ------------------------------------------------------------------ writing
    def _commit(self, spec: Field, value: Any) -> bool:
        project = self._document.project
        try:
            candidate = spec.set(project, value)
        except CellError as exc:
            self._document.refuse(str(exc))
            self.refresh()
            return False
        except ModelError as exc:
            self._document.refuse(f"Not applied — {describe_model_error(exc)}")
            self.refresh()
            return False
        applied = self._document.apply(candidate, f"Set {spec.label.lower()}", (self._area, spec.key))
        if not applied:
            self.refresh()
        return applied

    def _commit_number(self, spec: NumberField) -> None:
        editor = self._bound[spec.key].line_edit()
        if not editor.isModified():
            return  # the shown (rounded) value was not edited: keep the stored one exactly
        editor.setModified(False)
        project = self._document.project
        try:
            value = parse_value(editor.text(), label=spec.label, quantity=spec.quantity,
                                limit_key=spec.limit, system=self._document.unit_system,
                                field_path=f"{self._area}.{spec.key}", optional=spec.optional)
        except CellError as exc:
            self._document.refuse(str(exc))
            self.refresh()
            return
        if same_value(value, spec.get(project)):
            return
        self._commit(spec, value)

    def _commit_text(self, spec: TextField) -> None:
        editor = self._bound[spec.key].line_edit()
        if not editor.isModified():
            return
        editor.setModified(False)
        text = editor.text().strip()
        if text == (spec.get(self._document.project) or ""):
            return
        if not text and not spec.allow_empty:
            self._document.refuse(f"{spec.label}: cannot be empty")
            self.refresh()
            return
        self._commit(spec, text)

    def _commit_choice(self, spec: ChoiceField, position: int) -> None:
        values = self._bound[spec.key].choice_values
        if not 0 <= position < len(values):
            return
        if values[position] == spec.get(self._document.project):
            return
        self._commit(spec, values[position])

    def set_text(self, key: str, text: str) -> None:
        """Type ``text`` into a number or text field and commit it (as Enter would)."""
        editor = self._bound[key].line_edit()
        editor.setText(text)
        editor.setModified(True)
        editor.editingFinished.emit()

    def choose(self, key: str, value: Any) -> None:
        """Pick the choice ``value`` of a drop-down field (as a user would)."""
        bound = self._bound[key]
        if not isinstance(bound.spec, ChoiceField):
            raise TypeError(f"field {key!r} is not a drop-down")
        self._commit_choice(bound.spec, bound.choice_values.index(value))

    def focus_field(self, key: str) -> bool:
        """Give keyboard focus to field ``key`` if this form has it."""
        bound = self._bound.get(key)
        if bound is None:
            return False
        bound.editor.setFocus()
        return True

"""What the report prints, gathered in one plain object: the Assessment, its findings, the
few descriptive fields of the setup that the Assessment does not carry, and the sign-offs.

Nothing here computes physics; it only copies text and settings out of the validated setup.
"""
from __future__ import annotations

import datetime
import os
import time
from dataclasses import dataclass, field
from typing import Any

from reports.pdf.scenes import scenes_from_setup
from reports.register import DEFAULT_REVIEW_INTERVAL_S, ApprovalStatus, SignOff


@dataclass
class ReportInputs:
    """Everything one report needs."""

    assessment: Any                          # planner.assessment.Assessment with .findings filled
    fingerprint: str
    site: str | None = None
    work_date: str | None = None
    audience: dict = field(default_factory=dict)
    site_rules_name: str | None = None
    site_requirements: list[str] = field(default_factory=list)
    protective_equipment: list[str] = field(default_factory=list)
    competent_persons: list[tuple[str, str]] = field(default_factory=list)
    review_interval_s: float = DEFAULT_REVIEW_INTERVAL_S
    interval_from_site: bool = False
    setup_notes: str | None = None
    signoffs: list[SignOff] = field(default_factory=list)   # rows for exactly this fingerprint
    status: ApprovalStatus | None = None
    created_epoch: int = 0
    map_scenes: dict = field(default_factory=dict)           # {view: [reports.field_map.MapScene, ...]}

    @property
    def findings(self) -> list:
        return list(getattr(self.assessment, "findings", None) or [])

    @property
    def created_date(self) -> str:
        return datetime.datetime.fromtimestamp(self.created_epoch, datetime.timezone.utc).date().isoformat()


def creation_epoch() -> int:
    """``$SOURCE_DATE_EPOCH`` if set (reproducible builds), else the current time."""
    text = os.environ.get("SOURCE_DATE_EPOCH", "").strip()
    if text:
        try:
            return int(text)
        except ValueError:
            pass
    return int(time.time())


def inputs_from_setup(setup, assessment, fingerprint: str, status: ApprovalStatus | None = None,
                      created_epoch: int | None = None) -> ReportInputs:
    """Gather the report's inputs from a validated setup, its assessment and its register status."""
    rules = setup.site_rules if not isinstance(setup.site_rules, (str, type(None))) else None
    audience = setup.audience
    interval = getattr(rules, "review_interval", None) if rules else None
    return ReportInputs(
        assessment=assessment,
        fingerprint=fingerprint,
        site=setup.site,
        work_date=setup.date.isoformat() if setup.date else None,
        audience={"groups": list(audience.groups), "youngest_age": audience.youngest_age,
                  "implant_wearers": audience.implant_wearers, "size": audience.size},
        site_rules_name=getattr(rules, "name", None),
        site_requirements=list(getattr(rules, "requirements", []) or []),
        protective_equipment=list(getattr(rules, "protective_equipment", []) or []),
        competent_persons=[(p.name, p.role) for p in (getattr(rules, "competent_persons", []) or [])],
        review_interval_s=float(interval) if interval else DEFAULT_REVIEW_INTERVAL_S,
        interval_from_site=bool(interval),
        setup_notes=setup.notes,
        signoffs=list(status.current_signoffs) if status and status.state != "damaged" else [],
        status=status,
        created_epoch=creation_epoch() if created_epoch is None else created_epoch,
        map_scenes=scenes_from_setup(setup, assessment),
    )

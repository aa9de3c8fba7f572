"""Stored studies: a request, its result, the versions of its inputs, the service version."""

from __future__ import annotations

import secrets

from sqlalchemy import delete, select
from sqlalchemy.orm import Session

from service.storage.models import Study


def add(session: Session, team_id: int, kind: str, request: dict, result: dict, inputs: dict,
        service_version: str, rerun_of: str | None = None) -> Study:
    study = Study(id=secrets.token_hex(8), team_id=team_id, kind=kind, request=request,
                  result=result, inputs=inputs, service_version=service_version,
                  rerun_of=rerun_of)
    session.add(study)
    session.flush()
    return study


def get(session: Session, team_id: int, study_id: str) -> Study | None:
    return session.scalars(
        select(Study).where(Study.id == study_id, Study.team_id == team_id)
    ).first()


def listing(session: Session, team_id: int, kind: str | None = None) -> list[Study]:
    query = select(Study).where(Study.team_id == team_id)
    if kind is not None:
        query = query.where(Study.kind == kind)
    return list(session.scalars(query.order_by(Study.created_at.desc(), Study.id)))


def remove(session: Session, team_id: int, study_id: str) -> bool:
    result = session.execute(
        delete(Study).where(Study.id == study_id, Study.team_id == team_id)
    )
    return result.rowcount > 0

"""Jobs and their result rows.

A job's rows are appended chunk by chunk, each chunk in one transaction together with the
progress count, and only by the worker that holds the job (``worker`` column) while it is
running: so the rows a job reports are exactly the rows stored, a cancelled or reclaimed job
takes no more rows from its old worker, and ``done`` only follows a complete table.
"""

from __future__ import annotations

import datetime as dt
import secrets
from collections.abc import Sequence

from sqlalchemy import func, select, update
from sqlalchemy.orm import Session

from service.storage.models import Job, JobRow, utcnow

QUEUED, RUNNING, DONE, FAILED, CANCELLED = "queued", "running", "done", "failed", "cancelled"
ACTIVE = (QUEUED, RUNNING)


def create(session: Session, team_id: int, key_id: str | None, kind: str, request: dict,
           inputs: dict, total: int, columns: list[str]) -> Job:
    job = Job(id=secrets.token_hex(8), team_id=team_id, key_id=key_id, kind=kind,
              request=request, inputs=inputs, status=QUEUED, done=0, total=total,
              columns=columns, attempts=0)
    session.add(job)
    session.flush()
    return job


def get(session: Session, team_id: int, job_id: str) -> Job | None:
    return session.scalars(select(Job).where(Job.id == job_id, Job.team_id == team_id)).first()


def listing(session: Session, team_id: int, status: str | None = None) -> list[Job]:
    """The team's jobs, newest first (of one status when given)."""
    query = select(Job).where(Job.team_id == team_id)
    if status is not None:
        query = query.where(Job.status == status)
    return list(session.scalars(query.order_by(Job.created_at.desc(), Job.id)))


def active_count(session: Session, team_id: int, key_id: str | None) -> int:
    """Queued and running jobs of a key (of the team while the service runs open)."""
    owner = Job.key_id == key_id if key_id is not None else Job.team_id == team_id
    return session.scalar(select(func.count()).select_from(Job)
                          .where(owner, Job.status.in_(ACTIVE)))


def claim(session: Session, job_id: str, worker: str) -> Job | None:
    """Start a queued job on ``worker``; None if it is not queued (cancelled, taken, gone)."""
    claimed = session.execute(
        update(Job).where(Job.id == job_id, Job.status == QUEUED)
        .values(status=RUNNING, worker=worker, heartbeat_at=utcnow(),
                attempts=Job.attempts + 1)
    ).rowcount
    return session.get(Job, job_id) if claimed else None


def row_count(session: Session, job_id: str) -> int:
    return session.scalar(select(func.count()).select_from(JobRow).where(JobRow.job_id == job_id))


def append(session: Session, job_id: str, worker: str, first_seq: int,
           rows: Sequence[Sequence[object]], case_column: int, done: int, total: int) -> bool:
    """Store ``rows`` and set the progress to ``done`` cases (``done == total`` finishes the
    job). False, storing nothing, when the job is no longer running on ``worker``."""
    values = {"done": done, "heartbeat_at": utcnow()}
    if done >= total:
        values.update(status=DONE, finished_at=utcnow())
    owned = session.execute(
        update(Job).where(Job.id == job_id, Job.status == RUNNING, Job.worker == worker)
        .values(**values)
    ).rowcount
    if not owned:
        return False
    session.add_all(
        JobRow(job_id=job_id, seq=first_seq + k, case=int(row[case_column]), row=list(row))
        for k, row in enumerate(rows)
    )
    return True


def fail(session: Session, job_id: str, worker: str, error: str) -> None:
    session.execute(
        update(Job).where(Job.id == job_id, Job.status == RUNNING, Job.worker == worker)
        .values(status=FAILED, error=error, finished_at=utcnow())
    )


def cancel(session: Session, team_id: int, job_id: str) -> Job | None:
    """Cancel a queued or running job (a finished one keeps its status); None if unknown."""
    job = get(session, team_id, job_id)
    if job is not None and job.status in ACTIVE:
        session.execute(update(Job).where(Job.id == job_id, Job.status.in_(ACTIVE))
                        .values(status=CANCELLED, finished_at=utcnow()))
        session.refresh(job)
    return job


def heartbeat(session: Session, worker: str) -> None:
    session.execute(update(Job).where(Job.worker == worker, Job.status == RUNNING)
                    .values(heartbeat_at=utcnow()))


def reclaim_stale(session: Session, stale_after: float, max_attempts: int) -> list[str]:
    """Jobs whose worker stopped beating for ``stale_after`` s (killed, host lost): queued
    again to resume after their last stored chunk, or failed after ``max_attempts`` starts.
    Returns the ids queued again."""
    cutoff = utcnow() - dt.timedelta(seconds=stale_after)
    stale = list(session.scalars(
        select(Job).where(Job.status == RUNNING, Job.heartbeat_at < cutoff)
        .with_for_update(skip_locked=True)
    ))
    again = []
    for job in stale:
        if job.attempts >= max_attempts:
            job.status, job.finished_at = FAILED, utcnow()
            job.error = f"its worker stopped {job.attempts} times; the rows kept are incomplete"
        else:
            job.status, job.worker = QUEUED, None
            again.append(job.id)
    return again


def rows(session: Session, job_id: str, first_seq: int, count: int) -> list[list[object]]:
    """``count`` rows of the job from ``first_seq`` on, in order."""
    return list(session.scalars(
        select(JobRow.row)
        .where(JobRow.job_id == job_id, JobRow.seq >= first_seq, JobRow.seq < first_seq + count)
        .order_by(JobRow.seq)
    ))

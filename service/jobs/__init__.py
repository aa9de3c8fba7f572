"""Long requests run in the background: a task queue (huey) carries job ids, the database
holds each job's state and rows (:mod:`service.storage.jobs`).

:mod:`.queue` builds the queue from the configuration (SQLite file by default, Redis by URL)
and runs consumers, in the service process or in ``formwise worker``; :mod:`.run` computes
one job chunk by chunk.
"""

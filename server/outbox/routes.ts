import { Router } from 'express';
import { allow } from '../auth/middleware';
import type { AppContext } from '../context';
import { queuedMail, receivedMail } from './store';

/** Messages the local fake SMTP server received, and what is still queued (never mounted in production). */
export function outboxRoutes(ctx: AppContext): Router {
  const router = Router();
  router.get('/', allow('admin'), async (_req, res) => {
    const received = await receivedMail(ctx.db);
    const queued = await queuedMail(ctx.db);
    res.json({
      messages: received.map((m) => ({
        id: m.id,
        from: m.from,
        to: m.to,
        subject: m.subject,
        text: m.text,
        html: m.html,
        receivedAt: m.received_at,
      })),
      queued: queued.map((q) => ({
        id: q.id,
        to: q.to,
        subject: q.subject,
        status: q.status,
        attempts: q.attempts,
        lastError: q.last_error,
        nextAttemptAt: q.next_attempt_at,
      })),
    });
  });
  return router;
}

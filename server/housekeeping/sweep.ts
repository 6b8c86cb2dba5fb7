import type { Logger } from 'pino';
import { BackgroundLoop } from '../background';
import type { Config } from '../config';
import type { Db } from '../db/knex';
import { openContentStore, type ContentStore } from '../evidence/storage';
import { JobLease, leaseTtl } from '../leases/lease';
import { fileReleases, forgetReleases, holdWriteLock, referencedEvidenceFiles, referencedSignedDossiers } from './store';
import { sweepTempFiles } from './temp-files';

/** A temporary file untouched this long belongs to an upload that will not finish. */
const TEMP_MAX_AGE_MS = 3600_000;
const SWEEP_EVERY_MS = 10 * 60_000;

interface SweepReport {
  tempFiles: number;
  orphanEvidence: number;
  orphanSignedDossiers: number;
}

/**
 * Keeps the data folder to what the database refers to: temporary files of interrupted uploads and
 * signings, evidence files no row references (after the grace period when a draft released them, at
 * once when nothing ever committed a row for them), signed dossiers of approvals that never committed.
 * A file any evidence row references — every submitted revision's included — is never touched.
 *
 * Temporary files are on this machine's disk, so every instance sweeps its own. Stored objects in a
 * bucket are shared: their sweep runs on the instance holding its lease. A folder store is on one
 * machine, swept by the instance (or the instances of that machine) that own it.
 */
export class Housekeeping {
  private readonly loop: BackgroundLoop;
  private readonly evidence: ContentStore;
  private readonly dossiers: ContentStore;
  private readonly sharedStoreLease: JobLease | null;

  constructor(
    private readonly db: Db,
    config: Pick<Config, 'dataDir' | 'evidenceStore'>,
    private readonly graceMs: number,
    private readonly log: Logger,
  ) {
    this.evidence = openContentStore(config, 'evidence');
    this.dossiers = openContentStore(config, 'dossiers');
    this.sharedStoreLease = config.evidenceStore.kind === 's3' ? new JobLease(db, 'sweep of stored objects', leaseTtl(SWEEP_EVERY_MS)) : null;
    this.loop = new BackgroundLoop('data folder sweep', async () => void (await this.sweep(false)), log, SWEEP_EVERY_MS);
  }

  /**
   * At start-up nothing of this process is in progress, so its own temporary files go too. A sweep that
   * fails here (a busy database) does not stop the server; the periodic one tries again.
   */
  async startUp(): Promise<void> {
    try {
      await this.sweep(true);
    } catch (err) {
      this.log.warn({ err }, 'the start-up sweep of the data folder failed; the periodic sweep will retry');
    }
    this.loop.start();
  }

  async stop(): Promise<void> {
    await this.loop.stop();
    await this.sharedStoreLease?.release().catch((err: unknown) => this.log.warn({ err }, 'could not release the lease of the stored-object sweep'));
  }

  async sweep(startingUp: boolean, now = Date.now()): Promise<SweepReport> {
    const temp = await sweepTempFiles([this.evidence.stagingDir, this.dossiers.stagingDir], TEMP_MAX_AGE_MS, startingUp, now);
    if (this.sharedStoreLease && !(await this.sharedStoreLease.take())) return { tempFiles: temp.length, orphanEvidence: 0, orphanSignedDossiers: 0 };
    const evidenceFiles = (await this.evidence.list()).map((o) => o.name);
    const signedFiles = (await this.dossiers.list()).map((o) => o.name);
    const removed = await this.db.transaction(async (trx) => {
      await holdWriteLock(trx);
      const used = await referencedEvidenceFiles(trx);
      const released = await fileReleases(trx);
      const signed = await referencedSignedDossiers(trx);
      const orphans = evidenceFiles.filter((f) => !used.has(f) && !(released.has(f) && now - Date.parse(released.get(f)!) < this.graceMs));
      const unsigned = signedFiles.filter((f) => !signed.has(f));
      for (const f of orphans) await this.evidence.remove(f);
      for (const f of unsigned) await this.dossiers.remove(f);
      // Releases of files that are gone, or in use again, have nothing left to time.
      const gone = new Set(orphans);
      const present = new Set(evidenceFiles);
      await forgetReleases(
        trx,
        [...released.keys()].filter((f) => gone.has(f) || used.has(f) || !present.has(f)),
      );
      return { orphans, unsigned };
    });
    const report = { tempFiles: temp.length, orphanEvidence: removed.orphans.length, orphanSignedDossiers: removed.unsigned.length };
    if (report.tempFiles || report.orphanEvidence || report.orphanSignedDossiers)
      this.log.info(report, 'removed leftover files from the data folder');
    return report;
  }
}

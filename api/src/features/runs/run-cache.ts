import type { Request, Response } from 'express';
import type { DataSource } from 'typeorm';
import { versionsOf } from '../../lib/data-versions';
import { TaggedAnswers } from '../../lib/tagged-answers';

/**
 * Reads of run figures. A run's results never change once stored, so what a reader gets from a
 * run route depends only on the address asked, the run that is current (a reader other than the
 * physician may read the current run only), who asks (role and sites) and the small-count
 * threshold: answers are tagged and kept by exactly these (lib/tagged-answers.ts), the current run
 * read with the request's other versions in one small query (lib/data-versions.ts).
 */
export class RunAnswers {
  private readonly answers: TaggedAnswers;

  constructor(
    private readonly ds: DataSource,
    private readonly smallCellThreshold: number,
    budgetBytes: number,
  ) {
    this.answers = new TaggedAnswers('run', budgetBytes);
  }

  /** Answers `req` with what `read` gives, from the browser's copy or this process's when it can. */
  async send(req: Request, res: Response, read: () => Promise<unknown>): Promise<void> {
    const { run } = await versionsOf(this.ds, req);
    await this.answers.send(req, res, [run, this.smallCellThreshold], read);
  }
}

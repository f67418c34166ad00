import type { Db } from '../db/database.js';
import type { LivePredictionFeed } from '../prediction/live-prediction-feed.js';
import { findActiveProfile } from './profile-repository.js';

/**
 * Keeps the live prediction on the profile the database marks active. Reloads run one after
 * another, each reading the database afresh, so after concurrent activations the last commit
 * is the one predicted for.
 */
export class ActiveProfileLoader {
  private queue: Promise<void> = Promise.resolve();

  constructor(
    private readonly db: Db,
    private readonly feed: LivePredictionFeed,
  ) {}

  /** Reads the active profile and hands it to the feed if it changed. Rejects when none is active. */
  reload(): Promise<void> {
    const run = this.queue.then(() => this.load());
    this.queue = run.catch(() => undefined);
    return run;
  }

  private async load(): Promise<void> {
    const active = await findActiveProfile(this.db);
    if (!active) throw new Error('no active sample profile in the database: mark one version of sample_profiles active');
    if (active.id !== this.feed.activeProfileId()) this.feed.setProfile(active);
  }
}

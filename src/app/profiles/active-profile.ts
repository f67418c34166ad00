import { httpResource } from '@angular/common/http';
import { Injectable, computed, effect, inject, untracked } from '@angular/core';
import type { ProfileRecord } from '../../../shared/profiles/profile-record';
import { errorText } from '../api/error-text';
import { LiveFeed } from '../feed/live-feed';

/**
 * The active sample profile (`GET /api/profiles/active`), shared by the Live page and the
 * orientation map. Re-read whenever the live prediction names another profile, so a profile
 * activated on another screen reaches this one within a push.
 */
@Injectable({ providedIn: 'root' })
export class ActiveProfile {
  private readonly feed = inject(LiveFeed);
  private readonly resource = httpResource<ProfileRecord>(() => '/api/profiles/active');
  private readonly livePredictionProfileId = computed(() => this.feed.live()?.prediction?.profileId ?? null);

  /** The active profile; null while loading or when it could not be read. */
  readonly record = computed(() => (this.resource.hasValue() ? this.resource.value() : null));
  /** Why the profile could not be read, for the user; null when it could. */
  readonly error = computed(() => (this.resource.error() ? errorText(this.resource.error()) : null));
  readonly loading = computed(() => this.resource.isLoading());

  constructor() {
    effect(() => {
      const wanted = this.livePredictionProfileId();
      const loaded = untracked(() => this.record()?.id ?? null);
      if (wanted !== null && wanted !== loaded && !untracked(() => this.resource.isLoading())) this.resource.reload();
    });
  }

  /** Reads the active profile again (after activating or saving one). */
  reload(): void {
    this.resource.reload();
  }
}

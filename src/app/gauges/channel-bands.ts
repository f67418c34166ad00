import { httpResource } from '@angular/common/http';
import { Injectable, computed, inject } from '@angular/core';
import type { ChannelBands } from '../../../shared/live/channels';
import { errorText } from '../api/error-text';
import { LiveFeed } from '../feed/live-feed';

/**
 * The display bands in force: fetched once (`GET /api/channels`) and then replaced by every
 * version the server pushes on the live feed, so a lead's change of a level or an alarm limit
 * redraws the gauges without a reload. Nothing is drawn against bands the server did not send.
 */
@Injectable({ providedIn: 'root' })
export class ChannelBandsSource {
  private readonly feed = inject(LiveFeed);
  private readonly fetched = httpResource<ChannelBands>(() => '/api/channels');

  readonly bands = computed<ChannelBands | null>(() => {
    const pushed = this.feed.channels();
    const fetched = this.fetched.hasValue() ? this.fetched.value() : null;
    if (pushed && (!fetched || pushed.version >= fetched.version)) return pushed;
    return fetched ?? pushed;
  });
  readonly error = computed(() => (this.bands() === null && this.fetched.error() ? errorText(this.fetched.error()) : null));

  reload(): void {
    this.fetched.reload();
  }
}

import { HttpClient, HttpErrorResponse, httpResource } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, computed, effect, inject, signal, untracked } from '@angular/core';
import { FormControl, FormGroup, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { firstValueFrom } from 'rxjs';
import type { InterlockCondition, InterlockResetRefusal, InterlockStatus, InterlockTripRecord } from '../../../shared/alarms/alarm-api';
import { hasRole } from '../../../shared/auth/roles';
import { quantityText } from '../alarms/channel-text';
import { MAX_REASON_CHARS } from '../shared-ui/reason-dialog';
import { errorText } from '../api/error-text';
import { fieldMessage, placeServerError } from '../api/field-errors';
import { Session } from '../auth/session';
import { LiveFeed } from '../feed/live-feed';
import { formatLocalDateTime } from '../readout/format-quantity';
import { InterlockCautions } from './interlock-cautions';
import { conditionOnChannel, conditionUnit, conditionWords, firstOutText, readingAgainstLimit, tripCauseText } from './interlock-text';

/** How often the present values are re-read while the page is open, ms. */
const REFRESH_MS = 1000;

/**
 * The Interlocks page: every trip condition with its present value, trip level and margin;
 * the latched state and first-out with the values at the trip; reset with a reason (operator
 * and above); the controller's hardware trip apart; the trip history; the cautions.
 */
@Component({
  selector: 'tw-interlocks-page',
  imports: [InterlockCautions, MatButtonModule, MatFormFieldModule, MatIconModule, MatInputModule, ReactiveFormsModule],
  templateUrl: './interlocks-page.html',
  styleUrl: './interlocks-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class InterlocksPage {
  private readonly http = inject(HttpClient);
  private readonly feed = inject(LiveFeed);
  private readonly role = inject(Session).role;

  protected readonly status = httpResource<InterlockStatus>(() => '/api/interlock');
  protected readonly loadError = computed(() => (this.status.error() ? errorText(this.status.error()) : null));
  protected readonly canReset = computed(() => {
    const role = this.role();
    return role !== null && hasRole(role, 'operator');
  });
  protected readonly tripped = computed(() => this.status.hasValue() && this.status.value().state === 'tripped');
  protected readonly firstOut = computed(() => {
    const s = this.status.hasValue() ? this.status.value() : null;
    return s?.firstOut ? firstOutText(s.firstOut, s.conditions) : null;
  });
  protected readonly hardwareTripped = computed(
    () => !!this.feed.live()?.controller.hardwareTripped || (this.status.hasValue() && this.status.value().hardwareTripped),
  );
  protected readonly hardwareCause = computed(
    () => this.feed.live()?.controller.hardwareTripCause ?? (this.status.hasValue() ? this.status.value().hardwareTripCause : null) ?? null,
  );

  protected readonly resetForm = new FormGroup({ reason: new FormControl('', { nonNullable: true }) });
  protected readonly maxReason = MAX_REASON_CHARS;
  protected readonly resetting = signal(false);
  protected readonly resetProblem = signal<string | null>(null);
  protected readonly fieldMessage = fieldMessage;
  /** Conditions the server said still hold when it refused the reset. */
  protected readonly stillActive = signal<InterlockCondition[]>([]);
  protected readonly resetDone = signal<string | null>(null);

  protected readonly conditionWords = conditionWords;
  protected readonly conditionOnChannel = conditionOnChannel;
  protected readonly readingAgainstLimit = readingAgainstLimit;

  constructor() {
    // Paced by the live feed's clock, which ticks a few times per second while the feed runs,
    // also when the controller is silent (then the staleness condition must be seen growing).
    let lastRead = Date.now();
    effect(() => {
      const now = this.feed.clock();
      if (now - lastRead < REFRESH_MS) return;
      lastRead = now;
      untracked(() => this.status.reload());
    });
    // A pushed change (trip, reset by someone else) is shown at once.
    effect(() => {
      if (this.feed.alarmsRevision() !== null) untracked(() => this.status.reload());
    });
  }

  protected presentValue(c: InterlockCondition): string {
    return c.valueText ?? quantityText(c.value, conditionUnit(c));
  }

  protected tripLevel(c: InterlockCondition): string {
    return c.tripsWhen ?? quantityText(c.limit, conditionUnit(c));
  }

  protected margin(c: InterlockCondition): string {
    return c.margin === null || c.margin === undefined ? '—' : quantityText(c.margin, conditionUnit(c));
  }

  /** The condition's value at the moment of the trip. */
  protected atTrip(trip: InterlockTripRecord, c: InterlockCondition): string {
    const then = trip.valuesAtTrip.find((v) => v.name === c.name);
    return then ? this.presentValue(then) : '—';
  }

  /** "low flow x on flow.x: 0.42 L/min, trip level 1.00 L/min". */
  protected tripCause(trip: InterlockTripRecord): string {
    const { condition, channel } = trip.firstOut;
    return tripCauseText(trip.firstOut, trip.valuesAtTrip.find((v) => v.name === condition) ?? { channel });
  }

  protected localTime(iso: string): string {
    return formatLocalDateTime(Date.parse(iso));
  }

  protected async resetInterlock(): Promise<void> {
    const reason = this.resetForm.controls.reason.value.trim();
    this.resetDone.set(null);
    this.stillActive.set([]);
    if (reason === '') {
      this.resetProblem.set('Write a reason: what caused the trip and what was done about it.');
      return;
    }
    this.resetProblem.set(null);
    this.resetting.set(true);
    try {
      await firstValueFrom(this.http.post('/api/interlock/reset', { reason }));
      this.resetForm.reset();
      this.resetDone.set(`Reset at ${formatLocalDateTime(Date.now())}. The controller is released and holds zero current until it gets a new setpoint.`);
    } catch (err) {
      this.resetProblem.set(placeServerError(err, this.resetForm.controls));
      if (err instanceof HttpErrorResponse && err.status === 409) {
        this.stillActive.set((err.error as Partial<InterlockResetRefusal> | null)?.conditions ?? []);
      }
    } finally {
      this.resetting.set(false);
      this.status.reload();
    }
  }
}
